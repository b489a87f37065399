package format

// ShapeTriplets lists every triplet ab|c an outline resolves: for every
// three items, the pair whose lowest common category lies strictly below
// the third's. Three items that meet in one category resolve nothing. The
// list is cubic in the outline's size: it is for comparing review packets
// (a dozen items); package format/shape compiles a shape to a linear-size
// set instead.
func ShapeTriplets(root *Category) [][3]string {
	// path[i] is the chain of categories from the root to item i.
	type placed struct {
		id   string
		path []*Category
	}
	var items []placed
	var walk func(c *Category, path []*Category)
	walk = func(c *Category, path []*Category) {
		path = append(path, c)
		for _, it := range c.Items {
			items = append(items, placed{it, append([]*Category(nil), path...)})
		}
		for _, ch := range c.Children {
			walk(ch, path)
		}
	}
	walk(root, nil)
	// depth of the lowest common category of two items.
	lcaDepth := func(a, b placed) int {
		d := 0
		for d < len(a.path) && d < len(b.path) && a.path[d] == b.path[d] {
			d++
		}
		return d
	}
	var out [][3]string
	for i := 0; i < len(items); i++ {
		for j := i + 1; j < len(items); j++ {
			for k := j + 1; k < len(items); k++ {
				a, b, c := items[i], items[j], items[k]
				ab, ac, bc := lcaDepth(a, b), lcaDepth(a, c), lcaDepth(b, c)
				switch {
				case ab > ac && ab > bc:
					out = append(out, [3]string{a.id, b.id, c.id})
				case ac > ab && ac > bc:
					out = append(out, [3]string{a.id, c.id, b.id})
				case bc > ab && bc > ac:
					out = append(out, [3]string{b.id, c.id, a.id})
				}
			}
		}
	}
	return out
}
