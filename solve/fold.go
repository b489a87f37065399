package solve

import (
	"container/heap"
	"math"
	"slices"
	"sort"

	"github.com/ramify-tax/ramify/internal/disjoint"
	"github.com/ramify-tax/ramify/solve/graph"
)

// Folding the binary tree into a multiway taxonomy: binary nodes whose
// split is not meaningfully tighter than their parent's are folded into
// it, within MinSize, MaxChildren and MaxDepth, and never against a
// constraint. Folding (contracting) a node u into its parent v makes u's
// children v's children.
//
// Tightness. A node's split is scored by the mean similarity across its
// children, the linkage value of average linkage:
//
//	ψ(v) = w(between v's children) / Σ_{children a<b} |a|·|b|.
//
// The rule: u is folded into its parent v when its split is not
// meaningfully tighter than v's, that is when ψ̃(u) < foldTightness · ψ(v),
// where ψ̃(u) = (w_u + κ·ψ(v)) / (p_u + κ) is u's ψ shrunk toward its
// parent's by κ = foldPseudoPairs pairs (w_u: weight across u's children,
// p_u: their pairs). Without the shrinkage the small nodes at the bottom,
// which the binary tree builds from the heaviest pairs, pass the test by
// selection alone and the result is a thicket of three-item categories.
// Under a planted hierarchy the binary nodes that only regroup siblings of
// one level have ψ(u) ≈ ψ(v) and fold, while a real level is markedly
// tighter than the one above it and stays. Folds go least-tight first (by
// ψ(u)/ψ(v)), and a fold updates the parent by the mediant
// ψ(v) ← (w_v + w_u)/(p_v + p_u), which is exact. Folding never increases
// the number of categories a leaf sits in and costs Δ = (|L(v)|−|L(u)|)·w_u
// of Dasgupta's cost (the node form: the edges across u's children move
// from lca u to lca v).
//
// With Stability the previous categories (found again as nodes by
// priorMatches) are exempt from the tightness rule and folded last for
// depth, and every other node needs foldTightness/(1 − Stability).
//
// Order of the passes: (1) categories smaller than MinSize are folded away,
// bottom-up; (2) the tightness rule; (3) while some item sits deeper than
// MaxDepth categories, the least-tight category above it is folded; (4) the
// MinSize pass once more, for folds that the earlier ones made legal. No fold
// may give a node more than MaxChildren children, dissolve a cluster
// constraint, or dissolve the node lca(a,b) of a triplet ab|c whose c lies
// in the parent (folding that node would make a, b and c siblings, which
// no longer resolves ab|c), so MinSize and MaxDepth are met as far as
// those allow.

// foldTightness: a split must be this many times tighter than its parent's
// to stay a category of its own.
const foldTightness = 1.5

// foldPseudoPairs is the weight, in member pairs, of the parent's ψ in a
// node's shrunk ψ (see gain).
const foldPseudoPairs = 20.0

type foldParams struct {
	minSize, maxChildren, maxDepth int
	ratio                          float64
	// prior: the previous outline's categories, with stability > 0. A
	// binary node that is one of them (up to priorMatch overlap) is exempt
	// from the tightness rule and folded last for depth; any other node
	// must be foldTightness/(1 − stability) times tighter than its parent
	// to stay, so that the previous outline is not refined needlessly.
	prior     [][]int32
	stability float64
	// browsable opens chains and a dominant top level (see foldChains).
	browsable bool
}

// folder is the mutable multiway tree over the binary tree's node ids.
type folder struct {
	t       *Tree
	p       foldParams
	kids    [][]int32
	parent  []int32
	cross   []float64 // weight between the current children
	pairs   []float64 // Σ over pairs of current children of |a|·|b|
	alive   []bool
	pinned  []bool
	rep     disjoint.Sets // folded node → node it went into
	tripsAt [][]int32
	tripTop []int32 // triplet → binary lca(a,b,c)
	keep    []bool  // exempt from the tightness rule
	// aboveKept marks nodes with a previous category below them. Such a
	// node that is not itself a previous category would add a level over
	// the categories editors already know; with stability it is folded
	// whenever the limits allow, so a regenerated or imported taxonomy
	// does not grow new layers on top of its old shelves.
	aboveKept []bool
	// insideKept marks nodes below a previous category: splitting a shelf
	// editors know into new sub-shelves needs markedly more evidence than
	// a first solve does (refineRatio).
	insideKept []bool
}

