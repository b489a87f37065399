package concept

import (
	"cmp"
	"slices"

	"github.com/ramify-tax/ramify/diff"
	"github.com/ramify-tax/ramify/format"
)

// Retired is an identifier of the earlier tree that the later one no
// longer has, with where its items went.
type Retired struct {
	ID   string `json:"id" toml:"id"`
	Name string `json:"name" toml:"name"`
	// Successors are the identifiers that took over its items: the
	// category it was merged into, the parts it was split into, or else
	// the smallest category that now holds all its remaining items
	// (when that is not the whole tree), or else the categories its
	// items now sit in. Empty when none of its items is left in a
	// category.
	Successors []string `json:"successors" toml:"successors"`
}

// Split is a concept of the earlier tree whose items now sit in several
// categories; the identifier may live on in one of them.
type Split struct {
	ID   string   `json:"id" toml:"id"`
	Name string   `json:"name" toml:"name"`
	Into []string `json:"into" toml:"into"`
}

// Merge is a category of the later tree made of several earlier ones.
type Merge struct {
	ID   string   `json:"id" toml:"id"`
	Name string   `json:"name" toml:"name"`
	From []string `json:"from" toml:"from"`
}

// Changes are what happened to the concepts between two trees.
type Changes struct {
	Added   []string  `json:"added" toml:"added"`
	Retired []Retired `json:"retired" toml:"retired"`
	Split   []Split   `json:"split" toml:"split"`
	Merged  []Merge   `json:"merged" toml:"merged"`
}

// Compare lists the concept changes from old to new, whose categories
// carry identifiers (categories without one are left out). Splits and
// merges are diff.Compare's (its 80% rules), named by identifier. Every
// list is sorted by identifier.
func Compare(old, new *format.Category) Changes {
	oldIDs, newIDs := idsByPath(old), idsByPath(new)
	rep := diff.Compare(old, new)
	ch := Changes{Added: []string{}, Retired: []Retired{}, Split: []Split{}, Merged: []Merge{}}
	had := idSet(oldIDs)
	for _, e := range newIDs {
		if e.id != "" && !had[e.id] {
			ch.Added = append(ch.Added, e.id)
		}
	}
	mergedInto := ch.addMerges(rep.Merged, oldIDs, newIDs)
	splitInto := ch.addSplits(rep.Split, oldIDs, newIDs)
	ch.addRetired(oldIDs, idSet(newIDs), mergedInto, splitInto, newHolder(new))
	slices.Sort(ch.Added)
	slices.SortFunc(ch.Retired, func(a, b Retired) int { return cmp.Compare(a.ID, b.ID) })
	slices.SortFunc(ch.Split, func(a, b Split) int { return cmp.Compare(a.ID, b.ID) })
	slices.SortFunc(ch.Merged, func(a, b Merge) int { return cmp.Compare(a.ID, b.ID) })
	return ch
}

// idSet is the set of identifiers m gives.
func idSet(m map[string]entry) map[string]bool {
	set := map[string]bool{}
	for _, e := range m {
		set[e.id] = true
	}
	return set
}

// lookPath is m's entry for path p.
func lookPath(m map[string]entry, p diff.Path) entry { return m[pathKey(p)] }

// idsAt lists, sorted, the identifiers that m gives the paths.
func idsAt(m map[string]entry, paths []diff.Path) []string {
	var ids []string
	for _, p := range paths {
		if e := lookPath(m, p); e.id != "" {
			ids = append(ids, e.id)
		}
	}
	slices.Sort(ids)
	return ids
}

// addMerges records the merges whose result and parts carry identifiers,
// and returns which new identifier each merged old one went into.
func (ch *Changes) addMerges(merged []diff.Merge, oldIDs, newIDs map[string]entry) map[string]string {
	mergedInto := map[string]string{}
	for _, m := range merged {
		into := lookPath(newIDs, m.Into)
		from := idsAt(oldIDs, m.From)
		for _, id := range from {
			mergedInto[id] = into.id
		}
		if into.id != "" && len(from) > 0 {
			ch.Merged = append(ch.Merged, Merge{ID: into.id, Name: into.name, From: from})
		}
	}
	return mergedInto
}

