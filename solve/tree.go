package solve

import "github.com/ramify-tax/ramify/solve/hier"

// Tree is the rooted tree over leaves 0..N-1 that the solver builds (see
// hier.Tree): leaves are the items, ids N and up the internal nodes.
type Tree = hier.Tree

// NewTree returns a tree with n leaves and no internal nodes yet.
func NewTree(n int) *Tree { return hier.NewTree(n) }
