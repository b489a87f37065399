package project

import (
	"errors"
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

// Conflict names the records of a conflicting set, given by the solver's
// record numbers (positions in Records).
func (c *Compiled) Conflict(recs []int) *ConflictError {
	conflict := &ConflictError{}
	for _, r := range recs {
		conflict.Records = append(conflict.Records, c.Records[r])
	}
	return conflict
}

// NameConflict turns the solver's *solve.ConflictError, which numbers
// the records, into a *ConflictError naming them; any other error comes
// back as it is.
func (c *Compiled) NameConflict(err error) error {
	var ce *solve.ConflictError
	if errors.As(err, &ce) {
		return c.Conflict(ce.Records)
	}
	return err
}

// Consistent returns nil when the records over n items can all hold, and
// otherwise a *ConflictError naming a smallest set that cannot.
func (c *Compiled) Consistent(n int) error {
	if ok, recs := solve.Consistent(n, c.Constraints); !ok {
		return c.Conflict(recs)
	}
	return nil
}

// Compile turns every constraint record into solver constraints. It
// assumes Load reported no unknown items (unknown ids are skipped).
func (p *Project) Compile() *Compiled {
	c := &Compiled{Constraints: &solve.Constraints{}}
	tripletRecords, shapeTriplets := 0, int64(0)
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
				tripletRecords++
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
			nodes := shapeNodes(s.Tree, idx)
			c.Constraints.Triplets = appendShapeTriplets(c.Constraints.Triplets, nodes, rec)
			shapeTriplets += resolvedTriplets(nodes)
			if s.SideBySide {
				c.Constraints.SideBySide = appendSideBySide(c.Constraints.SideBySide, nodes, rec)
			}
		}
	}
	// Triplets counts what the records mean, not the (smaller) set the
	// shapes compile to, so the number reported stays that of the records.
	c.Triplets = tripletRecords + int(shapeTriplets)
	c.Groups = len(c.Constraints.Clusters)
	return c
}

// MaxShapeTripletsPerItem bounds what one shape compiles to: at most this
// many triplets for each of its items, so that memory stays linear in the
// size of the shape. A shape that needs more is refused (see ShapeProblems).
const MaxShapeTripletsPerItem = 256

// shapeNode is one node of a shape's outline over item indices, with
// categories that hold a single child (item or category) merged into it:
// they resolve no triplet of their own.
type shapeNode struct {
	kids []*shapeNode // none for an item
	rep  int32        // the item itself, or the first item below
}

// shapeNodes turns a shape's outline into shapeNodes, leaving out items
// that idx does not know (their triplets are skipped, as for triplet
// records). It returns nil when no item is left.
func shapeNodes(c *format.Category, idx func(string) (int32, bool)) *shapeNode {
	var kids []*shapeNode
	for _, id := range c.Items {
		if i, ok := idx(id); ok {
			kids = append(kids, &shapeNode{rep: i})
		}
	}
	for _, ch := range c.Children {
		if n := shapeNodes(ch, idx); n != nil {
			kids = append(kids, n)
		}
	}
	switch len(kids) {
	case 0:
		return nil
	case 1:
		return kids[0]
	}
	return &shapeNode{kids: kids, rep: kids[0].rep}
}

// shapeTripletCount is how many triplets appendShapeTriplets writes for
// the tree under n: for each category v below the root,
// (children of v - 1) × (siblings of v).
func shapeTripletCount(n *shapeNode) int64 {
	var total int64
	for _, v := range n.kids {
		if len(v.kids) > 0 {
			total += int64(len(v.kids)-1)*int64(len(n.kids)-1) + shapeTripletCount(v)
		}
	}
	return total
}

// resolvedTriplets counts the triplets the tree under n resolves (the
// length of ShapeTriplets) without listing them: a pair whose lca is the
// category v resolves one triplet with every item outside v.
func resolvedTriplets(n *shapeNode) int64 {
	if n == nil {
		return 0
	}
	// Σ pairs(v) × (all − size(v)) = all × Σ pairs(v) − Σ pairs(v) × size(v).
	var pairs, pairsBySize int64
	var walk func(v *shapeNode) int64 // returns the number of items under v
	walk = func(v *shapeNode) int64 {
		if len(v.kids) == 0 {
			return 1
		}
		var size, squares int64
		for _, k := range v.kids {
			m := walk(k)
			size += m
			squares += m * m
		}
		p := (size*size - squares) / 2
		pairs += p
		pairsBySize += p * size
		return size
	}
	all := walk(n)
	return all*pairs - pairsBySize
}

