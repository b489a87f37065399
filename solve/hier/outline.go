package hier

// Nested is how the adapters read a nested category tree of any type C
// without this package knowing it: the subcategories of a category in
// order, and the leaves (item indices below the tree's N) it holds
// directly, appended to buf, with items the tree is not over left out.
type Nested[C comparable] struct {
	Children func(c C) []C
	Leaves   func(c C, buf []int32) []int32
}

// CollapsingChains builds the tree over n leaves that the categories below
// root state: a category becomes an internal node whose children are its
// subcategories' nodes and then its leaves. A category with no leaf below
// it is dropped, and one left with a single child has no node of its own:
// it maps to its child's node, so a chain of single-child categories
// states one cluster. nodes says which node each category that was not
// dropped became. Nodes are added children first, in the categories'
// post-order.
func CollapsingChains[C comparable](root C, n int, in Nested[C]) (t *Tree, nodes map[C]int32) {
	return fromNested(root, n, in, false)
}

// KeepingChains is CollapsingChains giving every category with a leaf
// below it a node of its own, single-child ones too, and the root always,
// so that the tree printed again is the same outline. A tree with no leaf
// has an empty root.
func KeepingChains[C comparable](root C, n int, in Nested[C]) (t *Tree, nodes map[C]int32) {
	return fromNested(root, n, in, true)
}

func fromNested[C comparable](root C, n int, in Nested[C], keepChains bool) (*Tree, map[C]int32) {
	t := NewTree(n)
	nodes := map[C]int32{}
	var build func(c C) (int32, bool)
	build = func(c C) (int32, bool) {
		var kids []int32
		for _, ch := range in.Children(c) {
			if id, ok := build(ch); ok {
				kids = append(kids, id)
			}
		}
		kids = in.Leaves(c, kids)
		var id int32
		switch {
		case keepChains && (len(kids) > 0 || c == root):
			id = t.Add(kids...)
		case len(kids) == 0:
			return 0, false
		case len(kids) == 1:
			id = kids[0]
		default:
			id = t.Add(kids...)
		}
		nodes[c] = id
		return id, true
	}
	if r, ok := build(root); ok {
		t.Root = r
	}
	return t, nodes
}

// Unfold is the way back: it turns t into nested categories below root,
// every internal node under the root a category made by newChild(parent)
// in child order, every leaf passed to addLeaf with the category of its
// parent. A tree whose root is a leaf puts that leaf in root.
func Unfold[C any](t *Tree, root C, newChild func(parent C) C, addLeaf func(c C, leaf int32)) {
	if t.N == 0 {
		return
	}
	if t.IsLeaf(t.Root) {
		addLeaf(root, t.Root)
		return
	}
	type frame struct {
		node int32
		cat  C
	}
	stack := []frame{{t.Root, root}}
	for len(stack) > 0 {
		f := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		for _, k := range t.Kids[f.node] {
			if t.IsLeaf(k) {
				addLeaf(f.cat, k)
				continue
			}
			stack = append(stack, frame{k, newChild(f.cat)})
		}
	}
}
