package solve

import "testing"

// multiway builds a tree from nested leaf lists written as a newick-like
// spec: each []any is a node, each int a leaf.
func multiway(n int, spec []any) *Tree {
	t := NewTree(n)
	var rec func(s []any) int32
	rec = func(s []any) int32 {
		var kids []int32
		for _, x := range s {
			switch x := x.(type) {
			case int:
				kids = append(kids, int32(x))
			case []any:
				kids = append(kids, rec(x))
			}
		}
		return t.Add(kids...)
	}
	t.Root = rec(spec)
	return t
}

func shaped(t *testing.T, n int, spec []any, c *Constraints, p foldParams) string {
	t.Helper()
	tr := multiway(n, spec)
	g := dgClique(t, n)
	f := newFolder(g, tr, c, p)
	f.foldChains()
	return newick(f.result())
}

func TestFoldChains(t *testing.T) {
	p := foldParams{maxChildren: 12}
	cases := []struct {
		name string
		n    int
		spec []any
		c    *Constraints
		p    foldParams
		want string
	}{{
		// The top-level category holds 9 of 10 items (over 60%): opened.
		name: "dominant top level",
		n:    10,
		spec: []any{[]any{[]any{0, 1, 2}, []any{3, 4, 5}, []any{6, 7, 8}}, 9},
		p:    p,
		want: "((a,b,c),(d,e,f),(g,h,i),j)",
	}, {
		// Inside a top-level category of 10, a subcategory of 9 (90%, over
		// 80%) is a chain and is opened; the 80/20 split beside it is not.
		name: "chain below the top",
		n:    20,
		spec: []any{
			[]any{[]any{0, 1, 2, 3, 4, 5, 6, 7, 8}, 9},
			[]any{[]any{10, 11, 12, 13}, 14},
			[]any{[]any{15, 16}, 17, 18, 19},
		},
		p:    p,
		want: "((a,b,c,d,e,f,g,h,i,j),((k,l,m,n),o),((p,q),r,s,t))",
	}, {
		// Two top-level categories: the larger is opened when it has two
		// subcategories of its own, giving three.
		name: "too few at the top",
		n:    12,
		spec: []any{[]any{[]any{0, 1, 2}, []any{3, 4, 5}, 6}, []any{7, 8, 9, 10, 11}},
		p:    p,
		want: "((a,b,c),(d,e,f),g,(h,i,j,k,l))",
	}, {
		// Opening the dominant category would give the top level 2 − 1 + 3
		// = 4 subcategories, over max_children 3: its largest
		// subcategories move up beside it instead until it holds at most
		// 60% or the top level is full.
		name: "max children",
		n:    20,
		spec: []any{[]any{[]any{0, 1, 2, 3, 4, 5}, []any{6, 7, 8, 9, 10}, []any{11, 12, 13, 14, 15}, 16}, []any{17, 18, 19}},
		p:    foldParams{maxChildren: 3},
		want: "((a,b,c,d,e,f),((g,h,i,j,k),(l,m,n,o,p),q),(r,s,t))",
	}, {
		// A cluster constraint on the dominant category keeps it whole.
		name: "pinned",
		n:    10,
		spec: []any{[]any{[]any{0, 1, 2}, []any{3, 4, 5}, []any{6, 7, 8}}, 9},
		c:    &Constraints{Clusters: []Cluster{{Leaves: []int32{0, 1, 2, 3, 4, 5, 6, 7, 8}}}},
		p:    p,
		want: "(((a,b,c),(d,e,f),(g,h,i)),j)",
	}}
	for _, c := range cases {
		if got := shaped(t, c.n, c.spec, c.c, c.p); got != c.want {
			t.Errorf("%s: foldChains gives %s, want %s", c.name, got, c.want)
		}
		tr := multiway(c.n, c.spec)
		f := newFolder(dgClique(t, c.n), tr, c.c, c.p)
		f.foldChains()
		if c.c != nil {
			if bad := Satisfies(f.result(), c.c); len(bad) > 0 {
				t.Errorf("%s: violates %v", c.name, bad)
			}
		}
	}
}

// Promotion never breaks a triplet: with ab|c recorded inside the
// dominant category (a, b in one subcategory, c in another), the category
// is the lca of a pair with its third item below it and stays whole.
func TestFoldChainsKeepsTriplets(t *testing.T) {
	spec := []any{[]any{[]any{0, 1, 2, 3, 4, 5}, []any{6, 7, 8, 9, 10}, []any{11, 12, 13, 14, 15}, 16}, []any{17, 18, 19}}
	c := &Constraints{Triplets: []Triplet{trip(0, 6, 17, 0), trip(1, 2, 6, 1)}}
	tr := multiway(20, spec)
	f := newFolder(dgClique(t, 20), tr, c, foldParams{maxChildren: 3})
	f.foldChains()
	out := f.result()
	if bad := Satisfies(out, c); len(bad) > 0 {
		t.Errorf("foldChains gives %s, violating records %v", newick(out), bad)
	}
}
