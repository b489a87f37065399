package hier

import (
	"errors"
	"fmt"
	"math/bits"
)

// Index lays a tree out for range questions: the leaves in depth-first
// order, so that every node's leaves take the contiguous positions
// [Lo[v], Hi[v]), with each node's parent and depth and the nodes in
// post-order. Nodes and leaves the root does not reach get Pos −1,
// Parent −1, Depth 0 and an empty range.
type Index struct {
	N      int     // leaves of the tree
	Root   int32   // the tree's root
	Pos    []int32 // leaf → position (−1 when unreachable)
	LeafAt []int32 // position → leaf
	Lo, Hi []int32 // node → its positions [Lo, Hi)
	Depth  []int32 // node → depth, the root 0
	Parent []int32 // node → parent (−1 for the root and unreachable nodes)
	Post   []int32 // reachable nodes, children before parents
	// gapNode[g] is the lowest node holding both the leaves at positions
	// g and g+1: the node whose child boundary falls between them.
	gapNode []int32
}

// NewIndex walks t once, without recursion. It does not check t (see
// Check); a node reached twice is indexed twice.
func NewIndex(t *Tree) *Index {
	nodes := t.NumNodes()
	x := &Index{
		N:       t.N,
		Root:    t.Root,
		Pos:     make([]int32, t.N),
		LeafAt:  make([]int32, 0, t.N),
		Lo:      make([]int32, nodes),
		Hi:      make([]int32, nodes),
		Depth:   make([]int32, nodes),
		Parent:  make([]int32, nodes),
		Post:    make([]int32, 0, nodes),
		gapNode: make([]int32, 0, t.N),
	}
	for i := range x.Pos {
		x.Pos[i] = -1
	}
	for i := range x.Parent {
		x.Parent[i] = -1
	}
	if t.N == 0 {
		return x
	}
	type frame struct {
		v    int32
		next int
	}
	stack := []frame{{t.Root, 0}}
	for len(stack) > 0 {
		f := &stack[len(stack)-1]
		v := f.v
		if t.IsLeaf(v) {
			p := int32(len(x.LeafAt))
			x.Pos[v] = p
			x.LeafAt = append(x.LeafAt, v)
			x.Lo[v], x.Hi[v] = p, p+1
			x.Post = append(x.Post, v)
			stack = stack[:len(stack)-1]
			continue
		}
		kids := t.Kids[v]
		if f.next < len(kids) {
			if f.next > 0 {
				// The gap before the next child's first leaf belongs to v.
				x.gapNode = append(x.gapNode, v)
			} else {
				x.Lo[v] = int32(len(x.LeafAt))
			}
			c := kids[f.next]
			f.next++
			x.Parent[c] = v
			x.Depth[c] = x.Depth[v] + 1
			stack = append(stack, frame{c, 0})
			continue
		}
		if len(kids) == 0 {
			x.Lo[v] = int32(len(x.LeafAt))
		}
		x.Hi[v] = int32(len(x.LeafAt))
		x.Post = append(x.Post, v)
		stack = stack[:len(stack)-1]
	}
	return x
}

// Size is the number of leaves below v.
func (x *Index) Size(v int32) int32 { return x.Hi[v] - x.Lo[v] }

// Leaves lists the leaves below v in depth-first order (a shared slice; do
// not modify).
func (x *Index) Leaves(v int32) []int32 { return x.LeafAt[x.Lo[v]:x.Hi[v]] }

// LCAIndex is an Index that also answers lowest-common-ancestor questions
// about leaves in O(1) after O(n log n) preparation. The LCA of the leaves
// at positions p < q is the shallowest owner of the gaps p..q−1 between
// them (each gap belongs to the lowest node holding its two sides), found
// by a sparse-table range minimum over the gaps' owner depths (Bender &
// Farach-Colton, "The LCA problem revisited", LATIN 2000, on the leaf
// order instead of the Euler tour).
type LCAIndex struct {
	*Index
	gapDepth []int32   // gap → depth of its owner
	table    [][]int32 // table[k][g] = gap of least depth in [g, g+2^k)
}

// NewLCAIndex indexes t and prepares its LCA table.
func NewLCAIndex(t *Tree) *LCAIndex { return NewIndex(t).WithLCA() }

// WithLCA prepares the LCA table over x.
func (x *Index) WithLCA() *LCAIndex {
	l := &LCAIndex{Index: x}
	m := len(x.gapNode)
	if m == 0 {
		return l
	}
	l.gapDepth = make([]int32, m)
	for g, v := range x.gapNode {
		l.gapDepth[g] = x.Depth[v]
	}
	levels := bits.Len(uint(m))
	l.table = make([][]int32, levels)
	l.table[0] = make([]int32, m)
	for i := range l.table[0] {
		l.table[0][i] = int32(i)
	}
	for k := 1; k < levels; k++ {
		prev := l.table[k-1]
		cur := make([]int32, m-(1<<k)+1)
		half := 1 << (k - 1)
		for i := range cur {
			a, b := prev[i], prev[i+half]
			if l.gapDepth[b] < l.gapDepth[a] {
				a = b
			}
			cur[i] = a
		}
		l.table[k] = cur
	}
	return l
}

// LCAPos is the lowest common ancestor of the leaves at positions p ≤ q.
func (l *LCAIndex) LCAPos(p, q int32) int32 {
	if p == q {
		return l.LeafAt[p]
	}
	a, b := int(p), int(q-1) // gaps p..q-1
	k := bits.Len(uint(b-a+1)) - 1
	x, y := l.table[k][a], l.table[k][b-(1<<k)+1]
	if l.gapDepth[y] < l.gapDepth[x] {
		x = y
	}
	return l.gapNode[x]
}

// LCA is the lowest common ancestor of two leaves the root reaches (a
// itself when a == b).
func (l *LCAIndex) LCA(a, b int32) int32 {
	if a == b {
		return a
	}
	p, q := l.Pos[a], l.Pos[b]
	if p > q {
		p, q = q, p
	}
	return l.LCAPos(p, q)
}

// Check reports why t cannot be walked safely: ids out of range, a leaf
// with children, or a node reachable twice (which also catches a cycle).
func Check(t *Tree) error {
	if t == nil {
		return errors.New("nil tree")
	}
	nodes := len(t.Kids)
	if t.N < 0 || t.N > nodes {
		return fmt.Errorf("tree has %d leaves but %d nodes", t.N, nodes)
	}
	if nodes == 0 {
		return errors.New("tree has no nodes")
	}
	if t.Root < 0 || int(t.Root) >= nodes {
		return fmt.Errorf("root %d outside 0..%d", t.Root, nodes-1)
	}
	seen := make([]bool, nodes)
	seen[t.Root] = true
	stack := []int32{t.Root}
	for len(stack) > 0 {
		v := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		if int(v) < t.N && len(t.Kids[v]) > 0 {
			return fmt.Errorf("leaf %d has children", v)
		}
		for _, c := range t.Kids[v] {
			if c < 0 || int(c) >= nodes {
				return fmt.Errorf("node %d has child %d outside 0..%d", v, c, nodes-1)
			}
			if seen[c] {
				return fmt.Errorf("node %d is reachable twice", c)
			}
			seen[c] = true
			stack = append(stack, c)
		}
	}
	return nil
}
