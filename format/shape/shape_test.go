package shape

import (
	"math/rand/v2"
	"slices"
	"strconv"
	"testing"

	"github.com/ramify-tax/ramify/format"
)

// leafTree is a rooted tree over leaves 0..n-1 as a parent array: nodes
// 0..n-1 are the leaves, parent[root] = -1.
type leafTree []int

// allTrees lists every rooted tree (internal nodes with two or more
// children) over n labelled leaves when binaryOnly is false, or every
// rooted binary tree when it is true, by inserting leaf k into each tree
// over 0..k-1: above any node (a new parent of that node and k) or, for
// all trees, as one more child of an internal node. Each tree comes out
// once (the standard insertion construction; 1, 1, 4, 26, 236, 2752
// trees for n = 1..6, and (2n-3)!! binary ones: OEIS A000311, A001147).
func allTrees(n int, binaryOnly bool) []leafTree {
	// Node ids: leaves 0..n-1, internal nodes n, n+1, ... as created.
	type tree struct{ parent map[int]int }
	trees := []tree{{parent: map[int]int{0: -1}}}
	next := func(t tree) int { // a fresh internal id
		id := n
		for {
			if _, ok := t.parent[id]; !ok {
				return id
			}
			id++
		}
	}
	for k := 1; k < n; k++ {
		var grown []tree
		for _, t := range trees {
			nodes := make([]int, 0, len(t.parent))
			for v := range t.parent {
				nodes = append(nodes, v)
			}
			slices.Sort(nodes)
			for _, v := range nodes {
				// k and v under a new node that takes v's place.
				c := tree{parent: map[int]int{}}
				for a, b := range t.parent {
					c.parent[a] = b
				}
				x := next(c)
				c.parent[x] = t.parent[v]
				c.parent[v] = x
				c.parent[k] = x
				grown = append(grown, c)
				if !binaryOnly && v >= n {
					d := tree{parent: map[int]int{}}
					for a, b := range t.parent {
						d.parent[a] = b
					}
					d.parent[k] = v
					grown = append(grown, d)
				}
			}
		}
		trees = grown
	}
	out := make([]leafTree, len(trees))
	for i, t := range trees {
		size := 0
		for v := range t.parent {
			size = max(size, v+1)
		}
		lt := make(leafTree, size)
		for j := range lt {
			lt[j] = -2 // unused id
		}
		for v, p := range t.parent {
			lt[v] = p
		}
		out[i] = lt
	}
	return out
}

// ancestors lists v and its ancestors, v first.
func (t leafTree) ancestors(v int) []int {
	var out []int
	for ; v >= 0; v = t[v] {
		out = append(out, v)
	}
	return out
}

// lcaDepth is the number of common ancestors of a and b (the depth of
// their lca, counting the root as 1).
func (t leafTree) lcaDepth(a, b int) int {
	pa, pb := t.ancestors(a), t.ancestors(b)
	d := 0
	for i, j := len(pa)-1, len(pb)-1; i >= 0 && j >= 0 && pa[i] == pb[j]; i, j = i-1, j-1 {
		d++
	}
	return d
}

// displays reports whether t displays the triplet ab|c.
func (t leafTree) displays(a, b, c int) bool {
	return t.lcaDepth(a, b) > t.lcaDepth(a, c)
}

func displaysAll(t leafTree, trips [][3]int32) bool {
	for _, tr := range trips {
		if !t.displays(int(tr[0]), int(tr[1]), int(tr[2])) {
			return false
		}
	}
	return true
}

// shapeOf turns a leafTree into a shape outline over items "i0".."i{n-1}",
// with the categories in a shuffled order and, at random, categories that
// hold a single child (they resolve nothing of their own).
func shapeOf(t leafTree, n int, r *rand.Rand) *format.Category {
	kids := map[int][]int{}
	root := -1
	for v, p := range t {
		switch {
		case p == -1:
			root = v
		case p >= 0:
			kids[p] = append(kids[p], v)
		}
	}
	var build func(v int) *format.Category
	build = func(v int) *format.Category {
		c := &format.Category{Name: "c" + strconv.Itoa(v)}
		ks := kids[v]
		r.Shuffle(len(ks), func(i, j int) { ks[i], ks[j] = ks[j], ks[i] })
		for _, k := range ks {
			if k < n {
				if r.IntN(5) == 0 { // an item alone in a category
					c.Children = append(c.Children, &format.Category{Name: "one" + strconv.Itoa(k), Items: []string{"i" + strconv.Itoa(k)}})
				} else {
					c.Items = append(c.Items, "i"+strconv.Itoa(k))
				}
				continue
			}
			ch := build(k)
			if r.IntN(6) == 0 { // a category wrapped in another
				ch = &format.Category{Name: "wrap" + strconv.Itoa(k), Children: []*format.Category{ch}}
			}
			c.Children = append(c.Children, ch)
		}
		return c
	}
	if root < n { // a single leaf
		return &format.Category{Items: []string{"i" + strconv.Itoa(root)}}
	}
	return build(root)
}

