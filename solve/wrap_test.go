package solve

import (
	"slices"
	"testing"
)

// TestRepairJoinsCategoriesForAStar checks wrap through Repair: a hand
// edit's triplet 0 2 | 4 over the categories {0 1}, {2 3}, {4 5}, which
// the tree leaves as a star at the root, is mended by one new category
// over {0 1} and {2 3}, with no item leaving its category; when item 4
// shares a category with 0, no new category can separate them and the
// items are taken out and placed instead.
func TestRepairJoinsCategoriesForAStar(t *testing.T) {
	for _, tc := range []struct {
		name       string
		categories [][]int32
		joined     int
		want       []int32 // a category the result must have
	}{
		{"star", [][]int32{{0, 1}, {2, 3}, {4, 5}}, 1, []int32{0, 1, 2, 3}},
		{"contradiction", [][]int32{{0, 1, 4}, {2, 3}, {5}}, 0, nil},
	} {
		t.Run(tc.name, func(t *testing.T) {
			g := RandomWeightedGraph(t, 3, dgStream, 6, 0.6)
			prev := NewTree(6)
			var tops []int32
			for _, cat := range tc.categories {
				if len(cat) == 1 {
					tops = append(tops, cat[0])
					continue
				}
				tops = append(tops, prev.Add(cat...))
			}
			prev.Root = prev.Add(tops...)
			c := &Constraints{Triplets: []Triplet{{A: 0, B: 2, C: 4, Record: 0}}}
			got, rep, err := Repair(g, c, prev, Change{Whole: map[int]bool{0: true}}, Options{MinSize: 1})
			if err != nil {
				t.Fatal(err)
			}
			if bad := Satisfies(got, c); len(bad) > 0 {
				t.Fatalf("the repaired tree breaks records %v", bad)
			}
			if rep.Joined != tc.joined {
				t.Errorf("Joined = %d, want %d", rep.Joined, tc.joined)
			}
			if tc.want == nil {
				return
			}
			before, after := leafHomes(prev), leafHomes(got)
			for x := range int32(6) {
				if before[x] != after[x] {
					t.Errorf("item %d changed category", x)
				}
			}
			found := false
			for _, v := range got.PostOrder() {
				ls := got.Leaves(v)
				slices.Sort(ls)
				found = found || slices.Equal(ls, tc.want)
			}
			if !found {
				t.Errorf("no category over %v in the repaired tree", tc.want)
			}
		})
	}
}
