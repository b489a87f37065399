package taxgen

import (
	"maps"
	"math/rand/v2"
	"testing"

	"github.com/ramify-tax/ramify/format"
)

// TestTaxonomyAndPerturb: a generated tree holds every item once, at most
// depth levels down, with no empty category; an edited copy keeps the old
// tree as it was, holds no empty category either, moves or removes about
// the share asked for and adds a sixth of that.
func TestTaxonomyAndPerturb(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	old := Taxonomy(rng, 2000, 3, 5)
	checkTree(t, "old", old, 3)
	before := homes(old)
	if len(before) != 2000 {
		t.Fatalf("the tree holds %d items, want 2000", len(before))
	}
	cur := Perturb(rng, old, 0.1, 0)
	checkTree(t, "new", cur, 3)
	if !maps.Equal(homes(old), before) {
		t.Fatal("Perturb changed the tree it copies")
	}
	after := homes(cur)
	changed := 0
	for id, c := range before {
		if d, ok := after[id]; !ok || d != c {
			changed++
		}
	}
	// 200 items are moved or removed; a move may land where the item was.
	if changed < 150 || changed > 200 {
		t.Errorf("%d of 2000 items changed, want about 200", changed)
	}
	added := 0
	for id := range after {
		if _, ok := before[id]; !ok {
			added++
		}
	}
	if added != 200/6 {
		t.Errorf("%d items added, want a sixth of the 200 changed, %d", added, 200/6)
	}
	for id, path := range after {
		if path == "(twice)" {
			t.Errorf("item %s stands twice in the edited copy", id)
		}
	}
}

func checkTree(t *testing.T, name string, root *format.Category, depth int) {
	t.Helper()
	root.Walk(func(c *format.Category, d int) bool {
		if d > depth {
			t.Errorf("%s: category %q at depth %d", name, c.Name, d)
		}
		if c != root && len(c.Items) == 0 && len(c.Children) == 0 {
			t.Errorf("%s: empty category %q", name, c.Name)
		}
		return true
	})
}

// homes maps each item to the name path of its category.
func homes(root *format.Category) map[string]string {
	out := map[string]string{}
	var walk func(c *format.Category, path string)
	walk = func(c *format.Category, path string) {
		for _, id := range c.Items {
			if _, dup := out[id]; dup {
				out[id] = "(twice)"
				continue
			}
			out[id] = path
		}
		for _, ch := range c.Children {
			walk(ch, path+"/"+ch.Name)
		}
	}
	walk(root, "")
	return out
}
