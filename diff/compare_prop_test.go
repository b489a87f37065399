package diff

import (
	"bytes"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/internal/taxgen"
)

// applyReport predicts every item's path in the new outline from the old
// outline and the report alone: added and moved items go where the report
// says, the others keep their path with renamed categories' new names.
func applyReport(old *format.Category, r *Report) map[string][]string {
	oldPaths := format.Paths(old)
	renamed := map[string]Path{}
	for _, n := range r.Renamed {
		renamed[strings.Join(n.From, "\x00")] = n.To
	}
	moved := map[string]Path{}
	for _, m := range r.Moved {
		moved[m.Item] = m.To
	}
	// An item that moved with its category keeps its path below it.
	carried := map[string]CategoryMove{}
	for _, cm := range r.MovedCategories {
		for _, it := range cm.Items {
			carried[it] = cm
		}
	}
	removed := map[string]bool{}
	for _, rm := range r.Removed {
		removed[rm.Item] = true
	}
	out := map[string][]string{}
	for it, p := range oldPaths {
		if removed[it] {
			continue
		}
		if to, ok := moved[it]; ok {
			out[it] = to
			continue
		}
		// Each level takes its renamed name; an item that moved with its
		// category swaps the category's old path for its new one.
		var np []string
		from := 0
		if cm, ok := carried[it]; ok {
			np, from = slices.Clone([]string(cm.To)), len(cm.From)
		}
		for k := from; k < len(p); k++ {
			name := p[k]
			if to, ok := renamed[strings.Join(p[:k+1], "\x00")]; ok {
				name = to[len(to)-1]
			}
			np = append(np, name)
		}
		out[it] = np
	}
	for _, a := range r.Added {
		out[a.Item] = a.To
	}
	return out
}

// Applying the report to the old outline gives the new one (every item's
// path), on random taxonomies with random moves, removals, additions and
// renames; the report is the same on a second run, and its categories
// exist where it says.
func TestCompareReportReproducesNewOutline(t *testing.T) {
	rng := rand.New(rand.NewPCG(21, 22))
	for trial := range 40 {
		old := taxgen.Taxonomy(rng, 100+rng.IntN(400), 2+rng.IntN(3), 3+rng.IntN(4))
		new := taxgen.Perturb(rng, old, rng.Float64()*0.3, rng.IntN(4))
		r := Compare(old, new)
		want := format.Paths(new)
		got := applyReport(old, r)
		if len(got) != len(want) {
			t.Fatalf("trial %d: predicted %d items, new outline has %d", trial, len(got), len(want))
		}
		for it, p := range want {
			if !slices.Equal(got[it], p) {
				t.Fatalf("trial %d: item %s predicted at %q, is at %q", trial, it, got[it], p)
			}
		}
		var a, b bytes.Buffer
		r.WriteJSON(&a)
		Compare(old, new).WriteJSON(&b)
		if !bytes.Equal(a.Bytes(), b.Bytes()) {
			t.Fatalf("trial %d: two runs gave different JSON", trial)
		}
		checkCategoriesExist(t, old, new, r)
		if r.Metrics.TripletAgreement < 0 || r.Metrics.TripletAgreement > 1 || !r.Metrics.TripletExact {
			t.Fatalf("trial %d: metrics %+v", trial, r.Metrics)
		}
	}
}

func categoryPaths(root *format.Category) map[string]bool {
	out := map[string]bool{}
	var rec func(c *format.Category, p []string)
	rec = func(c *format.Category, p []string) {
		for _, ch := range c.Children {
			q := append(slices.Clip(p), ch.DisplayName())
			out[strings.Join(q, "\x00")] = true
			rec(ch, q)
		}
	}
	rec(root, nil)
	return out
}

func checkCategoriesExist(t *testing.T, old, new *format.Category, r *Report) {
	t.Helper()
	inOld, inNew := categoryPaths(old), categoryPaths(new)
	key := func(p Path) string { return strings.Join(p, "\x00") }
	check := func(set map[string]bool, p Path, what string) {
		if !set[key(p)] {
			t.Fatalf("%s %q is not a category there", what, p)
		}
	}
	for _, p := range r.Created {
		check(inNew, p, "created")
	}
	for _, p := range r.Dissolved {
		check(inOld, p, "dissolved")
	}
	for _, n := range r.Renamed {
		check(inOld, n.From, "renamed from")
		check(inNew, n.To, "renamed to")
	}
	for _, s := range r.Split {
		check(inOld, s.From, "split")
		for _, p := range s.Into {
			check(inNew, p, "split into")
		}
	}
	for _, m := range r.Merged {
		check(inNew, m.Into, "merged into")
		for _, p := range m.From {
			check(inOld, p, "merged from")
		}
	}
}

// Above ExactTripletLimit common items the agreement is sampled and the
// report says so, with an interval that holds the exact value here.
func TestCompareSamplesLargeTrees(t *testing.T) {
	rng := rand.New(rand.NewPCG(23, 24))
	old := taxgen.Taxonomy(rng, ExactTripletLimit+1000, 3, 6)
	new := taxgen.Perturb(rng, old, 0.05, 2)
	r := Compare(old, new)
	m := r.Metrics
	if m.TripletExact || len(m.TripletInterval) != 2 || m.TripletSamples != TripletSamples {
		t.Fatalf("metrics on %d common items: %+v; want a sampled estimate", m.CommonItems, m)
	}
	c := newComparison(old, new)
	exact := TripletAgreement(c.old.solveTree(c.oldCat), c.new.solveTree(c.newCat))
	if exact < m.TripletInterval[0] || exact > m.TripletInterval[1] {
		t.Errorf("exact agreement %v outside the sampled 95%% interval %v", exact, m.TripletInterval)
	}
	var md bytes.Buffer
	r.Markdown(&md)
	if !strings.Contains(md.String(), "95% interval") {
		t.Errorf("Markdown does not say the agreement was sampled:\n%s", md.String())
	}
}

// The trees handed to the metrics have one leaf per common item and drop
// categories left empty.
func TestSolveTreeDropsEmptyCategories(t *testing.T) {
	old := parseOutline(t, "old", []byte("A/\n  B/\n    x\n  y\nC/\n  z\n"))
	new := parseOutline(t, "new", []byte("A/\n  x\n  y\nD/\n  w\n"))
	c := newComparison(old, new)
	if !slices.Equal(c.common, []string{"x", "y"}) {
		t.Fatalf("common = %v", c.common)
	}
	tr := c.old.solveTree(c.oldCat)
	// Old restricted to {x, y}: root → A → (B → x), y; C is empty and gone.
	if got := len(tr.Kids) - tr.N; got != 3 {
		t.Errorf("old tree over common items has %d internal nodes, want 3 (root, A, B)", got)
	}
	if d, _ := RF(tr, c.new.solveTree(c.newCat)); d != 0 {
		t.Errorf("RF = %d, want 0: both trees hold only trivial clusters on 2 items", d)
	}
}
