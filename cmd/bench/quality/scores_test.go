package main

import (
	"testing"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/internal/realdata"
)

func outline(t *testing.T, text string) *format.Category {
	t.Helper()
	o, err := format.ParseOutline("t.outline", []byte("# ramify outline 1\n"+text))
	if err != nil {
		t.Fatal(err)
	}
	return o.Root
}

func indexOf(root *format.Category) map[string]int {
	idx := map[string]int{}
	for i, id := range root.AllItems() {
		idx[id] = i
	}
	return idx
}

// A reference scored against itself is perfect on every dev set.
func TestReferenceScoresItselfPerfectly(t *testing.T) {
	sets, err := realdata.All()
	if err != nil {
		t.Fatal(err)
	}
	for _, s := range sets {
		got := score(s.Reference, s.Reference, indexOf(s.Reference))
		if got.Precision != 1 || got.Recall != 1 || got.F1 != 1 || got.ClusterF1 != 1 {
			t.Errorf("%s: score(ref, ref) = %+v, want precision, recall, F1 and cluster F1 of 1", s.Name, got)
		}
	}
}

// Shape measures on a small outline worked by hand: "a" holds 6 items of
// which its subcategory "b" holds 5 (83% > 80%: a chain); "b" holds 5 of
// which "c" holds 4 (80%, not above: no chain); the top level is "a" and
// "z" with 6 of the 8 items in "a".
func TestShapeMeasures(t *testing.T) {
	root := outline(t, "a/\n  b/\n    c/\n      i1\n      i2\n      i3\n      i4\n    i5\n  i6\nz/\n  i7\n  i8\n")
	got := score(root, root, indexOf(root))
	if got.Chains != 1 || got.TopLevel != 2 || got.TopShare != 0.75 || got.Depth != 3 {
		t.Errorf("score = %+v; want 1 chain, 2 top-level entries, top share 0.75, depth 3", got)
	}
}

// Cluster F1 by hand: the reference has {i1,i2} (weight 2) and {i3,i4,i5}
// (weight 3); the tree has {i1,i2,i3} only. Best F1 for the first is
// 2·2/(2+3) = 0.8, for the second 2·1/(3+3) = 1/3; weighted mean
// (2·0.8 + 3/3)/5 = 0.52.
func TestClusterF1ByHand(t *testing.T) {
	ref := outline(t, "p/\n  i1\n  i2\nq/\n  i3\n  i4\n  i5\n")
	tree := outline(t, "r/\n  i1\n  i2\n  i3\ni4\ni5\n")
	if got := clusterF1(tree, ref, indexOf(ref)); got < 0.52-1e-12 || got > 0.52+1e-12 {
		t.Errorf("clusterF1 = %v, want 0.52", got)
	}
}
