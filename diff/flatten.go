package diff

import (
	"slices"
	"strings"

	"github.com/ramify-tax/ramify/diff/match"
	"github.com/ramify-tax/ramify/format"
)

// flatTree is a format tree laid out for comparison. Category 0 is the
// root (the file itself); the others follow in walk order.
type flatTree struct {
	cats    []*format.Category
	parent  []int
	path    []Path         // display names from the top level down; root: empty
	items   []match.Placed // every item with its category, sorted by id
	members [][]int32      // common items below each category, ascending
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
			t.items = append(t.items, match.Placed{ID: it, Cat: id})
		}
		for i := len(f.c.Children) - 1; i >= 0; i-- {
			stack = append(stack, frame{f.c.Children[i], id})
		}
	}
	match.SortPlaced(t.items)
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

// comparePaths orders paths element by element, byte order.
func comparePaths(a, b Path) int {
	for i := 0; i < len(a) && i < len(b); i++ {
		if c := strings.Compare(a[i], b[i]); c != 0 {
			return c
		}
	}
	return len(a) - len(b)
}
