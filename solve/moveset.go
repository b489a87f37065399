package solve

import (
	"cmp"
	"fmt"
	"maps"
	"math"
	"slices"

	"github.com/ramify-tax/ramify/internal/disjoint"
)

// Which items a broken record makes move.
//
// A record that the tree breaks is mended by moving some of the items it
// names; moving all of them, as a naive repair does, throws away where
// the others were and lets a greedy placement wander. Each triplet record
// or shape means a small tree over its items (BUILD of its triplets gives
// it back: Aho et al. 1981), and the current tree keeps the record among
// the items it does not move exactly when, restricted to those items, it
// holds every category of the record's tree as a category. So Repair
// looks, for each set of broken records that share items, for the
// smallest set of items whose removal leaves every one of them kept, and
// puts those items back where every record holds. Such a place always
// exists for one record (below the lowest category that holds the
// record-category the item belongs to, or beside it when that category is
// a single child); with several records it is tried. Among the sets of the
// smallest size it keeps the one whose placement creates the fewest
// categories, then raises Dasgupta's cost least: the item the
// similarities least want where it is moves. Only when no set works are
// all the items of the broken records taken out, as before.

const (
	// maxMoveItems bounds the items of one set of broken records for
	// which moves are searched. A record of linked answers holds every
	// item placed under two names, often a hundred or more, and is
	// usually broken by one or two newly named items; below this bound
	// moving those is tried before the subtree where all its items meet
	// is re-solved. The search itself stays bounded by maxMoveChecks and
	// maxMoveTrials, whatever the size. (On the dev sets' review loop,
	// 40 here left "F1 never falls" at 82.5% of rounds; 400 gives 91.2%.)
	maxMoveItems = 400
	// maxMoveChecks bounds the item sets whose removal is checked for one
	// set of broken records.
	maxMoveChecks = 20000
	// maxMoveTrials bounds the item sets whose placement is tried for
	// one set of broken records, so that a large tree stays fast.
	maxMoveTrials = 24
)

// recordShape is what one triplet record or shape says: its items and
// the categories of its tree (each as sorted items).
type recordShape struct {
	record   int
	items    []int32 // sorted
	clusters [][]int32
}

// outside lists the record's items outside its category cl that are not
// gone, and reports whether some outside item is gone.
func (rs recordShape) outside(cl []int32, gone func(int32) bool) (placed []int32, someGone bool) {
	for _, y := range rs.items {
		if _, in := slices.BinarySearch(cl, y); in {
			continue
		}
		if gone(y) {
			someGone = true
			continue
		}
		placed = append(placed, y)
	}
	return placed, someGone
}

// brokenSet is a set of broken records that share placed items, and
// those items, sorted.
type brokenSet struct {
	records []recordShape
	items   []int32
}

// brokenRecords lists, grouped by shared items, the triplet records and
// shapes that the current tree does not keep.
func (r *repairer) brokenRecords() []brokenSet {
	ix := r.t.shapeIndex(r.keys, r.c)
	gone := func(x int32) bool { return !ix.inMain(r.t, x) }
	var broken []recordShape
	for _, rec := range r.tripletRecords() {
		rs, ok := r.recordShape(r.recordTriplets(rec))
		if ok && !r.keeps(indexedTree{r.t, ix}, rs, gone) {
			broken = append(broken, rs)
		}
	}
	// Group records that share a placed item.
	owner := map[int32]int{}
	sets := disjoint.New(len(broken))
	for i, rs := range broken {
		for _, x := range rs.items {
			if gone(x) {
				continue
			}
			if j, ok := owner[x]; ok {
				sets.Union(int32(i), int32(j))
			} else {
				owner[x] = i
			}
		}
	}
	var out []brokenSet
	at := map[int32]int{}
	for i, rs := range broken {
		root := sets.Find(int32(i))
		j, ok := at[root]
		if !ok {
			j = len(out)
			at[root] = j
			out = append(out, brokenSet{})
		}
		out[j].records = append(out[j].records, rs)
		for _, x := range rs.items {
			if !gone(x) && !slices.Contains(out[j].items, x) {
				out[j].items = append(out[j].items, x)
			}
		}
	}
	for i := range out {
		slices.Sort(out[i].items)
	}
	return out
}

