package solve

import (
	"math"
	"math/bits"
	"math/rand/v2"
	"testing"

	"github.com/ramify-tax/ramify/solve/graph"
)

// dgNode is an immutable binary tree used to enumerate all trees.
type dgNode struct {
	leaf int32
	l, r *dgNode
}

// dgAllBinaryTrees lists every rooted binary tree on leaves 0..n-1 by
// inserting leaf k as the sibling of each node of every tree on 0..k-1.
func dgAllBinaryTrees(n int) []*Tree {
	trees := []*dgNode{{leaf: 0}}
	for k := int32(1); int(k) < n; k++ {
		var next []*dgNode
		for _, t := range trees {
			next = append(next, dgInsert(t, k)...)
		}
		trees = next
	}
	out := make([]*Tree, len(trees))
	for i, x := range trees {
		t := NewTree(n)
		t.Root = dgEmit(t, x)
		out[i] = t
	}
	return out
}

func dgInsert(x *dgNode, k int32) []*dgNode {
	out := []*dgNode{{l: x, r: &dgNode{leaf: k}}}
	if x.l == nil {
		return out
	}
	for _, l := range dgInsert(x.l, k) {
		out = append(out, &dgNode{l: l, r: x.r})
	}
	for _, r := range dgInsert(x.r, k) {
		out = append(out, &dgNode{l: x.l, r: r})
	}
	return out
}

func dgEmit(t *Tree, x *dgNode) int32 {
	if x.l == nil {
		return x.leaf
	}
	a := dgEmit(t, x.l)
	b := dgEmit(t, x.r)
	return t.Add(a, b)
}

// dgLeafMasks gives each node's leaf set as a bit mask (n ≤ 32).
func dgLeafMasks(t *Tree) []uint32 {
	m := make([]uint32, t.NumNodes())
	for _, v := range t.PostOrder() {
		if t.IsLeaf(v) {
			m[v] = 1 << uint(v)
			continue
		}
		for _, c := range t.Kids[v] {
			m[v] |= m[c]
		}
	}
	return m
}

// dgDisplays checks constraints from their definitions:
// ab|c holds iff the smallest cluster holding a and b misses c; a cluster
// constraint holds iff some node has exactly that leaf set.
func dgDisplays(t *Tree, c *Constraints) bool {
	masks := dgLeafMasks(t)
	for _, tr := range c.Triplets {
		ab := uint32(1)<<uint(tr.A) | uint32(1)<<uint(tr.B)
		best := uint32(0)
		for _, m := range masks {
			if m&ab == ab && (best == 0 || bits.OnesCount32(m) < bits.OnesCount32(best)) {
				best = m
			}
		}
		if best&(1<<uint(tr.C)) != 0 {
			return false
		}
	}
	for _, cl := range c.Clusters {
		var want uint32
		for _, l := range cl.Leaves {
			want |= 1 << uint(l)
		}
		found := false
		for _, m := range masks {
			found = found || m == want
		}
		if !found {
			return false
		}
	}
	return true
}

func dgIsBinary(t *Tree) bool {
	for _, v := range t.PostOrder() {
		if !t.IsLeaf(v) && len(t.Kids[v]) != 2 {
			return false
		}
	}
	return len(t.PostOrder()) == 2*t.N-1
}

// dgCheckOptimum checks that OptimalCost and WorstCost give want/worst and
// that the returned tree is binary and really costs want.
func dgCheckOptimum(t *testing.T, name string, g *graph.CSR, want, worst float64) *Tree {
	t.Helper()
	opt, tr := OptimalCost(g)
	if opt != want {
		t.Errorf("%s: OPT %v, want %v", name, opt, want)
	}
	if c := Cost(g, tr); c != opt || !dgIsBinary(tr) {
		t.Errorf("%s: returned tree costs %v (binary %v), OPT %v", name, c, dgIsBinary(tr), opt)
	}
	if !math.IsNaN(worst) {
		if w := WorstCost(g); w != worst {
			t.Errorf("%s: MAX %v, want %v", name, w, worst)
		}
	}
	return tr
}

