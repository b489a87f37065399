package review

import (
	"runtime"
	"testing"

	"github.com/ramify-tax/ramify/solve"
	"github.com/ramify-tax/ramify/solve/graph"
	"github.com/ramify-tax/ramify/solve/planted"
)

// twoBlocks is a graph over 12 items with two blocks of six: view a
// groups 0–5 and 6–11, view b groups the even and the odd items — two
// views that disagree systematically, whatever the reweighting.
func twoBlocks(t *testing.T, same func(i, j int) bool) *graph.CSR {
	t.Helper()
	var edges []graph.Edge
	for i := 0; i < 12; i++ {
		for j := i + 1; j < 12; j++ {
			w := 0.05
			if same(i, j) {
				w = 1
			}
			edges = append(edges, graph.Edge{A: int32(i), B: int32(j), W: w})
		}
	}
	g, err := graph.FromEdges(12, edges)
	if err != nil {
		t.Fatal(err)
	}
	return g
}

// TestViewCommitteeFindsDisagreeingViews: members solved from two views
// that group the items differently split on every cross triplet (0, 1, 6):
// view a puts 0 with 1, view b puts 0 with 6 — disagreement that a
// bootstrap of view a alone never shows. The committee is the same on a
// second build.
func TestViewCommitteeFindsDisagreeingViews(t *testing.T) {
	a := twoBlocks(t, func(i, j int) bool { return (i < 6) == (j < 6) })
	b := twoBlocks(t, func(i, j int) bool { return i%2 == j%2 })
	opt := solve.Options{MinSize: 2, MaxChildren: 12, MaxDepth: 6}
	c, err := BuildViewCommittee([]*graph.CSR{a, b}, &solve.Constraints{}, opt, 6, 7)
	if err != nil {
		t.Fatal(err)
	}
	v := c.Votes(0, 1, 6) // topologies star, ab|c (0 1 | 6), ac|b (0 6 | 1), bc|a
	if v[topoAB] != 3 || v[topoAC] != 3 {
		t.Errorf("votes on (0, 1, 6): %v, want 3 for 0 1|6 (view a) and 3 for 0 6|1 (view b)", v)
	}
	boot, err := BuildCommittee(a, &solve.Constraints{}, opt, 6, 7)
	if err != nil {
		t.Fatal(err)
	}
	if v := boot.Votes(0, 1, 6); v[topoAB] != 6 {
		t.Errorf("bootstrap of view a alone: votes %v, want all 6 for 0 1|6", v)
	}
	again, _ := BuildViewCommittee([]*graph.CSR{a, b}, &solve.Constraints{}, opt, 6, 7)
	for i := range c.Trees {
		if !sameTree(c.Trees[i], again.Trees[i]) {
			t.Fatalf("member %d differs between two builds", i)
		}
	}
	if _, err := BuildViewCommittee([]*graph.CSR{a, twoBlocksN(t, 5)}, &solve.Constraints{}, opt, 4, 7); err == nil {
		t.Error("views over different item counts were accepted")
	}
}

func twoBlocksN(t *testing.T, n int) *graph.CSR {
	g, err := graph.FromEdges(n, nil)
	if err != nil {
		t.Fatal(err)
	}
	return g
}

func sameTree(x, y *solve.Tree) bool {
	if x.NumNodes() != y.NumNodes() || x.Root != y.Root {
		return false
	}
	for v := range x.Kids {
		if len(x.Kids[v]) != len(y.Kids[v]) {
			return false
		}
		for i := range x.Kids[v] {
			if x.Kids[v][i] != y.Kids[v][i] {
				return false
			}
		}
	}
	return true
}

// TestViewCommitteeIgnoresGOMAXPROCS: the bootstrap members wait for
// their view's own member and reuse its guide, and still the committee is
// the same for one thread and for four.
func TestViewCommitteeIgnoresGOMAXPROCS(t *testing.T) {
	a := planted.Generate(6, 400, 3, 2).Graph
	b := planted.Generate(7, 400, 3, 2).Graph
	build := func(procs int) *Committee {
		defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(procs))
		c, err := BuildViewCommittee([]*graph.CSR{a, b}, nil, testOptions, 7, 77)
		if err != nil {
			t.Fatal(err)
		}
		return c
	}
	one, many := build(1), build(4)
	for i := range one.Trees {
		if !sameTree(one.Trees[i], many.Trees[i]) || !sameTree(one.Binary[i], many.Binary[i]) {
			t.Fatalf("member %d differs between GOMAXPROCS 1 and 4", i)
		}
	}
}
