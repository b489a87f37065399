package solve

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/ramify-tax/ramify/internal/brackets"
	"github.com/ramify-tax/ramify/solve/graph"
)

// Test helpers of cost.go, linkage.go and the exact oracle (export_test.go)
// carry the prefix dg so they cannot collide with other test files of the
// package.

func dgPath(tb testing.TB, n int) *graph.CSR {
	var e []graph.Edge
	for i := 0; i+1 < n; i++ {
		e = append(e, graph.Edge{A: int32(i), B: int32(i + 1), W: 1})
	}
	return MustGraph(tb, n, e)
}

func dgCycle(tb testing.TB, n int) *graph.CSR {
	e := []graph.Edge{{A: 0, B: int32(n - 1), W: 1}}
	for i := 0; i+1 < n; i++ {
		e = append(e, graph.Edge{A: int32(i), B: int32(i + 1), W: 1})
	}
	return MustGraph(tb, n, e)
}

func dgClique(tb testing.TB, n int) *graph.CSR {
	var e []graph.Edge
	for i := 0; i < n; i++ {
		for j := i + 1; j < n; j++ {
			e = append(e, graph.Edge{A: int32(i), B: int32(j), W: 1})
		}
	}
	return MustGraph(tb, n, e)
}

// dgStar is K_{1,n-1} with centre 0.
func dgStar(tb testing.TB, n int) *graph.CSR {
	var e []graph.Edge
	for i := 1; i < n; i++ {
		e = append(e, graph.Edge{A: 0, B: int32(i), W: 1})
	}
	return MustGraph(tb, n, e)
}

// dgTwoTriangles is the triangles {0,1,2}, {3,4,5} with the bridge 2-3,
// unit weights: a small graph of our own whose optimum (22, by the exact
// DP of export_test.go) is known.
func dgTwoTriangles(tb testing.TB) *graph.CSR {
	return MustGraph(tb, 6, []graph.Edge{
		{A: 0, B: 1, W: 1}, {A: 0, B: 2, W: 1}, {A: 1, B: 2, W: 1},
		{A: 3, B: 4, W: 1}, {A: 3, B: 5, W: 1}, {A: 4, B: 5, W: 1},
		{A: 2, B: 3, W: 1},
	})
}

// dgFourNodes is a 4-node example of our own, w01=3, w23=2, w12=1, w03=0.5
// (optimum 16 by the exact DP).
func dgFourNodes(tb testing.TB) *graph.CSR {
	return MustGraph(tb, 4, []graph.Edge{
		{A: 0, B: 1, W: 3}, {A: 2, B: 3, W: 2}, {A: 1, B: 2, W: 1}, {A: 0, B: 3, W: 0.5},
	})
}

// dgStream is the PCG stream this package's own tests draw their G(n, p)
// graphs from (RandomWeightedGraph).
const dgStream = 0x5eed

// dgNested parses a nested-parenthesis tree over leaves 0..n-1, such as
// "((0,(1,2)),(3,4,5))"; a group may have any number of members.
func dgNested(tb testing.TB, n int, s string) *Tree {
	tb.Helper()
	t := NewTree(n)
	root, err := brackets.Parse(s, n, func(kids []int32) int32 { return t.Add(kids...) })
	if err != nil {
		tb.Fatal(err)
	}
	t.Root = root
	return t
}

// dgCaterpillar is (((0,1),2),...,n-1).
func dgCaterpillar(n int) *Tree {
	t := NewTree(n)
	cur := int32(0)
	for i := 1; i < n; i++ {
		cur = t.Add(cur, int32(i))
	}
	t.Root = cur
	return t
}

// dgBalanced splits leaves lo..hi-1 into ⌊len/2⌋ / ⌈len/2⌉ in path order.
func dgBalanced(n int) *Tree {
	t := NewTree(n)
	var build func(lo, hi int) int32
	build = func(lo, hi int) int32 {
		if hi-lo == 1 {
			return int32(lo)
		}
		mid := lo + (hi-lo)/2
		a := build(lo, mid)
		b := build(mid, hi)
		return t.Add(a, b)
	}
	t.Root = build(0, n)
	return t
}

// dgNaiveCost computes the cost from the definition: for each pair with an
// edge, find the smallest node containing both by scanning leaf sets.
func dgNaiveCost(g *graph.CSR, t *Tree) float64 {
	leaves := make([]map[int32]bool, t.NumNodes())
	for v := range leaves {
		leaves[v] = map[int32]bool{}
		for _, l := range t.Leaves(int32(v)) {
			leaves[v][l] = true
		}
	}
	total := 0.0
	for _, e := range g.Edges() {
		best := math.MaxInt
		for v := range leaves {
			if leaves[v][e.A] && leaves[v][e.B] && len(leaves[v]) < best {
				best = len(leaves[v])
			}
		}
		total += e.W * float64(best)
	}
	return total
}

