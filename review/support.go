package review

import (
	"math"
	"slices"
	"sort"

	"github.com/ramify-tax/ramify/solve"
)

// NearMatch is the least Jaccard overlap |C ∩ C'| / |C ∪ C'| at which a
// cluster C' of a committee tree counts as holding the category C. At 0.9
// a category of fewer than ten items must be matched exactly, and one of
// twenty may differ by two items.
const NearMatch = 0.9

// companionSample bounds how many of an item's companions in a committee
// tree are looked up to place them in the tree being assessed.
const companionSample = 16

// Assessment is what the committee says about one tree.
type Assessment struct {
	// Support[v], for an internal node v of the tree, is the share of
	// committee trees that hold L(v), up to NearMatch, as a cluster of
	// their binary hierarchy — whether the data and the records group
	// these items together at some level, however the tree was folded
	// into categories. Leaves and the root hold 0.
	Support []float64
	// Unsettled[i] is how far the committee would move item i, as a share
	// of all items: for each committee tree, take the item's companions
	// there (the other items of its category) and find the smallest
	// category of the assessed tree that holds the item and at least half
	// of them; its size less the size of the item's own category, over n,
	// averaged over the committee. 0 means every committee tree keeps the
	// item's company inside its category; an item the committee would
	// move to the other side of the top split scores about one half.
	Unsettled []float64
}

// Assess measures tree t, over the committee's items, against the
// committee. Support costs O(m log m) per category of m items and
// committee tree, plus the near matches tried (see holds); Unsettled at
// most companionSample lookups per item and tree.
func (c *Committee) Assess(t *solve.Tree) *Assessment {
	nodes := t.NumNodes()
	a := &Assessment{Support: make([]float64, nodes), Unsettled: make([]float64, t.N)}
	tx := newLeafIndex(t)
	internal := internalNodes(t)
	held := make([]int, nodes)
	var pos []int32
	for _, ix := range c.binary {
		for _, u := range internal {
			if u == t.Root {
				continue
			}
			pos = pos[:0]
			for _, l := range tx.leaves(u) {
				pos = append(pos, ix.pos[l])
			}
			slices.Sort(pos)
			if ix.holds(pos) {
				held[u]++
			}
		}
	}
	moved := make([]float64, t.N)
	var sizes []int32
	for _, ix := range c.index {
		for x := int32(0); int(x) < t.N; x++ {
			own := tx.parent[x]
			p := ix.parent[x]
			if own < 0 || p < 0 || tx.pos[x] < 0 || ix.pos[x] < 0 {
				continue
			}
			sizes = sizes[:0]
			mates := ix.leaves(p)
			step := max(1, len(mates)/companionSample)
			for k := 0; k < len(mates); k += step {
				if y := mates[k]; y != x {
					sizes = append(sizes, tx.size[tx.lca(x, y)])
				}
			}
			if len(sizes) == 0 {
				continue
			}
			slices.Sort(sizes)
			half := sizes[(len(sizes)-1)/2]
			moved[x] += float64(half-tx.size[own]) / float64(t.N)
		}
	}
	trees := float64(len(c.index))
	for _, u := range internal {
		if u != t.Root {
			a.Support[u] = float64(held[u]) / float64(len(c.binary))
		}
	}
	for i := range a.Unsettled {
		a.Unsettled[i] = moved[i] / trees
	}
	return a
}

// holds reports whether the tree has a node whose leaves overlap the set
// at the given positions (sorted, all reached by the tree) with Jaccard
// at least NearMatch. Such a node holds at least k = ⌈NearMatch·m⌉ of the
// m positions, so it covers a run of k consecutive ones, and it has at
// most m/NearMatch leaves. For each run the candidates are the run's
// lowest common ancestor and its ancestors up to that size.
func (x *leafIndex) holds(pos []int32) bool {
	m := len(pos)
	if m < 2 {
		return false
	}
	k := int(math.Ceil(NearMatch * float64(m)))
	limit := int32(float64(m) / NearMatch)
	for i := 0; i+k <= m; i++ {
		v := x.lca(x.leafAt[pos[i]], x.leafAt[pos[i+k-1]])
		for ; v >= 0 && x.size[v] <= limit; v = x.parent[v] {
			lo, hi := x.lo[v], x.lo[v]+x.size[v]
			inside := int32(sort.Search(m, func(j int) bool { return pos[j] >= hi }) - sort.Search(m, func(j int) bool { return pos[j] >= lo }))
			if jaccard(inside, int32(m), x.size[v]) >= NearMatch {
				return true
			}
		}
	}
	return false
}

// jaccard of a set of size sa and one of size sb sharing inter members.
func jaccard(inter, sa, sb int32) float64 {
	union := sa + sb - inter
	if union == 0 {
		return 0
	}
	return float64(inter) / float64(union)
}

// internalNodes lists the internal nodes reachable from t's root in
// post-order.
func internalNodes(t *solve.Tree) []int32 {
	var out []int32
	if t.N == 0 {
		return nil
	}
	for _, v := range t.PostOrder() {
		if !t.IsLeaf(v) {
			out = append(out, v)
		}
	}
	return out
}

// ItemUncertainty is the committee's per-item uncertainty about tree t:
// how far the committee would move each item (Assessment.Unsettled).
// Review packets start from the items that score highest.
func ItemUncertainty(c *Committee, t *solve.Tree) []float64 {
	return c.Assess(t).Unsettled
}
