package diff

import (
	"fmt"

	"github.com/ramify-tax/ramify/solve/hier"
)

// treeIndex is a tree laid out for the comparison measures (hier.Index:
// every node's leaf set is the range LeafAt[Lo[v]:Hi[v]] of the depth-first
// leaf order), checked to be a tree over all its leaves.
type treeIndex struct{ *hier.Index }

// newTreeIndex indexes t. It panics when t is not a tree over exactly the
// leaves 0..N-1, each reached once from the root: comparing malformed trees
// is a programming error.
func newTreeIndex(t *hier.Tree) treeIndex {
	if t.N < 0 || len(t.Kids) < t.N {
		panic(fmt.Sprintf("diff: malformed tree (N=%d, %d nodes, root %d)", t.N, len(t.Kids), t.Root))
	}
	if t.N == 0 {
		return treeIndex{hier.NewIndex(t)}
	}
	if err := hier.Check(t); err != nil {
		panic("diff: malformed tree: " + err.Error())
	}
	x := treeIndex{hier.NewIndex(t)}
	for _, v := range x.Post {
		if int(v) >= t.N && len(t.Kids[v]) == 0 {
			panic(fmt.Sprintf("diff: internal node %d has no children", v))
		}
	}
	if len(x.LeafAt) != t.N {
		panic(fmt.Sprintf("diff: the root reaches %d of %d leaves", len(x.LeafAt), t.N))
	}
	return x
}

// mustMatch panics unless a and b have the same leaves.
func mustMatch(a, b *hier.Tree) {
	if a.N != b.N {
		panic(fmt.Sprintf("diff: comparing trees over %d and %d leaves", a.N, b.N))
	}
}
