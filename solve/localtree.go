package solve

import (
	"slices"

	"github.com/ramify-tax/ramify/solve/graph"
)

// mutableTree is a multiway tree that Repair edits in place: leaves are
// taken out and put back, categories added and emptied ones dropped. Node
// ids are stable while it lives; compact turns it back into a Tree.
type mutableTree struct {
	n      int
	kids   [][]int32
	parent []int32
	root   int32 // always an internal node
}

func newMutableTree(prev *Tree) *mutableTree {
	t := &mutableTree{n: prev.N, kids: make([][]int32, len(prev.Kids)), parent: make([]int32, len(prev.Kids))}
	for v, ks := range prev.Kids {
		t.kids[v] = slices.Clone(ks)
	}
	for i := range t.parent {
		t.parent[i] = -1
	}
	root := prev.Root
	reachable := prev.N > 0 && int(root) < len(prev.Kids) && (len(prev.Kids[root]) > 0 || prev.N == 1)
	switch {
	case !reachable:
		t.root = t.newNode(nil)
	case prev.IsLeaf(root):
		t.root = t.newNode([]int32{root})
	default:
		t.root = root
	}
	for _, v := range prev.PostOrder() {
		for _, c := range t.kids[v] {
			t.parent[c] = v
		}
	}
	if reachable && prev.IsLeaf(root) {
		t.parent[root] = t.root
	}
	return t
}

func (t *mutableTree) newNode(kids []int32) int32 {
	id := int32(len(t.kids))
	t.kids = append(t.kids, kids)
	t.parent = append(t.parent, -1)
	for _, c := range kids {
		t.parent[c] = id
	}
	return id
}

func (t *mutableTree) isLeaf(v int32) bool { return int(v) < t.n }

// alive reports whether v hangs from the root.
func (t *mutableTree) alive(v int32) bool {
	for v >= 0 {
		if v == t.root {
			return true
		}
		v = t.parent[v]
	}
	return false
}

// placed reports whether leaf x is in the tree.
func (t *mutableTree) placed(x int32) bool { return t.alive(x) }

// detach takes leaf x out and drops the categories it leaves empty.
func (t *mutableTree) detach(x int32) {
	v := x
	for v != t.root && t.parent[v] >= 0 {
		p := t.parent[v]
		t.kids[p] = slices.DeleteFunc(t.kids[p], func(c int32) bool { return c == v })
		t.parent[v] = -1
		if len(t.kids[p]) > 0 || p == t.root {
			return
		}
		v = p
	}
}

// attach hangs the detached subtree u at s.
func (t *mutableTree) attach(u int32, s spot) {
	if !s.beside {
		t.kids[s.v] = append(t.kids[s.v], u)
		t.parent[u] = s.v
		return
	}
	p := t.parent[s.v]
	i := slices.Index(t.kids[p], s.v)
	w := t.newNode([]int32{s.v, u})
	t.kids[p][i] = w
	t.parent[w] = p
}

// graft copies a solved tree over local leaves 0..len(items)-1 into
// detached nodes over items and returns the copy's root.
func (t *mutableTree) graft(sub *Tree, items []int32) int32 {
	if sub.IsLeaf(sub.Root) {
		return items[sub.Root]
	}
	ids := make([]int32, len(sub.Kids))
	for _, v := range sub.PostOrder() {
		if sub.IsLeaf(v) {
			ids[v] = items[v]
			continue
		}
		kids := make([]int32, len(sub.Kids[v]))
		for i, c := range sub.Kids[v] {
			kids[i] = ids[c]
		}
		ids[v] = t.newNode(kids)
	}
	return ids[sub.Root]
}

// discard lets go of a detached subtree (its leaves become unplaced).
func (t *mutableTree) discard(u int32) {
	if t.isLeaf(u) {
		t.parent[u] = -1
		return
	}
	stack := []int32{u}
	for len(stack) > 0 {
		v := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		t.parent[v] = -1
		if !t.isLeaf(v) {
			stack = append(stack, t.kids[v]...)
			t.kids[v] = nil
		}
	}
}

