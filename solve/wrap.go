package solve

import "slices"

// wrap mends the broken set s by adding categories instead of moving
// items. A record category whose items the tree spreads over several
// children of their lowest common category v, with an item the record
// keeps outside the category below another child of v (a star where the
// record wants a split), is mended by joining the children that hold the
// category's items under a new category in v.
//
// A new category only adds structure: every triplet ab|c the tree keeps
// (lca(a,b) strictly below lca(a,c)) and every cluster stays as it is, so
// no other record can break. It re-parents whole categories, though, so
// Repair tries mend's item moves first. wrap reports how many items the
// new categories hold, or false, leaving the tree as it was, when a
// record wants an item out of a child that holds the category's items too
// (a contradiction, which only moving items mends).
func (r *repairer) wrap(s brokenSet) (int, bool) {
	t := r.t.clone()
	tv := walkedTree{t}
	gone := func(x int32) bool { return !t.placed(x) }
	wrapped := 0
	clusters := 0
	for _, rs := range s.records {
		clusters += len(rs.clusters)
	}
	// Each join makes one record category a category of the tree for
	// good, so there are at most as many joins as record categories.
	for range clusters + 1 {
		joined, ok := false, true
		for _, rs := range s.records {
			if r.keeps(tv, rs, gone) {
				continue
			}
			var held int
			if held, ok = joinCluster(t, rs, gone); !ok {
				return 0, false
			}
			if held > 0 {
				wrapped += held
				joined = true
				break
			}
		}
		if !joined {
			break
		}
	}
	for _, rs := range s.records {
		if !r.keeps(tv, rs, gone) {
			return 0, false
		}
	}
	r.t = t
	return wrapped, true
}

// joinCluster joins, for the first category of the record that t spreads
// as a star, the children of the category's lowest common category that
// hold its items, and returns how many items the new category holds: 0
// when no category of the record needed it, false when a category's
// items share a child with an item the record keeps outside it.
func joinCluster(t *mutableTree, rs recordShape, gone func(int32) bool) (int, bool) {
	for _, cl := range rs.clusters {
		var present []int32
		for _, x := range cl {
			if !gone(x) {
				present = append(present, x)
			}
		}
		if len(present) < 2 {
			continue
		}
		v := present[0]
		for _, x := range present[1:] {
			v = t.lca(v, x)
		}
		var kids []int32 // the children of v that hold the category's items
		for _, x := range present {
			if k := childToward(t, v, x); !slices.Contains(kids, k) {
				kids = append(kids, k)
			}
		}
		outsideBelow := false
		outside, outsideGone := rs.outside(cl, gone)
		for _, y := range outside {
			if !isBelow(t, v, y) {
				continue
			}
			if slices.Contains(kids, childToward(t, v, y)) {
				return 0, false
			}
			outsideBelow = true
		}
		if !outsideBelow && !(v == t.root && outsideGone) {
			continue // the category is already one of the tree's
		}
		if len(kids) < 2 || len(kids) == len(t.kids[v]) {
			return 0, false
		}
		slices.Sort(kids)
		t.kids[v] = slices.DeleteFunc(t.kids[v], func(k int32) bool { return slices.Contains(kids, k) })
		w := t.newNode(kids)
		t.kids[v] = append(t.kids[v], w)
		t.parent[w] = v
		return len(t.leavesUnder(w)), true
	}
	return 0, true
}

// childToward is the child of v on the path down to x, a node below v.
func childToward(t *mutableTree, v, x int32) int32 {
	for t.parent[x] != v {
		x = t.parent[x]
	}
	return x
}

// isBelow reports whether x lies strictly below v.
func isBelow(t *mutableTree, v, x int32) bool {
	for x = t.parent[x]; x >= 0; x = t.parent[x] {
		if x == v {
			return true
		}
	}
	return false
}
