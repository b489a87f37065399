package hier

import (
	"slices"
	"testing"
)

// cat is a category for the adapter tests: subcategories, then leaves,
// where a negative leaf stands for an item the tree is not over.
type cat struct {
	kids   []*cat
	leaves []int32
}

var nestedCats = Nested[*cat]{
	Children: func(c *cat) []*cat { return c.kids },
	Leaves: func(c *cat, buf []int32) []int32 {
		for _, l := range c.leaves {
			if l >= 0 {
				buf = append(buf, l)
			}
		}
		return buf
	},
}

func TestChainRules(t *testing.T) {
	// root { chain { inner { 0 1 } } single { 2 } empty { -1 } 3 }
	inner := &cat{leaves: []int32{0, 1}}
	chain := &cat{kids: []*cat{inner}}
	single := &cat{leaves: []int32{2}}
	empty := &cat{leaves: []int32{-1}}
	root := &cat{kids: []*cat{chain, single, empty}, leaves: []int32{3}}
	tests := []struct {
		name  string
		build func(*cat, int, Nested[*cat]) (*Tree, map[*cat]int32)
		kids  [][]int32 // internal nodes' children, from id N on
		nodes map[*cat]int32
	}{
		{"collapsing", CollapsingChains[*cat],
			[][]int32{{0, 1}, {4, 2, 3}},
			map[*cat]int32{inner: 4, chain: 4, single: 2, root: 5}},
		{"keeping", KeepingChains[*cat],
			[][]int32{{0, 1}, {4}, {2}, {5, 6, 3}},
			map[*cat]int32{inner: 4, chain: 5, single: 6, root: 7}},
	}
	for _, tc := range tests {
		tr, nodes := tc.build(root, 4, nestedCats)
		if got := tr.Kids[4:]; !slices.EqualFunc(got, tc.kids, slices.Equal) {
			t.Errorf("%s: internal nodes %v, want %v", tc.name, got, tc.kids)
		}
		if tr.Root != nodes[root] || len(nodes) != len(tc.nodes) {
			t.Errorf("%s: root %d, nodes %v", tc.name, tr.Root, nodes)
		}
		for c, want := range tc.nodes {
			if nodes[c] != want {
				t.Errorf("%s: category node %d, want %d", tc.name, nodes[c], want)
			}
		}
	}
}

func TestChainRulesEmpty(t *testing.T) {
	root := &cat{leaves: []int32{-1}}
	if tr, nodes := CollapsingChains(root, 0, nestedCats); len(nodes) != 0 || tr.NumNodes() != 0 {
		t.Errorf("collapsing an empty outline: %d nodes, map %v", tr.NumNodes(), nodes)
	}
	if tr, nodes := KeepingChains(root, 0, nestedCats); nodes[root] != 0 || tr.NumNodes() != 1 || tr.Root != 0 {
		t.Errorf("keeping an empty outline: %d nodes, root %d", tr.NumNodes(), tr.Root)
	}
}

func TestUnfoldInvertsKeepingChains(t *testing.T) {
	// root { chain { inner { 0 1 } } single { 2 } 3 }
	root := &cat{kids: []*cat{{kids: []*cat{{leaves: []int32{0, 1}}}}, {leaves: []int32{2}}}, leaves: []int32{3}}
	tr, _ := KeepingChains(root, 4, nestedCats)
	back := &cat{}
	Unfold(tr, back,
		func(p *cat) *cat { c := &cat{}; p.kids = append(p.kids, c); return c },
		func(c *cat, leaf int32) { c.leaves = append(c.leaves, leaf) })
	again, _ := KeepingChains(back, 4, nestedCats)
	if !slices.EqualFunc(again.Kids, tr.Kids, slices.Equal) {
		t.Errorf("unfolded and read again: %v, want %v", again.Kids, tr.Kids)
	}
	single := NewTree(1)
	one := &cat{}
	Unfold(single, one, func(*cat) *cat { t.Fatal("no category below a leaf root"); return nil },
		func(c *cat, leaf int32) { c.leaves = append(c.leaves, leaf) })
	if !slices.Equal(one.leaves, []int32{0}) {
		t.Errorf("a one-leaf tree unfolds to %v", one.leaves)
	}
}