// recordShape rebuilds the tree of one record from its triplets. It
// reports false for a record whose triplets BUILD cannot join (never for
// a consistent set).
func (r *repairer) recordShape(triplets []int) (recordShape, bool) {
	var all []int32
	for _, k := range triplets {
		all = append(all, uniqueTriple(r.c.Triplets[k])...)
	}
	slices.Sort(all)
	all = slices.Compact(all)
	local := make(map[int32]int32, len(all))
	for i, x := range all {
		local[x] = int32(i)
	}
	sub := &Constraints{}
	for _, k := range triplets {
		t := r.c.Triplets[k]
		sub.Triplets = append(sub.Triplets, Triplet{A: local[t.A], B: local[t.B], C: local[t.C]})
	}
	tree, ok := Build(len(all), sub)
	if !ok {
		return recordShape{}, false
	}
	rs := recordShape{record: r.c.Triplets[triplets[0]].Record, items: all}
	for _, v := range tree.PostOrder() {
		if tree.IsLeaf(v) || v == tree.Root {
			continue
		}
		var cl []int32
		for _, l := range tree.Leaves(v) {
			cl = append(cl, all[l])
		}
		slices.Sort(cl)
		rs.clusters = append(rs.clusters, cl)
	}
	return rs, true
}

// keeps reports whether the tree keeps the record among its items that
// are not gone (taken out, or still to be placed); see breach.
func (r *repairer) keeps(tv treeView, rs recordShape, gone func(int32) bool) bool {
	_, broken := r.breach(tv, rs, gone)
	return !broken
}

// breach finds a triplet of the record that the tree breaks among the
// items not gone, or reports false when there is none. The tree keeps the
// record when every category of the record's tree, over the items left,
// is the set of those items below their lowest common category, and that
// category is not the root while an item outside it is gone (it could not
// be put back outside the root). The triplet returned is ab|y with a, b
// inside such a category and meeting at its lowest common category, and y
// an item outside it found below that category; or with y gone, when that
// category is the root (then only a or b can move, so y is -1).
func (r *repairer) breach(tv treeView, rs recordShape, gone func(int32) bool) ([3]int32, bool) {
	for _, cl := range rs.clusters {
		lca, first, last, inside := int32(-1), int32(-1), int32(-1), 0
		for _, x := range cl {
			if gone(x) {
				continue
			}
			inside++
			if lca < 0 {
				lca, first = x, x
				continue
			}
			if next := tv.lca(lca, x); next != lca {
				lca, last = next, x
			}
		}
		if inside < 2 {
			continue
		}
		outside, outsideGone := rs.outside(cl, gone)
		for _, y := range outside {
			if tv.isAncestor(lca, y) {
				return [3]int32{first, last, y}, true
			}
		}
		if lca == tv.root() && outsideGone {
			return [3]int32{first, last, -1}, true
		}
	}
	return [3]int32{}, false
}

// mend moves the fewest items that mend the broken set s and says how
// many it moved, or reports false (leaving the tree as it was) when no
// tried set of items can be placed back with every record holding.
//
// The sets are found as hitting sets are (a bounded search tree): a
// triplet the tree breaks needs one of its items moved, so the search
// branches on each of them, to the size being tried, and every leaf that
// leaves no triplet broken is a candidate.
func (r *repairer) mend(s brokenSet) (int, bool) {
	if len(s.items) > maxMoveItems {
		return 0, false
	}
	ix := r.t.shapeIndex(r.keys, r.c)
	tv := indexedTree{r.t, ix}
	breachOf := func(moved []int32) ([3]int32, bool) {
		gone := func(x int32) bool { return !ix.inMain(r.t, x) || slices.Contains(moved, x) }
		for _, rs := range s.records {
			if w, ok := r.breach(tv, rs, gone); ok {
				return w, true
			}
		}
		return [3]int32{}, false
	}
	checks, trials := 0, 0
	for size := 1; size < len(s.items) && checks < maxMoveChecks && trials < maxMoveTrials; size++ {
		var sets [][]int32
		seen := map[string]bool{}
		var search func(moved []int32)
		search = func(moved []int32) {
			if checks >= maxMoveChecks || len(sets) >= maxMoveTrials-trials {
				return
			}
			checks++
			w, broken := breachOf(moved)
			if !broken {
				key := slices.Sorted(slices.Values(moved))
				if k := fmt.Sprint(key); !seen[k] {
					seen[k] = true
					sets = append(sets, key)
				}
				return
			}
			if len(moved) == size {
				return
			}
			for _, x := range w {
				if x >= 0 && !r.pinned[x] {
					search(append(slices.Clip(moved), x))
				}
			}
		}
		search(nil)
		var best *mutableTree
		bestCost, bestNew := math.Inf(1), math.MaxInt
		for _, h := range sets {
			trials++
			t, cost, created, ok := r.tryMove(h, s.records)
			if ok && (created < bestNew || created == bestNew && cost < bestCost-1e-9) {
				best, bestCost, bestNew = t, cost, created
			}
		}
		if best != nil {
			r.t = best
			return size, true
		}
	}
	return 0, false
}