// replaceUnder makes sub (over items, local ids) the new content of v.
func (t *mutableTree) replaceUnder(v int32, sub *Tree, items []int32) {
	for _, c := range t.kids[v] {
		t.discard(c)
	}
	t.kids[v] = nil
	r := t.graft(sub, items)
	if t.isLeaf(r) {
		t.kids[v] = []int32{r}
		t.parent[r] = v
		return
	}
	t.kids[v] = t.kids[r]
	for _, c := range t.kids[v] {
		t.parent[c] = v
	}
	t.kids[r] = nil
}

// leavesUnder lists the leaves below v (in child order; the callers sort
// or count them), read as the Tree the main tree's links make.
func (t *mutableTree) leavesUnder(v int32) []int32 {
	return (&Tree{N: t.n, Kids: t.kids}).Leaves(v)
}

// priorUnder lists the leaf sets of the categories strictly below v, in
// the local numbering of items (sorted), for the stability pull of a
// re-solved region.
func (t *mutableTree) priorUnder(v int32, items []int32) [][]int32 {
	local := make(map[int32]int32, len(items))
	for i, x := range items {
		local[x] = int32(i)
	}
	var out [][]int32
	var rec func(x int32) []int32
	rec = func(x int32) []int32 {
		if t.isLeaf(x) {
			return []int32{local[x]}
		}
		var mine []int32
		for _, c := range t.kids[x] {
			mine = append(mine, rec(c)...)
		}
		if x != v && len(mine) >= 2 {
			s := slices.Clone(mine)
			slices.Sort(s)
			out = append(out, s)
		}
		return mine
	}
	rec(v)
	return out
}

// lca of two nodes of one detached subtree or of the main tree, by
// walking up (units are small).
func (t *mutableTree) lca(a, b int32) int32 {
	seen := map[int32]bool{}
	for v := a; v >= 0; v = t.parent[v] {
		seen[v] = true
	}
	for v := b; v >= 0; v = t.parent[v] {
		if seen[v] {
			return v
		}
	}
	return -1
}

// lcaIdx is the lca of two main-tree nodes by their indexed depths.
func (t *mutableTree) lcaIdx(ix *treeIndex, a, b int32) int32 {
	for ix.depth[a] > ix.depth[b] {
		a = t.parent[a]
	}
	for ix.depth[b] > ix.depth[a] {
		b = t.parent[b]
	}
	for a != b {
		a, b = t.parent[a], t.parent[b]
	}
	return a
}

// compact renumbers the main tree into a Tree (internal nodes in post
// order), dropping everything detached.
func (t *mutableTree) compact() *Tree {
	out := NewTree(t.n)
	type frame struct {
		v    int32
		next int
		kids []int32
	}
	stack := []*frame{{v: t.root}}
	var last int32
	for len(stack) > 0 {
		f := stack[len(stack)-1]
		if f.next < len(t.kids[f.v]) {
			c := t.kids[f.v][f.next]
			f.next++
			if t.isLeaf(c) {
				f.kids = append(f.kids, c)
			} else {
				stack = append(stack, &frame{v: c})
			}
			continue
		}
		stack = stack[:len(stack)-1]
		var id int32
		if len(f.kids) == 0 {
			// An emptied category vanishes (only possible for the root of
			// an empty tree).
			if len(stack) > 0 {
				continue
			}
			id = out.Add()
		} else {
			id = out.Add(f.kids...)
		}
		last = id
		if len(stack) > 0 {
			p := stack[len(stack)-1]
			p.kids = append(p.kids, id)
		}
	}
	out.Root = last
	return out
}

// treeIndex is what the placement of one unit reads off the main tree:
// depths, sizes, ancestor tests, leaf-set hashes, the categories that are
// exactly a group, and the weights Dasgupta's cost adds up.
type treeIndex struct {
	depth, size, height, subcats []int32
	tin, tout                    []int32
	hash                         []uint64
	order                        []int32          // the main tree's nodes in pre-order
	byHash                       map[uint64]int32 // leaf-set hash → shallowest node; see nodeOfHash
	locked                       []bool
	upper                        []float64 // C(v): weight of placed pairs with lca at v or above

	// The unit whose neighbours are loaded.
	unitRoot int32
	unitMark map[int32]bool
	under    []float64 // weight from the unit to the leaves below each node
	touched  []int32
	wTotal   float64
}

