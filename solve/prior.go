package solve

import (
	"math"
)

// priorMatch is the Jaccard overlap at which a node counts as a previous
// category: the node is the LCA of the category's members, and at least
// this share of its leaves were in that category.
const priorMatch = 0.8

// priorMatches marks the binary nodes that reproduce a previous category.
func priorMatches(t *Tree, lay *layout, prior [][]int32) []bool {
	keep := make([]bool, t.NumNodes())
	for _, cat := range prior {
		lo, hi, cnt := int32(math.MaxInt32), int32(-1), 0
		seen := map[int32]bool{}
		for _, l := range cat {
			if l < 0 || int(l) >= t.N || seen[l] {
				continue
			}
			seen[l] = true
			cnt++
			lo, hi = min(lo, lay.Pos[l]), max(hi, lay.Pos[l])
		}
		if cnt < 2 {
			continue
		}
		v := lay.LCAPos(lo, hi)
		if float64(cnt) >= priorMatch*float64(lay.Hi[v]-lay.Lo[v]) {
			keep[v] = true
		}
	}
	return keep
}

func priorForFold(opt Options) [][]int32 {
	if opt.Stability > 0 {
		return opt.Prior
	}
	return nil
}
