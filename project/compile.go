package project

import (
	"slices"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/solve"
)

// Record is one editorial decision as the solver's conflict reports refer
// to it: what kind it is, where it is written, and who made it and why.
type Record struct {
	Kind string // "triplet", "group" or "shape"
	Pos  format.Pos
	format.Provenance
}

// Compiled holds the constraint records turned into triplets and clusters
// over item indices (positions in Project.Items).
type Compiled struct {
	Constraints *solve.Constraints
	Records     []Record
	// Triplets counts the triplets that shapes and triplet records stand
	// for; Groups counts cluster constraints.
	Triplets, Groups int
}

// Compile turns every constraint record into solver constraints. It
// assumes Load reported no unknown items (unknown ids are skipped).
func (p *Project) Compile() *Compiled {
	c := &Compiled{Constraints: &solve.Constraints{}}
	idx := func(id string) (int32, bool) {
		i, ok := p.Index[id]
		return int32(i), ok
	}
	for _, f := range p.Constraints {
		for _, t := range f.Triplets {
			rec := len(c.Records)
			c.Records = append(c.Records, Record{Kind: "triplet", Pos: t.Pos, Provenance: t.Provenance})
			a, ok1 := idx(t.Pair[0])
			b, ok2 := idx(t.Pair[1])
			o, ok3 := idx(t.Out)
			if ok1 && ok2 && ok3 {
				c.Constraints.Triplets = append(c.Constraints.Triplets, solve.Triplet{A: a, B: b, C: o, Record: rec})
			}
		}
		for _, g := range f.Groups {
			rec := len(c.Records)
			c.Records = append(c.Records, Record{Kind: "group", Pos: g.Pos, Provenance: g.Provenance})
			var leaves []int32
			for _, id := range g.Items {
				if i, ok := idx(id); ok {
					leaves = append(leaves, i)
				}
			}
			c.Constraints.Clusters = append(c.Constraints.Clusters, solve.Cluster{Leaves: sortedLeaves(leaves), Record: rec})
		}
		for _, s := range f.Shapes {
			rec := len(c.Records)
			c.Records = append(c.Records, Record{Kind: "shape", Pos: s.Pos, Provenance: s.Provenance})
			for _, t := range ShapeTriplets(s.Tree) {
				a, ok1 := idx(t[0])
				b, ok2 := idx(t[1])
				o, ok3 := idx(t[2])
				if ok1 && ok2 && ok3 {
					c.Constraints.Triplets = append(c.Constraints.Triplets, solve.Triplet{A: a, B: b, C: o, Record: rec})
				}
			}
		}
	}
	c.Triplets = len(c.Constraints.Triplets)
	c.Groups = len(c.Constraints.Clusters)
	return c
}

// ShapeTriplets lists the triplets ab|c an outline resolves: for every
// three items, the pair whose lowest common category lies strictly below
// the third's. Three items that meet in one category resolve nothing.
// Shapes are review packets (a dozen items at most), so the cubic loop is
// cheap.
func ShapeTriplets(root *format.Category) [][3]string {
	// path[i] is the chain of categories from the root to item i.
	type placed struct {
		id   string
		path []*format.Category
	}
	var items []placed
	var walk func(c *format.Category, path []*format.Category)
	walk = func(c *format.Category, path []*format.Category) {
		path = append(path, c)
		for _, it := range c.Items {
			items = append(items, placed{it, append([]*format.Category(nil), path...)})
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

func sortedLeaves(ls []int32) []int32 {
	slices.Sort(ls)
	return ls
}
