package graph

import "math"

// Float is the element type of a matrix of vectors: embeddings usually
// come as float32, and are kept so, which halves their memory (a million
// 384-dimensional embeddings take 1.5 GB as float32, 3.1 GB as float64).
type Float interface{ ~float32 | ~float64 }

// denseRows stores one point per item, row-major: item i is
// x[i*d : (i+1)*d]. Its score is the cosine (rows are unit length or zero)
// or, for the Gaussian kind, minus the squared Euclidean distance, so that
// higher always means closer. Scores are summed in float64 whatever T is.
type denseRows[T Float] struct {
	n, d     int
	x        []T
	gaussian bool
}

func (r *denseRows[T]) len() int { return r.n }

func (r *denseRows[T]) point(i int) []T { return r.x[i*r.d : (i+1)*r.d : (i+1)*r.d] }

func (r *denseRows[T]) score(i, j int) float64 {
	if r.gaussian {
		return -squaredDistance(r.point(i), r.point(j))
	}
	return dot(r.point(i), r.point(j))
}

func (r *denseRows[T]) newRowScorer() rowScorer { return &denseScorer[T]{rows: r} }

// denseScorer scores a fixed point against others with the same functions
// as denseRows.score.
type denseScorer[T Float] struct {
	rows  *denseRows[T]
	fixed []T
}

func (c *denseScorer[T]) fix(i int) { c.fixed = c.rows.point(i) }

func (c *denseScorer[T]) with(j int) float64 {
	if c.rows.gaussian {
		return -squaredDistance(c.fixed, c.rows.point(j))
	}
	return dot(c.fixed, c.rows.point(j))
}

func (c *denseScorer[T]) unfix() {}

// dot sums a·b in four interleaved partial sums combined in a fixed order:
// faster than one running sum, still the same bits on every run, and
// dot(a,b) == dot(b,a) exactly because each product commutes. Explicit
// conversions forbid fused multiply-add. Products are taken in float64: for
// float32 inputs they are then exact, for float64 the code is the same as
// without the conversions.
func dot[T Float](a, b []T) float64 {
	b = b[:len(a)]
	var s0, s1, s2, s3 float64
	i := 0
	for ; i+4 <= len(a); i += 4 {
		x, y := a[i:i+4:i+4], b[i:i+4:i+4] // one bounds check per four terms
		s0 += float64(float64(x[0]) * float64(y[0]))
		s1 += float64(float64(x[1]) * float64(y[1]))
		s2 += float64(float64(x[2]) * float64(y[2]))
		s3 += float64(float64(x[3]) * float64(y[3]))
	}
	for ; i < len(a); i++ {
		s0 += float64(float64(a[i]) * float64(b[i]))
	}
	return (s0 + s1) + (s2 + s3)
}

// squaredDistance is Σ (a-b)² in the same fixed four-way order as dot;
// (a-b)² and (b-a)² are equal, so it is exactly symmetric. Differences are
// taken in float64, like dot's products.
func squaredDistance[T Float](a, b []T) float64 {
	b = b[:len(a)]
	var s0, s1, s2, s3 float64
	i := 0
	for ; i+4 <= len(a); i += 4 {
		x, y := a[i:i+4:i+4], b[i:i+4:i+4]
		d0, d1 := float64(x[0])-float64(y[0]), float64(x[1])-float64(y[1])
		d2, d3 := float64(x[2])-float64(y[2]), float64(x[3])-float64(y[3])
		s0 += float64(d0 * d0)
		s1 += float64(d1 * d1)
		s2 += float64(d2 * d2)
		s3 += float64(d3 * d3)
	}
	for ; i < len(a); i++ {
		d := float64(a[i]) - float64(b[i])
		s0 += float64(d * d)
	}
	return (s0 + s1) + (s2 + s3)
}

