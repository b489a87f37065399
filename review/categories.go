package review

import (
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/project"
	"github.com/ramify-tax/ramify/solve"
)

// CategoryTree turns a category tree into a solver tree over item indices,
// like project.FromCategory, and says which node each category became. A
// category left with a single child has no node of its own and maps to
// its child's node; a category without known items is not mapped.
func CategoryTree(root *format.Category, index map[string]int, n int) (*solve.Tree, map[*format.Category]int32) {
	return project.CategoryNodes(root, index, n)
}