// fold turns the binary tree t into a multiway taxonomy under p. t must
// satisfy c.
func fold(g *graph.CSR, t *Tree, c *Constraints, p foldParams, progress func(string, int, int)) *Tree {
	if t.N < 3 {
		return copyTree(t)
	}
	progress("fold", 0, 3)
	f := newFolder(g, t, c, p)
	if p.minSize > 1 {
		f.foldSmall()
	}
	progress("fold", 1, 3)
	if p.ratio > 0 {
		f.foldLoose()
	}
	progress("fold", 2, 3)
	if p.maxDepth > 0 {
		f.foldDeep()
	}
	if p.browsable {
		f.foldChains()
	}
	if p.minSize > 1 {
		f.foldSmall() // folds above may have made a blocked one legal
	}
	progress("fold", 3, 3)
	return f.result()
}

func copyTree(t *Tree) *Tree {
	out := NewTree(t.N)
	out.Kids = make([][]int32, len(t.Kids))
	for i, k := range t.Kids {
		out.Kids[i] = append([]int32(nil), k...)
	}
	out.Root = t.Root
	return out
}

func newFolder(g *graph.CSR, t *Tree, c *Constraints, p foldParams) *folder {
	lay := newLayout(t)
	b := bucketEdges(g, t, lay)
	pinned, _ := constraintPins(t, c, lay)
	nodes := t.NumNodes()
	f := &folder{
		t: t, p: p,
		kids:    make([][]int32, nodes),
		parent:  lay.Parent,
		cross:   b.cross,
		pairs:   make([]float64, nodes),
		alive:   make([]bool, nodes),
		pinned:  pinned,
		rep:     disjoint.New(nodes),
		tripsAt: make([][]int32, nodes),
	}
	for v := t.N; v < nodes; v++ {
		if lay.Parent[v] < 0 && int32(v) != t.Root {
			continue
		}
		f.kids[v] = append([]int32(nil), t.Kids[v]...)
		f.alive[v] = true
		sum, sq := 0.0, 0.0
		for _, k := range t.Kids[v] {
			s := float64(lay.Hi[k] - lay.Lo[k])
			sum += s
			sq += float64(s * s)
		}
		f.pairs[v] = (float64(sum*sum) - sq) / 2
	}
	if len(p.prior) > 0 {
		f.keep = priorMatches(t, lay, p.prior)
		f.aboveKept = make([]bool, nodes)
		f.insideKept = make([]bool, nodes)
		post := t.PostOrder()
		for _, v := range post {
			for _, k := range t.Kids[v] {
				if f.keep[k] || f.aboveKept[k] {
					f.aboveKept[v] = true
				}
			}
		}
		for i := len(post) - 1; i >= 0; i-- {
			v := post[i]
			for _, k := range t.Kids[v] {
				f.insideKept[k] = f.keep[v] || f.insideKept[v]
			}
		}
	}
	if c != nil {
		f.tripTop = make([]int32, len(c.Triplets))
		for i, tr := range c.Triplets {
			if tr.A == tr.B {
				f.tripTop[i] = -1
				continue
			}
			x := lay.LCA(tr.A, tr.B)
			pa, pb, pc := lay.Pos[tr.A], lay.Pos[tr.B], lay.Pos[tr.C]
			f.tripTop[i] = lay.LCAPos(min(pa, pb, pc), max(pa, pb, pc))
			f.tripsAt[x] = append(f.tripsAt[x], int32(i))
		}
	}
	return f
}

// psi is the mean similarity across v's children.
func (f *folder) psi(v int32) float64 {
	if f.pairs[v] <= 0 {
		return 0
	}
	return f.cross[v] / f.pairs[v]
}

// gain is how many times tighter u's split is than its parent's, with
// u's ψ shrunk toward the parent's by foldPseudoPairs pairs: the binary
// tree joins the heaviest pairs lowest, so a split over a few pairs looks
// tight by selection alone, and needs more evidence than one over many.
func (f *folder) gain(u int32) float64 {
	pv := f.psi(f.parent[u])
	if pv <= 0 {
		if f.cross[u] <= 0 {
			return 0
		}
		return math.Inf(1)
	}
	shrunk := (f.cross[u] + float64(foldPseudoPairs*pv)) / (f.pairs[u] + foldPseudoPairs)
	return shrunk / pv
}

