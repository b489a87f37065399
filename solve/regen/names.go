package regen

import (
	"github.com/ramify-tax/ramify/diff/match"
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/format/shape"
	"github.com/ramify-tax/ramify/solve/graph"
	"github.com/ramify-tax/ramify/solve/naming"
)

// nameCategories names a freshly solved tree: named groups fix their
// category's name, categories that match one of the previous outline take
// its name, names people typed (in answered packets, the shape records,
// and in NameSources) replace provisional ones where the category they
// name still exists, and the rest get a provisional name from their
// members' tags and words. carried is naming.Carried(prev, root), or nil
// without a previous outline. linked says that the answers' typed names
// link them (Compiled.Linked): then each name the answers agree on names
// one category, the lowest that holds every item placed under it and none
// of the names apart from it, instead of one category per answer, which
// would repeat the name down a path ("Wine / Wine / Wine").
func nameCategories(p *repo.Repo, root, prev *format.Category, carried []match.Pair, linked bool) naming.Counts {
	var fixed []naming.Fixed
	for _, f := range p.Constraints {
		for _, g := range f.Groups {
			if g.Name != "" {
				fixed = append(fixed, naming.Fixed{Items: g.Items, Name: g.Name})
			}
		}
	}
	words := namingWords(p)
	var typed []naming.Typed
	for _, src := range p.NameSources {
		typed = append(typed, TypedNames(src)...)
	}
	var answers []shape.Answer
	for _, f := range p.Constraints {
		for _, s := range f.Shapes {
			answers = append(answers, shape.Answer{Tree: s.Tree, Record: len(answers)})
		}
	}
	agreed := map[string]bool{}
	var named []naming.Typed
	if linked {
		for _, n := range shape.NamedSets(answers, p.ItemIndex) {
			agreed[n.Name] = true
			items := idsOf(p, n.Items)
			named = append(named, naming.Typed{Items: items, Scope: append(items, idsOf(p, n.Outside)...), Name: n.Name})
		}
	}
	for _, a := range answers {
		for _, t := range TypedNames(a.Tree) {
			if !agreed[t.Name] {
				typed = append(typed, t)
			}
		}
	}
	typed = append(typed, named...)
	return naming.AssignMatched(root, prev, carried, fixed, typed, words)
}

// idsOf is the ids of the items at the given indices.
func idsOf(p *repo.Repo, xs []int32) []string {
	ids := make([]string, len(xs))
	for i, x := range xs {
		ids[i] = p.Items[x].ID
	}
	return ids
}

// TypedNames lists the confirmed category names of a tree (a shape's
// outline, or another version of the taxonomy) as names typed by people,
// each over the items of the tree. Provisional names are left out: ramify
// made them up.
func TypedNames(tree *format.Category) []naming.Typed {
	if tree == nil {
		return nil
	}
	scope := tree.AllItems()
	var out []naming.Typed
	tree.Walk(func(c *format.Category, _ int) bool {
		if c != tree && c.Name != "" && !c.Provisional {
			out = append(out, naming.Typed{Items: c.AllItems(), Scope: scope, Name: c.Name})
		}
		return true
	})
	return out
}

// namingWords lists, for each item, the words a provisional name may be
// made of: its tags, the words of its label, and those words of its
// description that name something somewhere in the collection, that is,
// that stand in some item's label. Descriptions are full of words that
// distinguish nothing ("used", "usually", "one", "small"): they describe
// how a thing is, not what kind it is, and people do not name things by
// them. Whether a word names things is read from where it occurs in the
// data, not from a list. When no item has a label, every description word
// may name. Plurals are folded (graph.PluralStem) so that "chairs" and
// "chair" count as one word.
func namingWords(p *repo.Repo) func(id string) []string {
	naming := map[string]bool{}
	for _, it := range p.Items {
		for _, tok := range graph.Tokens(it.Label) {
			naming[graph.PluralStem(tok)] = true
		}
	}
	cache := map[string][]string{}
	return func(id string) []string {
		if w, ok := cache[id]; ok {
			return w
		}
		i, ok := p.Index[id]
		if !ok {
			return nil
		}
		it := p.Items[i]
		w := append([]string(nil), it.Tags...)
		add := func(tok string, fromLabel bool) {
			tok = graph.PluralStem(tok)
			if unnamingWords[tok] || isNumberLike(tok) {
				return
			}
			if fromLabel || len(naming) == 0 || naming[tok] {
				w = append(w, tok)
			}
		}
		for _, tok := range graph.Tokens(it.Label) {
			add(tok, true)
		}
		for _, tok := range graph.Tokens(it.Text) {
			add(tok, false)
		}
		cache[id] = w
		return w
	}
}

// unnamingWords are words that describe an item well enough but never
// name a category: units of measure and packaging ("30 cm", "set of
// six"). A provisional name such as "~ set · mm" tells an editor nothing.
var unnamingWords = map[string]bool{
	"mm": true, "cm": true, "m": true, "km": true, "in": true, "inch": true, "ft": true,
	"oz": true, "lb": true, "lbs": true, "kg": true, "g": true, "nm": true, "v": true,
	"w": true, "l": true, "ml": true, "litre": true, "liter": true, "mah": true, "ah": true,
	"set": true, "kit": true, "pair": true, "pack": true, "piece": true, "pieces": true,
	"size": true, "sizes": true, "x": true,
}

// isNumberLike reports tokens made mostly of digits ("18v", "2t", "600").
func isNumberLike(tok string) bool {
	digits := 0
	for _, r := range tok {
		if r >= '0' && r <= '9' {
			digits++
		}
	}
	return digits > 0 && 2*digits >= len(tok)
}
