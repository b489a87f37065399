package hier

import (
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/ramify-tax/ramify/internal/naivelca"
)

// randomTree builds a tree over n leaves by merging random groups of two to
// four roots, sometimes over a single child (a chain), children before
// parents as Add needs.
func randomTree(rng *rand.Rand, n int) *Tree {
	t := NewTree(n)
	roots := make([]int32, n)
	for i := range roots {
		roots[i] = int32(i)
	}
	for len(roots) > 1 {
		k := min(len(roots), 2+rng.IntN(3))
		if rng.IntN(5) == 0 {
			k = 1
		}
		rng.Shuffle(len(roots), func(i, j int) { roots[i], roots[j] = roots[j], roots[i] })
		v := t.Add(roots[:k]...)
		roots = append([]int32{v}, roots[k:]...)
	}
	return t
}

func TestIndexAgreesWithTree(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for _, n := range []int{1, 2, 3, 7, 40} {
		tr := randomTree(rng, n)
		x := NewLCAIndex(tr)
		naive := naivelca.New(tr.Parents())
		if !slices.Equal(x.Parent, tr.Parents()) {
			t.Fatalf("n=%d: parents %v, want %v", n, x.Parent, tr.Parents())
		}
		if !slices.Equal(x.Post, tr.PostOrder()) {
			t.Fatalf("n=%d: post-order %v, want %v", n, x.Post, tr.PostOrder())
		}
		sizes := tr.Sizes()
		for v := range tr.NumNodes() {
			leaves := slices.Clone(x.Leaves(int32(v)))
			want := tr.Leaves(int32(v))
			if !slices.Equal(leaves, want) || int(x.Size(int32(v))) != sizes[v] {
				t.Fatalf("n=%d node %d: leaves %v, want %v", n, v, leaves, want)
			}
			if p := x.Parent[v]; p >= 0 && x.Depth[v] != x.Depth[p]+1 {
				t.Fatalf("n=%d node %d: depth %d under a parent at %d", n, v, x.Depth[v], x.Depth[p])
			}
		}
		for a := range int32(n) {
			if x.LeafAt[x.Pos[a]] != a {
				t.Fatalf("n=%d: leaf %d at position %d holds %d", n, a, x.Pos[a], x.LeafAt[x.Pos[a]])
			}
			for b := range int32(n) {
				if got, want := x.LCA(a, b), naive.LCA(a, b); got != want {
					t.Fatalf("n=%d: lca(%d, %d) = %d, want %d", n, a, b, got, want)
				}
			}
		}
	}
}

func TestIndexUnreachable(t *testing.T) {
	// Leaf 2 and node 4 hang outside the root's reach.
	tr := NewTree(3)
	tr.Add(0, 1)
	tr.Root = 3
	tr.Kids = append(tr.Kids, []int32{2})
	x := NewIndex(tr)
	if x.Pos[2] != -1 || x.Parent[4] != -1 || x.Size(4) != 0 || len(x.LeafAt) != 2 {
		t.Errorf("unreachable parts indexed: pos %v parent %v size(4) %d", x.Pos, x.Parent, x.Size(4))
	}
}

func TestCheck(t *testing.T) {
	leafWithKids := NewTree(2)
	leafWithKids.Add(0, 1)
	leafWithKids.Kids[0] = []int32{1}
	twice := NewTree(2)
	twice.Add(0, 1, 1)
	tests := []struct {
		name string
		t    *Tree
		ok   bool
	}{
		{"nil", nil, false},
		{"good", func() *Tree { t := NewTree(2); t.Add(0, 1); return t }(), true},
		{"no nodes", NewTree(0), false},
		{"root outside", &Tree{N: 1, Kids: [][]int32{nil}, Root: 5}, false},
		{"leaf with children", leafWithKids, false},
		{"child reached twice", twice, false},
		{"child outside", &Tree{N: 1, Kids: [][]int32{nil, {7}}, Root: 1}, false},
	}
	for _, tc := range tests {
		if err := Check(tc.t); (err == nil) != tc.ok {
			t.Errorf("%s: Check = %v, want ok %v", tc.name, err, tc.ok)
		}
	}
}