// legal reports whether folding u into its parent keeps every limit and
// every constraint.
func (f *folder) legal(u int32) bool {
	if !f.alive[u] || f.t.IsLeaf(u) || u == f.t.Root || f.pinned[u] {
		return false
	}
	v := f.parent[u]
	if f.p.maxChildren > 0 && f.subcategories(v)-1+f.subcategories(u) > f.p.maxChildren {
		return false
	}
	for _, ti := range f.tripsAt[u] {
		if f.rep.Find(f.tripTop[ti]) == v {
			return false // lca(a,b) = u and c under v: u must stay
		}
	}
	return true
}

// subcategories counts the internal children of v. max_children bounds
// these only: the items placed directly in a category are its contents, and
// a shelf of forty tools is still one shelf.
func (f *folder) subcategories(v int32) int {
	n := 0
	for _, k := range f.kids[v] {
		if !f.t.IsLeaf(k) {
			n++
		}
	}
	return n
}

// contract folds u into its parent.
func (f *folder) contract(u int32) {
	v := f.parent[u]
	out := make([]int32, 0, len(f.kids[v])-1+len(f.kids[u]))
	for _, k := range f.kids[v] {
		if k == u {
			out = append(out, f.kids[u]...)
		} else {
			out = append(out, k)
		}
	}
	f.kids[v] = out
	for _, k := range f.kids[u] {
		f.parent[k] = v
	}
	f.cross[v] += f.cross[u]
	f.pairs[v] += f.pairs[u]
	f.tripsAt[v] = append(f.tripsAt[v], f.tripsAt[u]...)
	f.tripsAt[u] = nil
	f.kids[u] = nil
	f.alive[u] = false
	f.rep[u] = v
}

// postOrder lists the alive internal nodes, children first: the post-order
// of the tree the current links make, its leaves left out.
func (f *folder) postOrder() []int32 {
	all := (&Tree{N: f.t.N, Kids: f.kids, Root: f.t.Root}).PostOrder()
	out := all[:0]
	for _, v := range all {
		if !f.t.IsLeaf(v) {
			out = append(out, v)
		}
	}
	return out
}

// leafCounts returns the number of leaves under every alive node.
func (f *folder) leafCounts() []int {
	cnt := make([]int, len(f.kids))
	for i := 0; i < f.t.N; i++ {
		cnt[i] = 1
	}
	for _, v := range f.postOrder() {
		for _, k := range f.kids[v] {
			cnt[v] += cnt[k]
		}
	}
	return cnt
}

func (f *folder) foldSmall() {
	cnt := f.leafCounts()
	for _, u := range f.postOrder() {
		if u != f.t.Root && cnt[u] < f.p.minSize && f.legal(u) {
			f.contract(u)
		}
	}
}

// gainHeap orders fold candidates by gain, then node id.
type gainEntry struct {
	rank int8 // lower ranks go first whatever their gain
	gain float64
	node int32
}
type gainHeap []gainEntry

func (h gainHeap) Len() int { return len(h) }
func (h gainHeap) Less(i, j int) bool {
	if h[i].rank != h[j].rank {
		return h[i].rank < h[j].rank
	}
	if h[i].gain != h[j].gain {
		return h[i].gain < h[j].gain
	}
	return h[i].node < h[j].node
}
func (h gainHeap) Swap(i, j int)     { h[i], h[j] = h[j], h[i] }
func (h *gainHeap) Push(x any)       { *h = append(*h, x.(gainEntry)) }
func (h *gainHeap) Pop() any         { old := *h; x := old[len(old)-1]; *h = old[:len(old)-1]; return x }
func (h *gainHeap) push(e gainEntry) { heap.Push(h, e) }

// entry is u's heap entry; with keepLast, nodes reproducing a previous
// category rank after all others.
func (f *folder) entry(u int32, keepLast bool) gainEntry {
	e := gainEntry{gain: f.gain(u), node: u}
	if keepLast && f.keep != nil && f.keep[u] {
		e.rank = 1
	}
	return e
}

