package regen

import (
	"slices"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/internal/sorted"
	"github.com/ramify-tax/ramify/solve"
	"github.com/ramify-tax/ramify/solve/hier"
)

// ToCategory turns a solved multiway tree over item indices into an
// unnamed category tree: every internal node below the root becomes a
// category, every leaf an item placed in its parent's category.
func ToCategory(t *solve.Tree, ids []string) *format.Category {
	root := &format.Category{}
	hier.Unfold(t, root, newSubcategory, func(c *format.Category, leaf int32) { c.Items = append(c.Items, ids[leaf]) })
	return root
}

// newSubcategory appends an empty subcategory to parent.
func newSubcategory(parent *format.Category) *format.Category {
	child := &format.Category{}
	parent.Children = append(parent.Children, child)
	return child
}

// FromCategory turns a category tree into a solver tree over the given
// item indices; items the index does not know are left out and
// categories left empty are dropped. It is how an outline becomes
// comparable with a solved tree.
func FromCategory(root *format.Category, index map[string]int, n int) *solve.Tree {
	t, _ := CategoryNodes(root, index, n)
	return t
}

// CategoryNodes is FromCategory that also says which node each category
// became. A category left with a single child has no node of its own and
// maps to its child's node; a category without known items is not mapped.
func CategoryNodes(root *format.Category, index map[string]int, n int) (*solve.Tree, map[*format.Category]int32) {
	return categoryNodes(root, index, n, false)
}

// categoryNodes builds the tree by the chain rule keepChains asks for
// (hier.KeepingChains or hier.CollapsingChains).
func categoryNodes(root *format.Category, index map[string]int, n int, keepChains bool) (*solve.Tree, map[*format.Category]int32) {
	in := hier.Nested[*format.Category]{
		Children: func(c *format.Category) []*format.Category { return c.Children },
		Leaves: func(c *format.Category, buf []int32) []int32 {
			for _, it := range c.Items {
				if i, ok := index[it]; ok {
					buf = append(buf, int32(i))
				}
			}
			return buf
		},
	}
	if keepChains {
		return hier.KeepingChains(root, n, in)
	}
	return hier.CollapsingChains(root, n, in)
}

// CategoryTree is FromCategory that keeps every category as a node of its
// own, single-child ones too, so that a tree read from an outline and
// printed again is the same outline. Categories without known items are
// dropped; a tree with no known item has an empty root.
func CategoryTree(root *format.Category, index map[string]int, n int) *solve.Tree {
	t, _ := categoryNodes(root, index, n, true)
	return t
}

// PriorClusters lists the leaf sets (item indices, sorted) of every
// category of a previous outline, restricted to the current items, for
// the solver's stability pull. Categories with fewer than two current
// items say nothing and are skipped.
func PriorClusters(root *format.Category, index map[string]int) [][]int32 {
	var out [][]int32
	// Each category's leaves, sorted, are the merge of its children's and
	// its own (sorted.Merge), not sorted anew at every level.
	var rec func(c *format.Category) []int32
	rec = func(c *format.Category) []int32 {
		lists := make([][]int32, 0, len(c.Children)+1)
		for _, ch := range c.Children {
			lists = append(lists, rec(ch))
		}
		var own []int32
		for _, it := range c.Items {
			if i, ok := index[it]; ok {
				own = append(own, int32(i))
			}
		}
		slices.Sort(own)
		mine := sorted.Merge(append(lists, own))
		if c != root && len(mine) >= 2 {
			out = append(out, mine)
		}
		return mine
	}
	rec(root)
	return out
}