// mendOneByOne mends the records of a broken set one at a time, when no
// move mends them all at once: the joint search branches three ways on
// every item to move, so a set that needs ten or more moves (a handful
// of answers linked by their names, each naming a few new items) is out
// of its reach, while each record alone needs only two or three. Each
// record gets the fewest moves that keep it and every record the tree
// keeps now; records of the set still broken are not held back (they
// are mended after it). It returns the records it could not mend, with
// their placed items, and how many items it moved. Smaller records go
// first: they need fewer moves and pin down more of the tree.
func (r *repairer) mendOneByOne(s brokenSet) (brokenSet, int) {
	if len(s.records) < 2 {
		return s, 0
	}
	order := slices.Clone(s.records)
	slices.SortStableFunc(order, func(a, b recordShape) int { return cmp.Compare(len(a.items), len(b.items)) })
	moved := 0
	var rest brokenSet
	for i, rs := range order {
		gone := func(x int32) bool { return !r.t.placed(x) }
		tv := walkedTree{r.t}
		if r.keeps(tv, rs, gone) {
			continue
		}
		r.unheld = map[int]bool{}
		for _, other := range order[i+1:] {
			if !r.keeps(tv, other, gone) {
				r.unheld[other.record] = true
			}
		}
		for _, other := range rest.records {
			r.unheld[other.record] = true
		}
		var items []int32
		for _, x := range rs.items {
			if r.t.placed(x) {
				items = append(items, x)
			}
		}
		n, ok := r.mend(brokenSet{records: []recordShape{rs}, items: items})
		r.unheld = nil
		if ok {
			moved += n
			continue
		}
		rest.records = append(rest.records, rs)
		for _, x := range items {
			if !slices.Contains(rest.items, x) {
				rest.items = append(rest.items, x)
			}
		}
	}
	slices.Sort(rest.items)
	return rest, moved
}

// widen joins the broken set with the records that share items with it,
// nearest first and as far as maxMoveItems allows, into one record: BUILD of all their
// triplets. Moving items so that the tree keeps that joint tree is more
// than the records need, but a place for each moved item then always
// exists, where records taken one at a time can each want the item
// somewhere the others forbid.
func (r *repairer) widen(s brokenSet) (brokenSet, bool) {
	records := map[int]bool{}
	for _, rs := range s.records {
		records[rs.record] = true
	}
	items := slices.Clone(s.items)
	for i := 0; i < len(items); i++ {
		for _, k := range r.touch[items[i]] {
			if k < 0 || records[r.c.Triplets[k].Record] {
				continue
			}
			rec := r.c.Triplets[k].Record
			var more []int32
			for _, t := range r.recordTriplets(rec) {
				for _, y := range uniqueTriple(r.c.Triplets[t]) {
					if r.t.placed(y) && !slices.Contains(items, y) && !slices.Contains(more, y) {
						more = append(more, y)
					}
				}
			}
			if len(items)+len(more) > maxMoveItems {
				continue // records nearer the broken ones come first
			}
			records[rec] = true
			items = append(items, more...)
		}
	}
	var triplets []int
	for _, rec := range slices.Sorted(maps.Keys(records)) {
		triplets = append(triplets, r.recordTriplets(rec)...)
	}
	rs, ok := r.recordShape(triplets)
	if !ok {
		return brokenSet{}, false
	}
	rs.record = -1
	slices.Sort(items)
	return brokenSet{records: []recordShape{rs}, items: items}, true
}

// tryMove takes the items h out of a copy of the tree and puts them back,
// one at a time, at their allowed places of least cost. It returns the
// copy, the rise of Dasgupta's cost the move makes (the cost at the new
// places less that at the old ones, both against the tree without h) and
// the categories it had to create, or false when an item finds no
// allowed place. A move that creates a category also moves what it wraps,
// so mend prefers moves that create none.
func (r *repairer) tryMove(h []int32, records []recordShape) (*mutableTree, float64, int, bool) {
	saved := r.t
	defer func() { r.t = saved }()
	r.t = saved.clone()
	old := make([]int32, len(h))
	for i, x := range h {
		old[i] = r.t.parent[x]
	}
	for _, x := range h {
		r.t.detach(x)
	}
	ix := r.t.index(r.g, r.keys, r.c)
	rise, created := 0.0, 0
	for i, x := range h {
		if p := old[i]; r.t.alive(p) {
			rise -= r.cost(ix, unit{items: []int32{x}, root: x}, spot{p, false})
		}
	}
	order := slices.Clone(h)
	slices.SortFunc(order, func(a, b int32) int {
		return cmp.Or(cmp.Compare(len(r.touch[a]), len(r.touch[b])), cmp.Compare(a, b))
	})
	shapes := r.shapesAround(h, records)
	gone := func(x int32) bool { return !r.t.placed(x) }
	for i, x := range order {
		if i > 0 { // the item placed before changed the tree
			ix = r.t.index(r.g, r.keys, r.c)
		}
		cost, beside, placed := r.placeKeeping(x, ix, shapes, gone)
		if !placed {
			return nil, 0, 0, false
		}
		if beside {
			created++
		}
		rise += cost
	}
	return r.t, rise, created, true
}

