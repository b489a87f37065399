package planted

import (
	"math"
	"math/rand/v2"
	"reflect"
	"slices"
	"testing"

	"github.com/ramify-tax/ramify/solve"
)

func TestGenerateSizes(t *testing.T) {
	cases := []struct {
		n, b, d   int
		wantDepth int
	}{
		{1000, 4, 3, 3},
		{1000, 3, 5, 5}, // 243 bottom categories
		{100, 10, 3, 2}, // 1000 > 100: depth lowered to 2
		{7, 2, 0, 0},    // flat
		{1, 3, 2, 0},    // a single item
		{50, 1, 2, 2},   // branching raised to 2
		{2000, 5, 4, 4},
	}
	for _, c := range cases {
		in := Generate(3, c.n, c.b, c.d)
		if in.Depth != c.wantDepth || in.N != c.n || len(in.Bottom) != c.n {
			t.Fatalf("%+v: depth %d, n %d", c, in.Depth, in.N)
		}
		if in.Tree.N != c.n || in.Graph.N != c.n || len(in.Vectors) != c.n {
			t.Fatalf("%+v: tree %d, graph %d, vectors %d", c, in.Tree.N, in.Graph.N, len(in.Vectors))
		}
		// Bottom categories hold ⌊n/B^D⌋ or ⌈n/B^D⌉ items.
		bottoms := pow(in.Branching, in.Depth)
		count := make([]int, bottoms)
		for _, b := range in.Bottom {
			count[b]++
		}
		lo, hi := slices.Min(count), slices.Max(count)
		if lo != c.n/bottoms || hi > lo+1 {
			t.Fatalf("%+v: bottom sizes %d..%d", c, lo, hi)
		}
		// Every item is a leaf under the root, exactly once.
		leaves := in.Tree.Leaves(in.Tree.Root)
		slices.Sort(leaves)
		for i, l := range leaves {
			if int(l) != i {
				t.Fatalf("%+v: leaves %v", c, leaves)
			}
		}
		if len(leaves) != c.n {
			t.Fatalf("%+v: %d leaves", c, len(leaves))
		}
		// About EdgesPerItem draws per item (pairs drawn twice merge).
		m := in.Graph.NumEdges()
		if c.n > 1 && (m < c.n-1 || m > c.n*EdgesPerItem+c.n) {
			t.Fatalf("%+v: %d edges", c, m)
		}
		for _, v := range in.Vectors {
			if len(v) != Dim {
				t.Fatalf("%+v: vector of %d coordinates", c, len(v))
			}
		}
	}
	if Generate(1, 0, 3, 2) != nil {
		t.Error("n = 0 gives an instance")
	}
}

func TestGenerateTreeIsTheCategories(t *testing.T) {
	// Every internal node of the true tree is a category: its leaves are
	// exactly the items whose ancestor at some level is that category.
	in := Generate(9, 500, 3, 3)
	tr := in.Tree
	for _, v := range tr.PostOrder() {
		if tr.IsLeaf(v) {
			continue
		}
		leaves := tr.Leaves(v)
		level := in.Depth
		for _, l := range leaves[1:] {
			level = min(level, in.CommonDepth(int(leaves[0]), int(l)))
		}
		c := in.Ancestor(int(leaves[0]), level)
		n := 0
		for i := 0; i < in.N; i++ {
			if in.Ancestor(i, level) == c {
				n++
			}
		}
		if n != len(leaves) {
			t.Fatalf("node %d: %d leaves, its category holds %d", v, len(leaves), n)
		}
	}
}

func TestGenerateDeterministic(t *testing.T) {
	a := Generate(42, 3000, 4, 3)
	b := Generate(42, 3000, 4, 3)
	if !reflect.DeepEqual(a, b) {
		t.Fatal("same seed, different instances")
	}
	c := Generate(43, 3000, 4, 3)
	if reflect.DeepEqual(a.Graph, c.Graph) || reflect.DeepEqual(a.Bottom, c.Bottom) {
		t.Fatal("different seeds, same instance")
	}
}

