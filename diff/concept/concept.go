// Package concept keeps the stable identifiers of a taxonomy's categories
// (format.Category.ID): it carries them from one version of the tree to
// the next by the matching that carries names, makes new ones from a
// category's members, and says between two releases which identifiers
// were retired and which took over their items.
package concept

import (
	"slices"
	"strings"

	"github.com/ramify-tax/ramify/diff/match"
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
// match.Clusters on the Jaccard overlap of their members (all items
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
	matched := make([]Matched, 0, len(prevs))
	for _, prev := range prevs {
		if prev != nil {
			matched = append(matched, Matched{Prev: prev, Pairs: naming.Carried(prev, root)})
		}
	}
	return CarryMatched(root, matched...)
}

// Matched is a previous version of a tree with its matching to the
// current one, naming.Carried(Prev, root).
type Matched struct {
	Prev  *format.Category
	Pairs []match.Pair
}

// CarryMatched is Carry with each previous version's matching already
// made: solve names the tree and carries identifiers by one matching.
func CarryMatched(root *format.Category, prevs ...Matched) Counts {
	var counts Counts
	cur := walkOrder(root)
	taken := map[string]bool{}
	for _, c := range cur {
		if c.ID != "" {
			taken[c.ID] = true
			counts.Kept++
		}
	}
	for _, m := range prevs {
		old := walkOrder(m.Prev)
		for _, p := range m.Pairs {
			id := old[p.Old].ID
			if id == "" || taken[id] || cur[p.New].ID != "" {
				continue
			}
			cur[p.New].ID = id
			taken[id] = true
			counts.Carried++
		}
		for _, c := range old {
			if c.ID != "" {
				taken[c.ID] = true
			}
		}
	}
	for _, c := range cur {
		if c.ID != "" {
			continue
		}
		members := c.AllItems()
		slices.Sort(members)
		for salt := 0; ; salt++ {
			if id := format.DeriveConceptID(members, salt); !taken[id] {
				c.ID = id
				taken[id] = true
				break
			}
		}
		counts.New++
	}
	return counts
}

// walkOrder lists the categories below root in walk order.
func walkOrder(root *format.Category) []*format.Category {
	var out []*format.Category
	root.Walk(func(c *format.Category, _ int) bool {
		if c != root {
			out = append(out, c)
		}
		return true
	})
	return out
}

// pathKey joins a display-name path for map keys.
func pathKey(p []string) string { return strings.Join(p, "\x00") }
