package solve

import (
	"slices"
)

// Re-solving a region around the categories a record does not reach.
//
// When no single place keeps the records of a unit, Repair re-solves the
// subtree where those records' items meet (resolveRegion). Near the root
// that subtree is most of the taxonomy, and a free re-solve of it moves
// a hundred items to honour one answer. But the records only need the
// items they name to move: every category of the region that holds none
// of those items (a block) can stay exactly as it is, and the re-solve
// only decides where the named items go and how the blocks group above
// them. So the region is solved first with each block's categories as
// group constraints (Cluster), which the solver keeps as categories;
// only if that is inconsistent with the records does the region get a
// free re-solve, as before.

// solveAroundBlocks solves the region's subproblem with its blocks kept
// (see above), or without them when they conflict with the records.
func (r *repairer) solveAroundBlocks(region int32, items []int32, u unit, sub subproblem, opt Options) (*Result, error) {
	blocks := r.blocks(region, items, u)
	if len(blocks) > 0 {
		c := &Constraints{Triplets: sub.c.Triplets, Clusters: append(slices.Clip(sub.c.Clusters), blocks...), SideBySide: sub.c.SideBySide}
		if res, err := Solve(sub.g, c, opt); err == nil {
			return res, nil
		}
	}
	return Solve(sub.g, sub.c, opt)
}

// blockRecord marks the group constraints that blocks add; they name no
// record of the repository.
const blockRecord = -1

// blocks lists, in the region's local numbering (items is sorted), every
// category below region with two or more items and none of the items
// the unit's records name.
func (r *repairer) blocks(region int32, items []int32, u unit) []Cluster {
	named := map[int32]bool{}
	for _, x := range u.items {
		named[x] = true
		for _, k := range r.touch[x] {
			for _, y := range r.constraintItems(k) {
				named[y] = true
			}
		}
	}
	local := func(x int32) int32 {
		i, _ := slices.BinarySearch(items, x)
		return int32(i)
	}
	var out []Cluster
	var walk func(v int32) (leaves []int32, clean bool)
	walk = func(v int32) ([]int32, bool) {
		if r.t.isLeaf(v) {
			return []int32{v}, !named[v]
		}
		var leaves []int32
		clean := true
		for _, k := range r.t.kids[v] {
			l, c := walk(k)
			leaves = append(leaves, l...)
			clean = clean && c
		}
		if clean && v != region && len(leaves) > 1 {
			ls := make([]int32, len(leaves))
			for i, x := range leaves {
				ls[i] = local(x)
			}
			slices.Sort(ls)
			out = append(out, Cluster{Leaves: ls, Record: blockRecord})
		}
		return leaves, clean
	}
	walk(region)
	return out
}
