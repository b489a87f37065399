package disjoint

import "testing"

func TestUnionFind(t *testing.T) {
	for _, tc := range []struct {
		name   string
		n      int
		unions [][2]int32
		want   []int32 // representative of each element
		joined int     // how many unions joined two sets
	}{
		{"singletons", 4, nil, []int32{0, 1, 2, 3}, 0},
		{"chain upward", 5, [][2]int32{{3, 4}, {2, 3}, {1, 2}}, []int32{0, 1, 1, 1, 1}, 3},
		{"chain downward", 5, [][2]int32{{0, 1}, {1, 2}, {2, 3}}, []int32{0, 0, 0, 0, 4}, 3},
		{"repeats", 4, [][2]int32{{1, 3}, {3, 1}, {1, 1}, {0, 2}, {2, 0}}, []int32{0, 1, 0, 1}, 2},
		{"two trees joined", 6, [][2]int32{{4, 5}, {2, 3}, {5, 3}, {1, 0}}, []int32{0, 0, 2, 2, 2, 2}, 4},
	} {
		t.Run(tc.name, func(t *testing.T) {
			s := New(tc.n)
			joined := 0
			for _, u := range tc.unions {
				if s.Union(u[0], u[1]) {
					joined++
				}
			}
			if joined != tc.joined {
				t.Errorf("%d unions joined sets, want %d", joined, tc.joined)
			}
			for x, w := range tc.want {
				if got := s.Find(int32(x)); got != w {
					t.Errorf("Find(%d) = %d, want %d", x, got, w)
				}
			}
		})
	}
}
