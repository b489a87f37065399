package review

import (
	"slices"
	"strings"

	"github.com/ramify-tax/ramify/format"
)

// MaxPinsPerMove bounds the triplet records written for one moved item.
const MaxPinsPerMove = 3

// Move is an item an editor moved by hand, with its category paths (display
// names joined by " / ") before and after.
type Move struct {
	Item     string
	From, To string
	// Pins are the triplets recorded for it (at most MaxPinsPerMove).
	Pins []format.Triplet
}

// PinMoves finds the items whose place differs between base (the tree
// ramify wrote) and edited (the same file after a hand edit) — renames do
// not count, see diff.Compare — and, for each, at most three triplets
// that hold in the edited tree and keep the item where the editor put it:
//
//  1. x c | a and 2. x c' | a — x joins two members c, c' of its new
//     category before a member a of its old one (two new mates, so that
//     the solver cannot keep the edit by dragging a single mate along to
//     x's old place);
//  3. a a' | x — two members of x's old category stay together without x;
//  4. when one of these is missing, x c | o — x stays with c rather than
//     with o, a member of the category around its new one.
//
// Representatives are chosen among items that did not move: with an
// affinity (the similarity of two items; nil for none), the members most
// similar to the rest of their category — the hardest for the solver to
// drag along to x's old place — else the smallest ids. A candidate that
// also holds in the base tree says nothing new and is left out, unless it
// is the only one. Items placed in only one of the trees are not moves.
func PinMoves(base, edited *format.Category, affinity func(a, b string) float64) []Move {
	rep, moved, bx, ex := compareEdit(base, edited, affinity)
	var out []Move
	for _, m := range rep.Moved {
		x := m.Item
		mv := Move{Item: x, From: strings.Join(m.From, " / "), To: strings.Join(m.To, " / ")}
		var fresh, stale []format.Triplet
		consider := func(a, b, c string) {
			if a == "" || b == "" || c == "" || a == b || a == c || b == c || !ex.resolves(a, b, c) {
				return
			}
			t := format.Triplet{Pair: [2]string{min(a, b), max(a, b)}, Out: c}
			for _, u := range append(fresh, stale...) {
				if u.Pair == t.Pair && u.Out == t.Out {
					return
				}
			}
			if bx.resolves(a, b, c) {
				stale = append(stale, t)
			} else {
				fresh = append(fresh, t)
			}
		}
		newCat := ex.company(x)
		mates := ex.ranked(ex.members(newCat), x, moved)
		c1, c2 := at(mates, 0), at(mates, 1)
		oldCat := bx.companyOf(x, 2)
		a1, a2 := ex.pairWithout(bx.members(oldCat), x, moved)
		consider(x, c1, a1)
		consider(x, c2, a1)
		consider(a1, a2, x)
		if outer := ex.around(newCat); outer != nil {
			inside := ex.memberSet(newCat)
			var others []string
			for _, it := range ex.members(outer) {
				if !inside[it] {
					others = append(others, it)
				}
			}
			consider(x, c1, at(ex.ranked(others, x, moved), 0))
		}
		pins := fresh
		if len(pins) == 0 && len(stale) > 0 {
			pins = stale[:1]
		}
		mv.Pins = pins[:min(len(pins), MaxPinsPerMove)]
		out = append(out, mv)
	}
	return out
}

// catIndex places the items of a category tree: the chain of categories
// from the root down to each item.
type catIndex struct {
	affinity func(a, b string) float64
	path     map[string][]*format.Category
	below    map[*format.Category][]string // items under each category, sorted
}

func newCatIndex(root *format.Category) *catIndex {
	x := &catIndex{path: map[string][]*format.Category{}, below: map[*format.Category][]string{}}
	var walk func(c *format.Category, chain []*format.Category) []string
	walk = func(c *format.Category, chain []*format.Category) []string {
		chain = append(chain, c)
		var mine []string
		for _, ch := range c.Children {
			mine = append(mine, walk(ch, chain)...)
		}
		for _, it := range c.Items {
			x.path[it] = slices.Clone(chain)
			mine = append(mine, it)
		}
		slices.Sort(mine)
		x.below[c] = mine
		return mine
	}
	walk(root, nil)
	return x
}

