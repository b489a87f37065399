package main

import (
	"github.com/ramify-tax/ramify/diff"
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/solve/regen"
)

// Scores compare a taxonomy with the reference over the same items.
type Scores struct {
	Precision, Recall, F1 float64 // triplet scores, exact (diff.TripletScores)
	ClusterF1             float64 // size-weighted best-match F1 per reference category
	TopShare              float64 // largest top-level category's share of the items
	TopLevel              int     // entries (categories and items) at the top level
	Chains                int     // categories whose largest subcategory holds > 80% of its items
	Depth                 int
}

// chainShare is the share of a category's items above which its largest
// subcategory makes it a chain: a level a reader opens only to open the
// one entry inside.
const chainShare = 0.8

// score measures tree (an outline) against ref; index maps item ids to
// 0..n-1.
func score(tree, ref *format.Category, index map[string]int) Scores {
	n := len(index)
	a := regen.FromCategory(tree, index, n)
	b := regen.FromCategory(ref, index, n)
	var s Scores
	s.Precision, s.Recall = diff.TripletScores(a, b)
	if s.Precision+s.Recall > 0 {
		s.F1 = 2 * s.Precision * s.Recall / (s.Precision + s.Recall)
	}
	s.ClusterF1 = clusterF1(tree, ref, index)
	s.TopShare, s.TopLevel = topShare(tree, n)
	s.Chains = chains(tree)
	s.Depth = tree.Depth()
	return s
}

// members lists, for every category below root, the set of its items
// (subcategories included) as item indices.
func members(root *format.Category, index map[string]int) []map[int]bool {
	var out []map[int]bool
	var rec func(c *format.Category) []int
	rec = func(c *format.Category) []int {
		var mine []int
		for _, ch := range c.Children {
			mine = append(mine, rec(ch)...)
		}
		for _, it := range c.Items {
			if i, ok := index[it]; ok {
				mine = append(mine, i)
			}
		}
		if c != root && len(mine) > 0 {
			set := make(map[int]bool, len(mine))
			for _, i := range mine {
				set[i] = true
			}
			out = append(out, set)
		}
		return mine
	}
	rec(root)
	return out
}

// clusterF1 is the size-weighted mean, over the reference's categories, of
// the best F1 = 2|R∩T|/(|R|+|T|) any category T of the tree reaches for
// reference category R (the "overall F-measure" of hierarchical clustering
// evaluation, Larsen & Aone, KDD 1999).
func clusterF1(tree, ref *format.Category, index map[string]int) float64 {
	ts := members(tree, index)
	rs := members(ref, index)
	num, den := 0.0, 0.0
	for _, r := range rs {
		best := 0.0
		for _, t := range ts {
			inter := 0
			small, large := r, t
			if len(t) < len(r) {
				small, large = t, r
			}
			for i := range small {
				if large[i] {
					inter++
				}
			}
			if f := 2 * float64(inter) / float64(len(r)+len(t)); f > best {
				best = f
			}
		}
		num += float64(len(r)) * best
		den += float64(len(r))
	}
	if den == 0 {
		return 0
	}
	return num / den
}

// topShare is the largest top-level category's share of the n items, and
// the number of top-level entries.
func topShare(root *format.Category, n int) (float64, int) {
	largest := 0
	for _, c := range root.Children {
		largest = max(largest, c.Size())
	}
	if n == 0 {
		return 0, 0
	}
	return float64(largest) / float64(n), len(root.Children) + len(root.Items)
}

// chains counts the categories below root whose largest subcategory holds
// more than chainShare of their items.
func chains(root *format.Category) int {
	count := 0
	root.Walk(func(c *format.Category, depth int) bool {
		if c == root || len(c.Children) == 0 {
			return true
		}
		largest := 0
		for _, ch := range c.Children {
			largest = max(largest, ch.Size())
		}
		if float64(largest) > chainShare*float64(c.Size()) {
			count++
		}
		return true
	})
	return count
}
