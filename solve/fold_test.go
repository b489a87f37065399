package solve

import (
	"fmt"
	"math/rand/v2"
	"slices"
	"sort"
	"testing"

	"github.com/ramify-tax/ramify/solve/graph"
)

func noProgress(string, int, int) {}

func TestFoldCollapseTwoTriangles(t *testing.T) {
	// Contracting (0,(1,2)) into the root of the two-triangle optimum
	// costs Δ = (6−3)·2 = 6, so the cost goes from 22 to 28 (by hand).
	g := dgTwoTriangles(t)
	tr, p, _ := twoTrianglesOpt()
	f := newFolder(g, tr, nil, foldParams{})
	f.contract(p)
	out := f.result()
	if c := Cost(g, out); c != 28 {
		t.Fatalf("cost after the fold %g, want 28 (%s)", c, newick(out))
	}
	if got := newick(out); got != "(a,(b,c),(d,(e,f)))" {
		t.Errorf("folded tree %s", got)
	}
	// The mediant bookkeeping matches ψ recomputed from the result: the
	// root now has children 0, (1,2), (3,(4,5)) with cross weight 1+1+1
	// and pairs 1·2 + 1·3 + 2·3 = 11.
	if psi := f.psi(tr.Root); psi != 3.0/11 {
		t.Errorf("ψ(root) = %g, want 3/11", psi)
	}
}

// chainTree is (((a,b),c),d) on four leaves, with ids for its nodes.
func chainTree() (tr *Tree, ab, abc int32) {
	tr = NewTree(4)
	ab = tr.Add(la, lb)
	abc = tr.Add(ab, lc)
	tr.Add(abc, ld)
	return
}

func TestFoldUncollapsible(t *testing.T) {
	// A node is uncollapsible if it is a cluster constraint or
	// lca(a,b) of a triplet ab|c with c in parent∖node. Here (a,b) is
	// smaller than MinSize 3 and as loose as its parent, so only a
	// constraint keeps it.
	g := dgClique(t, 4)
	tr, _, _ := chainTree()
	cases := []struct {
		name string
		c    *Constraints
		want string
	}{
		{"free", nil, "(a,b,c,d)"},
		{"triplet ab|c", &Constraints{Triplets: []Triplet{trip(la, lb, lc, 0)}}, "((a,b),c,d)"},
		{"triplet ab|d", &Constraints{Triplets: []Triplet{trip(la, lb, ld, 0)}}, "((a,b,c),d)"},
		{"cluster ab", &Constraints{Clusters: []Cluster{{Leaves: []int32{la, lb}, Record: 0}}}, "((a,b),c,d)"},
		{"cluster abc", &Constraints{Clusters: []Cluster{{Leaves: []int32{la, lb, lc}, Record: 0}}}, "((a,b,c),d)"},
	}
	for _, c := range cases {
		out := fold(g, tr, c.c, foldParams{minSize: 3, ratio: foldTightness}, noProgress)
		if got := newick(out); got != c.want {
			t.Errorf("%s: folded to %s, want %s", c.name, got, c.want)
		}
		if bad := Satisfies(out, c.c); len(bad) > 0 {
			t.Errorf("%s: violated %v", c.name, bad)
		}
	}
}

// blockGraph has groups of size k; weight in inside a group, out between.
func blockGraph(t testing.TB, groups, k int, in, out float64) *graph.CSR {
	var es []graph.Edge
	n := groups * k
	for i := 0; i < n; i++ {
		for j := i + 1; j < n; j++ {
			w := out
			if i/k == j/k {
				w = in
			}
			es = append(es, graph.Edge{A: int32(i), B: int32(j), W: w})
		}
	}
	return MustGraph(t, n, es)
}

func TestFoldTightnessRule(t *testing.T) {
	// Four cliques of five joined weakly: every binary split inside a
	// clique or between cliques is exactly as tight as its parent's (ψ
	// ratio 1 < foldTightness) and folds; a clique is 100 times tighter
	// than the level above it and stays. So the catalogue is four flat
	// categories of five.
	g := blockGraph(t, 4, 5, 1, 0.01)
	bin, err := construct(g, &Constraints{}, constructParams{})
	if err != nil {
		t.Fatal(err)
	}
	out := fold(g, bin, nil, foldParams{ratio: foldTightness}, noProgress)
	if got := newick(out); got != "((a,b,c,d,e),(f,g,h,i,j),(k,l,m,n,o),(p,q,r,s,t))" {
		t.Errorf("folded to %s", got)
	}
}

