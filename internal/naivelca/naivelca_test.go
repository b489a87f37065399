package naivelca

import "testing"

// The tree ((0,1),2,(3,(4,5))) with internal nodes 6 = (0,1), 7 = (4,5),
// 8 = (3,7) and the root 9, worked by hand.
func TestLCAAndTopologyByHand(t *testing.T) {
	parent := []int32{6, 6, 9, 8, 7, 7, 9, 8, 9, -1}
	tr := New(parent)
	wantDepth := []int32{2, 2, 1, 2, 3, 3, 1, 2, 1, 0}
	for v, d := range wantDepth {
		if tr.Depth[v] != d {
			t.Errorf("depth of %d = %d, want %d", v, tr.Depth[v], d)
		}
	}
	for _, c := range []struct{ a, b, want int32 }{
		{0, 1, 6}, {0, 2, 9}, {4, 5, 7}, {3, 5, 8}, {5, 3, 8}, {1, 4, 9}, {2, 2, 2}, {7, 4, 7},
	} {
		if got := tr.LCA(c.a, c.b); got != c.want {
			t.Errorf("LCA(%d, %d) = %d, want %d", c.a, c.b, got, c.want)
		}
	}
	for _, c := range []struct {
		a, b, c int32
		want    int
	}{
		{0, 1, 2, 1}, // 01|2
		{0, 2, 1, 2}, // 01|2 written a c b
		{2, 0, 1, 3}, // 01|2 written c a b
		{3, 4, 5, 3}, // 45|3
		{0, 2, 3, 0}, // three root children: unresolved
		{0, 3, 4, 3}, // 34|0
	} {
		if got := tr.Topology(c.a, c.b, c.c); got != c.want {
			t.Errorf("Topology(%d, %d, %d) = %d, want %d", c.a, c.b, c.c, got, c.want)
		}
	}
}