// standardize turns an n×dim row-major matrix into z-scores per column
// (population standard deviation, the mean and spread of the items
// themselves) and drops constant columns, which carry no information and
// would divide by zero. A column counts as constant only when all its
// values are equal, not when its computed deviation is tiny: rounding in the
// mean of a constant column would otherwise blow noise up to unit scale.
// Item i of the result is row rows[i] of values (rows nil: row i), so a
// matrix in another order need not be copied first. Means and deviations
// are computed in float64, each column summed in item order; the z-scores
// are stored as T.
func standardize[T Float](values []T, rows []int32, n, dim int) (x []T, d int) {
	row := func(i int) []T {
		r := i
		if rows != nil {
			r = int(rows[i])
		}
		return values[r*dim : (r+1)*dim : (r+1)*dim]
	}
	mean := make([]float64, dim)
	sd := make([]float64, dim)
	lo := make([]float64, dim)
	hi := make([]float64, dim)
	for c := range dim {
		lo[c], hi[c] = math.Inf(1), math.Inf(-1)
	}
	// Row by row, not column by column: one pass over the matrix in memory
	// order, with every column still summed in item order.
	for i := 0; i < n; i++ {
		for c, v := range row(i) {
			x := float64(v)
			lo[c], hi[c] = min(lo[c], x), max(hi[c], x)
			mean[c] += x
		}
	}
	keep := make([]int, 0, dim)
	for c := range dim {
		if n == 0 || lo[c] == hi[c] {
			continue
		}
		mean[c] /= float64(n)
		keep = append(keep, c)
	}
	for i := 0; i < n; i++ {
		r := row(i)
		for _, c := range keep {
			dv := float64(r[c]) - mean[c]
			sd[c] += float64(dv * dv)
		}
	}
	for _, c := range keep {
		sd[c] = math.Sqrt(sd[c] / float64(n))
	}
	d = len(keep)
	x = make([]T, n*d)
	for i := 0; i < n; i++ {
		r := row(i)
		for p, c := range keep {
			x[i*d+p] = T((float64(r[c]) - mean[c]) / sd[c])
		}
	}
	return x, d
}

// normalizeRows scales every row to unit length; zero rows stay zero and so
// have cosine 0 with everything.
func normalizeRows[T Float](x []T, n, d int) {
	for i := 0; i < n; i++ {
		row := x[i*d : (i+1)*d]
		norm := math.Sqrt(dot(row, row))
		if norm == 0 {
			continue
		}
		for p := range row {
			row[p] = T(float64(row[p]) / norm)
		}
	}
}

// exactDense finds, for each listed item (all when items is nil), its k
// best-scoring other items by comparing with every item, O(n·d) per row;
// k = 0 keeps every other item, in index order (all-pairs mode; for the
// cosine only positive scores, the rest could never become edges).
//
// With k > 0 a block of rows is compared with one tile of points at a time,
// small enough to stay in cache, instead of streaming all n points past
// every row: the same comparisons with a blockRows-th of the memory
// traffic, which matters once the points outgrow the cache (20,000
// embeddings of 768 dimensions take 123 MB). Each row still sees its
// candidates in increasing index order.
func exactDense[T Float](r *denseRows[T], k int, items []int32) *neighborLists {
	if k == 0 {
		return computeRows(r.n, items, func() struct{} { return struct{}{} }, func(_ struct{}, i int, ids []int32, sims []float64) ([]int32, []float64) {
			xi := r.point(i)
			for j := 0; j < r.n; j++ {
				if j == i {
					continue
				}
				if s := r.scoreWith(xi, j); r.gaussian || s > 0 {
					ids = append(ids, int32(j))
					sims = append(sims, s)
				}
			}
			return ids, sims
		})
	}
	tile := max(64, denseTileFloats/max(r.d, 1))
	newState := func() []*topK {
		tops := make([]*topK, blockRows)
		for q := range tops {
			tops[q] = newTopK(k)
		}
		return tops
	}
	return computeBlocks(r.n, items, newState, func(tops []*topK, block []int32, out *rowBlock) {
		for t0 := 0; t0 < r.n; t0 += tile {
			t1 := min(t0+tile, r.n)
			for q, i := range block {
				xi, top := r.point(int(i)), tops[q]
				for j := t0; j < t1; j++ {
					if j == int(i) {
						continue
					}
					if s := r.scoreWith(xi, j); top.admits(s, int32(j)) {
						top.push(s, int32(j))
					}
				}
			}
		}
		for q := range block {
			before := len(out.ids)
			out.ids, out.sims = tops[q].appendBestFirst(out.ids, out.sims)
			out.lens = append(out.lens, int32(len(out.ids)-before))
		}
	})
}

// denseTileFloats is the size of one tile of points in exactDense, in
// float64s: 256 KiB, which fits the per-core cache of common processors.
const denseTileFloats = 1 << 15

// scoreWith is the score between point xi and item j.
func (r *denseRows[T]) scoreWith(xi []T, j int) float64 {
	if r.gaussian {
		return -squaredDistance(xi, r.point(j))
	}
	return dot(xi, r.point(j))
}
