package format

import (
	"slices"

	"github.com/ramify-tax/ramify/internal/sorted"
)

// MemberLists lists, for every category below root in walk order, all the
// items below it, sorted. Each list is merged from the sorted lists of the
// category's children and its own items, so a tree of depth d over n items
// costs one sort of each category's own items and O(n·d·log k) string
// comparisons for k children, where sorting every list anew would cost
// O(n·d·log n); the lists share nothing, so a caller may keep or change one.
func MemberLists(root *Category) [][]string {
	var out [][]string
	var rec func(c *Category) []string
	rec = func(c *Category) []string {
		lists := make([][]string, 0, len(c.Children)+1)
		own := slices.Clone(c.Items)
		slices.Sort(own)
		lists = append(lists, own)
		for _, ch := range c.Children {
			i := len(out)
			out = append(out, nil)
			out[i] = rec(ch)
			lists = append(lists, out[i])
		}
		if c == root {
			return nil // no one asks for the root's list
		}
		return sorted.Merge(lists) // a fresh list, or own when there is nothing to merge
	}
	rec(root)
	return out
}