func dgClose(a, b, rel float64) bool {
	return math.Abs(a-b) <= rel*math.Max(1, math.Max(math.Abs(a), math.Abs(b)))
}

func TestCostHandBuiltTrees(t *testing.T) {
	cases := []struct {
		name string
		g    *graph.CSR
		t    *Tree
		want float64 // by the definition or the exact DP, not published values
	}{
		{"path8 caterpillar", dgPath(t, 8), dgCaterpillar(8), 35},                                  // n(n+1)/2-1
		{"path8 balanced", dgPath(t, 8), dgBalanced(8), 24},                                        // = OPT(P_8)
		{"path5 balanced", dgPath(t, 5), dgBalanced(5), 12},                                        // = OPT(P_5)
		{"path13 balanced", dgPath(t, 13), dgBalanced(13), 49},                                     // = OPT(P_13)
		{"path8 odd/even root", dgPath(t, 8), dgNested(t, 8, "(((0,2),(4,6)),((1,3),(5,7)))"), 56}, // worst n(n-1)
		{"star6 peel", dgStar(t, 6), dgNested(t, 6, "(((((0,1),2),3),4),5)"), 20},                  // n(n+1)/2-1
		{"two triangles opt", dgTwoTriangles(t), dgNested(t, 6, "((0,(1,2)),(3,(4,5)))"), 22},
		// Rotations at the root of the optimum: ((0,(3,(4,5))),(1,2)) costs
		// 22 + 3·2 − 2·0 = 28 and (((1,2),(3,(4,5))),0) costs 22 + 3·2 − 1·1
		// = 27 (the rotation Δ of improve.go, worked by hand).
		{"two triangles rotated A", dgTwoTriangles(t), dgNested(t, 6, "((0,(3,(4,5))),(1,2))"), 28},
		{"two triangles rotated B", dgTwoTriangles(t), dgNested(t, 6, "(((1,2),(3,(4,5))),0)"), 27},
		// Contracting (0,(1,2)) into the root adds (|L(v)|−|L(u)|)·c(u) =
		// (6-3)·2 = 6 (fold.go's Δ, worked by hand).
		{"two triangles collapsed", dgTwoTriangles(t), dgNested(t, 6, "(0,(1,2),(3,(4,5)))"), 28},
		{"four nodes opt", dgFourNodes(t), dgNested(t, 4, "((0,1),(2,3))"), 16},
		{"clique5 star tree", dgClique(t, 5), dgNested(t, 5, "(0,1,2,3,4)"), 50}, // 5·C(5,2), by definition
		{"clique6 caterpillar", dgClique(t, 6), dgCaterpillar(6), 70},            // (n³-n)/3
		{"single leaf", MustGraph(t, 1, nil), NewTree(1), 0},
		{"no edges", MustGraph(t, 3, nil), dgCaterpillar(3), 0},
	}
	for _, c := range cases {
		if got := Cost(c.g, c.t); got != c.want {
			t.Errorf("%s: cost %v, want %v", c.name, got, c.want)
		}
	}
}

func TestCostCliqueEveryTree(t *testing.T) {
	// Dasgupta (2016) shows that on a clique of equal weights every tree
	// costs the same (where in the paper is not checked here). The value
	// for unit weights, (n³-n)/3, is derived from the triplet form of the
	// cost: 2·C(n,2) + 2·C(n,3).
	r := rand.New(rand.NewPCG(7, 7))
	for n := 2; n <= 12; n++ {
		g := dgClique(t, n)
		want := float64(n*n*n-n) / 3
		for k := 0; k < 5; k++ {
			if got := Cost(g, RandomBinaryTree(r, n)); got != want {
				t.Fatalf("n=%d: cost %v, want %v", n, got, want)
			}
		}
	}
}

func TestCostMatchesDefinition(t *testing.T) {
	// Internal check: the offline-LCA node form equals the edge-by-edge
	// definition Σ w_ij·|L(lca(i,j))| (Dasgupta 2016) on random graphs and
	// random binary and multiway trees.
	r := rand.New(rand.NewPCG(11, 3))
	for trial := 0; trial < 40; trial++ {
		n := 2 + r.IntN(30)
		g := RandomWeightedGraph(t, uint64(trial), dgStream, n, 0.3)
		tr := RandomBinaryTree(r, n)
		if trial%2 == 1 {
			tr = dgContractRandom(r, tr)
		}
		got, want := Cost(g, tr), dgNaiveCost(g, tr)
		if !dgClose(got, want, 1e-12) {
			t.Fatalf("trial %d: cost %v, definition %v", trial, got, want)
		}
	}
}

