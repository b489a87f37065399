package graph

import (
	"fmt"
	"math"
)

// VectorKind chooses the similarity between numeric feature vectors.
type VectorKind int

const (
	// Cosine is the cosine between z-scored vectors, negative values
	// clipped to 0 (opposite items are simply not similar).
	Cosine VectorKind = iota
	// Gaussian is the locally scaled kernel exp(−d_ij²/(σ_i σ_j)) on
	// z-scored vectors, σ_i the distance from i to its LocalScaleRank-th
	// nearest neighbour (self-tuning spectral clustering, Zelnik-Manor &
	// Perona 2004). Neighbours are chosen by Euclidean distance.
	Gaussian
)

// LocalScaleRank is the neighbour rank whose distance sets an item's
// Gaussian bandwidth (Zelnik-Manor & Perona, "Self-tuning spectral
// clustering", NIPS 2004). The value 7 is the one they are recalled to
// have used; it has not been checked against the paper's text. An item
// with fewer other items uses its farthest one.
const LocalScaleRank = 7

// Vectors builds the kNN graph over n items whose features are the
// row-major n×dim matrix values. Each column is standardised to z-scores
// with the population standard deviation; constant columns are dropped. An
// item with all z-scores 0 is the zero vector under Cosine and similar to
// nothing.
func Vectors(values []float64, n, dim, k int, kind VectorKind) (*CSR, error) {
	return Builder{K: k, Seed: DefaultSeed}.Vectors(values, n, dim, kind)
}

// Vectors is the package function Vectors with b's settings.
func (b Builder) Vectors(values []float64, n, dim int, kind VectorKind) (*CSR, error) {
	return VectorRows(b, values, nil, n, dim, kind)
}

// VectorRows is Builder.Vectors over a float32 or float64 matrix whose
// item i is row rows[i] (rows nil: row i), so that a matrix stored in
// another order, such as a file's, need not be copied into item order
// first. A float32 matrix is standardised into float32 z-scores: half the
// memory of float64, which is what lets a million embeddings of a few
// hundred dimensions fit; its similarities are still summed in float64. A
// float64 matrix gives exactly the graph it always did.
func VectorRows[T Float](b Builder, values []T, rows []int32, n, dim int, kind VectorKind) (*CSR, error) {
	if n < 0 || dim < 0 || rows == nil && len(values) != n*dim {
		return nil, fmt.Errorf("vectors: %d values do not form %d rows of %d", len(values), n, dim)
	}
	if rows != nil {
		stored := len(values) / max(dim, 1)
		if len(rows) != n || stored*dim != len(values) {
			return nil, fmt.Errorf("vectors: %d values and %d row numbers do not give %d items of %d features", len(values), len(rows), n, dim)
		}
		for _, r := range rows {
			if r < 0 || int(r) >= stored {
				return nil, fmt.Errorf("vectors: row %d is outside the %d rows of the matrix", r, stored)
			}
		}
	}
	for p, v := range values {
		if x := float64(v); math.IsNaN(x) || math.IsInf(x, 0) {
			return nil, fmt.Errorf("vectors: row %d feature %d is %v", p/dim, p%dim, x)
		}
	}
	if kind != Cosine && kind != Gaussian {
		return nil, fmt.Errorf("vectors: unknown kind %d", kind)
	}
	if err := b.checkK(n); err != nil {
		return nil, err
	}
	x, d := standardize(values, rows, n, dim)
	r := &denseRows[T]{n: n, d: d, x: x, gaussian: kind == Gaussian}
	if kind == Cosine {
		normalizeRows(x, n, d)
		lists := denseLists(b, r, effectiveK(b.K, n))
		if b.K > 0 {
			if far := farPartners(lists, r, b.FarPartners, b.Seed); far != nil {
				return symmetrize(cosineWeight, lists, far), nil
			}
		}
		return symmetrize(cosineWeight, lists), nil
	}
	return gaussianGraph(b, r), nil
}

// gaussianGraph searches at least LocalScaleRank neighbours to read each
// item's bandwidth, then weights the first K of them.
func gaussianGraph[T Float](b Builder, r *denseRows[T]) *CSR {
	k := effectiveK(b.K, r.n)
	rank := min(LocalScaleRank, r.n-1)
	var scaleLists, edgeLists *neighborLists
	if k == 0 {
		scaleLists = exactDense(r, rank, nil)
		edgeLists = exactDense(r, 0, nil)
	} else {
		scaleLists = denseLists(b, r, max(k, rank))
		edgeLists = truncateRows(scaleLists, k)
	}
	sigma := localScales(scaleLists, edgeLists, rank)
	return symmetrize(func(i int, j int32, score float64) float64 {
		return gaussianWeight(-score, sigma[i], sigma[j])
	}, edgeLists)
}

// gaussianWeight is exp(−d²/(σ_i σ_j)), and 1 for identical points.
func gaussianWeight(d2, si, sj float64) float64 {
	if d2 == 0 {
		return 1
	}
	return math.Exp(-d2 / float64(si*sj))
}

// localScales reads σ_i, the distance from i to its rank-th neighbour in
// scaleLists (best first). An item with as many exact duplicates as rank
// would get σ = 0 and divide by zero; it gets the smallest positive
// distance found in either list set instead, the tightest scale the data
// shows (1 if all listed distances are 0, when every weight is 1 anyway).
func localScales(scaleLists, edgeLists *neighborLists, rank int) []float64 {
	sigma := make([]float64, scaleLists.n)
	floor := math.Inf(1)
	for _, l := range []*neighborLists{scaleLists, edgeLists} {
		for _, s := range l.sims {
			if d2 := -s; d2 > 0 {
				floor = min(floor, math.Sqrt(d2))
			}
		}
	}
	if math.IsInf(floor, 1) {
		floor = 1
	}
	for i := range sigma {
		_, sims := scaleLists.row(i)
		if len(sims) == 0 {
			continue
		}
		sigma[i] = math.Sqrt(-sims[min(rank, len(sims))-1])
		if sigma[i] == 0 {
			sigma[i] = floor
		}
	}
	return sigma
}

// truncateRows keeps the first k entries of every (best-first) row.
func truncateRows(l *neighborLists, k int) *neighborLists {
	out := &neighborLists{n: l.n, off: make([]int64, l.n+1)}
	for i := 0; i < l.n; i++ {
		ids, sims := l.row(i)
		m := min(k, len(ids))
		out.ids = append(out.ids, ids[:m]...)
		out.sims = append(out.sims, sims[:m]...)
		out.off[i+1] = int64(len(out.ids))
	}
	return out
}
