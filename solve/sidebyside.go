package solve

import (
	"maps"
	"slices"
)

// SideBySide is a reviewer's "these meet in one category": the items of
// Branches meet at one node, so that two items of different branches have
// the same lowest common ancestor as all of them. It is what a category
// of an answered review packet says about its direct items and
// subcategories (each a branch) when it has three or more: for any three
// items from three branches, no pair is closer than the third. Triplets
// cannot state this (a triplet resolves, a side-by-side says "unresolved"),
// and in general keeping such statements is NP-hard together with
// triplets (forbidden triples: D. Bryant, PhD thesis, Canterbury 1997), so
// they are kept after solving, by KeepSideBySide, as far as the records
// allow.
type SideBySide struct {
	Branches [][]int32
	Record   int
}

// holdsSideBySide reports whether s holds in t: the branches' items that
// t holds, grouped by the child of their common ancestor w that holds
// them, come from one branch per child (items directly in w count as
// their own child).
func holdsSideBySide(t *mutableTree, s SideBySide) bool {
	_, _, clash := sideBySideClash(t, s)
	return !clash
}

// sideBySideClash finds w, the common ancestor of the branches' items, and
// for each child subtree of w the branches it holds items of. clash
// reports whether any holds two or more.
func sideBySideClash(t *mutableTree, s SideBySide) (w int32, byChild map[int32][]int, clash bool) {
	var items []int32
	for _, b := range s.Branches {
		for _, x := range b {
			if t.placed(x) {
				items = append(items, x)
			}
		}
	}
	if len(items) < 3 {
		return -1, nil, false
	}
	w = items[0]
	for _, x := range items[1:] {
		w = t.lca(w, x)
	}
	byChild = map[int32][]int{}
	for bi, b := range s.Branches {
		for _, x := range b {
			if !t.placed(x) {
				continue
			}
			c := x
			for t.parent[c] != w {
				c = t.parent[c]
			}
			if !slices.Contains(byChild[c], bi) {
				byChild[c] = append(byChild[c], bi)
				clash = clash || len(byChild[c]) > 1
			}
		}
	}
	return w, byChild, clash
}

// KeepSideBySide changes t, a solved multiway tree that keeps every record
// of c, as little as it can so that each of c's side-by-side statements
// holds, in record order: where a child subtree of the branches' common
// ancestor w holds items of several branches, the branch with the most
// items there stays and the items of the others move up into w, keeping
// their arrangement (the tree restricted to them, as one new category
// when there are several). No other item moves. A statement whose move
// would break a triplet or group record, or that still does not hold
// after it, is left as t has it and listed in notKept (record indices).
// When nothing moves, kept is t itself.
func KeepSideBySide(t *Tree, c *Constraints) (kept *Tree, notKept []int) {
	if c == nil || len(c.SideBySide) == 0 {
		return t, nil
	}
	mt := newMutableTree(t)
	changed := false
	// A move for one statement can part items another one had to part,
	// or undo its work: passes repeat until one moves nothing, so that
	// solving the result again changes nothing. Each pass only moves items
	// up, toward the root, so few passes are needed; the bound is a
	// guard.
	for pass := 0; pass < maxSideBySidePasses; pass++ {
		moved := false
		notKept = notKept[:0]
		for _, s := range c.SideBySide {
			w, byChild, clash := sideBySideClash(mt, s)
			if !clash {
				continue
			}
			trial := mt.clone()
			liftSideBySide(trial, s, w, byChild)
			if holdsSideBySide(trial, s) && len(Satisfies(trial.compact(), c)) == 0 {
				mt, moved = trial, true
				continue
			}
			notKept = append(notKept, s.Record)
		}
		if !moved {
			break
		}
		changed = true
	}
	if !changed {
		return t, notKept
	}
	return mt.compact(), notKept
}

// maxSideBySidePasses bounds KeepSideBySide's passes.
const maxSideBySidePasses = 16

// liftSideBySide moves, in every child subtree of the common ancestor w
// that holds items of several branches, the items of all but the largest
// branch up into w.
func liftSideBySide(t *mutableTree, s SideBySide, w int32, byChild map[int32][]int) {
	for _, ch := range slices.Sorted(maps.Keys(byChild)) { // map order must not reach the tree
		branches := byChild[ch]
		if len(branches) < 2 {
			continue
		}
		under := func(bi int) []int32 {
			var out []int32
			for _, x := range s.Branches[bi] {
				if t.placed(x) && t.isUnder(x, ch) {
					out = append(out, x)
				}
			}
			return out
		}
		stay := branches[0]
		for _, bi := range branches[1:] {
			if len(under(bi)) > len(under(stay)) {
				stay = bi
			}
		}
		// The categories the items leave give way to a single child only
		// once every branch is lifted: ch itself may be one of them, and
		// the branches after it are found below ch.
		var left []int32
		for _, bi := range branches {
			if bi == stay {
				continue
			}
			items := under(bi)
			if len(items) == 0 {
				continue
			}
			shape := t.restrictedShape(ch, items)
			for _, x := range items {
				left = append(left, t.parent[x])
				t.detach(x)
			}
			t.attach(t.materialize(shape), spot{w, false})
		}
		for _, p := range left {
			t.spliceSingle(p)
		}
	}
}

// spliceSingle replaces v, when it is a category left with one child
// below the root, by that child.
func (t *mutableTree) spliceSingle(v int32) {
	if v == t.root || !t.alive(v) || len(t.kids[v]) != 1 {
		return
	}
	p, only := t.parent[v], t.kids[v][0]
	i := slices.Index(t.kids[p], v)
	t.kids[p][i] = only
	t.parent[only] = p
	t.kids[v], t.parent[v] = nil, -1
}

// isUnder reports whether x lies in the subtree of v.
func (t *mutableTree) isUnder(x, v int32) bool {
	for ; x >= 0; x = t.parent[x] {
		if x == v {
			return true
		}
	}
	return false
}

// shapeNode is a detached description of a subtree: a leaf, or kids.
type shapeNode struct {
	leaf int32 // -1 for an inner node
	kids []shapeNode
}

// restrictedShape describes the subtree of v restricted to items (all
// under v), with single-child nodes skipped.
func (t *mutableTree) restrictedShape(v int32, items []int32) shapeNode {
	keep := map[int32]bool{}
	for _, x := range items {
		keep[x] = true
	}
	var build func(u int32) (shapeNode, bool)
	build = func(u int32) (shapeNode, bool) {
		if t.isLeaf(u) {
			return shapeNode{leaf: u}, keep[u]
		}
		var kids []shapeNode
		for _, k := range t.kids[u] {
			if r, ok := build(k); ok {
				kids = append(kids, r)
			}
		}
		switch len(kids) {
		case 0:
			return shapeNode{leaf: -1}, false
		case 1:
			return kids[0], true
		}
		return shapeNode{leaf: -1, kids: kids}, true
	}
	sh, _ := build(v)
	return sh
}

// materialize makes the described subtree out of detached leaves and
// returns its root.
func (t *mutableTree) materialize(sh shapeNode) int32 {
	if sh.leaf >= 0 {
		return sh.leaf
	}
	kids := make([]int32, len(sh.kids))
	for i, k := range sh.kids {
		kids[i] = t.materialize(k)
	}
	return t.newNode(kids)
}
