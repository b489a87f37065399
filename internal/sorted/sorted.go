// Package sorted merges sorted lists: the members of a category are the
// merge of its children's, and merging up a tree of depth d over n items
// costs O(n·d·log k) comparisons for k children where sorting every
// category's list anew costs O(n·d·log n).
package sorted

import "cmp"

// Merge merges sorted lists into one sorted list, pairwise in a balanced
// tree of merges. With two or more lists the result is new; a single list
// is returned as it is.
func Merge[T cmp.Ordered](lists [][]T) []T {
	switch len(lists) {
	case 0:
		return nil
	case 1:
		return lists[0]
	}
	mid := len(lists) / 2
	a, b := Merge(lists[:mid]), Merge(lists[mid:])
	out := make([]T, 0, len(a)+len(b))
	for len(a) > 0 && len(b) > 0 {
		if cmp.Less(b[0], a[0]) {
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
