package graph

import (
	"fmt"
	"math"
)

// Links builds the graph of explicit similarities between n items. The
// links are taken as given and symmetrised by summing: a link a→b of weight
// x and b→a of weight y give one edge of weight x+y, as do two links a→b,
// so every statement of similarity counts. Every weight must be positive
// and finite; a link from an item to itself says nothing about the tree and
// is dropped.
func Links(n int, edges []Edge) (*CSR, error) {
	if n < 0 {
		return nil, fmt.Errorf("links: %d items", n)
	}
	for _, e := range edges {
		if math.IsNaN(e.W) || math.IsInf(e.W, 0) || e.W <= 0 {
			return nil, fmt.Errorf("link %d-%d: weight must be positive and finite, got %v", e.A, e.B, e.W)
		}
	}
	return FromEdges(n, edges)
}

// LinkColumns is Links over a links table in columns, without a list of
// Edge values in between: link k joins vertex[a[k]] and vertex[b[k]] with
// weight w[k]. vertex maps the table's numbering of ids to vertices; a
// link to an id that maps below 0 (not an item) is left out.
func LinkColumns(n int, vertex, a, b []int32, w []float32) (*CSR, error) {
	if n < 0 {
		return nil, fmt.Errorf("links: %d items", n)
	}
	if len(a) != len(b) || len(a) != len(w) {
		return nil, fmt.Errorf("links: columns of %d, %d and %d rows", len(a), len(b), len(w))
	}
	for k := range a {
		if int(a[k]) >= len(vertex) || int(b[k]) >= len(vertex) || a[k] < 0 || b[k] < 0 {
			return nil, fmt.Errorf("link %d: id number outside 0..%d", k, len(vertex)-1)
		}
		x := float64(w[k])
		if math.IsNaN(x) || math.IsInf(x, 0) || x <= 0 {
			return nil, fmt.Errorf("link %d: weight must be positive and finite, got %v", k, x)
		}
	}
	for _, v := range vertex {
		if int(v) >= n {
			return nil, fmt.Errorf("links: vertex %d outside 0..%d", v, n-1)
		}
	}
	return fromEdgeFunc(n, len(a), func(k int) (int32, int32, float64) {
		return vertex[a[k]], vertex[b[k]], float64(w[k])
	}), nil
}
