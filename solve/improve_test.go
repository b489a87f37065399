package solve

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/ramify-tax/ramify/internal/naivelca"
)

// twoTrianglesOpt is ((0,(1,2)),(3,(4,5))), the optimum (cost 22) of the
// two-triangle graph by the exact DP of export_test.go.
func twoTrianglesOpt() (*Tree, int32, int32) {
	t := NewTree(6)
	p := t.Add(0, t.Add(1, 2))
	q := t.Add(3, t.Add(4, 5))
	t.Add(p, q)
	return t, p, q
}

// rotate applies a rotation in place as rotationPass does.
func rotate(t *Tree, v, u, keep, promote int32) {
	y := t.Kids[v][0]
	if y == u {
		y = t.Kids[v][1]
	}
	t.Kids[u] = []int32{keep, y}
	t.Kids[v] = []int32{u, promote}
}

func TestRotationTwoTriangles(t *testing.T) {
	// By hand: on two triangles with OPT ((0,(1,2)),(3,(4,5))) = 22,
	// ((0,(3,(4,5))),(1,2)) has Δ = 3·2 − 2·0 = +6 (cost 28) and
	// (((1,2),(3,(4,5))),0) has Δ = 3·2 − 1·1 = +5 (cost 27).
	g := dgTwoTriangles(t)
	tr, p, _ := twoTrianglesOpt()
	if c := Cost(g, tr); c != 22 {
		t.Fatalf("cost %g, want 22", c)
	}
	lay := newLayout(tr)
	b := bucketEdges(g, tr, lay)
	rs := rotationsAt(tr, lay, &b, tr.Root, p)
	want := []struct {
		delta, cost float64
		promote     int32
	}{{6, 28, tr.Kids[p][1]}, {5, 27, 0}}
	for i, r := range rs {
		if d := r.loss - r.gain; d != want[i].delta || r.promote != want[i].promote {
			t.Errorf("rotation %d: Δ = %g promoting %d, want %g promoting %d", i, d, r.promote, want[i].delta, want[i].promote)
		}
		cp := copyTree(tr)
		rotate(cp, cp.Root, p, r.keep, r.promote)
		if c := Cost(g, cp); c != want[i].cost {
			t.Errorf("rotation %d: cost after %g, want %g", i, c, want[i].cost)
		}
	}
	// The optimum admits no improving rotation.
	if k, _, _ := rotationPass(g, tr, nil, nil); k != 0 {
		t.Errorf("%d rotations applied to the optimum", k)
	}
}

func TestRotationDeltasAreExact(t *testing.T) {
	// Every rotation's Δ, from the LCA buckets, equals the change of
	// Cost (cost.go, computed from scratch) after applying it.
	r := rand.New(rand.NewPCG(2, 9))
	for trial := 0; trial < 40; trial++ {
		n := 5 + r.IntN(30)
		g := RandomGraph(t, uint64(trial), 11, n, 3*n)
		tr := RandomBinaryTree(r, n)
		base := Cost(g, tr)
		lay := newLayout(tr)
		b := bucketEdges(g, tr, lay)
		for v := int32(n); int(v) < tr.NumNodes(); v++ {
			for _, u := range tr.Kids[v] {
				if tr.IsLeaf(u) {
					continue
				}
				for _, rot := range rotationsAt(tr, lay, &b, v, u) {
					cp := copyTree(tr)
					rotate(cp, v, u, rot.keep, rot.promote)
					got := Cost(g, cp) - base
					if d := rot.loss - rot.gain; math.Abs(got-d) > 1e-9*base {
						t.Fatalf("trial %d node %d: Δ = %g, cost changed by %g", trial, v, d, got)
					}
				}
			}
		}
	}
}

