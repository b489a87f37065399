package diff

import (
	"slices"
	"strings"

	"github.com/ramify-tax/ramify/format"
)

// flatTree is a format tree laid out for comparison. Category 0 is the
// root (the file itself); the others follow in walk order.
type flatTree struct {
	cats    []*format.Category
	parent  []int
	path    []Path       // display names from the top level down; root: empty
	items   []placedItem // every item with its category, sorted by id
	members [][]int32    // common items below each category, ascending
}

// placedItem is an item and the category that holds it directly.
type placedItem struct {
	id  string
	cat int
}

func flatten(root *format.Category) *flatTree {
	t := &flatTree{}
	type frame struct {
		c      *format.Category
		parent int
	}
	stack := []frame{{root, -1}}
	for len(stack) > 0 {
		f := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		id := len(t.cats)
		t.cats = append(t.cats, f.c)
		t.parent = append(t.parent, f.parent)
		p := Path{}
		if f.parent >= 0 {
			p = append(slices.Clip(t.path[f.parent]), f.c.DisplayName())
		}
		t.path = append(t.path, p)
		for _, it := range f.c.Items {
			t.items = append(t.items, placedItem{it, id})
		}
		for i := len(f.c.Children) - 1; i >= 0; i-- {
			stack = append(stack, frame{f.c.Children[i], id})
		}
	}
	slices.SortFunc(t.items, func(a, b placedItem) int { return strings.Compare(a.id, b.id) })
	return t
}

// chain lists the categories from the top level down to c, root excluded.
func (t *flatTree) chain(c int, buf []int) []int {
	buf = buf[:0]
	for ; c > 0; c = t.parent[c] {
		buf = append(buf, c)
	}
	slices.Reverse(buf)
	return buf
}

// setMembers fills members from the common items: catOf[i] is the
// category of common item i. Each item joins its category and every
// ancestor; items are visited in index order, so every list comes out
// sorted.
func (t *flatTree) setMembers(catOf []int) {
	t.members = make([][]int32, len(t.cats))
	for i, cat := range catOf {
		for c := cat; c >= 0; c = t.parent[c] {
			t.members[c] = append(t.members[c], int32(i))
		}
	}
}

// comparePaths orders paths element by element, byte order.
func comparePaths(a, b Path) int {
	for i := 0; i < len(a) && i < len(b); i++ {
		if c := strings.Compare(a[i], b[i]); c != 0 {
			return c
		}
	}
	return len(a) - len(b)
}
