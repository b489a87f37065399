package match

import (
	"fmt"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"
)

func TestSortPlacedOrdersByID(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	numbered := make([]string, 3000)
	for i := range numbered {
		numbered[i] = fmt.Sprintf("item-%d", rng.IntN(1_000_000_000))
	}
	for _, tc := range []struct {
		name string
		ids  []string
	}{
		{"empty", nil},
		{"one", []string{"x"}},
		{"shared prefix, numbers of every length", numbered},
		{"prefix of another", []string{"ab", "a", "abc", "ab-", "abcdefghijk", "abcdefghij", "abcdefghijj"}},
		{"a zero byte sorts after the end", []string{"ab\x00", "ab", "ab\x00\x00", "a"}},
		{"no shared prefix", []string{"zeta", "alpha", "Beta", "9", "émile", "eta"}},
		{"one id a prefix of all", []string{"item-1", "item-10", "item-", "item-100", "item-09"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			ids := slices.Compact(slices.Sorted(slices.Values(tc.ids))) // distinct, as in a tree
			items := make([]Placed, len(ids))
			for i, id := range ids {
				items[i] = Placed{ID: id, Cat: i}
			}
			want := slices.Clone(items)
			rng.Shuffle(len(items), func(i, j int) { items[i], items[j] = items[j], items[i] })
			SortPlaced(items)
			if !slices.Equal(items, want) {
				t.Errorf("got %v, want %v", items, want)
			}
		})
	}
}

// BenchmarkSortPlaced1M sorts the items of a million-item tree by id, as
// the matching of two versions does for each tree.
func BenchmarkSortPlaced1M(b *testing.B) {
	rng := rand.New(rand.NewPCG(3, 4))
	items := make([]Placed, 1_000_000)
	for i := range items {
		items[i] = Placed{ID: "item-" + fmt.Sprint(i), Cat: i % 30000}
	}
	work := make([]Placed, len(items))
	for b.Loop() {
		b.StopTimer()
		copy(work, items)
		rng.Shuffle(len(work), func(i, j int) { work[i], work[j] = work[j], work[i] })
		b.StartTimer()
		SortPlaced(work)
	}
	if !slices.IsSortedFunc(work, func(a, c Placed) int { return strings.Compare(a.ID, c.ID) }) {
		b.Fatal("not sorted")
	}
}