func TestOptimalCostTable(t *testing.T) {
	// Not published values: computed for these tests by the subset DP for
	// n ≤ 16 and by enumerating every binary tree for n ≤ 6. The clique's
	// equal cost is Dasgupta's (STOC 2016); its value is derived in
	// TestCostCliqueEveryTree.
	for n := 2; n <= 9; n++ {
		want := float64(n*n*n-n) / 3 // K_n: every tree costs (n³-n)/3
		dgCheckOptimum(t, "clique", dgClique(t, n), want, want)
	}
	pathOPT := []float64{2, 5, 8, 12, 16, 20, 24, 29, 34, 39, 44, 49, 54, 59, 64}
	maxN := 16
	if testing.Short() {
		maxN = 13
	}
	for n := 2; n <= maxN; n++ {
		g := dgPath(t, n)
		worst := math.NaN()
		if n <= 12 {
			worst = float64(n * (n - 1)) // odd/even root cut cuts every edge
		}
		dgCheckOptimum(t, "path", g, pathOPT[n-2], worst)
		if c := Cost(g, dgBalanced(n)); c != pathOPT[n-2] {
			t.Errorf("path %d: balanced tree costs %v, OPT %v", n, c, pathOPT[n-2])
		}
	}
	starOPT := []float64{2, 5, 9, 14, 20, 27, 35, 44, 54}
	for n := 2; n <= 10; n++ {
		dgCheckOptimum(t, "star", dgStar(t, n), starOPT[n-2], float64(n*(n-1)))
	}
	cycleOPT := []float64{8, 12, 17, 22, 27, 32, 38, 44, 50, 56, 62, 68}
	for n := 3; n <= 14; n++ {
		dgCheckOptimum(t, "cycle", dgCycle(t, n), cycleOPT[n-3], math.NaN())
	}

	tr := dgCheckOptimum(t, "two triangles", dgTwoTriangles(t), 22, 38)
	m := dgLeafMasks(tr)
	if top := m[tr.Kids[tr.Root][0]]; top != 0b000111 && top != 0b111000 {
		t.Errorf("two triangles: top split %06b, want the triangles", top)
	}
	tr = dgCheckOptimum(t, "four nodes", dgFourNodes(t), 16, 26)
	if !dgSameClusters(tr, dgNested(t, 4, "((0,1),(2,3))")) {
		t.Errorf("four nodes: optimal tree is not ((0,1),(2,3))")
	}
}

// dgSameClusters compares the leaf sets of two trees.
func dgSameClusters(a, b *Tree) bool {
	set := map[uint32]int{}
	for _, m := range dgLeafMasks(a) {
		set[m]++
	}
	for _, m := range dgLeafMasks(b) {
		set[m]--
	}
	for _, c := range set {
		if c != 0 {
			return false
		}
	}
	return true
}

func TestOptimalCostPathFormula(t *testing.T) {
	// OPT(P_n) = n(⌈log₂n⌉+1) − 2^⌈log₂n⌉: a closed form fitted to the
	// exact DP for n ≤ 16 (the balanced tree attains it), not taken from a
	// paper.
	for n := 2; n <= 14; n++ {
		k := bits.Len(uint(n - 1)) // ⌈log₂n⌉
		want := float64(n*(k+1) - 1<<k)
		if got, _ := OptimalCost(dgPath(t, n)); got != want {
			t.Errorf("P_%d: OPT %v, formula %v", n, got, want)
		}
	}
}