// The compiled triplets of a shape mean the same as every triplet the
// shape resolves (the cubic format.ShapeTriplets list): for
// every shape over up to 6 items and every tree over those items (all
// rooted trees up to 5 items, all binary trees up to 6, with an item
// outside the shape too), the tree displays all of one set exactly when
// it displays all of the other; and each compiled triplet is one of the
// shape's.
func TestShapeCompileMeansTheSameTriplets(t *testing.T) {
	r := rand.New(rand.NewPCG(12, 1))
	for n := 3; n <= 6; n++ {
		shapes := allTrees(n, false)
		var candidates []leafTree
		if n <= 5 {
			candidates = allTrees(n+1, false) // leaf n lies outside the shape
		} else {
			candidates = allTrees(n+1, true)
		}
		if n == 6 {
			r.Shuffle(len(shapes), func(i, j int) { shapes[i], shapes[j] = shapes[j], shapes[i] })
			shapes = shapes[:120]
		}
		for si, st := range shapes {
			root := shapeOf(st, n, r)
			idx := func(id string) (int32, bool) {
				k, err := strconv.Atoi(id[1:])
				return int32(k), err == nil
			}
			var full [][3]int32
			for _, tr := range format.ShapeTriplets(root) {
				a, _ := idx(tr[0])
				b, _ := idx(tr[1])
				c, _ := idx(tr[2])
				full = append(full, [3]int32{a, b, c})
			}
			nodes := Nodes(root, idx)
			var compiled [][3]int32
			nodes.Triplets(func(a, b, c int32) { compiled = append(compiled, [3]int32{a, b, c}) })
			if got := nodes.TripletCount(); got != int64(len(compiled)) {
				t.Fatalf("n=%d shape %d: TripletCount %d, compiled %d", n, si, got, len(compiled))
			}
			for _, tr := range compiled {
				if !slices.ContainsFunc(full, func(f [3]int32) bool {
					return (f[0] == tr[0] && f[1] == tr[1] || f[0] == tr[1] && f[1] == tr[0]) && f[2] == tr[2]
				}) {
					t.Fatalf("n=%d shape %s: compiled %d%d|%d is not a triplet of the shape", n, outlineText(root), tr[0], tr[1], tr[2])
				}
			}
			for _, x := range candidates {
				if a, b := displaysAll(x, full), displaysAll(x, compiled); a != b {
					t.Fatalf("n=%d shape %s: tree %v displays all %d shape triplets: %v, all %d compiled: %v", n, outlineText(root), x, len(full), a, len(compiled), b)
				}
			}
		}
	}
}

func outlineText(c *format.Category) string {
	s := "("
	for _, it := range c.Items {
		s += it + " "
	}
	for _, ch := range c.Children {
		s += outlineText(ch) + " "
	}
	return s + ")"
}

// The enumeration behind the comparison is complete: the counts of rooted
// trees (OEIS A000311: 1, 1, 4, 26, 236, 2752) and of rooted binary trees
// ((2n-3)!!: 1, 1, 3, 15, 105, 945) over n labelled leaves.
func TestAllTreesCounts(t *testing.T) {
	all := []int{1, 1, 4, 26, 236, 2752}
	bin := []int{1, 1, 3, 15, 105, 945}
	for n := 1; n <= 6; n++ {
		if got := len(allTrees(n, false)); got != all[n-1] {
			t.Errorf("rooted trees over %d leaves: %d, want %d", n, got, all[n-1])
		}
		if got := len(allTrees(n, true)); got != bin[n-1] {
			t.Errorf("binary trees over %d leaves: %d, want %d", n, got, bin[n-1])
		}
	}
}

// Resolved counts what ShapeTriplets lists, on random shapes.
func TestResolvedTripletsCount(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	idx := func(id string) (int32, bool) {
		k, err := strconv.Atoi(id[1:])
		return int32(k), err == nil
	}
	for n := 3; n <= 6; n++ {
		for _, st := range allTrees(n, false) {
			root := shapeOf(st, n, r)
			if got, want := Nodes(root, idx).Resolved(), int64(len(format.ShapeTriplets(root))); got != want {
				t.Fatalf("shape %s: Resolved %d, ShapeTriplets lists %d", outlineText(root), got, want)
			}
		}
	}
}