// addSplits records the splits whose category and parts carry
// identifiers, and returns the new identifiers each split old one went
// into.
func (ch *Changes) addSplits(split []diff.Split, oldIDs, newIDs map[string]entry) map[string][]string {
	splitInto := map[string][]string{}
	for _, s := range split {
		from := lookPath(oldIDs, s.From)
		if into := idsAt(newIDs, s.Into); from.id != "" && len(into) > 0 {
			splitInto[from.id] = into
			ch.Split = append(ch.Split, Split{ID: from.id, Name: from.name, Into: into})
		}
	}
	return splitInto
}

// addRetired records the old identifiers the new tree no longer has, each
// with its successors: what it was merged into, what it was split into,
// or else the categories of the new tree that now hold its items.
func (ch *Changes) addRetired(oldIDs map[string]entry, have map[string]bool, mergedInto map[string]string, splitInto map[string][]string, newTree *holder) {
	for _, e := range oldIDs {
		if e.id == "" || have[e.id] {
			continue
		}
		r := Retired{ID: e.id, Name: e.name, Successors: []string{}}
		switch {
		case mergedInto[e.id] != "":
			r.Successors = []string{mergedInto[e.id]}
		case splitInto[e.id] != nil:
			r.Successors = splitInto[e.id]
		default:
			r.Successors = newTree.successors(e.cat.AllItems())
		}
		ch.Retired = append(ch.Retired, r)
	}
}

// entry is a category's identifier and display path, by path.
type entry struct {
	id, name string
	cat      *format.Category
}

func idsByPath(root *format.Category) map[string]entry {
	out := map[string]entry{}
	var rec func(c *format.Category, path []string)
	rec = func(c *format.Category, path []string) {
		for _, ch := range c.Children {
			p := append(path[:len(path):len(path)], ch.DisplayName())
			out[pathKey(p)] = entry{id: ch.ID, name: joinPath(p), cat: ch}
			rec(ch, p)
		}
	}
	rec(root, nil)
	return out
}

func joinPath(p []string) string {
	s := ""
	for i, n := range p {
		if i > 0 {
			s += format.ConceptPathSeparator
		}
		s += n
	}
	return s
}

// holder finds, in one tree, where items sit.
type holder struct {
	parent map[*format.Category]*format.Category
	of     map[string]*format.Category // item -> its category
	root   *format.Category
}

func newHolder(root *format.Category) *holder {
	h := &holder{parent: map[*format.Category]*format.Category{}, of: map[string]*format.Category{}, root: root}
	root.Walk(func(c *format.Category, _ int) bool {
		for _, ch := range c.Children {
			h.parent[ch] = c
		}
		for _, it := range c.Items {
			h.of[it] = c
		}
		return true
	})
	return h
}

// successors are the identifiers that hold items now: the smallest
// category holding all of them, if not the root, else the distinct
// categories they sit in (the root left out).
func (h *holder) successors(items []string) []string {
	var cats []*format.Category
	for _, it := range items {
		if c, ok := h.of[it]; ok {
			cats = append(cats, c)
		}
	}
	if len(cats) == 0 {
		return []string{}
	}
	lca := cats[0]
	for _, c := range cats[1:] {
		lca = h.lca(lca, c)
	}
	if lca != h.root && lca.ID != "" {
		return []string{lca.ID}
	}
	seen := map[string]bool{}
	out := []string{}
	for _, c := range cats {
		if c != h.root && c.ID != "" && !seen[c.ID] {
			seen[c.ID] = true
			out = append(out, c.ID)
		}
	}
	slices.Sort(out)
	return out
}

func (h *holder) lca(a, b *format.Category) *format.Category {
	anc := map[*format.Category]bool{}
	for c := a; c != nil; c = h.parent[c] {
		anc[c] = true
	}
	for c := b; c != nil; c = h.parent[c] {
		if anc[c] {
			return c
		}
	}
	return h.root
}
