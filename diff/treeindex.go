package diff

import (
	"fmt"

	"github.com/ramify-tax/ramify/solve"
)

// treeIndex lays a tree out for the comparison measures: a depth-first
// order of the leaves in which every node's leaf set is the contiguous
// range [lo, hi), each node's parent and depth, and the nodes in post-order.
type treeIndex struct {
	n      int     // leaves
	parent []int32 // -1 for the root and for nodes the root does not reach
	depth  []int32
	lo, hi []int32 // leaf set of v = order[lo[v]:hi[v]]
	order  []int32 // leaf at each position
	pos    []int32 // position of each leaf
	post   []int32 // reachable nodes, children before parents
	root   int32
}

// size is the number of leaves below v.
func (x *treeIndex) size(v int32) int32 { return x.hi[v] - x.lo[v] }

// newTreeIndex indexes t. It panics when t is not a tree over exactly the
// leaves 0..N-1, each reached once from the root: comparing malformed trees
// is a programming error.
func newTreeIndex(t *solve.Tree) *treeIndex {
	nodes := len(t.Kids)
	if t.N < 0 || nodes < t.N || (t.N > 0 && (t.Root < 0 || int(t.Root) >= nodes)) {
		panic(fmt.Sprintf("diff: malformed tree (N=%d, %d nodes, root %d)", t.N, nodes, t.Root))
	}
	x := &treeIndex{
		n:      t.N,
		parent: make([]int32, nodes),
		depth:  make([]int32, nodes),
		lo:     make([]int32, nodes),
		hi:     make([]int32, nodes),
		order:  make([]int32, 0, t.N),
		pos:    make([]int32, t.N),
		post:   make([]int32, 0, nodes),
		root:   t.Root,
	}
	for i := range x.parent {
		x.parent[i] = -1
	}
	if t.N == 0 {
		return x
	}
	seen := make([]bool, nodes)
	type frame struct {
		v    int32
		next int
	}
	stack := []frame{{t.Root, 0}}
	seen[t.Root] = true
	x.lo[t.Root] = 0
	for len(stack) > 0 {
		f := &stack[len(stack)-1]
		v := f.v
		if int(v) < t.N {
			if len(t.Kids[v]) != 0 {
				panic(fmt.Sprintf("diff: leaf %d has children", v))
			}
			x.pos[v] = int32(len(x.order))
			x.order = append(x.order, v)
		}
		if f.next < len(t.Kids[v]) {
			c := t.Kids[v][f.next]
			f.next++
			if c < 0 || int(c) >= nodes || seen[c] {
				panic(fmt.Sprintf("diff: node %d has bad or repeated child %d", v, c))
			}
			seen[c] = true
			x.parent[c] = v
			x.depth[c] = x.depth[v] + 1
			x.lo[c] = int32(len(x.order))
			stack = append(stack, frame{c, 0})
			continue
		}
		if int(v) >= t.N && len(t.Kids[v]) == 0 {
			panic(fmt.Sprintf("diff: internal node %d has no children", v))
		}
		x.hi[v] = int32(len(x.order))
		x.post = append(x.post, v)
		stack = stack[:len(stack)-1]
	}
	if len(x.order) != t.N {
		panic(fmt.Sprintf("diff: the root reaches %d of %d leaves", len(x.order), t.N))
	}
	return x
}

// mustMatch panics unless a and b have the same leaves.
func mustMatch(a, b *solve.Tree) {
	if a.N != b.N {
		panic(fmt.Sprintf("diff: comparing trees over %d and %d leaves", a.N, b.N))
	}
}
