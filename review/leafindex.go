package review

import (
	"math/bits"

	"github.com/ramify-tax/ramify/solve"
)

// leafIndex answers lowest-common-ancestor questions about the leaves of a
// tree in O(1). The leaves are numbered in depth-first order, so every node
// covers a contiguous range of positions; the gap between positions g−1 and
// g belongs to the lowest node holding both leaves, and the lca of the
// leaves at positions p < q is the shallowest owner of the gaps p+1..q,
// found by a sparse-table range minimum. Memory is O(n log n) over the n
// leaves only, whatever the number of internal nodes.
type leafIndex struct {
	n        int
	pos      []int32 // leaf → position (-1 when the tree does not reach it)
	parent   []int32 // node → parent (-1 for the root)
	depth    []int32 // node → depth, root 0
	size     []int32 // node → leaves below it
	lo       []int32 // node → first position of its leaves
	leafAt   []int32 // position → leaf
	gapNode  []int32 // gap index g (between positions g and g+1) → owner
	gapDepth []int32
	table    [][]int32 // table[k][g]: gap of least depth in [g, g+2^k)
}

func newLeafIndex(t *solve.Tree) *leafIndex {
	nodes := t.NumNodes()
	x := &leafIndex{
		n:      t.N,
		pos:    make([]int32, t.N),
		parent: make([]int32, nodes),
		depth:  make([]int32, nodes),
		size:   make([]int32, nodes),
		lo:     make([]int32, nodes),
	}
	for i := range x.pos {
		x.pos[i] = -1
	}
	for i := range x.parent {
		x.parent[i] = -1
	}
	if t.N == 0 {
		return x
	}
	type frame struct {
		v    int32
		next int
	}
	next := int32(0)
	stack := []frame{{t.Root, 0}}
	for len(stack) > 0 {
		f := &stack[len(stack)-1]
		v := f.v
		if f.next == 0 {
			x.lo[v] = next
		}
		if t.IsLeaf(v) {
			x.pos[v] = next
			x.leafAt = append(x.leafAt, v)
			next++
			x.size[v] = 1
			stack = stack[:len(stack)-1]
			continue
		}
		kids := t.Kids[v]
		if f.next < len(kids) {
			if f.next > 0 {
				x.gapNode = append(x.gapNode, v)
				x.gapDepth = append(x.gapDepth, x.depth[v])
			}
			c := kids[f.next]
			f.next++
			x.parent[c] = v
			x.depth[c] = x.depth[v] + 1
			stack = append(stack, frame{c, 0})
			continue
		}
		for _, c := range kids {
			x.size[v] += x.size[c]
		}
		stack = stack[:len(stack)-1]
	}
	m := len(x.gapNode)
	if m == 0 {
		return x
	}
	levels := bits.Len(uint(m))
	x.table = make([][]int32, levels)
	x.table[0] = make([]int32, m)
	for i := range x.table[0] {
		x.table[0][i] = int32(i)
	}
	for k := 1; k < levels; k++ {
		prev := x.table[k-1]
		half := 1 << (k - 1)
		cur := make([]int32, m-(1<<k)+1)
		for i := range cur {
			a, b := prev[i], prev[i+half]
			if x.gapDepth[b] < x.gapDepth[a] {
				a = b
			}
			cur[i] = a
		}
		x.table[k] = cur
	}
	return x
}

// leaves returns the leaves below v (a shared slice; do not modify).
func (x *leafIndex) leaves(v int32) []int32 {
	return x.leafAt[x.lo[v] : x.lo[v]+x.size[v]]
}

// lca is the lowest common ancestor of two leaves the tree reaches.
func (x *leafIndex) lca(a, b int32) int32 {
	p, q := x.pos[a], x.pos[b]
	if p == q {
		return a
	}
	if p > q {
		p, q = q, p
	}
	lo, hi := int(p), int(q-1) // gaps p+1..q are indices p..q-1
	k := bits.Len(uint(hi-lo+1)) - 1
	g1, g2 := x.table[k][lo], x.table[k][hi-(1<<k)+1]
	if x.gapDepth[g2] < x.gapDepth[g1] {
		g1 = g2
	}
	return x.gapNode[g1]
}

// Topologies of three leaves a, b, c.
const (
	topoStar = iota // unresolved: all three meet in one node
	topoAB          // ab|c
	topoAC          // ac|b
	topoBC          // bc|a
	numTopologies
)

// topology says how the tree resolves the leaves a, b, c: the pair whose
// lca lies strictly below the other two (which are then equal), or star.
func (x *leafIndex) topology(a, b, c int32) int {
	ab, ac, bc := x.depth[x.lca(a, b)], x.depth[x.lca(a, c)], x.depth[x.lca(b, c)]
	switch {
	case ab > ac:
		return topoAB
	case ac > ab:
		return topoAC
	case bc > ab:
		return topoBC
	}
	return topoStar
}
