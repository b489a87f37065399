package format

import (
	"math/rand/v2"
	"runtime"
	"slices"
	"testing"
)

func TestMemberListsAreTheSortedItemsBelowEachCategory(t *testing.T) {
	// Several processors, so the large tree's subtrees are listed at once.
	defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(4))
	rng := rand.New(rand.NewPCG(11, 12))
	for _, tc := range []struct {
		name string
		root *Category
	}{
		{"flat", &Category{Items: []string{"b", "a"}}},
		{"one chain", &Category{Children: []*Category{{Name: "x", Children: []*Category{{Name: "y", Items: []string{"q", "p"}}}}}}},
		{"mixed", &Category{Items: []string{"z"}, Children: []*Category{
			{Name: "x", Items: []string{"m", "c"}, Children: []*Category{{Name: "x1", Items: []string{"k", "a"}}, {Name: "x2", Items: []string{"b"}}}},
			{Name: "y", Items: []string{"d"}},
		}}},
		{"random", randomTree(rng, 500, 5)},
		{"large random", randomTree(rng, parallelMembers+1000, 5)},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var want [][]string
			tc.root.Walk(func(c *Category, _ int) bool {
				if c != tc.root {
					ids := c.AllItems()
					slices.Sort(ids)
					want = append(want, ids)
				}
				return true
			})
			got := MemberLists(tc.root)
			if len(got) != len(want) {
				t.Fatalf("%d lists for %d categories", len(got), len(want))
			}
			for i := range want {
				if !slices.Equal(got[i], want[i]) {
					t.Errorf("category %d: members %v, want %v", i, got[i], want[i])
				}
			}
		})
	}
}