// depth of the lowest category holding both items, or -1 when one is
// missing.
func (x *catIndex) meet(a, b string) int {
	pa, okA := x.path[a]
	pb, okB := x.path[b]
	if !okA || !okB {
		return -1
	}
	d := 0
	for d < len(pa) && d < len(pb) && pa[d] == pb[d] {
		d++
	}
	return d - 1
}

// resolves reports whether the tree arranges ab|c: a and b meet strictly
// below where they meet c.
func (x *catIndex) resolves(a, b, c string) bool {
	ab, ac := x.meet(a, b), x.meet(a, c)
	return ab >= 0 && ac >= 0 && ab > ac
}

func (x *catIndex) members(c *format.Category) []string {
	if c == nil {
		return nil
	}
	return x.below[c]
}

func (x *catIndex) memberSet(c *format.Category) map[string]bool {
	s := map[string]bool{}
	for _, it := range x.members(c) {
		s[it] = true
	}
	return s
}

// company is the lowest category holding item it and another item.
func (x *catIndex) company(it string) *format.Category { return x.companyOf(it, 1) }

// companyOf is the lowest category holding item it and at least others
// more items (the root when none does).
func (x *catIndex) companyOf(it string, others int) *format.Category {
	chain := x.path[it]
	for i := len(chain) - 1; i >= 0; i-- {
		if len(x.below[chain[i]]) > others {
			return chain[i]
		}
	}
	if len(chain) > 0 {
		return chain[0]
	}
	return nil
}

// around is the lowest category strictly holding more items than c, or
// nil when c holds every item.
func (x *catIndex) around(c *format.Category) *format.Category {
	var chain []*format.Category
	if ms := x.members(c); len(ms) > 0 {
		chain = x.path[ms[0]]
	}
	for i := len(chain) - 1; i >= 0; i-- {
		if len(x.below[chain[i]]) > len(x.members(c)) {
			return chain[i]
		}
	}
	return nil
}

// rankLimit bounds the candidates ranked, and the members each is
// compared with, so a huge category costs no more than a small one.
const rankLimit = 64

// ranked orders items other than self as representatives: items that did
// not move first; among them, with an affinity, the ones most similar to
// the other items (at most rankLimit of them, in id order); then by id.
func (x *catIndex) ranked(items []string, self string, moved map[string]bool) []string {
	var cands []string
	for _, it := range items {
		if it != self {
			cands = append(cands, it)
		}
	}
	slices.SortStableFunc(cands, func(a, b string) int {
		if moved[a] != moved[b] {
			if moved[a] {
				return 1
			}
			return -1
		}
		return strings.Compare(a, b)
	})
	cands = cands[:min(len(cands), rankLimit)]
	if x.affinity == nil {
		return cands
	}
	pull := map[string]float64{}
	for _, c := range cands {
		for _, d := range cands {
			if c != d {
				pull[c] += x.affinity(c, d)
			}
		}
	}
	slices.SortStableFunc(cands, func(a, b string) int {
		if moved[a] != moved[b] {
			if moved[a] {
				return 1
			}
			return -1
		}
		switch {
		case pull[a] > pull[b]:
			return -1
		case pull[a] < pull[b]:
			return 1
		}
		return 0
	})
	return cands
}

func at(items []string, i int) string {
	if i < len(items) {
		return items[i]
	}
	return ""
}

// pairWithout chooses two of items, neither self, that this tree joins
// before either joins self (aa'|self): the first such pair in the order
// of ranked.
func (x *catIndex) pairWithout(items []string, self string, moved map[string]bool) (string, string) {
	cands := x.ranked(items, self, moved)
	for i := range cands {
		for j := i + 1; j < len(cands); j++ {
			if x.resolves(cands[i], cands[j], self) {
				return cands[i], cands[j]
			}
		}
	}
	return "", ""
}
