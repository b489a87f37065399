package review

import (
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/project"
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
	// METHODS 8.2: T|Q keeps the lowest common ancestors of Q and
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
	fullTriplets := project.ShapeTriplets(full)
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
		if got, want := key(project.ShapeTriplets(proj), nil), key(fullTriplets, keep); !slices.Equal(got, want) {
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
