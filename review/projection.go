package review

import (
	"fmt"

	"github.com/ramify-tax/ramify/format"
)

// Restrict is the tree restricted to the given items (the restriction
// T|Q of phylogenetics, e.g. Semple & Steel, Phylogenetics, OUP 2003;
// the tree a review packet shows): items not listed are dropped, categories
// left empty are dropped, and a category left with a single child (one
// item or one subcategory) is replaced by that child, so that only the
// lowest common categories of the listed items remain, under their names
// in the full tree. A file root left with a single subcategory is
// replaced by that subcategory's contents, for the same reason. root is
// not changed; the result is in canonical order. Items the tree does not
// hold are ignored.
func Restrict(root *format.Category, items []string) *format.Category {
	keep := make(map[string]bool, len(items))
	for _, id := range items {
		keep[id] = true
	}
	out := restrictNode(root, keep)
	if out == nil {
		return &format.Category{}
	}
	for len(out.Items) == 0 && len(out.Children) == 1 {
		out = out.Children[0]
	}
	res := &format.Category{Children: out.Children, Items: out.Items}
	uniqueSiblingNames(res)
	res.Sort()
	return res
}

// uniqueSiblingNames renames a category whose name a sibling has already
// ("house" becomes "house (2)"): dropping a category with a single child
// can bring a category and a namesake from another level side by side,
// and an outline's siblings need distinct names.
func uniqueSiblingNames(c *format.Category) {
	seen := map[string]bool{}
	for _, ch := range c.Children {
		if ch.Name != "" && seen[ch.Name] {
			base := ch.Name
			for k := 2; seen[ch.Name]; k++ {
				ch.Name = fmt.Sprintf("%s (%d)", base, k)
			}
		}
		seen[ch.Name] = true
		uniqueSiblingNames(ch)
	}
}

// restrictNode copies c restricted to keep, or nil when nothing is left.
// A category with a single item left comes back as a bare item holder
// (no name) for its parent to take the item from.
func restrictNode(c *format.Category, keep map[string]bool) *format.Category {
	out := &format.Category{Name: c.Name, Provisional: c.Provisional}
	for _, ch := range c.Children {
		sub := restrictNode(ch, keep)
		switch {
		case sub == nil:
		case len(sub.Children) == 0 && len(sub.Items) == 1:
			out.Items = append(out.Items, sub.Items[0])
		case len(sub.Children) == 1 && len(sub.Items) == 0:
			out.Children = append(out.Children, sub.Children[0])
		default:
			out.Children = append(out.Children, sub)
		}
	}
	for _, it := range c.Items {
		if keep[it] {
			out.Items = append(out.Items, it)
		}
	}
	if len(out.Children) == 0 && len(out.Items) == 0 {
		return nil
	}
	return out
}
