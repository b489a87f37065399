// Package taxgen generates random taxonomies and edited copies of them,
// for the tests and benchmarks that compare versions (diff's, and the
// diff command's). The trees are made up: names and item ids are
// numbered, nothing of the demo.
package taxgen

import (
	"fmt"
	"math/rand/v2"

	"github.com/ramify-tax/ramify/format"
)

// Taxonomy builds a random taxonomy of about items items: depth levels
// of categories with fanout children each (randomised ±50%), items spread
// over the categories of the lowest level and a few higher up.
func Taxonomy(rng *rand.Rand, items, depth, fanout int) *format.Category {
	root := &format.Category{}
	var leaves []*format.Category
	var grow func(c *format.Category, level int, path string)
	grow = func(c *format.Category, level int, path string) {
		if level == depth {
			leaves = append(leaves, c)
			return
		}
		k := max(1, fanout/2+rng.IntN(fanout+1))
		for i := range k {
			name := fmt.Sprintf("%s%c", path, 'a'+rune(i%26))
			if i >= 26 {
				name += fmt.Sprint(i / 26)
			}
			ch := &format.Category{Name: "cat-" + name, Provisional: rng.IntN(5) == 0}
			c.Children = append(c.Children, ch)
			grow(ch, level+1, name)
		}
	}
	grow(root, 0, "")
	var all []*format.Category
	root.Walk(func(c *format.Category, _ int) bool {
		if c != root {
			all = append(all, c)
		}
		return true
	})
	for i := range items {
		id := fmt.Sprintf("item-%06d", i)
		target := leaves[rng.IntN(len(leaves))]
		if rng.IntN(10) == 0 {
			target = all[rng.IntN(len(all))]
		}
		target.Items = append(target.Items, id)
	}
	Prune(root)
	root.Sort()
	return root
}

// Prune drops categories left without items or subcategories.
func Prune(c *format.Category) bool {
	kept := c.Children[:0]
	for _, ch := range c.Children {
		if Prune(ch) {
			kept = append(kept, ch)
		}
	}
	c.Children = kept
	return len(c.Children) > 0 || len(c.Items) > 0
}

// Perturb returns an edited copy of root: a share of the items moved to
// random categories or removed (two to one), a sixth of that share added,
// and renames categories renamed.
func Perturb(rng *rand.Rand, root *format.Category, share float64, renames int) *format.Category {
	out := root.Clone()
	var cats []*format.Category
	out.Walk(func(c *format.Category, _ int) bool {
		if c != out {
			cats = append(cats, c)
		}
		return true
	})
	type slot struct {
		id string
		at *format.Category // nil: removed
	}
	var slots []slot
	out.Walk(func(c *format.Category, _ int) bool {
		for _, id := range c.Items {
			slots = append(slots, slot{id, c})
		}
		c.Items, c.ItemLines = nil, nil
		return true
	})
	changes := int(share * float64(len(slots)))
	for _, i := range rng.Perm(len(slots))[:changes] {
		if rng.IntN(3) == 0 {
			slots[i].at = nil
		} else {
			slots[i].at = cats[rng.IntN(len(cats))]
		}
	}
	for _, s := range slots {
		if s.at != nil {
			s.at.Items = append(s.at.Items, s.id)
		}
	}
	for i := range changes / 6 {
		dst := cats[rng.IntN(len(cats))]
		dst.Items = append(dst.Items, fmt.Sprintf("new-%06d", i))
	}
	for range renames {
		c := cats[rng.IntN(len(cats))]
		c.Name += "-renamed"
		c.Provisional = false
	}
	Prune(out)
	out.Sort()
	return out
}
