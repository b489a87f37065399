package format

import (
	"runtime"
	"slices"
	"sync"

	"github.com/ramify-tax/ramify/internal/sorted"
)

// MemberLists lists, for every category below root in walk order, all the
// items below it, sorted. Each list is merged from the sorted lists of the
// category's children and its own items, so a tree of depth d over n items
// costs one sort of each category's own items and O(n·d·log k) string
// comparisons for k children, where sorting every list anew would cost
// O(n·d·log n); the lists share nothing, so a caller may keep or change one.
//
// The subtrees of root's children share nothing either: in a large tree
// each is listed on a goroutine of its own (at most one a processor), and
// their lists are joined in walk order, the same lists as one walk gives.
func MemberLists(root *Category) [][]string {
	parts := make([][][]string, len(root.Children))
	list := func(i int) {
		var out [][]string
		i0 := len(out)
		out = append(out, nil)
		out[i0] = memberLists(root.Children[i], &out)
		parts[i] = out
	}
	if workers := runtime.GOMAXPROCS(0); workers > 1 && len(root.Children) > 1 && itemsAtLeast(root, parallelMembers) {
		next := make(chan int)
		var wg sync.WaitGroup
		for range min(workers, len(root.Children)) {
			wg.Add(1)
			go func() {
				defer wg.Done()
				for i := range next {
					list(i)
				}
			}()
		}
		for i := range root.Children {
			next <- i
		}
		close(next)
		wg.Wait()
	} else {
		for i := range root.Children {
			list(i)
		}
	}
	return slices.Concat(parts...)
}

// parallelMembers is the fewest items a tree needs before MemberLists
// lists its top-level subtrees at once.
const parallelMembers = 50_000

// memberLists appends the lists of the categories below c to out in walk
// order and returns c's own.
func memberLists(c *Category, out *[][]string) []string {
	lists := make([][]string, 0, len(c.Children)+1)
	own := slices.Clone(c.Items)
	slices.Sort(own)
	lists = append(lists, own)
	for _, ch := range c.Children {
		i := len(*out)
		*out = append(*out, nil)
		list := memberLists(ch, out)
		(*out)[i] = list
		lists = append(lists, list)
	}
	return sorted.Merge(lists) // a fresh list, or own when there is nothing to merge
}

// itemsAtLeast reports whether the tree of root holds at least n items.
func itemsAtLeast(root *Category, n int) bool {
	count := 0
	root.Walk(func(c *Category, _ int) bool {
		count += len(c.Items)
		return count < n
	})
	return count >= n
}
