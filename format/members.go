package format

import (
	"slices"
	"strings"
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
		if len(lists) == 1 {
			return own
		}
		return mergeSorted(lists)
	}
	rec(root)
	return out
}

// mergeSorted merges sorted lists into one new sorted list, pairwise in a
// balanced tree of merges.
func mergeSorted(lists [][]string) []string {
	if len(lists) == 1 {
		return lists[0]
	}
	mid := len(lists) / 2
	a, b := mergeSorted(lists[:mid]), mergeSorted(lists[mid:])
	out := make([]string, 0, len(a)+len(b))
	for len(a) > 0 && len(b) > 0 {
		if strings.Compare(b[0], a[0]) < 0 {
			out = append(out, b[0])
			b = b[1:]
		} else {
			out = append(out, a[0])
			a = a[1:]
		}
	}
	out = append(out, a...)
	return append(out, b...)
}
