package review

import (
	"fmt"
	"math/rand/v2"
	"testing"

	"github.com/ramify-tax/ramify/format"
)

// randomCategoryTree builds a random multiway tree over leaves l0..l(n-1).
func randomCategoryTree(rng *rand.Rand, n int) *format.Category {
	nodes := make([]*format.Category, n)
	for i := range nodes {
		nodes[i] = &format.Category{Items: []string{fmt.Sprintf("l%d", i)}}
	}
	for len(nodes) > 1 {
		k := 2 + rng.IntN(min(3, len(nodes)-1))
		rng.Shuffle(len(nodes), func(i, j int) { nodes[i], nodes[j] = nodes[j], nodes[i] })
		c := &format.Category{Name: fmt.Sprintf("c%d", len(nodes))}
		for _, x := range nodes[:k] {
			if len(x.Children) == 0 && len(x.Items) == 1 && x.Name == "" {
				c.Items = append(c.Items, x.Items[0])
			} else {
				c.Children = append(c.Children, x)
			}
		}
		nodes = append(nodes[k:], c)
	}
	return &format.Category{Children: []*format.Category{nodes[0]}}
}

// Every inference rule of PruneRecords is sound: on random trees of four
// and five leaves, whenever a tree resolves the premises of a rule it
// resolves the conclusion too.
func TestPruneRulesHoldInEveryTree(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	for trial := range 3000 {
		n := 4 + trial%2
		root := randomCategoryTree(rng, n)
		holds := map[[3]string]bool{}
		for _, tr := range format.ShapeTriplets(root) {
			holds[tripletKey(tr[0], tr[1], tr[2])] = true
		}
		has := func(a, b, c string) bool { return holds[tripletKey(a, b, c)] }
		var ids []string
		for i := range n {
			ids = append(ids, fmt.Sprintf("l%d", i))
		}
		for _, a := range ids {
			for _, b := range ids {
				for _, c := range ids {
					for _, z := range ids {
						if len(map[string]bool{a: true, b: true, c: true, z: true}) < 4 {
							continue
						}
						if impliedBy(a, b, c, z, has) && !has(a, b, c) {
							t.Fatalf("tree %s: rule gives %s %s | %s through %s, which the tree does not resolve",
								format.FormatTree(root), a, b, c, z)
						}
					}
				}
			}
		}
	}
}

func trip(a, b, c string) format.Triplet {
	return format.Triplet{Pair: [2]string{a, b}, Out: c}
}

func TestPruneRecords(t *testing.T) {
	shape, err := format.ParseOutline("s", []byte("K/\n  k1\n  k2\no1\n"))
	if err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name string
		cf   format.ConstraintFile
		want []format.Triplet
	}{
		{"the same triplet twice, the pair either way",
			format.ConstraintFile{Triplets: []format.Triplet{trip("a", "b", "c"), trip("b", "a", "c"), trip("a", "b", "c")}},
			[]format.Triplet{trip("a", "b", "c")}},
		{"a triplet a group implies",
			format.ConstraintFile{Triplets: []format.Triplet{trip("a", "b", "c"), trip("a", "c", "d")},
				Groups: []format.Group{{Items: []string{"a", "b"}}}},
			[]format.Triplet{trip("a", "c", "d")}},
		{"a triplet a shape resolves",
			format.ConstraintFile{Triplets: []format.Triplet{trip("k2", "k1", "o1"), trip("k1", "o1", "x")},
				Shapes: []format.Shape{{Tree: shape.Root}}},
			[]format.Triplet{trip("k1", "o1", "x")}},
		{"a triplet two others imply",
			format.ConstraintFile{Triplets: []format.Triplet{trip("z", "a", "c"), trip("z", "b", "c"), trip("a", "b", "c")}},
			[]format.Triplet{trip("z", "a", "c"), trip("z", "b", "c")}},
		{"independent triplets stay",
			format.ConstraintFile{Triplets: []format.Triplet{trip("a", "b", "c"), trip("c", "d", "a")}},
			[]format.Triplet{trip("a", "b", "c"), trip("c", "d", "a")}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			cf := tc.cf
			removed := PruneRecords(&cf)
			if fmt.Sprint(cf.Triplets) != fmt.Sprint(tc.want) {
				t.Fatalf("PruneRecords kept %v, want %v", cf.Triplets, tc.want)
			}
			if removed != len(tc.cf.Triplets)-len(tc.want) {
				t.Errorf("PruneRecords = %d, want %d", removed, len(tc.cf.Triplets)-len(tc.want))
			}
		})
	}
}
