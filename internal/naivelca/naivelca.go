// Package naivelca answers lowest-common-ancestor questions on a rooted
// tree given by parent links, the slow way that is plainly right: climb to
// equal depth, then climb together. It is the oracle the tests of solve,
// solve/hier and diff check the fast indexes and the triplet scores
// against, so it shares no code with them.
package naivelca

// Tree is a rooted tree as parent links, with each node's depth.
type Tree struct {
	Parent []int32 // node → parent, −1 for a root
	Depth  []int32 // node → number of links up to its root
}

// New returns the tree of the parent links (−1 for a root). Depths are
// counted by climbing from every node: O(nodes · height).
func New(parent []int32) *Tree {
	depth := make([]int32, len(parent))
	for v := range parent {
		for u := parent[v]; u >= 0; u = parent[u] {
			depth[v]++
		}
	}
	return &Tree{Parent: parent, Depth: depth}
}

// LCA is the lowest common ancestor of a and b, which must share a root.
func (t *Tree) LCA(a, b int32) int32 {
	for t.Depth[a] > t.Depth[b] {
		a = t.Parent[a]
	}
	for t.Depth[b] > t.Depth[a] {
		b = t.Parent[b]
	}
	for a != b {
		a, b = t.Parent[a], t.Parent[b]
	}
	return a
}

// Topology codes how the tree resolves the triple a, b, c by the
// definition, ab|c when lca(a, b) lies strictly below lca(a, b, c): 1 for
// ab|c, 2 for ac|b, 3 for bc|a, and 0 when the tree leaves the triple
// unresolved (all three pairs meet at one node).
func (t *Tree) Topology(a, b, c int32) int {
	ab, ac, bc := t.LCA(a, b), t.LCA(a, c), t.LCA(b, c)
	top := t.LCA(ab, c)
	switch {
	case ab != top:
		return 1
	case ac != top:
		return 2
	case bc != top:
		return 3
	}
	return 0
}