// index reads the main tree for placing units: its shape (shapeIndex)
// and the Dasgupta weights that r.cost adds up (sumUpper).
func (t *mutableTree) index(g *graph.CSR, keys []uint64, c *Constraints) *treeIndex {
	ix := t.shapeIndex(keys, c)
	ix.sumUpper(t, g, ix.order)
	return ix
}

// shapeIndex reads the main tree's shape: depths, sizes, ancestor tests,
// leaf-set hashes and locked groups, all that checking records needs. It
// leaves out the weights (upper), a pass over every edge that only costing
// a place needs: a cost read off a shape index fails.
func (t *mutableTree) shapeIndex(keys []uint64, c *Constraints) *treeIndex {
	nodes := len(t.kids)
	ix := &treeIndex{
		depth: make([]int32, nodes), size: make([]int32, nodes), height: make([]int32, nodes),
		subcats: make([]int32, nodes), tin: make([]int32, nodes), tout: make([]int32, nodes),
		hash: make([]uint64, nodes), locked: make([]bool, nodes),
		under: make([]float64, nodes), unitRoot: -1,
	}
	ix.order = ix.walk(t, keys)
	ix.lockGroups(t, keys, c)
	return ix
}

// walk fills the node measures: depth and entry times in pre-order;
// sizes, leaf-set hashes, heights, exit times and subcategory counts in
// post-order. It returns the pre-order.
func (ix *treeIndex) walk(t *mutableTree, keys []uint64) []int32 {
	order := make([]int32, 0, len(t.kids))
	stack := []int32{t.root}
	clock := int32(0)
	for len(stack) > 0 {
		v := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		order = append(order, v)
		ix.tin[v] = clock
		clock++
		for i := len(t.kids[v]) - 1; i >= 0; i-- {
			c := t.kids[v][i]
			ix.depth[c] = ix.depth[v] + 1
			stack = append(stack, c)
		}
	}
	for i := len(order) - 1; i >= 0; i-- {
		v := order[i]
		if t.isLeaf(v) {
			ix.size[v], ix.hash[v], ix.tout[v] = 1, keys[v], ix.tin[v]
			continue
		}
		ix.tout[v] = ix.tin[v]
		for _, c := range t.kids[v] {
			ix.size[v] += ix.size[c]
			ix.hash[v] ^= ix.hash[c]
			ix.height[v] = max(ix.height[v], ix.height[c]+1)
			ix.tout[v] = max(ix.tout[v], ix.tout[c])
			if !t.isLeaf(c) {
				ix.subcats[v]++
			}
		}
	}
	return order
}

// nodeOfHash is the shallowest node of the main tree whose leaf set has
// hash h. The map is made on the first call, from the hashes as the index
// read them: only groups ask, and a tree of a million leaves without
// groups never pays for it.
func (ix *treeIndex) nodeOfHash(h uint64) (int32, bool) {
	if ix.byHash == nil {
		ix.byHash = make(map[uint64]int32, len(ix.order))
		// Backwards through the pre-order, so the shallowest node of a
		// hash is written last and stays.
		for i := len(ix.order) - 1; i >= 0; i-- {
			v := ix.order[i]
			ix.byHash[ix.hash[v]] = v
		}
	}
	v, ok := ix.byHash[h]
	return v, ok
}

// lockGroups marks, for each group whose items are all placed, the
// deepest node holding exactly its items: nothing may join that node or
// anything below.
func (ix *treeIndex) lockGroups(t *mutableTree, keys []uint64, c *Constraints) {
	for _, cl := range c.Clusters {
		var h uint64
		all := true
		for _, x := range cl.Leaves {
			if !ix.inMain(t, x) {
				all = false
				break
			}
			h ^= keys[x]
		}
		if !all || len(cl.Leaves) < 2 {
			continue
		}
		v, ok := ix.nodeOfHash(h)
		if !ok || int(ix.size[v]) != len(cl.Leaves) {
			continue
		}
		for !t.isLeaf(v) && len(t.kids[v]) == 1 && !t.isLeaf(t.kids[v][0]) {
			v = t.kids[v][0]
		}
		ix.locked[v] = true
	}
}

