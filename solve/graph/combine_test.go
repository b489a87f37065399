package graph

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

func mustEdges(t *testing.T, n int, edges []Edge) *CSR {
	t.Helper()
	g, err := FromEdges(n, edges)
	if err != nil {
		t.Fatal(err)
	}
	return g
}

func TestCombineNormalisesByMedian(t *testing.T) {
	// Worked by hand. g1 weights {1, 2, 4}: median 2, normalised 0.5, 1, 2.
	// g2 weights {10, 30}: median 20 (mean of the middle two), normalised
	// 0.5, 1.5. Source weights 1 and 2: edge 0-1 = 0.5 + 2·0.5 = 1.5,
	// 1-2 = 1, 0-2 = 2, 2-3 = 2·1.5 = 3. All exact in binary.
	g1 := mustEdges(t, 4, []Edge{{0, 1, 1}, {1, 2, 2}, {0, 2, 4}})
	g2 := mustEdges(t, 4, []Edge{{0, 1, 10}, {2, 3, 30}})
	if m := MedianWeight(g1); m != 2 {
		t.Errorf("median of g1 = %v, want 2", m)
	}
	if m := MedianWeight(g2); m != 20 {
		t.Errorf("median of g2 = %v, want 20", m)
	}
	g, err := Combine([]*CSR{g1, g2}, []float64{1, 2})
	if err != nil {
		t.Fatal(err)
	}
	checkGraph(t, g)
	compareEdges(t, edgeMap(g), map[[2]int32]float64{{0, 1}: 1.5, {1, 2}: 1, {0, 2}: 2, {2, 3}: 3}, 0)

	// Rescaling a source does not change the result: that is the point of
	// the normalisation.
	g2x := mustEdges(t, 4, []Edge{{0, 1, 1000}, {2, 3, 3000}})
	h, err := Combine([]*CSR{g1, g2x}, []float64{1, 2})
	if err != nil {
		t.Fatal(err)
	}
	compareEdges(t, edgeMap(h), edgeMap(g), 1e-15)
}

func TestCombineSkipsEmptyAndUnweightedParts(t *testing.T) {
	g1 := mustEdges(t, 3, []Edge{{0, 1, 3}})
	empty := mustEdges(t, 3, nil)
	g3 := mustEdges(t, 3, []Edge{{1, 2, 5}})
	g, err := Combine([]*CSR{g1, empty, g3}, []float64{2, 1, 0})
	if err != nil {
		t.Fatal(err)
	}
	checkGraph(t, g)
	compareEdges(t, edgeMap(g), map[[2]int32]float64{{0, 1}: 2}, 0)
}

func TestCombineErrors(t *testing.T) {
	a := mustEdges(t, 3, []Edge{{0, 1, 1}})
	b := mustEdges(t, 4, []Edge{{0, 1, 1}})
	tests := []struct {
		name    string
		parts   []*CSR
		weights []float64
	}{
		{"no parts", nil, nil},
		{"weights count", []*CSR{a}, []float64{1, 2}},
		{"sizes differ", []*CSR{a, b}, []float64{1, 1}},
		{"nil part", []*CSR{a, nil}, []float64{1, 1}},
		{"negative weight", []*CSR{a}, []float64{-1}},
		{"NaN weight", []*CSR{a}, []float64{math.NaN()}},
	}
	for _, tc := range tests {
		if _, err := Combine(tc.parts, tc.weights); err == nil {
			t.Errorf("%s: no error", tc.name)
		}
	}
}

func TestCombineRealSources(t *testing.T) {
	// Tags and text over the same items combine into a valid graph whose
	// edge set is the union of the parts' edge sets.
	tags := topicTags(500, 80, 8, 4, 41)
	texts := topicTexts(500, 100, 8, 42)
	gt, err := Tags(tags, 8)
	if err != nil {
		t.Fatal(err)
	}
	gx, err := Text(texts, 8)
	if err != nil {
		t.Fatal(err)
	}
	g, err := Combine([]*CSR{gt, gx}, []float64{1, 0.5})
	if err != nil {
		t.Fatal(err)
	}
	checkGraph(t, g)
	want := edgeMap(gt)
	for e := range edgeMap(gx) {
		want[e] = 0
	}
	got := edgeMap(g)
	if len(got) != len(want) {
		t.Errorf("%d edges, want %d", len(got), len(want))
	}
	for e := range want {
		if _, ok := got[e]; !ok {
			t.Errorf("edge %v missing", e)
		}
	}
}

