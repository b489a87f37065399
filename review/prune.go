package review

import (
	"github.com/ramify-tax/ramify/format"
)

// PruneRecords removes from cf, in place, the triplet records that say
// nothing the rest of the file does not say already, and returns how many
// it removed:
//
//   - a triplet written twice (the pair in either order) is kept once;
//   - ab|c is dropped when a group of the file holds a and b but not c
//     (a cluster implies every such triplet), or when a shape of the file
//     resolves ab|c (a shape stands for all the triplets it resolves);
//   - ab|c is dropped when two other triplets of the file imply it by one
//     of these rules, each of which holds in every rooted tree (they
//     follow from the definition of ab|c; TestPruneRulesHoldInEveryTree
//     checks them on every tree of up to five leaves):
//     {za|c, zb|c} ⊢ ab|c;  {ab|z, zc|a} ⊢ ab|c;  {ab|z, bz|c} ⊢ ab|c;
//     {az|b, zb|c} ⊢ ab|c (and each with a and b exchanged).
//
// Triplets are looked at last to first, and a dropped one no longer
// implies anything, so what remains implies everything removed. Groups and
// shapes are kept as they are.
func PruneRecords(cf *format.ConstraintFile) int {
	type key = [3]string
	implied := map[key]bool{}
	for _, g := range cf.Groups {
		in := map[string]bool{}
		for _, it := range g.Items {
			in[it] = true
		}
		for _, t := range cf.Triplets {
			if in[t.Pair[0]] && in[t.Pair[1]] && !in[t.Out] {
				implied[tripletKey(t.Pair[0], t.Pair[1], t.Out)] = true
			}
		}
	}
	for _, s := range cf.Shapes {
		for _, t := range format.ShapeTriplets(s.Tree) {
			implied[tripletKey(t[0], t[1], t[2])] = true
		}
	}
	kept := make([]bool, len(cf.Triplets))
	live := map[key]int{} // triplets still kept, by key, with their count
	for i, t := range cf.Triplets {
		kept[i] = true
		live[tripletKey(t.Pair[0], t.Pair[1], t.Out)]++
	}
	has := func(a, b, c string) bool { return live[tripletKey(a, b, c)] > 0 }
	items := map[string]bool{}
	for _, t := range cf.Triplets {
		items[t.Pair[0]], items[t.Pair[1]], items[t.Out] = true, true, true
	}
	derivable := func(a, b, c string) bool {
		for z := range items {
			if z == a || z == b || z == c {
				continue
			}
			if impliedBy(a, b, c, z, has) {
				return true
			}
		}
		return false
	}
	removed := 0
	for i := len(cf.Triplets) - 1; i >= 0; i-- {
		t := cf.Triplets[i]
		k := tripletKey(t.Pair[0], t.Pair[1], t.Out)
		live[k]--
		if live[k] > 0 || implied[k] || derivable(t.Pair[0], t.Pair[1], t.Out) {
			kept[i] = false
			removed++
			continue
		}
		live[k]++
	}
	out := cf.Triplets[:0]
	for i, t := range cf.Triplets {
		if kept[i] {
			out = append(out, t)
		}
	}
	cf.Triplets = out
	return removed
}

// impliedBy reports whether the triplets has knows imply ab|c through a
// fourth item z by one of PruneRecords' rules.
func impliedBy(a, b, c, z string, has func(a, b, c string) bool) bool {
	return has(z, a, c) && has(z, b, c) ||
		has(a, b, z) && (has(z, c, a) || has(z, c, b)) ||
		has(a, b, z) && (has(b, z, c) || has(a, z, c)) ||
		has(a, z, b) && has(z, b, c) ||
		has(b, z, a) && has(z, a, c)
}
