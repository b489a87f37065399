// Package graph holds the similarity graph ramify clusters: a sparse,
// symmetric, non-negative weighted graph in compressed sparse row form,
// and the builders that turn items' tags, text, vectors and links into one.
package graph

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"sort"
)

// CSR is an undirected weighted graph on vertices 0..N-1. Row i lists the
// neighbours of i in increasing order in Targets[Offsets[i]:Offsets[i+1]]
// with their weights in Weights at the same positions. Every edge is stored
// in both rows with the same weight; there are no self-loops and no
// zero-weight entries.
type CSR struct {
	N       int
	Offsets []int64
	Targets []int32
	Weights []float64
}

// Edge is one undirected similarity between two vertices.
type Edge struct {
	A, B int32
	W    float64
}

// FromEdges builds a CSR from an edge list. Duplicate edges (in either
// direction) are summed; self-loops and non-positive weights are dropped.
// The result depends only on the multiset of edges, not their order, as
// long as duplicates are summed in a fixed order: they are summed in sorted
// order of (A, B, W), so the floating-point sum is deterministic too.
func FromEdges(n int, edges []Edge) (*CSR, error) {
	for _, e := range edges {
		if e.A < 0 || e.B < 0 || int(e.A) >= n || int(e.B) >= n {
			return nil, fmt.Errorf("edge %d-%d outside 0..%d", e.A, e.B, n-1)
		}
		if math.IsNaN(e.W) || math.IsInf(e.W, 0) {
			return nil, fmt.Errorf("edge %d-%d has weight %v", e.A, e.B, e.W)
		}
	}
	return fromEdgeFunc(n, len(edges), func(k int) (int32, int32, float64) {
		e := edges[k]
		return e.A, e.B, e.W
	}), nil
}

// fromEdgeFunc is FromEdges over m edges given by edge(k), checked
// already: vertices in range, weights finite. An edge with a vertex below
// 0 is left out (LinkColumns marks links to unknown items so).
func fromEdgeFunc(n, m int, edge func(k int) (a, b int32, w float64)) *CSR {
	g := &CSR{N: n, Offsets: make([]int64, n+1)}
	// Bucket the directed edges by row (a counting sort on A), then sort
	// each short row by (B, W): the same order as one sort of all 2m
	// directed edges by (A, B, W), at a fraction of the cost at a million
	// items.
	start := make([]int64, n+1)
	for k := range m {
		a, b, w := edge(k)
		if a == b || w <= 0 || a < 0 || b < 0 {
			continue
		}
		start[a+1]++
		start[b+1]++
	}
	for i := 0; i < n; i++ {
		start[i+1] += start[i]
	}
	type half struct {
		b int32
		w float64
	}
	dir := make([]half, start[n])
	fill := append([]int64(nil), start[:n]...)
	for k := range m {
		a, b, w := edge(k)
		if a == b || w <= 0 || a < 0 || b < 0 {
			continue
		}
		dir[fill[a]] = half{b, w}
		fill[a]++
		dir[fill[b]] = half{a, w}
		fill[b]++
	}
	fill = nil
	less := func(x, y half) int {
		if c := cmp.Compare(x.b, y.b); c != 0 {
			return c
		}
		return cmp.Compare(x.w, y.w)
	}
	// Sum the duplicates of each row in place; kept counts the entries
	// left, which then move into CSR arrays of their exact size.
	kept := int64(0)
	for i := 0; i < n; i++ {
		row := dir[start[i]:start[i+1]]
		if len(row) <= 16 {
			for a := 1; a < len(row); a++ {
				for c := a; c > 0 && less(row[c-1], row[c]) > 0; c-- {
					row[c-1], row[c] = row[c], row[c-1]
				}
			}
		} else {
			slices.SortFunc(row, less)
		}
		rowStart := kept
		for a := 0; a < len(row); {
			c := a
			w := 0.0
			for c < len(row) && row[c].b == row[a].b {
				w += row[c].w
				c++
			}
			dir[kept] = half{row[a].b, w}
			kept++
			a = c
		}
		g.Offsets[i+1] = g.Offsets[i] + (kept - rowStart)
	}
	g.Targets = make([]int32, kept)
	g.Weights = make([]float64, kept)
	for k, h := range dir[:kept] {
		g.Targets[k], g.Weights[k] = h.b, h.w
	}
	return g
}

// Neighbors returns the neighbour ids and weights of v (shared slices; do
// not modify).
func (g *CSR) Neighbors(v int) ([]int32, []float64) {
	a, b := g.Offsets[v], g.Offsets[v+1]
	return g.Targets[a:b], g.Weights[a:b]
}

// NumEdges is the number of undirected edges.
func (g *CSR) NumEdges() int { return len(g.Targets) / 2 }

// Degree is the weighted degree of v.
func (g *CSR) Degree(v int) float64 {
	_, ws := g.Neighbors(v)
	s := 0.0
	for _, w := range ws {
		s += w
	}
	return s
}

// Weight returns w(u,v), 0 when there is no edge (binary search in u's row).
func (g *CSR) Weight(u, v int) float64 {
	ts, ws := g.Neighbors(u)
	k := sort.Search(len(ts), func(i int) bool { return int(ts[i]) >= v })
	if k < len(ts) && int(ts[k]) == v {
		return ws[k]
	}
	return 0
}

// Edges lists each undirected edge once, with A < B, in row order.
func (g *CSR) Edges() []Edge {
	out := make([]Edge, 0, g.NumEdges())
	for u := 0; u < g.N; u++ {
		ts, ws := g.Neighbors(u)
		for k, t := range ts {
			if int(t) > u {
				out = append(out, Edge{int32(u), t, ws[k]})
			}
		}
	}
	return out
}
