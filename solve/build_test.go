package solve

import (
	"fmt"
	"math/rand/v2"
	"sort"
	"strings"
	"testing"

	"github.com/ramify-tax/ramify/internal/naivelca"
)

// Leaves a..e are 0..4 in the BUILD examples below.
const (
	la int32 = iota
	lb
	lc
	ld
	le
)

func trip(a, b, c int32, rec int) Triplet { return Triplet{A: a, B: b, C: c, Record: rec} }

// newick prints a tree with leaves as letters (a = 0) and children in the
// tree's order, for readable failures.
func newick(t *Tree) string {
	var rec func(v int32) string
	rec = func(v int32) string {
		if t.IsLeaf(v) {
			if t.N <= 26 {
				return string(rune('a' + v))
			}
			return fmt.Sprint(v)
		}
		parts := make([]string, len(t.Kids[v]))
		for i, k := range t.Kids[v] {
			parts[i] = rec(k)
		}
		return "(" + strings.Join(parts, ",") + ")"
	}
	return rec(t.Root)
}

func TestBuildExamples(t *testing.T) {
	// Small examples of our own for BUILD (Aho et al., SIAM J. Comput.
	// 1981), each traced by hand; not taken from the paper.
	cases := []struct {
		name     string
		n        int
		c        Constraints
		want     string // tree, or "" when inconsistent
		conflict []int
	}{
		{"ex1", 4, Constraints{Triplets: []Triplet{trip(la, lb, lc, 0), trip(la, lb, ld, 1), trip(lc, ld, la, 2)}}, "((a,b),(c,d))", nil},
		{"ex2", 3, Constraints{Triplets: []Triplet{trip(la, lb, lc, 0), trip(la, lc, lb, 1)}}, "", []int{0, 1}},
		{"ex2 on four", 4, Constraints{Triplets: []Triplet{trip(la, lb, lc, 0), trip(la, lc, lb, 1)}}, "", []int{0, 1}},
		// All three resolutions of one triple: any two already conflict;
		// BUILD's witness is the two records whose edges joined {a,b,c}.
		{"ex2 three", 3, Constraints{Triplets: []Triplet{trip(la, lb, lc, 0), trip(lb, lc, la, 1), trip(la, lc, lb, 2)}}, "", []int{0, 1}},
		// The hand trace gives (((b,c),a),(d,e)); children here are ordered
		// by their smallest leaf.
		{"ex3", 5, Constraints{Triplets: []Triplet{trip(lb, lc, la, 0), trip(la, lc, ld, 1), trip(ld, le, lb, 2)}}, "((a,(b,c)),(d,e))", nil},
		{"ex4", 4, Constraints{}, "(a,b,c,d)", nil},
		{"ex6", 5, Constraints{
			Clusters: []Cluster{{Leaves: []int32{la, lb, lc}, Record: 0}},
			Triplets: []Triplet{trip(la, ld, lb, 1)},
		}, "", []int{0, 1}},
		{"cluster", 5, Constraints{Clusters: []Cluster{{Leaves: []int32{lc, la, lb}, Record: 0}}}, "((a,b,c),d,e)", nil},
		{"self conflict", 4, Constraints{Triplets: []Triplet{trip(la, lb, la, 5), trip(lc, ld, la, 6)}}, "", []int{5}},
	}
	for _, c := range cases {
		tr, ok := Build(c.n, &c.c)
		okC, recs := Consistent(c.n, &c.c)
		if ok != okC {
			t.Errorf("%s: Build ok %v, Consistent %v", c.name, ok, okC)
		}
		if c.want == "" {
			if ok {
				t.Errorf("%s: built %s, want inconsistent", c.name, newick(tr))
			}
			if fmt.Sprint(recs) != fmt.Sprint(c.conflict) {
				t.Errorf("%s: conflict %v, want %v", c.name, recs, c.conflict)
			}
			continue
		}
		if !ok {
			t.Errorf("%s: inconsistent, want %s", c.name, c.want)
			continue
		}
		if got := newick(tr); got != c.want {
			t.Errorf("%s: built %s, want %s", c.name, got, c.want)
		}
		if bad := Satisfies(tr, &c.c); len(bad) > 0 {
			t.Errorf("%s: built tree violates %v", c.name, bad)
		}
	}
}

