package graph

import (
	"math"
	"testing"
)

func TestGaussianLocalScalingByHand(t *testing.T) {
	// Local scaling σ_i = distance to the 7th nearest neighbour, w_ij =
	// exp(−d²/(σ_i σ_j)) (Zelnik-Manor & Perona, NIPS 2004; the rank 7 is
	// recalled from that paper, not checked). Points on a line, so z-scoring
	// (a shift and one common scale) leaves every weight unchanged. Expected
	// values worked by hand.
	tests := []struct {
		name   string
		points []float64
		k      int
		want   map[[2]int32]float64
	}{
		{
			// 0..8: σ = 7,6,5,4,4,4,5,6,7. With k = 2 item i keeps its
			// two nearest (ties to the smaller index), e.g. 0 keeps 1, 2
			// and 8 keeps 7, 6.
			name:   "nine points",
			points: []float64{0, 1, 2, 3, 4, 5, 6, 7, 8},
			k:      2,
			want: map[[2]int32]float64{
				{0, 1}: math.Exp(-1.0 / (7 * 6)),
				{0, 2}: math.Exp(-4.0 / (7 * 5)),
				{1, 2}: math.Exp(-1.0 / (6 * 5)),
				{2, 3}: math.Exp(-1.0 / (5 * 4)),
				{3, 4}: math.Exp(-1.0 / (4 * 4)),
				{4, 5}: math.Exp(-1.0 / (4 * 4)),
				{5, 6}: math.Exp(-1.0 / (4 * 5)),
				{6, 7}: math.Exp(-1.0 / (5 * 6)),
				{7, 8}: math.Exp(-1.0 / (6 * 7)),
				{6, 8}: math.Exp(-4.0 / (5 * 7)),
			},
		},
		{
			// Fewer than 8 points: σ is the distance to the farthest other
			// point, so σ = 3, 2, 3 for 0, 1, 3.
			name:   "three points",
			points: []float64{0, 1, 3},
			k:      1,
			want: map[[2]int32]float64{
				{0, 1}: math.Exp(-1.0 / (3 * 2)),
				{1, 2}: math.Exp(-4.0 / (2 * 3)),
			},
		},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			g, err := Vectors(tc.points, len(tc.points), 1, tc.k, Gaussian)
			if err != nil {
				t.Fatal(err)
			}
			checkGraph(t, g)
			compareEdges(t, edgeMap(g), tc.want, 1e-12)
		})
	}
}

func TestGaussianDuplicatesStayFinite(t *testing.T) {
	// Eight copies of one point give σ = 0 there; the weights must still
	// be finite and positive (identical points weigh 1).
	points := []float64{0, 0, 0, 0, 0, 0, 0, 0, 1, 2}
	for _, k := range []int{3, 0} {
		g, err := Vectors(points, len(points), 1, k, Gaussian)
		if err != nil {
			t.Fatal(err)
		}
		checkGraph(t, g)
		if w := g.Weight(0, 1); w != 1 {
			t.Errorf("k=%d: identical points weigh %v, want 1", k, w)
		}
		for _, w := range g.Weights {
			if w > 1 {
				t.Errorf("k=%d: weight %v above 1", k, w)
			}
		}
	}
}

func TestCosineZeroVectorAndClipping(t *testing.T) {
	// Item 1 sits at the mean (z-score 0): the zero vector, similar to
	// nothing. Items 0 and 2 point in opposite directions (cosine −1),
	// clipped to 0: no edge. Item 3 repeats item 2 (cosine 1).
	points := []float64{-1, 0, 1, 1, -1}
	g, err := Vectors(points, 5, 1, 0, Cosine)
	if err != nil {
		t.Fatal(err)
	}
	checkGraph(t, g)
	want := map[[2]int32]float64{{2, 3}: 1, {0, 4}: 1}
	compareEdges(t, edgeMap(g), want, 1e-15)
}

func TestAllColumnsConstant(t *testing.T) {
	// Nothing varies: under the cosine every item is the zero vector (no
	// edges); under the Gaussian every item is the same point (weight 1).
	points := []float64{2, 7, 2, 7, 2, 7, 2, 7}
	g, err := Vectors(points, 4, 2, 2, Cosine)
	if err != nil {
		t.Fatal(err)
	}
	checkGraph(t, g)
	if g.NumEdges() != 0 {
		t.Errorf("cosine: %d edges, want 0", g.NumEdges())
	}
	g, err = Vectors(points, 4, 2, 0, Gaussian)
	if err != nil {
		t.Fatal(err)
	}
	checkGraph(t, g)
	if g.NumEdges() != 6 {
		t.Errorf("gaussian: %d edges, want all 6", g.NumEdges())
	}
}

func TestBuilderErrors(t *testing.T) {
	big := make([][]string, AllPairsLimit+1)
	tests := []struct {
		name string
		run  func() error
	}{
		{"all pairs above the limit", func() error { _, err := Tags(big, 0); return err }},
		{"negative k", func() error { _, err := Text([]string{"a b", "c d"}, -1); return err }},
		{"ragged values", func() error { _, err := Vectors([]float64{1, 2, 3}, 2, 2, 1, Cosine); return err }},
		{"NaN value", func() error { _, err := Vectors([]float64{1, math.NaN()}, 2, 1, 1, Cosine); return err }},
		{"infinite value", func() error { _, err := Vectors([]float64{1, math.Inf(1)}, 2, 1, 1, Gaussian); return err }},
		{"unknown kind", func() error { _, err := Vectors([]float64{1, 2}, 2, 1, 1, VectorKind(9)); return err }},
	}
	for _, tc := range tests {
		if err := tc.run(); err == nil {
			t.Errorf("%s: no error", tc.name)
		}
	}
}

func TestTinyInputs(t *testing.T) {
	// No items, one item, two items: valid graphs, no panics.
	for n := 0; n <= 2; n++ {
		tags := make([][]string, n)
		texts := make([]string, n)
		vals := make([]float64, n)
		for i := 0; i < n; i++ {
			tags[i] = []string{"x", "y"}[:i+1]
			texts[i] = "drill bits"
			vals[i] = float64(i)
		}
		for _, k := range []int{0, 1, 5} {
			graphs := []func() (*CSR, error){
				func() (*CSR, error) { return Tags(tags, k) },
				func() (*CSR, error) { return Text(texts, k) },
				func() (*CSR, error) { return Vectors(vals, n, 1, k, Cosine) },
				func() (*CSR, error) { return Vectors(vals, n, 1, k, Gaussian) },
			}
			for s, build := range graphs {
				g, err := build()
				if err != nil {
					t.Fatalf("n=%d k=%d source %d: %v", n, k, s, err)
				}
				if g.N != n {
					t.Fatalf("n=%d k=%d source %d: N = %d", n, k, s, g.N)
				}
				checkGraph(t, g)
			}
		}
	}
}