// dgContractRandom rebuilds t with about a third of its internal edges
// contracted, giving a multiway tree over the same leaves.
func dgContractRandom(r *rand.Rand, t *Tree) *Tree {
	out := NewTree(t.N)
	var build func(v int32) []int32 // returns the kids v contributes to its parent
	build = func(v int32) []int32 {
		if t.IsLeaf(v) {
			return []int32{v}
		}
		var kids []int32
		for _, c := range t.Kids[v] {
			sub := build(c)
			if !t.IsLeaf(c) && r.IntN(3) == 0 {
				kids = append(kids, sub...) // contract c into v
				continue
			}
			if t.IsLeaf(c) {
				kids = append(kids, c)
			} else {
				kids = append(kids, out.Add(sub...))
			}
		}
		return kids
	}
	out.Root = out.Add(build(t.Root)...)
	return out
}

func TestCostMalformedGivesNaN(t *testing.T) {
	g := dgPath(t, 3)
	cyc := NewTree(3)
	cyc.Add(0, 1)
	cyc.Add(3, 2)
	cyc.Kids[3] = append(cyc.Kids[3], 4) // 4 -> 3 -> 4
	missing := NewTree(3)
	missing.Root = missing.Add(0, 1) // leaf 2 has an edge but is not in the tree
	cases := map[string]*Tree{
		"nil":          nil,
		"root range":   {N: 3, Kids: make([][]int32, 3), Root: 9},
		"kid range":    {N: 2, Kids: [][]int32{nil, nil, {0, 7}}, Root: 2},
		"leaf kids":    {N: 2, Kids: [][]int32{{1}, nil, {0, 1}}, Root: 2},
		"shared child": {N: 2, Kids: [][]int32{nil, nil, {0, 0, 1}}, Root: 2},
		"cycle":        cyc,
		"missing leaf": missing,
	}
	for name, tr := range cases {
		if c := Cost(g, tr); !math.IsNaN(c) {
			t.Errorf("%s: cost %v, want NaN", name, c)
		}
	}
	if c := Cost(nil, dgCaterpillar(3)); !math.IsNaN(c) {
		t.Errorf("nil graph: cost %v, want NaN", c)
	}
	bad := &graph.CSR{N: 2, Offsets: []int64{0, 1, 2}, Targets: []int32{1, 5}, Weights: []float64{1, 1}}
	if c := Cost(bad, dgCaterpillar(2)); !math.IsNaN(c) {
		t.Errorf("corrupt graph: cost %v, want NaN", c)
	}
	// An isolated vertex outside the tree is harmless.
	g4 := MustGraph(t, 4, []graph.Edge{{A: 0, B: 1, W: 2}})
	tr := NewTree(3)
	tr.Root = tr.Add(0, 1, 2)
	if c := Cost(g4, tr); c != 6 {
		t.Errorf("isolated extra vertex: cost %v, want 6", c)
	}
}

func TestCostDeepCaterpillar(t *testing.T) {
	// The walk is iterative: a 200,000-deep caterpillar on a path costs
	// n(n+1)/2 - 1 (each level v adds |L(v)|·1; by hand) without exhausting
	// the stack.
	n := 200000
	if testing.Short() {
		n = 20000
	}
	got := Cost(dgPath(t, n), dgCaterpillar(n))
	want := float64(n)*float64(n+1)/2 - 1
	if got != want {
		t.Fatalf("cost %v, want %v", got, want)
	}
}

func TestCrossWeights(t *testing.T) {
	// Two triangles under ((0,(1,2)),(3,(4,5))): the root carries the
	// bridge 2-3, each triangle node its two outer edges, each pair node
	// its inner edge (the node form of the cost; by hand).
	tr := dgNested(t, 6, "((0,(1,2)),(3,(4,5)))")
	cross, err := CrossWeights(dgTwoTriangles(t), tr)
	if err != nil {
		t.Fatal(err)
	}
	want := []float64{0, 0, 0, 0, 0, 0, 1, 2, 1, 2, 1}
	for v := range want {
		if cross[v] != want[v] {
			t.Fatalf("cross weights %v, want %v", cross, want)
		}
	}
}