// displayedTriplet is the triplet, numbered rec, that the tree of the
// parent-climbing oracle l displays on the leaves a, b, c (the tests check
// the solver against code it does not share); ok is false when the tree
// leaves them unresolved.
func displayedTriplet(l *naivelca.Tree, a, b, c int32, rec int) (tr Triplet, ok bool) {
	switch l.Topology(a, b, c) {
	case 1:
		return trip(a, b, c, rec), true
	case 2:
		return trip(a, c, b, rec), true
	case 3:
		return trip(b, c, a, rec), true
	}
	return Triplet{}, false
}

// allTriplets lists, for every triple resolved by t, its triplet.
func allTriplets(t *Tree) []Triplet {
	l := naivelca.New(t.Parents())
	var out []Triplet
	n := int32(t.N)
	for i := int32(0); i < n; i++ {
		for j := i + 1; j < n; j++ {
			for k := j + 1; k < n; k++ {
				if tr, ok := displayedTriplet(l, i, j, k, len(out)); ok {
					out = append(out, tr)
				}
			}
		}
	}
	return out
}

// clusterSet lists the leaf sets of t's internal nodes, as sorted strings.
func clusterSet(t *Tree) []string {
	var out []string
	for v := t.N; v < t.NumNodes(); v++ {
		ls := t.Leaves(int32(v))
		sort.Slice(ls, func(i, j int) bool { return ls[i] < ls[j] })
		out = append(out, fmt.Sprint(ls))
	}
	sort.Strings(out)
	return out
}

func TestBuildIdentityProperty(t *testing.T) {
	// BUILD on all C(n,3) triplets of a binary tree returns that tree: it
	// returns a tree displaying them all (Aho et al. 1981), and a binary
	// tree is the only tree that displays all of its own triplets. 50
	// random trees on 10 leaves, and some of other sizes.
	r := rand.New(rand.NewPCG(7, 7))
	for trial := 0; trial < 80; trial++ {
		n := 10
		if trial >= 50 {
			n = 3 + r.IntN(14)
		}
		tr := RandomBinaryTree(r, n)
		c := &Constraints{Triplets: allTriplets(tr)}
		got, ok := Build(n, c)
		if !ok {
			t.Fatalf("trial %d: triplets of %s called inconsistent", trial, newick(tr))
		}
		if fmt.Sprint(clusterSet(got)) != fmt.Sprint(clusterSet(tr)) {
			t.Fatalf("trial %d: built %s from %s", trial, newick(got), newick(tr))
		}
	}
}

// randomConstraints draws triplets and clusters on n leaves, some records
// holding two triplets (as a shape does).
func randomConstraints(r *rand.Rand, n, triplets, clusters int) *Constraints {
	c := &Constraints{}
	rec := 0
	for i := 0; i < triplets; i++ {
		p := r.Perm(n)
		c.Triplets = append(c.Triplets, trip(int32(p[0]), int32(p[1]), int32(p[2]), rec))
		if r.IntN(4) != 0 {
			rec++
		}
	}
	rec++
	for i := 0; i < clusters; i++ {
		size := 2 + r.IntN(n-2)
		p := r.Perm(n)[:size]
		ls := make([]int32, size)
		for k, x := range p {
			ls[k] = int32(x)
		}
		c.Clusters = append(c.Clusters, Cluster{Leaves: ls, Record: rec})
		rec++
	}
	return c
}

// onlyRecords keeps the constraints whose record is in keep.
func onlyRecords(c *Constraints, keep []int) *Constraints {
	in := map[int]bool{}
	for _, k := range keep {
		in[k] = true
	}
	out := &Constraints{}
	for _, t := range c.Triplets {
		if in[t.Record] {
			out.Triplets = append(out.Triplets, t)
		}
	}
	for _, cl := range c.Clusters {
		if in[cl.Record] {
			out.Clusters = append(out.Clusters, cl)
		}
	}
	return out
}