// stale reports whether a popped entry's key is out of date; if so it was
// pushed again with its current gain.
func (f *folder) stale(h *gainHeap, e gainEntry) (float64, bool) {
	g := f.gain(e.node)
	if g > e.gain && !(math.IsInf(g, 1) && math.IsInf(e.gain, 1)) {
		e.gain = g
		h.push(e)
		return g, true
	}
	return g, false
}

func (f *folder) candidates(keepLast bool) *gainHeap {
	h := &gainHeap{}
	for _, u := range f.postOrder() {
		if u != f.t.Root {
			*h = append(*h, f.entry(u, keepLast))
		}
	}
	heap.Init(h)
	return h
}

// refineRatio is the tightness a new category inside a previous one
// needs: foldTightness/(1 − Stability)³, 4.4 at the default stability 0.3
// and foldTightness itself without stability.
func (f *folder) refineRatio() float64 {
	s := 1 - math.Min(f.p.stability, 0.9)
	return f.p.ratio / float64(s*s*s)
}

// foldLoose applies the tightness rule, least tight first.
func (f *folder) foldLoose() {
	ratio := f.p.ratio
	if f.keep != nil {
		ratio /= 1 - math.Min(f.p.stability, 0.9)
	}
	h := f.candidates(false)
	for h.Len() > 0 {
		e := heap.Pop(h).(gainEntry)
		u := e.node
		if !f.alive[u] {
			continue
		}
		if f.keep != nil && f.keep[u] {
			continue
		}
		g, st := f.stale(h, e)
		if st || !f.legal(u) {
			continue
		}
		need := ratio
		if f.insideKept != nil && f.insideKept[u] {
			need = f.refineRatio()
		}
		if g >= need && (f.aboveKept == nil || !f.aboveKept[u]) {
			continue
		}
		v := f.parent[u]
		before := f.psi(v)
		moved := f.kids[u]
		f.contract(u)
		// The parent's ψ changed: its own gain, and if it grew, its
		// children's gains fell; the moved grandchildren have a new parent.
		if v != f.t.Root {
			h.push(f.entry(v, false))
		}
		if f.psi(v) > before {
			for _, k := range f.kids[v] {
				if !f.t.IsLeaf(k) {
					h.push(f.entry(k, false))
				}
			}
		} else {
			for _, k := range moved {
				if !f.t.IsLeaf(k) {
					h.push(f.entry(k, false))
				}
			}
		}
	}
}

// foldDeep folds categories on too-deep paths, least tight first, keeping
// the number of categories above each leaf in a segment tree over the
// depth-first leaf positions (a fold lowers it on u's range by one).
func (f *folder) foldDeep() {
	lay := newLayout(f.t)
	depth := make([]int, f.t.N)
	// Categories above each leaf in the current multiway tree.
	walk := func() {
		type frame struct {
			v int32
			d int
		}
		stack := []frame{{f.t.Root, 0}}
		for len(stack) > 0 {
			fr := stack[len(stack)-1]
			stack = stack[:len(stack)-1]
			for _, k := range f.kids[fr.v] {
				if f.t.IsLeaf(k) {
					depth[lay.Pos[k]] = fr.d
				} else {
					stack = append(stack, frame{k, fr.d + 1})
				}
			}
		}
	}
	walk()
	st := newMaxAddTree(depth)
	h := f.candidates(true)
	for h.Len() > 0 {
		e := heap.Pop(h).(gainEntry)
		u := e.node
		if !f.alive[u] {
			continue
		}
		if _, s := f.stale(h, e); s {
			continue
		}
		lo, hi := int(lay.Lo[u]), int(lay.Hi[u])
		if st.max(lo, hi) <= f.p.maxDepth || !f.legal(u) {
			continue
		}
		v := f.parent[u]
		f.contract(u)
		st.add(lo, hi, -1)
		if v != f.t.Root {
			h.push(f.entry(v, true))
		}
		for _, k := range f.kids[v] {
			if !f.t.IsLeaf(k) {
				h.push(f.entry(k, true))
			}
		}
	}
}

