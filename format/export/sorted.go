package export

import "github.com/ramify-tax/ramify/format"

// sortedCopy returns a canonically ordered deep copy of root, so that no
// writer depends on the order the caller built the tree in and none of
// them changes the caller's tree.
func sortedCopy(root *format.Category) *format.Category {
	if root == nil {
		return &format.Category{}
	}
	c := root.Clone()
	c.Sort()
	return c
}

// itemIndex maps item ids to their records; the first record of an id
// wins, as it does when a repository is loaded.
func itemIndex(items []format.Item) map[string]*format.Item {
	idx := make(map[string]*format.Item, len(items))
	for i := range items {
		if _, dup := idx[items[i].ID]; !dup {
			idx[items[i].ID] = &items[i]
		}
	}
	return idx
}

// labelOf is what an item is called in every export: its label, or its id
// when it has none, so that no exported item is nameless.
func labelOf(idx map[string]*format.Item, id string) string {
	if it, ok := idx[id]; ok && it.Label != "" {
		return it.Label
	}
	return id
}
