package review

import (
	"slices"
	"strings"

	"github.com/ramify-tax/ramify/diff"
	"github.com/ramify-tax/ramify/format"
)

// Bounds on the shape recorded for a category moved by hand: members of
// the moved category, and neighbours taken from its old place and from
// its new one. The shape's triplets grow with the cube of its items, so it
// stays the size of a review packet.
const (
	maxMovedMembers  = 6
	maxOldNeighbours = 4
	maxNewNeighbours = 2
)

// CategoryMove is a category an editor moved whole by hand, with its paths
// (display names joined by " / ") before and after, the items that moved
// with it, and the shape recorded for it (nil when no shape over its
// neighbours says anything the tree ramify wrote did not say already).
type CategoryMove struct {
	From, To string
	Items    []string
	Shape    *format.Shape
}

// PinCategoryMoves finds the categories that moved whole between base
// (the tree ramify wrote) and edited (see diff.Report.MovedCategories) and
// records each as one shape: the edited tree restricted to some members
// of the moved category, members of the categories it left (one or two
// from each level between its old parent and its old top-level category)
// and members of its new parent. The shape holds in the edited tree and
// not in base, and forces the new place on the solver: the old neighbours
// join each other before any member of the moved category (so it cannot
// go back under its old ancestors), and the new neighbours join the
// members first. Representatives are ranked as in PinMoves.
func PinCategoryMoves(base, edited *format.Category, affinity func(a, b string) float64) []CategoryMove {
	rep, moved, bx, ex := compareEdit(base, edited, affinity)
	var out []CategoryMove
	for _, cm := range rep.MovedCategories {
		mv := CategoryMove{From: strings.Join(cm.From, " / "), To: strings.Join(cm.To, " / "), Items: slices.Clone(cm.Items)}
		inside := map[string]bool{}
		for _, it := range cm.Items {
			inside[it] = true
		}
		members := ex.ranked(cm.Items, "", nil)
		pick := slices.Clone(members[:min(len(members), maxMovedMembers)])
		outside := func(items []string) []string {
			var rest []string
			for _, it := range items {
				if !inside[it] && !moved[it] {
					rest = append(rest, it)
				}
			}
			return rest
		}
		// Old neighbours: up the base chain from the category's old
		// parent to its old top-level category, one or two items from
		// each level that are not below the level beneath it.
		oldCat := bx.lowestHolding(cm.Items)
		chain := bx.ancestors(oldCat)
		var olds []string
		below := bx.memberSet(oldCat)
		for i, a := range chain {
			var level []string
			for _, it := range outside(bx.members(a)) {
				if !below[it] {
					level = append(level, it)
				}
			}
			want := 1
			if i == 0 {
				want = 2
			}
			ranked := ex.ranked(level, "", moved)
			olds = append(olds, ranked[:min(len(ranked), want)]...)
			below = bx.memberSet(a)
		}
		olds = thinNeighbours(olds, maxOldNeighbours)
		// New neighbours: members of the new parent outside the category,
		// and one item outside that parent, which the members and the new
		// neighbours join last.
		var news []string
		if parent := ex.around(ex.lowestHolding(cm.Items)); parent != nil && parent != edited {
			ranked := ex.ranked(outside(ex.members(parent)), "", moved)
			news = ranked[:min(len(ranked), maxNewNeighbours)]
			inParent := ex.memberSet(parent)
			var beyond []string
			for _, it := range outside(ex.members(ex.around(parent))) {
				if !inParent[it] {
					beyond = append(beyond, it)
				}
			}
			news = append(news, ex.ranked(beyond, "", moved)[:min(len(beyond), 1)]...)
		}
		items := slices.Concat(pick, olds, news)
		slices.Sort(items)
		items = slices.Compact(items)
		if len(items) >= format.MinShapeItems && len(olds)+len(news) > 0 {
			tree := Restrict(edited, items)
			if saysSomethingNew(tree, Restrict(base, items)) {
				mv.Shape = &format.Shape{Tree: tree}
			}
		}
		out = append(out, mv)
	}
	return out
}

// compareEdit is what both kinds of pins start from: the semantic diff of
// the hand edit, the set of every moved item (never a representative) and
// the two trees indexed.
func compareEdit(base, edited *format.Category, affinity func(a, b string) float64) (*diff.Report, map[string]bool, *catIndex, *catIndex) {
	rep := diff.Compare(base, edited)
	moved := map[string]bool{}
	for _, m := range rep.AllMoved() {
		moved[m.Item] = true
	}
	bx, ex := newCatIndex(base), newCatIndex(edited)
	bx.affinity, ex.affinity = affinity, affinity
	return rep, moved, bx, ex
}

// thinNeighbours keeps at most n of the old neighbours, nearest levels
// first but always the last one (the old top-level category, which keeps
// the moved category from going back anywhere below it).
func thinNeighbours(olds []string, n int) []string {
	if len(olds) <= n {
		return olds
	}
	return append(slices.Clone(olds[:n-1]), olds[len(olds)-1])
}

// saysSomethingNew reports whether the edited restriction resolves a
// triplet the base restriction does not resolve the same way.
func saysSomethingNew(edited, base *format.Category) bool {
	had := map[[3]string]bool{}
	for _, t := range format.ShapeTriplets(base) {
		had[tripletKey(t[0], t[1], t[2])] = true
	}
	for _, t := range format.ShapeTriplets(edited) {
		if !had[tripletKey(t[0], t[1], t[2])] {
			return true
		}
	}
	return false
}

// tripletKey identifies ab|c regardless of the order of the pair.
func tripletKey(a, b, c string) [3]string {
	return [3]string{min(a, b), max(a, b), c}
}

// lowestHolding is the lowest category holding every one of items.
func (x *catIndex) lowestHolding(items []string) *format.Category {
	var common []*format.Category
	for i, it := range items {
		p := x.path[it]
		if i == 0 {
			common = p
			continue
		}
		d := 0
		for d < len(common) && d < len(p) && common[d] == p[d] {
			d++
		}
		common = common[:d]
	}
	if len(common) == 0 {
		return nil
	}
	return common[len(common)-1]
}

// ancestors lists the categories strictly above c, nearest first, up to
// and including the top-level category (the root left out).
func (x *catIndex) ancestors(c *format.Category) []*format.Category {
	ms := x.members(c)
	if len(ms) == 0 {
		return nil
	}
	chain := x.path[ms[0]]
	i := slices.Index(chain, c)
	if i <= 0 {
		return nil
	}
	var out []*format.Category
	for j := i - 1; j >= 1; j-- {
		out = append(out, chain[j])
	}
	return out
}
