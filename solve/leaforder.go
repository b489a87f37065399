package solve

// LeafOrder answers lowest-common-ancestor questions about a tree's leaves
// in O(1): the leaves in depth-first order, each node's range of
// positions, and a sparse-table range minimum over the gaps between
// consecutive leaves. It is the structure the construction, the moves and
// the folding use internally, exported so that review reads trees the same
// way.
type LeafOrder struct {
	l *layout
}

// NewLeafOrder indexes t.
func NewLeafOrder(t *Tree) *LeafOrder { return &LeafOrder{newLayout(t)} }

// LCA is the lowest common ancestor of two leaves the tree reaches.
func (o *LeafOrder) LCA(a, b int32) int32 { return o.l.lca(a, b) }

// Pos maps each leaf to its depth-first position (-1 when unreachable).
func (o *LeafOrder) Pos() []int32 { return o.l.pos }

// Parent maps each node to its parent (-1 for the root).
func (o *LeafOrder) Parent() []int32 { return o.l.parent }

// Depth maps each node to its depth, the root 0.
func (o *LeafOrder) Depth() []int32 { return o.l.depth }

// Leaves lists the leaves below v in depth-first order (a shared slice; do
// not modify).
func (o *LeafOrder) Leaves(v int32) []int32 { return o.l.leafAt[o.l.lo[v]:o.l.hi[v]] }

// Size is the number of leaves below v.
func (o *LeafOrder) Size(v int32) int32 { return o.l.hi[v] - o.l.lo[v] }

// LeafAt maps each depth-first position to its leaf.
func (o *LeafOrder) LeafAt() []int32 { return o.l.leafAt }

// Lo maps each node to the position of its first leaf; its leaves take
// positions Lo[v] .. Lo[v]+Size(v)-1.
func (o *LeafOrder) Lo() []int32 { return o.l.lo }
