package hier

// Tree is a rooted tree over leaves 0..N-1. Node ids 0..N-1 are the leaves
// (items); ids N and up are internal nodes. Kids[v] lists the children of
// internal node v (nil for leaves); Root is the root's id. Height is
// optional (linkage methods record merge heights there, indexed by node id).
type Tree struct {
	N      int
	Kids   [][]int32
	Root   int32
	Height []float64
}

// NewTree returns a tree with n leaves and no internal nodes yet.
func NewTree(n int) *Tree {
	t := &Tree{N: n, Kids: make([][]int32, n, 2*n)}
	if n == 1 {
		t.Root = 0
	}
	return t
}

// Add creates an internal node over kids and returns its id.
func (t *Tree) Add(kids ...int32) int32 {
	id := int32(len(t.Kids))
	t.Kids = append(t.Kids, append([]int32(nil), kids...))
	t.Root = id
	return id
}

// NumNodes is the number of nodes, leaves included.
func (t *Tree) NumNodes() int { return len(t.Kids) }

// IsLeaf reports whether v is a leaf.
func (t *Tree) IsLeaf(v int32) bool { return int(v) < t.N }

// PostOrder returns the nodes reachable from the root, children before
// parents, without recursion.
func (t *Tree) PostOrder() []int32 {
	out := make([]int32, 0, len(t.Kids))
	type frame struct {
		v    int32
		next int
	}
	stack := []frame{{t.Root, 0}}
	for len(stack) > 0 {
		f := &stack[len(stack)-1]
		if f.next < len(t.Kids[f.v]) {
			c := t.Kids[f.v][f.next]
			f.next++
			stack = append(stack, frame{c, 0})
			continue
		}
		out = append(out, f.v)
		stack = stack[:len(stack)-1]
	}
	return out
}

// Sizes returns the number of leaves below each node.
func (t *Tree) Sizes() []int {
	size := make([]int, len(t.Kids))
	for _, v := range t.PostOrder() {
		if t.IsLeaf(v) {
			size[v] = 1
			continue
		}
		for _, c := range t.Kids[v] {
			size[v] += size[c]
		}
	}
	return size
}

// Parents returns the parent of every node (-1 for the root and for nodes
// not reachable from it).
func (t *Tree) Parents() []int32 {
	p := make([]int32, len(t.Kids))
	for i := range p {
		p[i] = -1
	}
	for v, kids := range t.Kids {
		for _, c := range kids {
			p[c] = int32(v)
		}
	}
	p[t.Root] = -1
	return p
}

// Leaves lists the leaves below v in child order.
func (t *Tree) Leaves(v int32) []int32 {
	var out []int32
	stack := []int32{v}
	for len(stack) > 0 {
		x := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		if t.IsLeaf(x) {
			out = append(out, x)
			continue
		}
		for i := len(t.Kids[x]) - 1; i >= 0; i-- {
			stack = append(stack, t.Kids[x][i])
		}
	}
	return out
}