// Browsable shape. Sparsest cuts on real similarity graphs often peel a
// few outlying items off a large set, and the tightness rule keeps the
// large remainder, which is far tighter than the loose set it was cut
// from. The result is a caterpillar: a category whose one subcategory
// holds nearly all of its items, inside another such, so that a reader
// opens level after level before reaching any real grouping. Such a level
// groups nothing; the items it sets apart are the outliers of its parent.
const (
	// chainShare: a category whose largest subcategory holds more than
	// this share of its items is a chain, and that subcategory is folded
	// into it (its children become the category's own).
	chainShare = 0.8
	// topShare is the same bound for the top level, where a reader starts:
	// no top-level category holds more than this share of the items while
	// one can be opened.
	topShare = 0.6
	// minTopLevel is the fewest top-level categories worth browsing: while
	// the top level has fewer, its largest category is opened if that
	// gives it more.
	minTopLevel = 3
)

// foldChains opens chains top-down: at each category (the root first) it
// folds the largest subcategory while that holds more than chainShare of
// the category's items (topShare at the root, which also opens its largest
// subcategory while it has fewer than minTopLevel). Folds keep every limit
// and constraint (legal); a previous category kept by stability is never
// opened, so stability still keeps the shelves editors know.
func (f *folder) foldChains() {
	cnt := f.leafCounts()
	stack := []int32{f.t.Root}
	for len(stack) > 0 {
		v := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		share := chainShare
		if v == f.t.Root {
			share = topShare
		}
		for {
			u, subs := f.largestSubcategory(v, cnt)
			if u < 0 || (f.keep != nil && f.keep[u]) {
				break
			}
			big := float64(cnt[u]) > share*float64(cnt[v])
			// Opening a category with fewer than two subcategories would not
			// give the top level more of them.
			few := v == f.t.Root && subs < minTopLevel && f.subcategories(u) >= 2
			if !big && !few {
				break
			}
			if f.legal(u) {
				f.contract(u)
				continue
			}
			// Opening u would give v too many subcategories: lift u's
			// largest subcategory beside it instead, one at a time.
			if !big || !f.promotable(u) {
				break
			}
			w, _ := f.largestSubcategory(u, cnt)
			if w < 0 || (f.p.maxChildren > 0 && subs+1 > f.p.maxChildren) {
				break
			}
			f.promote(w, cnt)
		}
		for _, k := range f.kids[v] {
			if !f.t.IsLeaf(k) {
				stack = append(stack, k)
			}
		}
	}
}

// promotable reports whether a subcategory of u may move up beside u: u
// loses those members, so u must not be a cluster constraint, nor the
// lowest common ancestor of a constrained pair (whose third item could then
// share the new common ancestor), nor a category kept by stability.
func (f *folder) promotable(u int32) bool {
	return f.alive[u] && u != f.t.Root && !f.pinned[u] && len(f.tripsAt[u]) == 0 && (f.keep == nil || !f.keep[u])
}

// promote moves category w from its parent up to its grandparent.
func (f *folder) promote(w int32, cnt []int) {
	u := f.parent[w]
	v := f.parent[u]
	f.kids[u] = slices.DeleteFunc(f.kids[u], func(x int32) bool { return x == w })
	f.kids[v] = append(f.kids[v], w)
	f.parent[w] = v
	cnt[u] -= cnt[w]
}

// largestSubcategory is v's internal child with the most leaves (the
// smallest id among equals), or -1, and the number of internal children.
func (f *folder) largestSubcategory(v int32, cnt []int) (int32, int) {
	best, subs := int32(-1), 0
	for _, k := range f.kids[v] {
		if f.t.IsLeaf(k) {
			continue
		}
		subs++
		if best < 0 || cnt[k] > cnt[best] || (cnt[k] == cnt[best] && k < best) {
			best = k
		}
	}
	return best, subs
}

// result builds the folded tree with fresh internal ids in post-order and
// children sorted by their smallest leaf.
func (f *folder) result() *Tree {
	out := NewTree(f.t.N)
	minLeaf := make([]int32, len(f.kids))
	newID := make([]int32, len(f.kids))
	for i := 0; i < f.t.N; i++ {
		minLeaf[i] = int32(i)
		newID[i] = int32(i)
	}
	for _, v := range f.postOrder() {
		kids := append([]int32(nil), f.kids[v]...)
		sort.Slice(kids, func(i, j int) bool { return minLeaf[kids[i]] < minLeaf[kids[j]] })
		minLeaf[v] = minLeaf[kids[0]]
		for i, k := range kids {
			kids[i] = newID[k]
		}
		newID[v] = out.Add(kids...)
	}
	return out
}
