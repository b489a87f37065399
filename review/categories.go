package review

import (
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/solve"
)

// CategoryTree turns a category tree into a solver tree over item indices,
// like project.FromCategory, and says which node each category became. A
// category left with a single child has no node of its own and maps to
// its child's node; a category without known items is not mapped.
func CategoryTree(root *format.Category, index map[string]int, n int) (*solve.Tree, map[*format.Category]int32) {
	t := solve.NewTree(n)
	nodes := map[*format.Category]int32{}
	var build func(c *format.Category) (int32, bool)
	build = func(c *format.Category) (int32, bool) {
		var kids []int32
		for _, ch := range c.Children {
			if id, ok := build(ch); ok {
				kids = append(kids, id)
			}
		}
		for _, it := range c.Items {
			if i, ok := index[it]; ok {
				kids = append(kids, int32(i))
			}
		}
		var id int32
		switch len(kids) {
		case 0:
			return 0, false
		case 1:
			id = kids[0]
		default:
			id = t.Add(kids...)
		}
		nodes[c] = id
		return id, true
	}
	if r, ok := build(root); ok {
		t.Root = r
	}
	return t, nodes
}
