package main

import (
	"encoding/binary"
	"math"
	"testing"
)

func linkageBytes(rows [][4]float64) []byte {
	out := make([]byte, 0, len(rows)*32)
	for _, r := range rows {
		for _, v := range r {
			out = binary.LittleEndian.AppendUint64(out, math.Float64bits(v))
		}
	}
	return out
}

// The linkage matrix layout is SciPy's (scipy.cluster.hierarchy.linkage
// documentation), which fastcluster returns too: row k merges clusters
// Z[k,0] and Z[k,1], and cluster n+k is the result of row k.
func TestLinkageTree(t *testing.T) {
	// Points 0 and 2 merge first (cluster 4), then 1 and 3 (cluster 5),
	// then the two clusters.
	tr, err := linkageTree(4, linkageBytes([][4]float64{{0, 2, 0.5, 2}, {1, 3, 0.7, 2}, {4, 5, 2, 4}}))
	if err != nil {
		t.Fatal(err)
	}
	root := tr.Kids[tr.Root]
	if len(root) != 2 {
		t.Fatalf("root has %d children, want 2", len(root))
	}
	got := [][]int32{tr.Kids[root[0]], tr.Kids[root[1]]}
	if got[0][0] != 0 || got[0][1] != 2 || got[1][0] != 1 || got[1][1] != 3 {
		t.Errorf("children %v, want [[0 2] [1 3]]", got)
	}
	for _, bad := range [][][4]float64{
		{{0, 0, 1, 2}, {1, 2, 1, 2}, {4, 5, 1, 4}}, // a point merged with itself
		{{0, 9, 1, 2}, {1, 2, 1, 2}, {4, 5, 1, 4}}, // a cluster not made yet
	} {
		if _, err := linkageTree(4, linkageBytes(bad)); err == nil {
			t.Errorf("%v accepted", bad)
		}
	}
	if _, err := linkageTree(4, linkageBytes([][4]float64{{0, 1, 1, 2}})); err == nil {
		t.Error("short matrix accepted")
	}
}