// sumUpper fills the Dasgupta weights: each placed pair with an edge adds
// its weight at its lca; upper accumulates them down every root path
// (order is the pre-order).
func (ix *treeIndex) sumUpper(t *mutableTree, g *graph.CSR, order []int32) {
	ix.upper = make([]float64, len(t.kids))
	wlca := make([]float64, len(t.kids))
	for _, v := range order {
		if !t.isLeaf(v) {
			continue
		}
		targets, weights := g.Neighbors(int(v))
		for j, y := range targets {
			if y <= v || !ix.inMain(t, y) {
				continue
			}
			wlca[t.lcaIdx(ix, v, y)] += weights[j]
		}
	}
	for _, v := range order {
		ix.upper[v] = wlca[v]
		if p := t.parent[v]; v != t.root && p >= 0 {
			ix.upper[v] += ix.upper[p]
		}
	}
}

// inMain reports whether leaf y was in the main tree when ix was built.
func (ix *treeIndex) inMain(t *mutableTree, y int32) bool {
	return y == t.root || ix.depth[y] > 0
}

func (ix *treeIndex) isAncestor(a, b int32) bool {
	return ix.tin[a] <= ix.tin[b] && ix.tout[b] <= ix.tout[a]
}

func (ix *treeIndex) inUnit(u unit, y int32) bool {
	if ix.unitRoot != u.root || ix.unitMark == nil {
		ix.unitMark = make(map[int32]bool, len(u.items))
		for _, x := range u.items {
			ix.unitMark[x] = true
		}
		ix.unitRoot = u.root
		ix.touched = ix.touched[:0]
		ix.wTotal = -1
	}
	return ix.unitMark[y]
}

// loadNeighbours sums, once per unit, the edge weight from the unit to
// the placed leaves below every node.
func (ix *treeIndex) loadNeighbours(g *graph.CSR, t *mutableTree, u unit) {
	ix.inUnit(u, -1)
	if ix.wTotal >= 0 {
		return
	}
	for _, v := range ix.touched {
		ix.under[v] = 0
	}
	ix.touched = ix.touched[:0]
	ix.wTotal = 0
	for _, x := range u.items {
		targets, weights := g.Neighbors(int(x))
		for j, y := range targets {
			if ix.unitMark[y] || !ix.inMain(t, y) {
				continue
			}
			ix.wTotal += weights[j]
			for v := y; v >= 0; v = t.parent[v] {
				if ix.under[v] == 0 {
					ix.touched = append(ix.touched, v)
				}
				ix.under[v] += weights[j]
				if v == t.root {
					break
				}
			}
		}
	}
}

// edgeTerm is Σ_y w_y·|lca(v, y)| over the unit's placed neighbours y,
// leaving out those below a child of v whose weight is skipW: walking up from v, the neighbours first met at ancestor a meet
// the unit there.
func (ix *treeIndex) edgeTerm(t *mutableTree, v int32, skipW float64) float64 {
	total := (ix.under[v] - skipW) * float64(ix.size[v])
	below := ix.under[v]
	for a := v; a != t.root; {
		a = t.parent[a]
		total += (ix.under[a] - below) * float64(ix.size[a])
		below = ix.under[a]
	}
	return total
}

// unitHeight is the height of a detached unit (0 for a single leaf).
func (ix *treeIndex) unitHeight(t *mutableTree, root int32) int32 {
	if t.isLeaf(root) {
		return 0
	}
	h := int32(0)
	var rec func(v int32, d int32)
	rec = func(v int32, d int32) {
		h = max(h, d)
		if !t.isLeaf(v) {
			for _, c := range t.kids[v] {
				rec(c, d+1)
			}
		}
	}
	rec(root, 0)
	return h
}

// depthInUnit counts the steps from the unit's root down to v.
func (ix *treeIndex) depthInUnit(t *mutableTree, root, v int32) int32 {
	d := int32(0)
	for v != root && v >= 0 {
		v = t.parent[v]
		d++
	}
	return d
}