// clusterStrings lists the leaf sets of the internal nodes of t.
func clusterStrings(t *Tree) map[string]bool {
	out := map[string]bool{}
	for v := t.N; v < t.NumNodes(); v++ {
		ls := t.Leaves(int32(v))
		sort.Slice(ls, func(i, j int) bool { return ls[i] < ls[j] })
		out[fmt.Sprint(ls)] = true
	}
	return out
}

// categoryDepth is the largest number of categories (internal nodes other
// than the root) above any leaf.
func categoryDepth(t *Tree) int {
	depth := make([]int, t.NumNodes())
	best := 0
	for _, v := range slices.Backward(t.PostOrder()) {
		for _, k := range t.Kids[v] {
			if t.IsLeaf(k) {
				best = max(best, depth[v])
			} else {
				depth[k] = depth[v] + 1
			}
		}
	}
	return best
}

func TestFoldLimits(t *testing.T) {
	// On random graphs and random constraint sets: no node gets more than
	// MaxChildren children; folding only contracts (every category is a
	// cluster of the binary tree); the root has at least two children; a
	// category below MinSize survives only if folding it is illegal; and
	// without a fan-out limit or constraints every path fits MaxDepth.
	r := rand.New(rand.NewPCG(8, 1))
	for trial := 0; trial < 60; trial++ {
		n := 20 + r.IntN(300)
		g := RandomGraph(t, uint64(500+trial), 11, n, 5*n)
		hidden := RandomBinaryTree(r, n)
		var c *Constraints
		if trial%2 == 1 {
			c = hiddenConstraints(r, hidden, r.IntN(n), r.IntN(5))
		}
		bin, err := construct(g, orEmpty(c), constructParams{})
		if err != nil {
			t.Fatal(err)
		}
		p := foldParams{
			minSize:     []int{0, 2, 3, 5}[r.IntN(4)],
			maxChildren: []int{0, 3, 6, 12}[r.IntN(4)],
			maxDepth:    []int{0, 1, 2, 4}[r.IntN(4)],
			ratio:       foldTightness,
		}
		out := fold(g, bin, c, p, noProgress)
		name := fmt.Sprintf("trial %d %+v", trial, p)
		if bad := Satisfies(out, c); len(bad) > 0 {
			t.Fatalf("%s: violated %v", name, bad)
		}
		if len(out.Kids[out.Root]) < 2 {
			t.Fatalf("%s: root has %d children", name, len(out.Kids[out.Root]))
		}
		binClusters := clusterStrings(bin)
		for cl := range clusterStrings(out) {
			if !binClusters[cl] {
				t.Fatalf("%s: category %s is not a binary cluster", name, cl)
			}
		}
		sizes := out.Sizes()
		parents := out.Parents()
		for v := out.N; v < out.NumNodes(); v++ {
			// max_children bounds subcategories; items are not counted.
			kids := 0
			for _, k := range out.Kids[v] {
				if !out.IsLeaf(k) {
					kids++
				}
			}
			if p.maxChildren > 0 && kids > p.maxChildren {
				t.Fatalf("%s: node with %d subcategories", name, kids)
			}
			if int32(v) == out.Root || sizes[v] >= p.minSize {
				continue
			}
			// A small category may stay only when folding it breaks a
			// constraint or the fan-out limit.
			par := parents[v]
			tooWide := p.maxChildren > 0 && len(out.Kids[par])-1+kids > p.maxChildren
			cp := copyTree(out)
			var merged []int32
			for _, k := range cp.Kids[par] {
				if k == int32(v) {
					merged = append(merged, cp.Kids[v]...)
				} else {
					merged = append(merged, k)
				}
			}
			cp.Kids[par] = merged
			cp.Kids[v] = nil
			if !tooWide && len(Satisfies(cp, c)) == 0 {
				t.Fatalf("%s: category of %d items could have been folded", name, sizes[v])
			}
		}
		if p.maxDepth > 0 && p.maxChildren == 0 && c == nil {
			if d := categoryDepth(out); d > p.maxDepth {
				t.Fatalf("%s: depth %d", name, d)
			}
		}
	}
}

func orEmpty(c *Constraints) *Constraints {
	if c == nil {
		return &Constraints{}
	}
	return c
}
