package review

import (
	"github.com/ramify-tax/ramify/solve/hier"
)

// leafIndex is review's view of a tree's leaves: hier.LCAIndex (O(1)
// lowest common ancestors over the depth-first leaf order) with the
// per-node arrays the packet code reads directly.
type leafIndex struct {
	o      *hier.LCAIndex
	pos    []int32 // leaf → position (-1 when the tree does not reach it)
	parent []int32 // node → parent (-1 for the root)
	depth  []int32 // node → depth, root 0
	size   []int32 // node → leaves below it
	lo     []int32 // node → position of its first leaf
	leafAt []int32 // position → leaf
}

func newLeafIndex(t *hier.Tree) *leafIndex {
	o := hier.NewLCAIndex(t)
	x := &leafIndex{o: o, pos: o.Pos, parent: o.Parent, depth: o.Depth, lo: o.Lo, leafAt: o.LeafAt, size: make([]int32, t.NumNodes())}
	for v := range x.size {
		x.size[v] = o.Size(int32(v))
	}
	return x
}

// leaves returns the leaves below v (a shared slice; do not modify).
func (x *leafIndex) leaves(v int32) []int32 { return x.o.Leaves(v) }

// lca is the lowest common ancestor of two leaves the tree reaches.
func (x *leafIndex) lca(a, b int32) int32 { return x.o.LCA(a, b) }

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
