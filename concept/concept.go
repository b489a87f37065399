// Package concept keeps the stable identifiers of a taxonomy's categories
// (format.Category.ID): it carries them from one version of the tree to
// the next by the matching that carries names, makes new ones from a
// category's members, and says between two releases which identifiers
// were retired and which took over their items.
package concept

import (
	"slices"
	"strings"

	"github.com/ramify-tax/ramify/diff"
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/solve/naming"
)

// Counts says where the identifiers of a tree came from.
type Counts struct {
	Kept    int `json:"kept"`    // the category had one already
	Carried int `json:"carried"` // from the matching category of a previous version
	New     int `json:"new"`     // made from the category's members
}

// Carry gives every category below root an identifier, in place. A
// category that has one keeps it. Otherwise the categories of each
// previous version, in the order given, are matched to root's by
// diff.MatchClusters on the Jaccard overlap of their members (all items
// below them, counting only items both trees hold), kept at
// naming.CarryJaccard — the matching that carries names — and a matched
// category takes the old identifier. Every other category gets
// format.DeriveConceptID of its members, with the first salt that no
// category of root and no previous version uses, so an identifier is
// never given to two concepts and a retired one is not handed on.
//
// The merge of two branches passes both sides: a category made on either
// branch keeps the identifier that branch gave it, and one made on both
// alike has the same identifier on both (it is made from the members).
func Carry(root *format.Category, prevs ...*format.Category) Counts {
	var counts Counts
	cur := members(root)
	taken := map[string]bool{}
	for _, c := range cur {
		if c.cat.ID != "" {
			taken[c.cat.ID] = true
			counts.Kept++
		}
	}
	for _, prev := range prevs {
		if prev == nil {
			continue
		}
		old := members(prev)
		oldSets, curSets := commonSets(old, cur)
		for _, p := range diff.MatchClusters(oldSets, curSets, naming.CarryJaccard) {
			id := old[p.Old].cat.ID
			if id == "" || taken[id] || cur[p.New].cat.ID != "" {
				continue
			}
			cur[p.New].cat.ID = id
			taken[id] = true
			counts.Carried++
		}
		for _, c := range old {
			if c.cat.ID != "" {
				taken[c.cat.ID] = true
			}
		}
	}
	for _, c := range cur {
		if c.cat.ID != "" {
			continue
		}
		for salt := 0; ; salt++ {
			if id := format.DeriveConceptID(c.members, salt); !taken[id] {
				c.cat.ID = id
				taken[id] = true
				break
			}
		}
		counts.New++
	}
	return counts
}

// category is a non-root category with its members (every item below
// it, sorted).
type category struct {
	cat     *format.Category
	members []string
}

// members lists the categories below root in walk order.
func members(root *format.Category) []category {
	var out []category
	var rec func(c *format.Category) []string
	rec = func(c *format.Category) []string {
		all := slices.Clone(c.Items)
		for _, ch := range c.Children {
			i := len(out)
			out = append(out, category{cat: ch})
			sub := rec(ch)
			slices.Sort(sub)
			out[i].members = sub
			all = append(all, sub...)
		}
		return all
	}
	rec(root)
	return out
}

// commonSets turns both lists into sorted index sets over the items both
// hold.
func commonSets(a, b []category) (aSets, bSets [][]int32) {
	inA := map[string]bool{}
	for _, c := range a {
		for _, it := range c.members {
			inA[it] = true
		}
	}
	var common []string
	seen := map[string]bool{}
	for _, c := range b {
		for _, it := range c.members {
			if inA[it] && !seen[it] {
				seen[it] = true
				common = append(common, it)
			}
		}
	}
	slices.Sort(common)
	index := make(map[string]int32, len(common))
	for i, it := range common {
		index[it] = int32(i)
	}
	toSets := func(cs []category) [][]int32 {
		out := make([][]int32, len(cs))
		for k, c := range cs {
			var s []int32
			for _, it := range c.members {
				if i, ok := index[it]; ok {
					s = append(s, i)
				}
			}
			slices.Sort(s)
			out[k] = s
		}
		return out
	}
	return toSets(a), toSets(b)
}

// pathKey joins a display-name path for map keys.
func pathKey(p []string) string { return strings.Join(p, "\x00") }
