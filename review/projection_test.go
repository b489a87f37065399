package review

import (
	"maps"
	"math/rand/v2"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/ramify-tax/ramify/format"
)

const fullOutline = `
Fastening/
  Hammers/
    claw-hammer
    mallet-rubber
    pin-hammer
  Screwdrivers/
    driver-set
    impact-driver
  drill-driver
Measuring/
  ~ laser · level/
    laser-level
    spirit-level
  tape-measure
glue-gun
`

func TestRestrict(t *testing.T) {
	// The restriction T|Q keeps the lowest common ancestors of Q and
	// suppresses unary nodes; categories keep their full-tree names.
	tests := []struct {
		name  string
		items []string
		want  string
	}{
		{"a category left with one item is folded away",
			[]string{"claw-hammer", "mallet-rubber", "driver-set", "tape-measure"},
			"Fastening/\n  Hammers/\n    claw-hammer\n    mallet-rubber\n  driver-set\ntape-measure\n"},
		{"a category left with one subcategory is replaced by it",
			[]string{"claw-hammer", "mallet-rubber", "laser-level", "spirit-level"},
			"Hammers/\n  claw-hammer\n  mallet-rubber\n~ laser · level/\n  laser-level\n  spirit-level\n"},
		{"the file root left with one category takes its contents",
			[]string{"claw-hammer", "mallet-rubber", "driver-set", "impact-driver"},
			"Hammers/\n  claw-hammer\n  mallet-rubber\nScrewdrivers/\n  driver-set\n  impact-driver\n"},
		{"items in three top categories stay flat",
			[]string{"pin-hammer", "tape-measure", "glue-gun"},
			"glue-gun\npin-hammer\ntape-measure\n"},
		{"unknown items are ignored",
			[]string{"claw-hammer", "pin-hammer", "no-such-item"},
			"claw-hammer\npin-hammer\n"},
	}
	full := outline(t, fullOutline)
	before := string(format.FormatTree(full.Clone()))
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := string(format.FormatTree(Restrict(full, tc.items)))
			if got != tc.want {
				t.Errorf("Restrict =\n%s\nwant\n%s", got, tc.want)
			}
		})
	}
	if after := string(format.FormatTree(full)); after != before {
		t.Error("Restrict changed the full tree")
	}
}

// TestRestrictKeepsTriplets checks the defining property of a projection
// on random subsets: every triplet of the chosen items is resolved in T|Q
// exactly as in T, and T|Q has no category with a single child.
func TestRestrictKeepsTriplets(t *testing.T) {
	full := outline(t, fullOutline)
	all := full.AllItems()
	slices.Sort(all)
	key := func(ts [][3]string, keep map[string]bool) []string {
		var out []string
		for _, tr := range ts {
			if keep == nil || keep[tr[0]] && keep[tr[1]] && keep[tr[2]] {
				pair := []string{tr[0], tr[1]}
				slices.Sort(pair)
				out = append(out, strings.Join(pair, ",")+"|"+tr[2])
			}
		}
		slices.Sort(out)
		return out
	}
	fullTriplets := format.ShapeTriplets(full)
	r := rand.New(rand.NewPCG(3, 4))
	for trial := range 200 {
		k := 3 + r.IntN(len(all)-2)
		var q []string
		keep := map[string]bool{}
		for _, i := range UniformSubset(r, len(all), k) {
			q = append(q, all[i])
			keep[all[i]] = true
		}
		proj := Restrict(full, q)
		if got, want := key(format.ShapeTriplets(proj), nil), key(fullTriplets, keep); !slices.Equal(got, want) {
			t.Fatalf("trial %d, items %v: triplets of T|Q %v, of T %v", trial, q, got, want)
		}
		proj.Walk(func(c *format.Category, depth int) bool {
			if depth > 0 && len(c.Children)+len(c.Items) < 2 {
				t.Fatalf("trial %d: category %q has a single child", trial, c.Name)
			}
			return true
		})
		if n := proj.Size(); n != k {
			t.Fatalf("trial %d: T|Q holds %d items, want %d", trial, n, k)
		}
	}
}

// TestRestrictKeepsSeparatingCategories checks T|Q against its definition
// on random deep trees: its categories are exactly the distinct sets
// C ∩ Q with 2 ≤ |C ∩ Q| < |Q| over the categories C of T (every category
// that separates the packet's items, none that holds them all or a single
// one), each under the name of the lowest category of T that cuts that set
// (a chain of categories over the same items shows as its branching end).
func TestRestrictKeepsSeparatingCategories(t *testing.T) {
	r := rand.New(rand.NewPCG(13, 3))
	for trial := range 300 {
		full, all := randomDeepTree(r)
		k := min(len(all), 3+r.IntN(8))
		var q []string
		keep := map[string]bool{}
		for _, i := range UniformSubset(r, len(all), k) {
			q = append(q, all[i])
			keep[all[i]] = true
		}
		// want: cluster -> name of its lowest category in T. A walk visits
		// parents before children, so the last write is the lowest.
		want := map[string]string{}
		full.Walk(func(c *format.Category, depth int) bool {
			var in []string
			for _, id := range c.AllItems() {
				if keep[id] {
					in = append(in, id)
				}
			}
			if depth > 0 && len(in) >= 2 && len(in) < k {
				slices.Sort(in)
				want[strings.Join(in, " ")] = c.DisplayName()
			}
			return true
		})
		got := map[string]string{}
		proj := Restrict(full, q)
		proj.Walk(func(c *format.Category, depth int) bool {
			if depth > 0 {
				got[strings.Join(sortedItems(c), " ")] = c.DisplayName()
			}
			return true
		})
		if n := proj.CountCategories(); n != len(got) {
			t.Fatalf("trial %d: T|Q has %d categories over %d sets of items (a chain was kept)", trial, n, len(got))
		}
		if !maps.Equal(got, want) {
			t.Fatalf("trial %d, items %v:\nT|Q  %v\nwant %v\n%s", trial, q, got, want, format.FormatTree(full.Clone()))
		}
		if n := proj.Size(); n != k {
			t.Fatalf("trial %d: T|Q holds %d items, want %d", trial, n, k)
		}
	}
}

// randomDeepTree is a tree of up to six levels whose categories have
// distinct names (some provisional), over items named by number, and its
// items sorted.
func randomDeepTree(r *rand.Rand) (*format.Category, []string) {
	items, cats := 0, 0
	var grow func(depth int) *format.Category
	grow = func(depth int) *format.Category {
		c := &format.Category{}
		if depth > 0 {
			cats++
			c.Name = "c" + strconv.Itoa(cats)
			c.Provisional = r.IntN(4) == 0
		}
		for range r.IntN(3) {
			items++
			c.Items = append(c.Items, "i"+strconv.Itoa(items))
		}
		if depth < 6 {
			for range r.IntN(4 - min(depth, 3)/2) {
				c.Children = append(c.Children, grow(depth+1))
			}
		}
		if len(c.Items) == 0 && len(c.Children) == 0 {
			items++
			c.Items = []string{"i" + strconv.Itoa(items)}
		}
		return c
	}
	root := grow(0)
	for root.Size() < 3 {
		root = grow(0)
	}
	all := root.AllItems()
	slices.Sort(all)
	return root, all
}
