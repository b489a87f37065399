package regen

import (
	"testing"

	"github.com/ramify-tax/ramify/format"
)

// TestCategoryRoundTrip: an outline turned into a solver tree and back
// keeps its clusters; single-child categories collapse into their child.
func TestCategoryRoundTrip(t *testing.T) {
	o, err := format.ParseOutline("t.outline", []byte("A/\n  B/\n    a\n    b\n  c\nD/\n  E/\n    d\n    e\n"))
	if err != nil {
		t.Fatal(err)
	}
	ids := []string{"a", "b", "c", "d", "e"}
	index := map[string]int{}
	for i, id := range ids {
		index[id] = i
	}
	tree, nodes := CategoryNodes(o.Root, index, len(ids))
	back := ToCategory(tree, ids)
	// D/E/ collapses to one category: the same tree without D.
	want, err := format.ParseOutline("w.outline", []byte("A/\n  B/\n    a\n    b\n  c\nE/\n  d\n  e\n"))
	if err != nil {
		t.Fatal(err)
	}
	if got, want := format.StructureHash(back), format.StructureHash(want.Root); got != want {
		t.Errorf("structure %s after the round trip, want %s:\n%s", got, want, format.FormatTree(back))
	}
	// D has the single child E: both map to the node over {d, e}.
	var d, e *format.Category
	for _, c := range o.Root.Children {
		if c.Name == "D" {
			d, e = c, c.Children[0]
		}
	}
	if nodes[d] != nodes[e] {
		t.Errorf("D and its only child E map to different nodes %d, %d", nodes[d], nodes[e])
	}
	prior := PriorClusters(o.Root, index)
	if len(prior) != 4 { // A, B, D, E
		t.Errorf("%d prior clusters, want 4: %v", len(prior), prior)
	}
}