// hiddenConstraints draws triplets and clusters that the tree h displays.
func hiddenConstraints(r *rand.Rand, h *Tree, triplets, clusters int) *Constraints {
	l := naivelca.New(h.Parents())
	c := &Constraints{}
	n := h.N
	for len(c.Triplets) < triplets && n >= 3 {
		a, b, x := int32(r.IntN(n)), int32(r.IntN(n)), int32(r.IntN(n))
		if a == b || a == x || b == x {
			continue
		}
		if tr, ok := displayedTriplet(l, a, b, x, len(c.Triplets)); ok {
			c.Triplets = append(c.Triplets, tr)
		}
	}
	for i := 0; i < clusters && h.NumNodes() > n; i++ {
		v := int32(n + r.IntN(h.NumNodes()-n))
		if v == h.Root {
			continue
		}
		c.Clusters = append(c.Clusters, Cluster{Leaves: h.Leaves(v), Record: triplets + i})
	}
	return c
}

func TestImproveKeepsConstraintsAndNeverWorsens(t *testing.T) {
	// Start from a random tree that displays the constraints (they are
	// drawn from it) on an unrelated random graph, so that many rotations
	// want to break them: the cost must not rise, every constraint must
	// hold, and at the end no legal rotation improves (local optimality).
	r := rand.New(rand.NewPCG(4, 4))
	for trial := 0; trial < 30; trial++ {
		n := 8 + r.IntN(60)
		g := RandomGraph(t, uint64(100+trial), 11, n, 4*n)
		tr := RandomBinaryTree(r, n)
		c := hiddenConstraints(r, tr, r.IntN(2*n), r.IntN(4))
		before := Cost(g, tr)
		improveRotations(g, tr, c, nil, 1000, 0, func(string, int, int) {})
		after := Cost(g, tr)
		if after > before*(1+1e-12) {
			t.Fatalf("trial %d: cost rose from %g to %g", trial, before, after)
		}
		if bad := Satisfies(tr, c); len(bad) > 0 {
			t.Fatalf("trial %d: violated %v", trial, bad)
		}
		lay := newLayout(tr)
		b := bucketEdges(g, tr, lay)
		pinned, locked := constraintPins(tr, c, lay)
		for v := int32(n); int(v) < tr.NumNodes(); v++ {
			for _, u := range tr.Kids[v] {
				if tr.IsLeaf(u) || pinned[u] || locked[u] {
					continue
				}
				for _, rot := range rotationsAt(tr, lay, &b, v, u) {
					if improves(rot.loss, rot.gain) {
						t.Fatalf("trial %d: improving rotation left at node %d (Δ = %g)", trial, v, rot.loss-rot.gain)
					}
				}
			}
		}
	}
}

func TestSatisfiesOnMultiwayTrees(t *testing.T) {
	// The definitions on hand-made trees: ab|c holds iff lca(a,b) lies
	// strictly below lca(a,b,c); a cluster holds iff some node has exactly
	// its leaves.
	tr := NewTree(5)
	ab := tr.Add(la, lb)
	abc := tr.Add(ab, lc)
	tr.Add(abc, ld, le) // root (((a,b),c),d,e)
	c := &Constraints{
		Triplets: []Triplet{
			trip(la, lb, lc, 0), // holds
			trip(la, lc, lb, 1), // violated
			trip(ld, le, la, 2), // d, e meet only at the root: violated
			trip(la, lb, ld, 3), // holds
			trip(lc, lb, ld, 4), // holds
		},
		Clusters: []Cluster{
			{Leaves: []int32{lb, la}, Record: 5},         // holds
			{Leaves: []int32{la, lb, lc, la}, Record: 6}, // holds (repeats ignored)
			{Leaves: []int32{la, lc}, Record: 7},         // violated
			{Leaves: []int32{ld, le}, Record: 8},         // violated
			{Leaves: []int32{la, lb, lc, ld, le}, Record: 9},
		},
	}
	got := Satisfies(tr, c)
	want := []int{1, 2, 7, 8}
	if len(got) != len(want) {
		t.Fatalf("violated %v, want %v", got, want)
	}
	for i := range got {
		if got[i] != want[i] {
			t.Fatalf("violated %v, want %v", got, want)
		}
	}
}
