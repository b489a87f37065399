package review

import (
	"math/rand/v2"
	"testing"

	"github.com/ramify-tax/ramify/solve"
)

// randomTree joins n leaves into a random multiway tree: repeatedly two to
// four of the current roots become children of a new node.
func randomTree(r *rand.Rand, n int) *solve.Tree {
	t := solve.NewTree(n)
	roots := make([]int32, n)
	for i := range roots {
		roots[i] = int32(i)
	}
	for len(roots) > 1 {
		r.Shuffle(len(roots), func(i, j int) { roots[i], roots[j] = roots[j], roots[i] })
		k := min(len(roots), 2+r.IntN(3))
		v := t.Add(roots[:k]...)
		roots = append([]int32{v}, roots[k:]...)
	}
	return t
}

// bruteTopology classifies a, b, c by comparing the depths of pairwise
// lowest common ancestors found by walking parent pointers.
func bruteTopology(t *solve.Tree, a, b, c int32) int {
	parent := t.Parents()
	ancestors := func(x int32) []int32 {
		var out []int32
		for v := x; v >= 0; v = parent[v] {
			out = append(out, v)
		}
		return out
	}
	depth := func(x, y int32) int {
		ax, ay := ancestors(x), ancestors(y)
		in := map[int32]bool{}
		for _, v := range ay {
			in[v] = true
		}
		for _, v := range ax {
			if in[v] {
				return len(ancestors(v))
			}
		}
		return 0
	}
	ab, ac, bc := depth(a, b), depth(a, c), depth(b, c)
	switch {
	case ab > ac && ab > bc:
		return topoAB
	case ac > ab && ac > bc:
		return topoAC
	case bc > ab && bc > ac:
		return topoBC
	}
	return topoStar
}

func TestLeafIndexMatchesBruteForce(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	for trial := range 40 {
		n := 3 + r.IntN(25)
		tr := randomTree(r, n)
		ix := newLeafIndex(tr)
		sizes := tr.Sizes()
		for v := range tr.NumNodes() {
			if got := len(ix.leaves(int32(v))); got != sizes[v] {
				t.Fatalf("trial %d: node %d has %d leaves, index says %d", trial, v, sizes[v], got)
			}
		}
		for range 200 {
			a, b, c := int32(r.IntN(n)), int32(r.IntN(n)), int32(r.IntN(n))
			if a == b || a == c || b == c {
				continue
			}
			if got, want := ix.topology(a, b, c), bruteTopology(tr, a, b, c); got != want {
				t.Fatalf("trial %d: topology(%d,%d,%d) = %d, brute force %d", trial, a, b, c, got, want)
			}
		}
	}
}

func TestTopologyOfSmallTrees(t *testing.T) {
	tests := []struct {
		tree    string
		a, b, c int32
		want    int
	}{
		{"((0,1),2)", 0, 1, 2, topoAB},
		{"((0,1),2)", 0, 2, 1, topoAC},
		{"((0,1),2)", 2, 0, 1, topoBC},
		{"(0,1,2)", 0, 1, 2, topoStar},
		{"(((0,1),2),3)", 2, 3, 0, topoAC},
		{"(((0,1),2),3)", 3, 0, 2, topoBC},
		{"((0,1),(2,3))", 0, 2, 3, topoBC},
	}
	for _, tc := range tests {
		ix := newLeafIndex(tree(t, 4, tc.tree))
		if got := ix.topology(tc.a, tc.b, tc.c); got != tc.want {
			t.Errorf("%s: topology(%d,%d,%d) = %d, want %d", tc.tree, tc.a, tc.b, tc.c, got, tc.want)
		}
	}
}
