package sorted

import (
	"slices"
	"testing"
)

func TestMergeIsTheSortOfTheConcatenation(t *testing.T) {
	for _, tc := range []struct {
		name  string
		lists [][]int
	}{
		{"none", nil},
		{"one", [][]int{{1, 4, 9}}},
		{"two", [][]int{{1, 4, 9}, {2, 3, 10}}},
		{"empty among them", [][]int{{}, {5}, {}, {1, 7}}},
		{"equal values", [][]int{{1, 1, 2}, {1, 2, 2}, {0, 1}}},
		{"many", [][]int{{9}, {8}, {7}, {6}, {5}, {4}, {3}, {2}, {1}}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			want := slices.Sorted(slices.Values(slices.Concat(tc.lists...)))
			if got := Merge(tc.lists); !slices.Equal(got, want) {
				t.Errorf("Merge(%v) = %v, want %v", tc.lists, got, want)
			}
		})
	}
}

func TestMergeOfStrings(t *testing.T) {
	got := Merge([][]string{{"b", "item-10"}, {"a", "item-1", "item-9"}})
	if want := []string{"a", "b", "item-1", "item-10", "item-9"}; !slices.Equal(got, want) {
		t.Errorf("got %v, want %v", got, want)
	}
}
