package solve

// treeView is what keeps asks of a tree: lowest common ancestors and
// ancestry, from an index or by walking up.
type treeView interface {
	lca(a, b int32) int32
	isAncestor(a, b int32) bool
	root() int32
}

type indexedTree struct {
	t  *mutableTree
	ix *treeIndex
}

func (v indexedTree) lca(a, b int32) int32       { return v.t.lcaIdx(v.ix, a, b) }
func (v indexedTree) isAncestor(a, b int32) bool { return v.ix.isAncestor(a, b) }
func (v indexedTree) root() int32                { return v.t.root }

// walkedTree answers from parent links alone, for a tree that changes
// between questions (record items are few).
type walkedTree struct{ t *mutableTree }

func (v walkedTree) lca(a, b int32) int32 { return v.t.lca(a, b) }
func (v walkedTree) isAncestor(a, b int32) bool {
	for ; b >= 0; b = v.t.parent[b] {
		if b == a {
			return true
		}
	}
	return false
}
func (v walkedTree) root() int32 { return v.t.root }
