package solve

import (
	"slices"
	"testing"
)

func TestStablePartition(t *testing.T) {
	for _, tc := range []struct {
		name       string
		seg        []int32
		keys       map[int32]int32 // element → key; absent means -1 (dropped)
		k          int
		want       []int32
		wantCounts []int
	}{
		{"empty", nil, nil, 3, []int32{}, []int{0, 0, 0}},
		{"two sides keep order", []int32{5, 1, 4, 2, 3}, map[int32]int32{5: 1, 1: 0, 4: 1, 2: 0, 3: 0}, 2, []int32{1, 2, 3, 5, 4}, []int{3, 2}},
		{"drops", []int32{7, 8, 9, 10}, map[int32]int32{8: 1, 10: 0}, 2, []int32{10, 8}, []int{1, 1}},
		{"many keys", []int32{0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11}, map[int32]int32{0: 9, 1: 8, 2: 0, 3: 9, 4: 5, 5: 0, 6: 1, 7: 8, 8: 2, 9: 3, 10: 4, 11: 6},
			10, []int32{2, 5, 6, 8, 9, 10, 4, 11, 1, 7, 0, 3}, []int{2, 1, 1, 1, 1, 1, 1, 0, 2, 2}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			seg := slices.Clone(tc.seg)
			key := func(x int32) int32 {
				if k, ok := tc.keys[x]; ok {
					return k
				}
				return -1
			}
			var scratch []int32
			counts := stablePartition(seg, tc.k, key, &scratch, []int{99})
			kept := 0
			for _, c := range counts {
				kept += c
			}
			if !slices.Equal(seg[:kept], tc.want) || !slices.Equal(counts, tc.wantCounts) {
				t.Errorf("got %v counts %v, want %v counts %v", seg[:kept], counts, tc.want, tc.wantCounts)
			}
		})
	}
}