// shapesAround returns records and the shapes of every other triplet
// record that names an item of h. Records are checked whole at each step
// of a move, not only through their triplets: a shape's triplets say
// everything only once all its items are placed, and a step that keeps
// them but not the shape would leave a later item of the shape with no
// place.
func (r *repairer) shapesAround(h []int32, records []recordShape) []recordShape {
	shapes := slices.Clone(records)
	for _, x := range h {
		for _, k := range r.touch[x] {
			if k < 0 {
				continue
			}
			rec := r.c.Triplets[k].Record
			if r.unheld[rec] {
				continue // broken still, mended after this move
			}
			if !slices.ContainsFunc(shapes, func(rs recordShape) bool { return rs.record == rec }) {
				if rs, ok := r.recordShape(r.recordTriplets(rec)); ok {
					shapes = append(shapes, rs)
				}
			}
		}
	}
	return shapes
}

// placeKeeping attaches item x at its cheapest allowed place that keeps
// every shape (places in existing categories before new ones beside a
// node) and returns that place's cost and whether it made a category, or
// false when no place keeps them. ix indexes the tree as it is.
func (r *repairer) placeKeeping(x int32, ix *treeIndex, shapes []recordShape, gone func(int32) bool) (float64, bool, bool) {
	u := unit{items: []int32{x}, root: x}
	type scored struct {
		s    spot
		cost float64
	}
	var ok []scored
	var near []int32
	for _, rs := range shapes {
		if _, in := slices.BinarySearch(rs.items, x); in {
			near = append(near, rs.items...)
		}
	}
	for _, sp := range r.candidatesNear(ix, u, near) {
		if r.allowed(ix, u, sp) {
			ok = append(ok, scored{sp, r.cost(ix, u, sp)})
		}
	}
	slices.SortStableFunc(ok, func(a, b scored) int {
		if a.s.beside != b.s.beside {
			if a.s.beside {
				return 1
			}
			return -1
		}
		return cmp.Compare(a.cost, b.cost)
	})
	for _, c := range ok {
		r.t.attach(x, c.s)
		if r.keepsAll(shapes, gone) {
			return c.cost, c.s.beside, true
		}
		r.t.unattach(x, c.s)
	}
	return 0, false, false
}

func (r *repairer) keepsAll(shapes []recordShape, gone func(int32) bool) bool {
	for _, rs := range shapes {
		if !r.keeps(walkedTree{r.t}, rs, gone) {
			return false
		}
	}
	return true
}

// clone copies the tree, so that a trial placement can be thrown away.
func (t *mutableTree) clone() *mutableTree {
	c := &mutableTree{n: t.n, kids: make([][]int32, len(t.kids)), parent: slices.Clone(t.parent), root: t.root}
	for v, ks := range t.kids {
		c.kids[v] = slices.Clone(ks)
	}
	return c
}

// tripletRecords lists the records that have triplets, in order of their
// first triplet; recordTriplets lists a record's triplets.
func (r *repairer) tripletRecords() []int {
	r.indexRecords()
	return r.recordOrder
}

func (r *repairer) recordTriplets(rec int) []int {
	r.indexRecords()
	return r.byRecord[rec]
}

func (r *repairer) indexRecords() {
	if r.byRecord != nil {
		return
	}
	r.byRecord = map[int][]int{}
	for k, t := range r.c.Triplets {
		if _, ok := r.byRecord[t.Record]; !ok {
			r.recordOrder = append(r.recordOrder, t.Record)
		}
		r.byRecord[t.Record] = append(r.byRecord[t.Record], k)
	}
}

// unattach undoes attach(u, s) while nothing else changed.
func (t *mutableTree) unattach(u int32, s spot) {
	if !s.beside {
		t.detach(u)
		return
	}
	w := t.parent[u]
	p := t.parent[w]
	i := slices.Index(t.kids[p], w)
	t.kids[p][i] = s.v
	t.parent[s.v] = p
	t.parent[u], t.parent[w] = -1, -1
	t.kids[w] = nil
}
