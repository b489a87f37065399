// Package naming gives the categories of a freshly solved taxonomy their
// names: names decided by editors (named groups), names carried over from
// the previous version by membership, and provisional names made up from
// the members' most distinctive tags or words.
package naming

import (
	"slices"
	"strings"

	"github.com/ramify-tax/ramify/diff/match"
	"github.com/ramify-tax/ramify/format"
)

// Fixed is a named group constraint: exactly these items form one
// category, and it is called Name.
type Fixed struct {
	Items []string
	Name  string
}

// Typed is a category name a person typed somewhere other than a named
// group: in an answered review packet (a shape record) or in another
// version of the outline. Items are the members of the named category
// among Scope, the items that place shows; the category it names in a new
// tree is the lowest one whose members among Scope are exactly Items.
type Typed struct {
	Items []string
	Scope []string
	Name  string
}

// Counts says how the categories got their names.
type Counts struct {
	Fixed       int // from a named group
	Typed       int // typed by a person in a packet or another outline
	Carried     int // from the matching category of the previous version
	Provisional int // made up from the members' words
	Suffixed    int // given " 2", " 3", … to differ from a sibling
}

// CarryJaccard is the least Jaccard overlap, on the items both versions
// hold, at which a category of the previous version hands its name to a
// new one. A category A overlaps two disjoint categories X and Y by more
// than 1/2 only if |A∩X| + |A∩Y| > |A|, which cannot be, so from 1/2 up a
// category's candidates lie (apart from ties at exactly 1/2) on one root
// path of the other tree, and the matching stays small.
const CarryJaccard = 0.5

// Assign names every category below root (the root itself keeps no name),
// in place, in this order of precedence:
//
//  1. A category whose items (all items below it) are exactly a named
//     group's gets the group's name, confirmed (Provisional false). When
//     several groups have the same items, the first in fixed wins; when a
//     category and its only subcategory have them, the outer one. A name
//     that format.CheckCategoryName rejects is ignored (the constraint
//     parser reports it).
//  2. Otherwise, if prev is not nil, the categories of prev are matched to
//     the new ones by match.Clusters on the Jaccard overlap of their
//     items, counting only items present in both trees, kept at
//     ≥ CarryJaccard; a matched category takes the old name and its
//     Provisional flag.
//  3. Any other category gets a provisional name from words, which lists
//     the tags or words of an item (see ProvisionalName).
//
// Finally, names are made unique among siblings: the category with the
// strongest claim keeps the name — fixed, then carried and confirmed,
// then carried provisional, then made up; among equals the one with the
// smallest item id — and the others get " 2", " 3", … (the first number
// no sibling uses). The outcome depends only on the inputs.
func Assign(root, prev *format.Category, fixed []Fixed, words func(item string) []string) Counts {
	return AssignTyped(root, prev, fixed, nil, words)
}

// AssignTyped is Assign with names typed by people (see Typed): after the
// names of groups and those carried over, a category whose name would be
// provisional — carried provisional, or made up — takes the name a person
// typed for it, wherever that category still exists. When several typed
// names fall on one category, the last in typed wins (records are read in
// order, so the newest answer is usually last). A typed name never
// replaces a confirmed one, and names that format.CheckCategoryName
// rejects are ignored.
func AssignTyped(root, prev *format.Category, fixed []Fixed, typed []Typed, words func(item string) []string) Counts {
	var carried []match.Pair
	if prev != nil {
		carried = Carried(prev, root)
	}
	return AssignMatched(root, prev, carried, fixed, typed, words)
}

// Carried is the matching by which names and concept identifiers pass
// from the categories of prev to those of root (see Assign): match.Clusters
// on CommonSets at CarryJaccard, indices in walk order below each root.
func Carried(prev, root *format.Category) []match.Pair {
	oldSets, newSets := CommonSets(prev, root)
	return match.Clusters(oldSets, newSets, CarryJaccard)
}