func TestOptimalCostBruteForce(t *testing.T) {
	// The DP agrees with enumerating all (2n−3)!! rooted binary trees on n
	// labelled leaves (the standard count: 1, 3, 15, 105, 945).
	counts := map[int]int{2: 1, 3: 3, 4: 15, 5: 105, 6: 945}
	for n := 2; n <= 6; n++ {
		trees := dgAllBinaryTrees(n)
		if len(trees) != counts[n] {
			t.Fatalf("n=%d: %d trees, want %d", n, len(trees), counts[n])
		}
		for seed := uint64(0); seed < 8; seed++ {
			g := RandomWeightedGraph(t, 100*uint64(n)+seed, dgStream, n, 0.7)
			lo, hi := math.Inf(1), math.Inf(-1)
			for _, tr := range trees {
				c := Cost(g, tr)
				lo, hi = math.Min(lo, c), math.Max(hi, c)
			}
			opt, tr := OptimalCost(g)
			if !dgClose(opt, lo, 1e-12) || !dgClose(Cost(g, tr), lo, 1e-12) {
				t.Errorf("n=%d seed %d: OPT %v (tree %v), brute force %v", n, seed, opt, Cost(g, tr), lo)
			}
			if w := WorstCost(g); !dgClose(w, hi, 1e-12) {
				t.Errorf("n=%d seed %d: MAX %v, brute force %v", n, seed, w, hi)
			}
		}
	}
}

func TestOptimalCostDisconnected(t *testing.T) {
	// An optimal tree separates the components above
	// everything else, so the root carries no edge, and OPT is the sum of
	// the components' optima.
	edges := []graph.Edge{
		{A: 0, B: 3, W: 2}, {A: 3, B: 6, W: 1}, {A: 0, B: 6, W: 0.5}, // {0,3,6}
		{A: 1, B: 4, W: 1}, {A: 4, B: 7, W: 3}, {A: 7, B: 1, W: 1}, {A: 1, B: 8, W: 2}, // {1,4,7,8}
		{A: 2, B: 5, W: 4}, // {2,5}
	}
	g := MustGraph(t, 9, edges)
	opt, tr := OptimalCost(g)
	cross, err := CrossWeights(g, tr)
	if err != nil {
		t.Fatal(err)
	}
	if cross[tr.Root] != 0 {
		t.Errorf("root split cuts weight %v, want 0", cross[tr.Root])
	}
	parts := [][]int32{{0, 3, 6}, {1, 4, 7, 8}, {2, 5}}
	sum := 0.0
	for _, p := range parts {
		idx := map[int32]int32{}
		for i, v := range p {
			idx[v] = int32(i)
		}
		var sub []graph.Edge
		for _, e := range edges {
			if a, ok := idx[e.A]; ok {
				sub = append(sub, graph.Edge{A: a, B: idx[e.B], W: e.W})
			}
		}
		c, _ := OptimalCost(MustGraph(t, len(p), sub))
		sum += c
	}
	if opt != sum {
		t.Errorf("OPT %v, sum over components %v", opt, sum)
	}
}

func TestOptimalCostLimits(t *testing.T) {
	if c, tr := OptimalCost(nil); !math.IsNaN(c) || tr != nil {
		t.Errorf("nil graph: %v %v", c, tr)
	}
	if c, tr := OptimalCost(MustGraph(t, MaxExactItems+1, nil)); !math.IsNaN(c) || tr != nil {
		t.Errorf("too large: %v %v", c, tr)
	}
	if c, tr := OptimalCost(MustGraph(t, 1, nil)); c != 0 || tr == nil || tr.Root != 0 {
		t.Errorf("one vertex: %v %v", c, tr)
	}
}