func TestConsistentAgreesWithExactOracle(t *testing.T) {
	// Consistency decided by BUILD against the constrained subset DP of
	// export_test.go (OptimalConstrained's ok, an independent implementation of
	// the Aho-graph condition), on random small constraint sets; and on
	// every inconsistent set the conflict returned is minimal: inconsistent on
	// its own, consistent after dropping any one record.
	r := rand.New(rand.NewPCG(11, 3))
	inconsistent := 0
	for trial := 0; trial < 400; trial++ {
		n := 4 + r.IntN(5)
		c := randomConstraints(r, n, 1+r.IntN(7), r.IntN(3))
		g := dgClique(t, n)
		_, _, okExact := OptimalConstrained(g, c)
		ok, recs := Consistent(n, c)
		if ok != okExact {
			t.Fatalf("trial %d: Consistent %v, exact oracle %v for %+v", trial, ok, okExact, c)
		}
		tr, okB := Build(n, c)
		if okB != ok {
			t.Fatalf("trial %d: Build %v, Consistent %v", trial, okB, ok)
		}
		if ok {
			if bad := Satisfies(tr, c); len(bad) > 0 {
				t.Fatalf("trial %d: BUILD tree %s violates %v", trial, newick(tr), bad)
			}
			continue
		}
		inconsistent++
		if !sort.IntsAreSorted(recs) || len(recs) == 0 {
			t.Fatalf("trial %d: conflict %v", trial, recs)
		}
		if okSub, _ := Consistent(n, onlyRecords(c, recs)); okSub {
			t.Fatalf("trial %d: conflict %v is consistent on its own", trial, recs)
		}
		for i := range recs {
			rest := append(append([]int(nil), recs[:i]...), recs[i+1:]...)
			if okRest, _ := Consistent(n, onlyRecords(c, rest)); !okRest {
				t.Fatalf("trial %d: conflict %v is not minimal: %v still conflicts", trial, recs, rest)
			}
		}
		again, recs2 := Consistent(n, c)
		if again || fmt.Sprint(recs2) != fmt.Sprint(recs) {
			t.Fatalf("trial %d: second run gave %v %v", trial, again, recs2)
		}
	}
	if inconsistent < 50 {
		t.Fatalf("only %d inconsistent sets drawn; the test needs more", inconsistent)
	}
}

func TestConsistentLargeMinimalConflict(t *testing.T) {
	// 50,000 items and 3,000 consistent records drawn from a hidden tree,
	// plus two records that contradict one of them: the conflict found is
	// exactly that contradiction.
	r := rand.New(rand.NewPCG(5, 5))
	n := 50000
	if testing.Short() {
		n = 5000
	}
	hidden := RandomBinaryTree(r, n)
	l := naivelca.New(hidden.Parents())
	c := &Constraints{}
	for len(c.Triplets) < 3000 {
		a, b, x := int32(r.IntN(n)), int32(r.IntN(n)), int32(r.IntN(n))
		if a == b || b == x || a == x {
			continue
		}
		if tr, ok := displayedTriplet(l, a, b, x, len(c.Triplets)); ok {
			c.Triplets = append(c.Triplets, tr)
		}
	}
	if ok, recs := Consistent(n, c); !ok {
		t.Fatalf("consistent set called inconsistent (%v)", recs)
	}
	// Record 3000 swaps the pair and the out-item of record 17.
	t17 := c.Triplets[17]
	c.Triplets = append(c.Triplets, trip(t17.A, t17.C, t17.B, 3000))
	ok, recs := Consistent(n, c)
	if ok || fmt.Sprint(recs) != fmt.Sprint([]int{17, 3000}) {
		t.Fatalf("got %v %v, want the conflict [17 3000]", ok, recs)
	}
}

// BenchmarkConsistent decides 100,000 items with 5,000 records drawn from
// a hidden tree (4,000 triplet records, some holding several triplets, and
// 1,000 cluster records), consistent and with one contradicting record
// added (which adds the minimal-conflict search).
func BenchmarkConsistent(b *testing.B) {
	r := rand.New(rand.NewPCG(1, 1))
	n := 100000
	hidden := RandomBinaryTree(r, n)
	c := hiddenConstraints(r, hidden, 4000, 1000)
	for name, cs := range map[string]*Constraints{"consistent": c, "conflict": withContradiction(c)} {
		b.Run(name, func(b *testing.B) {
			b.ReportAllocs()
			for i := 0; i < b.N; i++ {
				ok, recs := Consistent(n, cs)
				if ok == (name == "conflict") {
					b.Fatalf("ok = %v (%v)", ok, recs)
				}
			}
		})
	}
}

// withContradiction adds a record that swaps the out-item of triplet 0.
func withContradiction(c *Constraints) *Constraints {
	t0 := c.Triplets[0]
	out := &Constraints{Clusters: c.Clusters}
	out.Triplets = append(append([]Triplet(nil), c.Triplets...), trip(t0.A, t0.C, t0.B, 1<<30))
	return out
}
