package solve

import (
	"fmt"
	"slices"
	"strings"
	"testing"

	"github.com/ramify-tax/ramify/solve/graph"
)

// nestedString writes t in the bracket form dgNested reads, children
// ordered by their smallest leaf, so that equal trees give equal strings.
func nestedString(t *Tree) string {
	var write func(v int32) (string, int32)
	write = func(v int32) (string, int32) {
		if t.IsLeaf(v) {
			return fmt.Sprint(v), v
		}
		type part struct {
			s   string
			min int32
		}
		var parts []part
		for _, k := range t.Kids[v] {
			s, m := write(k)
			parts = append(parts, part{s, m})
		}
		slices.SortFunc(parts, func(a, b part) int { return int(a.min - b.min) })
		var ss []string
		for _, p := range parts {
			ss = append(ss, p.s)
		}
		return "(" + strings.Join(ss, ",") + ")", parts[0].min
	}
	s, _ := write(t.Root)
	return s
}

// TestKeepSideBySide works small trees by hand: the branches' items that
// share a child of their common ancestor are parted by moving the smaller
// branch up into that ancestor (the first on a tie), with its own
// arrangement, and a category left with one child gives way to it; a
// statement that already holds changes nothing; one whose move would
// break a triplet record stays as the tree has it and is reported.
func TestKeepSideBySide(t *testing.T) {
	for _, c := range []struct {
		name    string
		n       int
		tree    string
		sides   [][][]int32
		trips   []Triplet
		want    string
		notKept []int
	}{
		{"lift one item", 6, "(((0,1,2),3),(4,5))", [][][]int32{{{0}, {1}, {4}}},
			nil, "(((0,2),3),1,(4,5))", nil},
		{"already side by side", 6, "((0,1),(2,3),4,5)", [][][]int32{{{0}, {2}, {4}}},
			nil, "((0,1),(2,3),4,5)", nil},
		{"two of one child", 6, "((0,1,2),(3,4,5))", [][][]int32{{{0}, {3}, {4}}},
			nil, "((0,1,2),(3,5),4)", nil},
		{"a branch moves with its arrangement", 7, "((((0,1),2),3),(4,5,6))", [][][]int32{{{0, 1}, {2}, {4}}},
			nil, "(((0,1),3),2,(4,5,6))", nil},
		// Lifting 4 leaves its category with one child, which gives way;
		// the branch after it must still be lifted, not a stray leaf 0.
		{"a category gives way mid-pass", 5, "(((1,2,3),4),0)", [][][]int32{{{1, 2}, {4}, {3}, {0}}},
			nil, "(0,(1,2),3,4)", nil},
		{"a triplet record forbids the move", 6, "(((0,1,2),3),(4,5))", [][][]int32{{{0}, {1}, {4}}},
			[]Triplet{{A: 0, B: 2, C: 3, Record: 0}, {A: 1, B: 2, C: 3, Record: 0}}, "(((0,1,2),3),(4,5))", []int{1}},
	} {
		t.Run(c.name, func(t *testing.T) {
			tree := dgNested(t, c.n, c.tree)
			cons := &Constraints{Triplets: c.trips}
			for i, s := range c.sides {
				cons.SideBySide = append(cons.SideBySide, SideBySide{Branches: s, Record: 1 + i})
			}
			got, notKept := KeepSideBySide(tree, cons)
			if s := nestedString(got); s != c.want {
				t.Errorf("tree %s, want %s", s, c.want)
			}
			if !slices.Equal(notKept, c.notKept) {
				t.Errorf("not kept %v, want %v", notKept, c.notKept)
			}
			if bad := Satisfies(got, cons); len(bad) > 0 {
				t.Errorf("records %v broken", bad)
			}
			if leaves := got.Leaves(got.Root); len(leaves) != c.n {
				t.Errorf("%d leaves, want %d", len(leaves), c.n)
			}
		})
	}
}

// TestSolveKeepsSideBySide: three tight pairs (0 1), (2 3), (4 5) and a
// statement that 0, 1 and 2 meet in one category. The solver alone pairs 0
// with 1; Solve's taxonomy must part them, and keep a triplet record that
// holds 2 with 3.
func TestSolveKeepsSideBySide(t *testing.T) {
	var edges []graph.Edge
	for a := int32(0); a < 6; a++ {
		for b := a + 1; b < 6; b++ {
			w := 0.05
			if b == a+1 && a%2 == 0 {
				w = 1
			}
			edges = append(edges, graph.Edge{A: a, B: b, W: w})
		}
	}
	g := MustGraph(t, 6, edges)
	c := &Constraints{
		Triplets:   []Triplet{{A: 2, B: 3, C: 4, Record: 0}},
		SideBySide: []SideBySide{{Branches: [][]int32{{0}, {1}, {2}}, Record: 1}},
	}
	alone, err := Solve(g, &Constraints{Triplets: c.Triplets}, Options{MinSize: 2})
	if err != nil {
		t.Fatal(err)
	}
	if holdsSideBySide(newMutableTree(alone.Taxonomy), c.SideBySide[0]) {
		t.Fatalf("the test needs a tree that groups 0 with 1, got %s", nestedString(alone.Taxonomy))
	}
	res, err := Solve(g, c, Options{MinSize: 2})
	if err != nil {
		t.Fatal(err)
	}
	if !holdsSideBySide(newMutableTree(res.Taxonomy), c.SideBySide[0]) {
		t.Errorf("0, 1 and 2 do not meet in one category: %s", nestedString(res.Taxonomy))
	}
	if bad := Satisfies(res.Taxonomy, c); len(bad) > 0 {
		t.Errorf("records %v broken: %s", bad, nestedString(res.Taxonomy))
	}
}