func TestOptimalConstrainedExamples(t *testing.T) {
	// The BUILD examples of build_test.go (traced by hand) with a = 0,
	// b = 1, ...
	tri := func(a, b, c int32) Triplet { return Triplet{A: a, B: b, C: c} }
	g4, g5 := dgClique(t, 4), dgClique(t, 5)
	cases := []struct {
		name string
		g    *graph.CSR
		c    Constraints
		ok   bool
		want string // a tree whose clusters the result must have ("" = any)
	}{
		{"ex1 ab|c ab|d cd|a", g4, Constraints{Triplets: []Triplet{tri(0, 1, 2), tri(0, 1, 3), tri(2, 3, 0)}}, true, "((0,1),(2,3))"},
		{"ex2 ab|c ac|b", g4, Constraints{Triplets: []Triplet{tri(0, 1, 2), tri(0, 2, 1)}}, false, ""},
		{"ex2 all three", g4, Constraints{Triplets: []Triplet{tri(0, 1, 2), tri(1, 2, 0), tri(0, 2, 1)}}, false, ""},
		{"ex3 bc|a ac|d de|b", g5, Constraints{Triplets: []Triplet{tri(1, 2, 0), tri(0, 2, 3), tri(3, 4, 1)}}, true, "(((1,2),0),(3,4))"},
		{"ex6 cluster abc + ad|b", g5, Constraints{Triplets: []Triplet{tri(0, 3, 1)}, Clusters: []Cluster{{Leaves: []int32{0, 1, 2}}}}, false, ""},
		{"leaf out of range", g4, Constraints{Triplets: []Triplet{tri(0, 1, 9)}}, false, ""},
	}
	for _, c := range cases {
		cost, tr, ok := OptimalConstrained(c.g, &c.c)
		if ok != c.ok {
			t.Errorf("%s: ok %v, want %v", c.name, ok, c.ok)
			continue
		}
		if !ok {
			continue
		}
		if !dgDisplays(tr, &c.c) || Cost(c.g, tr) != cost {
			t.Errorf("%s: tree does not display the constraints or cost differs", c.name)
		}
		if c.want != "" && !dgSameClusters(tr, dgNested(t, c.g.N, c.want)) {
			t.Errorf("%s: tree differs from %s", c.name, c.want)
		}
	}
	// No constraints: same as the unconstrained optimum.
	g := RandomWeightedGraph(t, 5, dgStream, 9, 0.5)
	want, _ := OptimalCost(g)
	if got, _, ok := OptimalConstrained(g, nil); !ok || got != want {
		t.Errorf("nil constraints: %v %v, want %v", got, ok, want)
	}
}

func TestOptimalConstrainedBruteForce(t *testing.T) {
	// The constrained DP equals the minimum over
	// all binary trees that display the constraints, and ok is false
	// exactly when none does.
	r := rand.New(rand.NewPCG(2024, 6))
	infeasible := 0
	for trial := 0; trial < 60; trial++ {
		n := 4 + r.IntN(4)
		g := RandomWeightedGraph(t, uint64(1000+trial), dgStream, n, 0.6)
		var c Constraints
		for k := r.IntN(4); k > 0; k-- {
			p := r.Perm(n)
			c.Triplets = append(c.Triplets, Triplet{A: int32(p[0]), B: int32(p[1]), C: int32(p[2]), Record: k})
		}
		for k := r.IntN(3); k > 0; k-- {
			p := r.Perm(n)
			size := 2 + r.IntN(n-2)
			var leaves []int32
			for _, v := range p[:size] {
				leaves = append(leaves, int32(v))
			}
			c.Clusters = append(c.Clusters, Cluster{Leaves: leaves, Record: k})
		}
		best := math.Inf(1)
		for _, tr := range dgAllBinaryTrees(n) {
			if dgDisplays(tr, &c) {
				best = math.Min(best, Cost(g, tr))
			}
		}
		cost, tr, ok := OptimalConstrained(g, &c)
		if ok != !math.IsInf(best, 1) {
			t.Fatalf("trial %d: ok %v, brute force best %v", trial, ok, best)
		}
		if !ok {
			infeasible++
			continue
		}
		if !dgClose(cost, best, 1e-12) || !dgDisplays(tr, &c) || !dgClose(Cost(g, tr), cost, 1e-12) {
			t.Fatalf("trial %d: cost %v (tree %v, displays %v), brute force %v",
				trial, cost, Cost(g, tr), dgDisplays(tr, &c), best)
		}
	}
	if infeasible == 0 || infeasible == 60 {
		t.Errorf("%d of 60 instances infeasible: the sample does not test both outcomes", infeasible)
	}
}

func BenchmarkOptimalCost16(b *testing.B) {
	g := RandomWeightedGraph(b, 16, dgStream, 16, 0.5)
	for b.Loop() {
		OptimalCost(g)
	}
}
