package diff

import (
	"fmt"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/ramify-tax/ramify/diff/match"
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/internal/taxgen"
)

// naiveCommonSets is the definition match.CommonSets implements, written out
// the slow way: every category's items as strings, the items both trees
// hold in some category, numbered in id order.
func naiveCommonSets(oldRoot, newRoot *format.Category) (oldSets, newSets [][]int32) {
	below := func(root *format.Category) [][]string {
		var out [][]string
		root.Walk(func(c *format.Category, _ int) bool {
			if c != root {
				out = append(out, c.AllItems())
			}
			return true
		})
		return out
	}
	a, b := below(oldRoot), below(newRoot)
	inA, inB := map[string]bool{}, map[string]bool{}
	for _, s := range a {
		for _, it := range s {
			inA[it] = true
		}
	}
	for _, s := range b {
		for _, it := range s {
			inB[it] = true
		}
	}
	var common []string
	for it := range inA {
		if inB[it] {
			common = append(common, it)
		}
	}
	slices.Sort(common)
	index := map[string]int32{}
	for i, it := range common {
		index[it] = int32(i)
	}
	sets := func(lists [][]string) [][]int32 {
		out := make([][]int32, len(lists))
		for k, l := range lists {
			for _, it := range l {
				if i, ok := index[it]; ok {
					out[k] = append(out[k], i)
				}
			}
			slices.Sort(out[k])
		}
		return out
	}
	return sets(a), sets(b)
}

// TestCommonSetsMatchesDefinition: on random trees and perturbations of
// them, with items placed in the root itself on either side (which do not
// count), match.CommonSets gives the sets of the definition.
func TestCommonSetsMatchesDefinition(t *testing.T) {
	for seed := range uint64(12) {
		rng := rand.New(rand.NewPCG(seed, 7))
		old := taxgen.Taxonomy(rng, 200+rng.IntN(300), 1+rng.IntN(3), 4)
		cur := taxgen.Perturb(rng, old, 0.2, 2)
		// Items in one root that the other tree holds in a category, and
		// items in a root only.
		some := func(root *format.Category) *format.Category {
			for c := root; ; c = c.Children[rng.IntN(len(c.Children))] {
				if len(c.Children) == 0 || c != root && rng.IntN(2) == 0 {
					return c
				}
			}
		}
		for i := range 5 {
			x, y := fmt.Sprintf("x-%d", i), fmt.Sprintf("y-%d", i)
			old.Items = append(old.Items, x, fmt.Sprintf("root-old-%d", i))
			c := some(cur)
			c.Items = append(c.Items, x)
			cur.Items = append(cur.Items, y, fmt.Sprintf("root-new-%d", i))
			c = some(old)
			c.Items = append(c.Items, y)
		}
		gotOld, gotNew := match.CommonSets(old, cur,
			func(c *format.Category) []*format.Category { return c.Children },
			func(c *format.Category) []string { return c.Items })
		wantOld, wantNew := naiveCommonSets(old, cur)
		eq := func(a, b [][]int32) bool {
			return len(a) == len(b) && slices.EqualFunc(a, b, func(x, y []int32) bool { return len(x) == 0 && len(y) == 0 || slices.Equal(x, y) })
		}
		if !eq(gotOld, wantOld) || !eq(gotNew, wantNew) {
			t.Fatalf("seed %d: match.CommonSets differs from the definition", seed)
		}
	}
}

// TestCompareChangesIsCompareWithoutMetrics: on random trees and edits,
// CompareChanges reports every change Compare does and leaves the metrics
// out.
func TestCompareChangesIsCompareWithoutMetrics(t *testing.T) {
	for seed := range uint64(8) {
		rng := rand.New(rand.NewPCG(seed, 9))
		old := taxgen.Taxonomy(rng, 300, 2, 4)
		cur := taxgen.Perturb(rng, old, 0.2, 2)
		full, changes := Compare(old, cur), CompareChanges(old, cur)
		if !cmp.Equal(changes.Metrics, Metrics{}) {
			t.Fatalf("seed %d: CompareChanges filled the metrics", seed)
		}
		full.Metrics = Metrics{}
		if !cmp.Equal(full, changes, cmp.AllowUnexported(Report{})) {
			t.Fatalf("seed %d: CompareChanges differs from Compare: %s", seed, cmp.Diff(full, changes, cmp.AllowUnexported(Report{})))
		}
	}
}
