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