// appendSideBySide appends, for every category of a side-by-side shape
// with three or more entries, the statement that they meet in one
// category (solve.SideBySide), each entry's items one branch. Categories
// with two entries say nothing more than their triplets do.
func appendSideBySide(out []solve.SideBySide, n *shapeNode, rec int) []solve.SideBySide {
	if n == nil || len(n.kids) == 0 {
		return out
	}
	if len(n.kids) >= 3 {
		s := solve.SideBySide{Record: rec}
		for _, k := range n.kids {
			s.Branches = append(s.Branches, shapeItems(k, nil))
		}
		out = append(out, s)
	}
	for _, k := range n.kids {
		out = appendSideBySide(out, k, rec)
	}
	return out
}

// shapeItems appends the items under n.
func shapeItems(n *shapeNode, out []int32) []int32 {
	if len(n.kids) == 0 {
		return append(out, n.rep)
	}
	for _, k := range n.kids {
		out = shapeItems(k, out)
	}
	return out
}

// appendShapeTriplets appends a set of triplets that means the same as
// all the triplets the shape resolves (ShapeTriplets): a tree displays
// all of one set exactly when it displays all of the other. Its size is
// shapeTripletCount, not cubic. For every category v below the root, with
// children v1..vk (first items r1..rk) and siblings w (first items rw),
// it holds r1 ri | rw for i > 1.
//
// Why that is enough, for a tree X (h(u) is lca_X of the first items of
// u's children, so every triplet above says h(v) leaves out rw):
//  1. For a child c of u, h(c) lies under h(u): both hold c's first item,
//     and were h(u) strictly below h(c), h(c) would hold the first item of
//     a sibling of c, which its triplets leave out.
//  2. So every item of u is under h(u) (follow 1 down to the category
//     holding it), and h(u) = lca_X(items of u).
//  3. h(u) holds no other item y of the shape: let a be where u and y
//     meet in the shape, u' and w the children of a towards them. h(u)
//     lies under h(u') by 1, which leaves out rw. If w is the item y,
//     done; else h(w) holds y (by 2) but not u's first item, and h(u')
//     holds that but not rw, so the two are disjoint and y is not under
//     h(u).
//
// So each category's items form a cluster of X restricted to the shape,
// which is what displaying every triplet of the shape means; and each
// r1 ri | rw is one of those triplets. Categories with one child say
// nothing of their own and were merged by shapeNodes. Fewer triplets are
// not possible in general: a root over m pairs needs one for each two
// pairs (else a tree swapping an item between those two pairs displays
// the rest), so a shape of wide categories can exceed
// MaxShapeTripletsPerItem and is refused.
func appendShapeTriplets(out []solve.Triplet, n *shapeNode, rec int) []solve.Triplet {
	if n == nil {
		return out
	}
	for vi, v := range n.kids {
		if len(v.kids) == 0 {
			continue
		}
		for _, u := range v.kids[1:] {
			for wi, w := range n.kids {
				if wi != vi {
					out = append(out, solve.Triplet{A: v.kids[0].rep, B: u.rep, C: w.rep, Record: rec})
				}
			}
		}
		out = appendShapeTriplets(out, v, rec)
	}
	return out
}

// shapeProblems reports shapes of a constraint file that would compile to
// more than MaxShapeTripletsPerItem triplets per item, at the shape's
// header, before anything is allocated for them.
func (p *Project) shapeProblems(cf *format.ConstraintFile) format.Diags {
	var ds format.Diags
	idx := func(id string) (int32, bool) {
		i, ok := p.Index[id]
		return int32(i), ok
	}
	for _, s := range cf.Shapes {
		n := shapeNodes(s.Tree, idx)
		if n == nil {
			continue
		}
		items := int64(len(s.Refs))
		if need, limit := shapeTripletCount(n), MaxShapeTripletsPerItem*items; need > limit {
			ds.Add(s.Pos, "this shape needs %d triplets to say; the limit is %d for its %d items (%d each): split it into smaller shapes, or write its categories as [[group]] records", need, limit, items, MaxShapeTripletsPerItem)
		}
	}
	return ds
}

func sortedLeaves(ls []int32) []int32 {
	slices.Sort(ls)
	return ls
}
