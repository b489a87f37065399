package solve

import (
	"testing"

	"github.com/ramify-tax/ramify/solve/graph"
)

// TestGuideSplitsAtTheWeakestJoin: two 4-cliques joined by one weak edge;
// average linkage merges each clique before joining them, so the guide's
// split of all eight leaves — and of any set holding leaves of both — is
// the one between the cliques, and within one clique it splits that clique.
func TestGuideSplitsAtTheWeakestJoin(t *testing.T) {
	var e []graph.Edge
	for _, base := range []int32{0, 4} {
		for i := int32(0); i < 4; i++ {
			for j := i + 1; j < 4; j++ {
				e = append(e, graph.Edge{A: base + i, B: base + j, W: 1})
			}
		}
	}
	e = append(e, graph.Edge{A: 3, B: 4, W: 0.1})
	g, err := graph.FromEdges(8, e)
	if err != nil {
		t.Fatal(err)
	}
	gd := newGuide(g)
	if gd == nil {
		t.Fatal("no guide")
	}
	side := func(leaves []int32) map[int32]bool {
		cut, ok, _ := gd.threshold(leaves, nil)
		if !ok {
			t.Fatalf("no split of %v", leaves)
		}
		below := map[int32]bool{}
		for _, l := range leaves {
			below[l] = gd.pos[l] < cut
		}
		return below
	}
	for _, set := range [][]int32{{0, 1, 2, 3, 4, 5, 6, 7}, {1, 2, 5}, {0, 7}} {
		s := side(set)
		for _, l := range set {
			for _, m := range set {
				if (l < 4) == (m < 4) && s[l] != s[m] {
					t.Errorf("set %v: %d and %d of one clique split apart", set, l, m)
				}
				if (l < 4) != (m < 4) && s[l] == s[m] {
					t.Errorf("set %v: %d and %d of different cliques kept together", set, l, m)
				}
			}
		}
	}
	// Inside one clique the guide still splits (into two non-empty sides).
	s := side([]int32{0, 1, 2, 3})
	n0 := 0
	for _, b := range s {
		if b {
			n0++
		}
	}
	if n0 == 0 || n0 == 4 {
		t.Errorf("split of one clique is one-sided: %v", s)
	}
}