// AssignMatched is AssignTyped with the matching to prev already made
// (Carried(prev, root)): a re-solve names the tree and carries concept
// identifiers by the one matching, made once for a million items.
func AssignMatched(root, prev *format.Category, carried []match.Pair, fixed []Fixed, typed []Typed, words func(item string) []string) Counts {
	cats := categories(root)
	claims := make([]claim, len(cats))
	var counts Counts

	byItems := map[string]string{}
	sizes := map[int]bool{} // only categories of a group's size can match it
	for _, g := range fixed {
		key := setKey(g.Items)
		if _, seen := byItems[key]; !seen && format.CheckCategoryName(g.Name) == "" {
			byItems[key] = g.Name
			sizes[len(g.Items)] = true
		}
	}
	for i, c := range cats {
		if !sizes[len(c.members)] {
			continue
		}
		key := setKey(c.members)
		if name, ok := byItems[key]; ok {
			c.cat.Name, c.cat.Provisional = name, false
			claims[i] = claimFixed
			counts.Fixed++
			// A category and its only subcategory can hold the same items;
			// the outer one, first in walk order, takes the name.
			delete(byItems, key)
		}
	}

	if prev != nil {
		var old []*format.Category
		prev.Walk(func(c *format.Category, _ int) bool {
			if c != prev {
				old = append(old, c)
			}
			return true
		})
		for _, p := range carried {
			if claims[p.New] != claimNone {
				continue
			}
			from := old[p.Old]
			cats[p.New].cat.Name, cats[p.New].cat.Provisional = from.Name, from.Provisional
			claims[p.New] = claimCarried
			if from.Provisional {
				claims[p.New] = claimCarriedProvisional
			}
			counts.Carried++
		}
	}

	if len(typed) > 0 {
		var fromCarried int
		counts.Typed, fromCarried = applyTyped(cats, claims, typed)
		counts.Carried -= fromCarried
	}

	maker := newWordCounter(words)
	rootItems := root.AllItems()
	slices.Sort(rootItems)
	for i, c := range cats {
		if claims[i] != claimNone {
			continue
		}
		parentItems, parentName := rootItems, ""
		if c.parent >= 0 {
			parentItems, parentName = cats[c.parent].members, cats[c.parent].cat.Name
		}
		c.cat.Name = maker.name(i, c.members, c.parent, parentItems, parentName)
		c.cat.Provisional = true
		claims[i] = claimMade
		counts.Provisional++
	}

	counts.Suffixed = makeUnique(root, cats, claims)
	return counts
}

// claim ranks how strongly a category holds its name, strongest first.
type claim int

const (
	claimNone claim = iota
	claimFixed
	claimCarried
	claimTyped
	claimCarriedProvisional
	claimMade
)

// applyTyped gives typed names to the categories they name whose claim is
// weaker than a typed one, and returns how many categories it named and
// how many of those had carried a provisional name.
func applyTyped(cats []category, claims []claim, typed []Typed) (named, fromCarried int) {
	done := map[int]bool{}
	for _, t := range typed {
		if format.CheckCategoryName(t.Name) != "" || len(t.Items) == 0 {
			continue
		}
		i := namedBy(cats, t)
		if i < 0 || claims[i] == claimFixed || claims[i] == claimCarried {
			continue
		}
		if claims[i] == claimCarriedProvisional {
			fromCarried++
		}
		cats[i].cat.Name, cats[i].cat.Provisional = t.Name, false
		claims[i] = claimTyped
		done[i] = true
	}
	return len(done), fromCarried
}

// namedBy is the index of the lowest category whose members among the
// typed name's scope are exactly its items, or -1.
func namedBy(cats []category, t Typed) int {
	scope := map[string]bool{}
	for _, it := range t.Scope {
		scope[it] = true
	}
	want := setKey(t.Items)
	best := -1
	for i, c := range cats {
		var in []string
		for _, it := range c.members {
			if scope[it] {
				in = append(in, it)
			}
		}
		// Walk order puts children after parents: a later match is lower.
		if len(in) == len(t.Items) && setKey(in) == want {
			best = i
		}
	}
	return best
}

// category is a non-root category with its members (all items below it,
// sorted) and the index of its parent category (−1 for the top level).
type category struct {
	cat     *format.Category
	members []string
	parent  int
}

// categories lists the categories below root in walk order (parents
// before children).
func categories(root *format.Category) []category {
	var out []category
	index := map[*format.Category]int{}
	var parentOf = map[*format.Category]int{}
	root.Walk(func(c *format.Category, _ int) bool {
		if c != root {
			index[c] = len(out)
			out = append(out, category{cat: c, parent: parentOf[c]})
		}
		for _, ch := range c.Children {
			if c == root {
				parentOf[ch] = -1
			} else {
				parentOf[ch] = index[c]
			}
		}
		return true
	})
	for i, members := range format.MemberLists(root) {
		out[i].members = members
	}
	return out
}

// setKey identifies a set of items regardless of order.
func setKey(items []string) string {
	s := slices.Clone(items)
	slices.Sort(s)
	s = slices.Compact(s)
	return strings.Join(s, "\x00")
}

// CommonSets is match.CommonSets over format categories: for every
// category below prev and below root in walk order, the items below it
// that both outlines hold in some category, as ascending indices into
// those items sorted by id.
func CommonSets(prev, root *format.Category) (prevSets, rootSets [][]int32) {
	return match.CommonSets(prev, root,
		func(c *format.Category) []*format.Category { return c.Children },
		func(c *format.Category) []string { return c.Items })
}
