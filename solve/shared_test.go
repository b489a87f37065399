package solve_test

import (
	"math/rand/v2"
	"testing"

	"github.com/ramify-tax/ramify/solve"
	"github.com/ramify-tax/ramify/solve/planted"
)

// TestSharedGuide: a solve given the Shared of an earlier solve of the
// same graph consults the same guide it would have built, so it gives the
// same trees; a Shared over a different number of items is ignored; and a
// solve of a reweighted copy with the shared guide still keeps every
// record.
func TestSharedGuide(t *testing.T) {
	in := planted.Generate(5, 1500, 4, 3)
	c := drawConstraints(rand.New(rand.NewPCG(5, 5)), in.Tree, 200, 4)
	opt := solve.Options{MinSize: 3, MaxChildren: 12, MaxDepth: 5, Seed: 9}
	plain := mustSolve(t, in.Graph, c, opt)
	if plain.Shared != nil {
		t.Fatal("a solve that did not ask for it returned a Shared")
	}
	keep := opt
	keep.KeepShared = true
	first := mustSolve(t, in.Graph, c, keep)
	if first.Shared == nil {
		t.Fatal("KeepShared returned no Shared")
	}
	if !sameTree(first.Binary, plain.Binary) {
		t.Error("KeepShared changed the tree")
	}
	from := opt
	from.SharedFrom = first.Shared
	again := mustSolve(t, in.Graph, c, from)
	if !sameTree(again.Binary, plain.Binary) || !sameTree(again.Taxonomy, plain.Taxonomy) {
		t.Error("the shared guide of the same graph gave other trees than a guide built afresh")
	}

	other := planted.Generate(6, 1400, 4, 3)
	mismatched := solve.Options{MinSize: 3, MaxChildren: 12, MaxDepth: 5, Seed: 9, SharedFrom: first.Shared}
	if a, b := mustSolve(t, other.Graph, nil, mismatched), mustSolve(t, other.Graph, nil, solve.Options{MinSize: 3, MaxChildren: 12, MaxDepth: 5, Seed: 9}); !sameTree(a.Binary, b.Binary) {
		t.Error("a Shared over 1500 items was used for 1400")
	}

	r := rand.New(rand.NewPCG(7, 7))
	edges := in.Graph.Edges()
	for i := range edges {
		edges[i].W *= r.ExpFloat64()
	}
	copyG := solve.MustGraph(t, in.Graph.N, edges)
	res := mustSolve(t, copyG, c, from)
	if bad := solve.Satisfies(res.Binary, c); len(bad) > 0 {
		t.Errorf("reweighted copy with the shared guide breaks records %v", bad)
	}
}

// TestCutSteps: fewer Lanczos steps per split still give a tree that keeps
// every record, and a different one from the default's on a graph whose
// splits need more than a few steps.
func TestCutSteps(t *testing.T) {
	in := planted.Generate(8, 2000, 4, 3)
	c := drawConstraints(rand.New(rand.NewPCG(8, 8)), in.Tree, 200, 4)
	opt := solve.Options{MinSize: 3, MaxChildren: 12, MaxDepth: 5, Seed: 3}
	def := mustSolve(t, in.Graph, c, opt)
	for _, steps := range []int{3, 20} {
		o := opt
		o.CutSteps = steps
		res := mustSolve(t, in.Graph, c, o)
		if bad := solve.Satisfies(res.Binary, c); len(bad) > 0 {
			t.Errorf("CutSteps %d: records %v broken", steps, bad)
		}
		if steps == 3 && sameTree(res.Binary, def.Binary) {
			t.Error("CutSteps 3 gave the default's tree: the bound is not applied")
		}
	}
}
