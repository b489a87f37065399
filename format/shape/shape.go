// Package shape compiles the outline of a shape record over item indices:
// a set of triplets that means the same as every triplet the outline
// resolves but grows linearly with it, how many triplets that is before
// any is listed (so the repository loader can count a shape against its
// budget, and refuse one that is too wide, before it costs memory), and
// the entries of its categories for a side-by-side answer. It knows the
// document model only; the solver's types are made from what it yields.
package shape

import "github.com/ramify-tax/ramify/format"

// MaxTripletsPerItem bounds what one shape compiles to: at most this many
// triplets for each of its items, so that memory stays linear in the size
// of the shape. A shape that needs more is refused when it is loaded.
const MaxTripletsPerItem = 256

// Node is one node of a shape's outline over item indices, with
// categories that hold a single child (item or category) merged into it:
// they resolve no triplet of their own. A nil *Node is a shape with no
// known item, and every method takes it as such.
type Node struct {
	kids []*Node // none for an item
	rep  int32   // the item itself, or the first item below
}

// Nodes turns a shape's outline into Nodes, leaving out items that idx
// does not know (their triplets are skipped, as for triplet records). It
// returns nil when no item is left.
func Nodes(c *format.Category, idx func(string) (int32, bool)) *Node {
	var kids []*Node
	for _, id := range c.Items {
		if i, ok := idx(id); ok {
			kids = append(kids, &Node{rep: i})
		}
	}
	for _, ch := range c.Children {
		if n := Nodes(ch, idx); n != nil {
			kids = append(kids, n)
		}
	}
	switch len(kids) {
	case 0:
		return nil
	case 1:
		return kids[0]
	}
	return &Node{kids: kids, rep: kids[0].rep}
}

// TripletCount is how many triplets Triplets yields for the tree under n:
// for each category v below the root, (children of v - 1) × (siblings of
// v).
func (n *Node) TripletCount() int64 {
	if n == nil {
		return 0
	}
	var total int64
	for _, v := range n.kids {
		if len(v.kids) > 0 {
			total += int64(len(v.kids)-1)*int64(len(n.kids)-1) + v.TripletCount()
		}
	}
	return total
}

// Resolved counts the triplets the tree under n resolves (the length of
// format.ShapeTriplets) without listing them: a pair whose lca is the
// category v resolves one triplet with every item outside v.
func (n *Node) Resolved() int64 {
	if n == nil {
		return 0
	}
	// Σ pairs(v) × (all − size(v)) = all × Σ pairs(v) − Σ pairs(v) × size(v).
	var pairs, pairsBySize int64
	var walk func(v *Node) int64 // returns the number of items under v
	walk = func(v *Node) int64 {
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

// SideBySide calls yield, depth first, for every category of the shape
// with three or more entries, with each entry's items (one branch each):
// what a side-by-side answer says is that they meet in one category.
// Categories with two entries say nothing more than their triplets do.
func (n *Node) SideBySide(yield func(branches [][]int32)) {
	if n == nil || len(n.kids) == 0 {
		return
	}
	if len(n.kids) >= 3 {
		var branches [][]int32
		for _, k := range n.kids {
			branches = append(branches, k.items(nil))
		}
		yield(branches)
	}
	for _, k := range n.kids {
		k.SideBySide(yield)
	}
}

// items appends the items under n.
func (n *Node) items(out []int32) []int32 {
	if len(n.kids) == 0 {
		return append(out, n.rep)
	}
	for _, k := range n.kids {
		out = k.items(out)
	}
	return out
}

// Triplets calls yield with each triplet ab|c of a set that means the
// same as all the triplets the shape resolves (format.ShapeTriplets): a
// tree displays all of one set exactly when it displays all of the
// other. Its size is TripletCount, not cubic. For every category v below
// the root, with children v1..vk (first items r1..rk) and siblings w
// (first items rw), it yields r1 ri | rw for i > 1.
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
// nothing of their own and were merged by Nodes. Fewer triplets are not
// possible in general: a root over m pairs needs one for each two pairs
// (else a tree swapping an item between those two pairs displays the
// rest), so a shape of wide categories can exceed MaxTripletsPerItem and
// is refused.
func (n *Node) Triplets(yield func(a, b, c int32)) {
	if n == nil {
		return
	}
	for vi, v := range n.kids {
		if len(v.kids) == 0 {
			continue
		}
		for _, u := range v.kids[1:] {
			for wi, w := range n.kids {
				if wi != vi {
					yield(v.kids[0].rep, u.rep, w.rep)
				}
			}
		}
		v.Triplets(yield)
	}
}