func TestGenerateConnected(t *testing.T) {
	for _, c := range []struct {
		seed    uint64
		n, b, d int
	}{
		{1, 5000, 4, 4}, {2, 30, 2, 4}, {3, 3, 2, 1}, {4, 200, 8, 2},
	} {
		in := Generate(c.seed, c.n, c.b, c.d)
		g := in.Graph
		seen := make([]bool, g.N)
		seen[0] = true
		queue := []int32{0}
		reached := 1
		for len(queue) > 0 {
			v := queue[0]
			queue = queue[1:]
			ts, _ := g.Neighbors(int(v))
			for _, u := range ts {
				if !seen[u] {
					seen[u] = true
					reached++
					queue = append(queue, u)
				}
			}
		}
		if reached != g.N {
			t.Errorf("%+v: %d of %d vertices reachable", c, reached, g.N)
		}
	}
}

func TestGenerateFollowsHierarchy(t *testing.T) {
	// Edges are more frequent and heavier, and vectors closer, the deeper
	// the common category (the model in the package comment).
	in := Generate(5, 4000, 4, 3)
	count := make([]int, in.Depth+1)
	weight := make([]float64, in.Depth+1)
	for _, e := range in.Graph.Edges() {
		l := in.CommonDepth(int(e.A), int(e.B))
		count[l]++
		weight[l] += e.W
	}
	for l := 1; l <= in.Depth; l++ {
		if count[l] <= count[l-1] || weight[l]/float64(count[l]) <= weight[l-1]/float64(count[l-1]) {
			t.Errorf("level %d: %d edges, mean %v; level %d: %d edges, mean %v",
				l, count[l], weight[l]/float64(count[l]), l-1, count[l-1], weight[l-1]/float64(count[l-1]))
		}
	}
	dsum := make([]float64, in.Depth+1)
	dn := make([]int, in.Depth+1)
	for i := 0; i < 400; i++ {
		for j := i + 1; j < 400; j++ {
			l := in.CommonDepth(i, j)
			s := 0.0
			for k := range in.Vectors[i] {
				d := in.Vectors[i][k] - in.Vectors[j][k]
				s += d * d
			}
			dsum[l] += math.Sqrt(s)
			dn[l]++
		}
	}
	for l := 1; l <= in.Depth; l++ {
		if dsum[l]/float64(dn[l]) >= dsum[l-1]/float64(dn[l-1]) {
			t.Errorf("mean distance at common depth %d not below depth %d", l, l-1)
		}
	}
}

func TestGraphCarriesTheHierarchy(t *testing.T) {
	// Model sanity for recovery tests (thresholds measured on this seeded
	// instance, not taken from a source): the planted tree costs far less
	// than a random caterpillar on the same graph, and the average-linkage
	// baseline finds most planted categories as clusters (109 of 121 when
	// measured).
	in := Generate(8, 2000, 3, 4)
	truth := solve.Cost(in.Graph, in.Tree)
	r := rand.New(rand.NewPCG(1, 2))
	order := r.Perm(in.N)
	cat := solve.NewTree(in.N)
	cur := int32(order[0])
	for _, x := range order[1:] {
		cur = cat.Add(cur, int32(x))
	}
	if blind := solve.Cost(in.Graph, cat); math.IsNaN(truth) || truth*10 > blind {
		t.Errorf("planted tree costs %v, random caterpillar %v", truth, blind)
	}
	clusters := func(tr *solve.Tree) map[string]bool {
		out := map[string]bool{}
		for v := tr.N; v < tr.NumNodes(); v++ {
			mark := make([]byte, tr.N)
			for _, l := range tr.Leaves(int32(v)) {
				mark[l] = 1
			}
			out[string(mark)] = true
		}
		return out
	}
	planted, found := clusters(in.Tree), clusters(solve.AverageLinkageGraph(in.Graph))
	hit := 0
	for c := range planted {
		if found[c] {
			hit++
		}
	}
	if 10*hit < 8*len(planted) {
		t.Errorf("average linkage finds %d of %d planted categories", hit, len(planted))
	}
}