func TestLinks(t *testing.T) {
	// Both directions are summed (Links' documented choice), duplicates
	// too; self-links are dropped.
	g, err := Links(4, []Edge{{0, 1, 1}, {1, 0, 2}, {2, 3, 0.5}, {2, 3, 0.25}, {3, 3, 9}})
	if err != nil {
		t.Fatal(err)
	}
	checkGraph(t, g)
	compareEdges(t, edgeMap(g), map[[2]int32]float64{{0, 1}: 3, {2, 3}: 0.75}, 0)

	for _, bad := range []Edge{{0, 1, 0}, {0, 1, -1}, {0, 1, math.Inf(1)}, {0, 1, math.NaN()}, {0, 7, 1}} {
		if _, err := Links(4, []Edge{bad}); err == nil {
			t.Errorf("link %v accepted", bad)
		}
	}
}

func TestRecall(t *testing.T) {
	exact := mustEdges(t, 4, []Edge{{0, 1, 1}, {1, 2, 1}, {2, 3, 1}, {0, 3, 1}})
	approx := mustEdges(t, 4, []Edge{{0, 1, 1}, {2, 3, 1}, {0, 2, 1}})
	if r := Recall(approx, exact); r != 0.5 {
		t.Errorf("recall %v, want 0.5 (2 of 4 edges)", r)
	}
	if r := Recall(exact, exact); r != 1 {
		t.Errorf("self recall %v", r)
	}
	if r := Recall(approx, mustEdges(t, 4, nil)); r != 1 {
		t.Errorf("recall of an empty graph %v, want 1", r)
	}
}

// TestCombineOnePartAsMerged: one source takes a shortcut past the merge
// of rows; it gives the graph the merge gives when an empty part (which
// the merge skips) stands beside it, bit for bit.
func TestCombineOnePartAsMerged(t *testing.T) {
	var edges []Edge
	for i := range int32(40) {
		for j := i + 1; j < 40; j += 1 + i%5 {
			edges = append(edges, Edge{i, j, 0.1 + float64((i*7+j*3)%11)/3})
		}
	}
	g := mustEdges(t, 40, edges)
	one, err := Combine([]*CSR{g}, []float64{0.7})
	if err != nil {
		t.Fatal(err)
	}
	merged, err := Combine([]*CSR{g, mustEdges(t, 40, nil)}, []float64{0.7, 1})
	if err != nil {
		t.Fatal(err)
	}
	checkGraph(t, one)
	if !slices.Equal(one.Offsets, merged.Offsets) || !slices.Equal(one.Targets, merged.Targets) || !slices.Equal(one.Weights, merged.Weights) {
		t.Error("one part combined differs from the merge")
	}
}

func TestSelectKthMatchesSort(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	for _, tc := range []struct {
		name   string
		n      int
		values int // distinct values drawn from; 0 for continuous
	}{
		{"one", 1, 0}, {"two", 2, 0}, {"small", 7, 0}, {"ties", 50, 3},
		{"all equal", 40, 1}, {"continuous", 1000, 0}, {"many ties", 1000, 10},
	} {
		t.Run(tc.name, func(t *testing.T) {
			ws := make([]float64, tc.n)
			for i := range ws {
				if tc.values > 0 {
					ws[i] = float64(rng.IntN(tc.values))
				} else {
					ws[i] = rng.Float64()
				}
			}
			sorted := slices.Clone(ws)
			slices.Sort(sorted)
			for k := range ws {
				got := selectKth(slices.Clone(ws), k)
				if got != sorted[k] {
					t.Fatalf("k=%d: got %v, a sort puts %v there", k, got, sorted[k])
				}
			}
			// Sorted and reversed input are the classic bad cases.
			rev := slices.Clone(sorted)
			slices.Reverse(rev)
			for k := range ws {
				if a, b := selectKth(slices.Clone(sorted), k), selectKth(slices.Clone(rev), k); a != sorted[k] || b != sorted[k] {
					t.Fatalf("k=%d: sorted input gives %v, reversed %v, want %v", k, a, b, sorted[k])
				}
			}
		})
	}
}

func TestMedianWeightEvenCountAveragesTheMiddleTwo(t *testing.T) {
	g := mustEdges(t, 5, []Edge{{0, 1, 8}, {1, 2, 1}, {2, 3, 5}, {3, 4, 3}})
	if m := MedianWeight(g); m != 4 {
		t.Errorf("median of {1, 3, 5, 8} = %v, want 4", m)
	}
}
