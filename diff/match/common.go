package match

import (
	"cmp"
	"slices"
	"strings"
)

// Placed is an item and the category that holds it directly, as its index
// in walk order (the root 0).
type Placed struct {
	ID  string
	Cat int
}

// SortPlaced orders items by id, the order Common reads. Ids are
// distinct, so any sort gives this order; this one sorts numbers where it
// can. The ids of a tree often share a prefix ("item-"), and the eight
// bytes after it, read as one big-endian number with short ids padded by
// zero bytes, order two ids as the ids do unless the numbers are equal.
// The numbers are sorted by radix, a byte a pass (LSD, stable), and only
// runs of equal numbers are sorted by comparing the ids themselves: a
// million ids sort in a small fraction of the time string comparisons take.
func SortPlaced(items []Placed) {
	if len(items) < 2 {
		return
	}
	skip := len(items[0].ID)
	for _, it := range items[1:] {
		skip = min(skip, len(it.ID))
		for skip > 0 && it.ID[:skip] != items[0].ID[:skip] {
			skip--
		}
	}
	keys := make([]keyedAt, len(items))
	for i, it := range items {
		keys[i] = keyedAt{prefixNumber(it.ID[skip:]), i}
	}
	radixSort(keys)
	for lo := 0; lo < len(keys); {
		hi := lo + 1
		for hi < len(keys) && keys[hi].key == keys[lo].key {
			hi++
		}
		if hi-lo > 1 {
			slices.SortFunc(keys[lo:hi], func(a, b keyedAt) int {
				return cmp.Or(strings.Compare(items[a.at].ID, items[b.at].ID), cmp.Compare(a.at, b.at))
			})
		}
		lo = hi
	}
	sorted := make([]Placed, len(items))
	for i, k := range keys {
		sorted[i] = items[k.at]
	}
	copy(items, sorted)
}

// keyedAt is a sort key and the position of what it stands for.
type keyedAt struct {
	key uint64
	at  int
}

// radixSort sorts keys by key, stably, a byte a pass from the lowest; a
// byte that all keys share is skipped.
func radixSort(keys []keyedAt) {
	buf := make([]keyedAt, len(keys))
	src, dst := keys, buf
	for shift := 0; shift < 64; shift += 8 {
		var count [257]int
		for _, k := range src {
			count[byte(k.key>>shift)+1]++
		}
		if count[byte(src[0].key>>shift)+1] == len(src) {
			continue
		}
		for b := 1; b < 257; b++ {
			count[b] += count[b-1]
		}
		for _, k := range src {
			b := byte(k.key >> shift)
			dst[count[b]] = k
			count[b]++
		}
		src, dst = dst, src
	}
	if &src[0] != &keys[0] {
		copy(keys, src)
	}
}

// prefixNumber reads the first eight bytes of s as a big-endian number,
// zero bytes standing in past its end.
func prefixNumber(s string) uint64 {
	var k uint64
	for j := range 8 {
		k <<= 8
		if j < len(s) {
			k |= uint64(s[j])
		}
	}
	return k
}

// Shared is what two versions' item lists have in common: shared item i
// is IDs[i], held by category OldCat[i] in the old version and NewCat[i]
// in the new; the rest of each list is left in OnlyOld and OnlyNew.
type Shared struct {
	IDs              []string
	OldCat, NewCat   []int
	OnlyOld, OnlyNew []Placed
}

// Common merges two item lists sorted by id (SortPlaced).
func Common(old, new []Placed) Shared {
	var s Shared
	a, b := old, new
	for len(a) > 0 || len(b) > 0 {
		switch {
		case len(b) == 0 || len(a) > 0 && a[0].ID < b[0].ID:
			s.OnlyOld = append(s.OnlyOld, a[0])
			a = a[1:]
		case len(a) == 0 || b[0].ID < a[0].ID:
			s.OnlyNew = append(s.OnlyNew, b[0])
			b = b[1:]
		default:
			s.IDs = append(s.IDs, a[0].ID)
			s.OldCat = append(s.OldCat, a[0].Cat)
			s.NewCat = append(s.NewCat, b[0].Cat)
			a, b = a[1:], b[1:]
		}
	}
	return s
}

// Members lists, for each category of a version (parent[c] its parent,
// −1 for the root), the shared items below it: catOf[i] is the category
// of shared item i. Each item joins its category and every ancestor;
// items are visited in index order, so every list comes out sorted.
func Members(parent []int, catOf []int) [][]int32 {
	members := make([][]int32, len(parent))
	for i, cat := range catOf {
		for c := cat; c >= 0; c = parent[c] {
			members[c] = append(members[c], int32(i))
		}
	}
	return members
}

// CommonSets lists, for every category below each root in walk order
// (depth first, children in order), the items below it that both trees
// hold in some category (items placed in a root itself do not count), as
// ascending indices into those items sorted by id: the sets Clusters
// compares. children and items read a category of either tree. Each item
// is looked at once per tree, not once per category that holds it.
func CommonSets[C any](oldRoot, newRoot C, children func(C) []C, items func(C) []string) (oldSets, newSets [][]int32) {
	oldParent, oldItems := placeBelow(oldRoot, children, items)
	newParent, newItems := placeBelow(newRoot, children, items)
	s := Common(oldItems, newItems)
	return Members(oldParent, s.OldCat)[1:], Members(newParent, s.NewCat)[1:]
}

// placeBelow numbers the categories below root in walk order and lists
// the items of all but the root with their categories, sorted by id.
func placeBelow[C any](root C, children func(C) []C, items func(C) []string) ([]int, []Placed) {
	type frame struct {
		c      C
		parent int
	}
	var parent []int
	var placed []Placed
	stack := []frame{{root, -1}}
	for len(stack) > 0 {
		f := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		id := len(parent)
		parent = append(parent, f.parent)
		for _, it := range items(f.c) {
			placed = append(placed, Placed{it, id})
		}
		kids := children(f.c)
		for i := len(kids) - 1; i >= 0; i-- {
			stack = append(stack, frame{kids[i], id})
		}
	}
	SortPlaced(placed)
	placed = slices.DeleteFunc(placed, func(p Placed) bool { return p.Cat == 0 })
	return parent, placed
}
