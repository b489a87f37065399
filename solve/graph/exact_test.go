package graph

import (
	"fmt"
	"maps"
	"math"
	"slices"
	"sort"
	"testing"

	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/stat"
)

// gonumZScores is the reference standardisation, computed with gonum
// v0.17.0: stat.PopMeanStdDev per column (population sd), constant columns
// left out. Returns one slice per item.
func gonumZScores(values []float64, n, dim int) [][]float64 {
	rows := make([][]float64, n)
	col := make([]float64, n)
	for c := 0; c < dim; c++ {
		constant := true
		for i := 0; i < n; i++ {
			col[i] = values[i*dim+c]
			constant = constant && col[i] == col[0]
		}
		if constant {
			continue
		}
		mean, sd := stat.PopMeanStdDev(col, nil)
		for i := 0; i < n; i++ {
			rows[i] = append(rows[i], (col[i]-mean)/sd)
		}
	}
	return rows
}

// withConstantColumn appends a constant feature to every row, which the
// builders must ignore.
func withConstantColumn(x []float64, n, dim int) []float64 {
	out := make([]float64, 0, n*(dim+1))
	for i := 0; i < n; i++ {
		out = append(out, x[i*dim:(i+1)*dim]...)
		out = append(out, 5)
	}
	return out
}

func TestVectorsCosineMatchesBruteForce(t *testing.T) {
	const n, dim = 300, 6
	values := withConstantColumn(clusteredVectors(n, dim, 5, 11), n, dim)
	z := gonumZScores(values, n, dim+1)
	// Reference cosine via gonum v0.17.0 floats.Dot and floats.Norm(·, 2).
	cos := func(i, j int) float64 {
		return floats.Dot(z[i], z[j]) / (floats.Norm(z[i], 2) * floats.Norm(z[j], 2))
	}
	for _, k := range []int{1, 5, 15, 0} {
		t.Run(fmt.Sprintf("k=%d", k), func(t *testing.T) {
			g, err := Vectors(values, n, dim+1, k, Cosine)
			if err != nil {
				t.Fatal(err)
			}
			checkGraph(t, g)
			want := bruteUnionKNN(n, k, cos, func(i, j int) float64 { return max(cos(i, j), 0) })
			compareEdges(t, edgeMap(g), want, 1e-9)
		})
	}
}

func TestVectorsGaussianMatchesBruteForce(t *testing.T) {
	const n, dim = 250, 4
	values := withConstantColumn(clusteredVectors(n, dim, 4, 12), n, dim)
	z := gonumZScores(values, n, dim+1)
	// Reference distances via gonum v0.17.0 floats.Distance(·, ·, 2); σ_i is
	// the distance to the 7th nearest other item (the local scaling of
	// Zelnik-Manor & Perona, "Self-tuning spectral clustering", NIPS 2004).
	dist := func(i, j int) float64 { return floats.Distance(z[i], z[j], 2) }
	sigma := make([]float64, n)
	for i := range sigma {
		var ds []float64
		for j := 0; j < n; j++ {
			if j != i {
				ds = append(ds, dist(i, j))
			}
		}
		sort.Float64s(ds)
		sigma[i] = ds[6]
	}
	weight := func(i, j int) float64 {
		d := dist(i, j)
		return math.Exp(-d * d / (sigma[i] * sigma[j]))
	}
	for _, k := range []int{1, 3, 10, 0} {
		t.Run(fmt.Sprintf("k=%d", k), func(t *testing.T) {
			g, err := Vectors(values, n, dim+1, k, Gaussian)
			if err != nil {
				t.Fatal(err)
			}
			checkGraph(t, g)
			want := bruteUnionKNN(n, k, func(i, j int) float64 { return -dist(i, j) }, weight)
			compareEdges(t, edgeMap(g), want, 1e-9)
		})
	}
}

// refTagCosine is the IDF-weighted cosine of binary tag vectors written out
// directly: cos = Σ_{t∈A∩B} u_t² / (‖u_A‖·‖u_B‖), u_t = ln(N/df_t), 0 for a
// zero vector. Empty tag names are ignored, as Tags documents.
func refTagCosine(tags [][]string) func(i, j int) float64 {
	n := len(tags)
	sets := make([]map[string]bool, n)
	df := map[string]int{}
	for i, ts := range tags {
		sets[i] = map[string]bool{}
		for _, t := range ts {
			if t != "" && !sets[i][t] {
				sets[i][t] = true
				df[t]++
			}
		}
	}
	vec := make([]map[string]float64, n)
	for i := range sets {
		vec[i] = map[string]float64{}
		for t := range sets[i] {
			vec[i][t] = math.Log(float64(n) / float64(df[t]))
		}
	}
	return refCosine(vec)
}

// refCosine is the cosine of sparse term vectors written out directly,
// cos = Σ_t x_t·y_t / (‖x‖·‖y‖) summed in term order, 0 for a zero vector.
func refCosine(vec []map[string]float64) func(i, j int) float64 {
	terms := make([][]string, len(vec))
	norm := make([]float64, len(vec))
	for i := range vec {
		terms[i] = slices.Sorted(maps.Keys(vec[i]))
		for _, t := range terms[i] {
			norm[i] += vec[i][t] * vec[i][t]
		}
		norm[i] = math.Sqrt(norm[i])
	}
	return func(i, j int) float64 {
		if norm[i] == 0 || norm[j] == 0 {
			return 0
		}
		s := 0.0
		for _, t := range terms[i] {
			s += vec[i][t] * vec[j][t]
		}
		return s / (norm[i] * norm[j])
	}
}

// refTextCosine is textbook TF-IDF (raw tf × ln(N/df); Salton & Buckley,
// "Term-weighting approaches in automatic text retrieval", 1988)
// written out with maps over the same tokens Text uses.
func refTextCosine(texts []string) func(i, j int) float64 {
	n := len(texts)
	counts := make([]map[string]int, n)
	df := map[string]int{}
	for i, s := range texts {
		counts[i] = map[string]int{}
		for _, w := range Tokens(s) {
			counts[i][PluralStem(w)]++
		}
		for w := range counts[i] {
			df[w]++
		}
	}
	vec := make([]map[string]float64, n)
	for i := range counts {
		vec[i] = map[string]float64{}
		for w, c := range counts[i] {
			vec[i][w] = float64(c) * math.Log(float64(n)/float64(df[w]))
		}
	}
	return refCosine(vec)
}

// checkUnionOf asserts that g is exactly the union-kNN graph of lists with
// the listed scores as weights (positive ones only), and that every weight
// matches the reference similarity.
func checkUnionOf(t *testing.T, g *CSR, l *neighborLists, ref func(i, j int) float64, tol float64) {
	t.Helper()
	want := map[[2]int32]float64{}
	for i := 0; i < l.n; i++ {
		ids, sims := l.row(i)
		for p, j := range ids {
			if sims[p] > 0 {
				want[[2]int32{int32(min(i, int(j))), int32(max(i, int(j)))}] = sims[p]
			}
		}
	}
	compareEdges(t, edgeMap(g), want, 0)
	for e, w := range edgeMap(g) {
		if r := ref(int(e[0]), int(e[1])); math.Abs(w-r) > tol {
			t.Errorf("edge %v: weight %v, reference %v", e, w, r)
		}
	}
}

// checkSparseMatchesReference checks, for one k, the exact top-k lists of
// the sparse rows and the graph g built from the same items (err its
// builder's error) against the brute-force similarity ref.
func checkSparseMatchesReference(t *testing.T, rows *sparseRows, k int, ref func(i, j int) float64, g *CSR, err error) {
	t.Helper()
	l := exactSparse(rows, effectiveK(k, rows.n), nil)
	checkTopLists(t, l, rows.n, k, true, ref, 1e-12)
	if err != nil {
		t.Fatal(err)
	}
	checkGraph(t, g)
	checkUnionOf(t, g, l, ref, 1e-12)
}

func TestTagsMatchBruteForce(t *testing.T) {
	// Few tags over a small vocabulary: many exact ties, which the checks
	// must tolerate.
	tags := topicTags(400, 60, 6, 3, 13)
	tags[7] = nil                    // an item without tags
	tags[8] = []string{"", "tag001"} // empty names are ignored
	ref := refTagCosine(tags)
	for _, k := range []int{1, 5, 10, 0} {
		t.Run(fmt.Sprintf("k=%d", k), func(t *testing.T) {
			g, err := Tags(tags, k)
			checkSparseMatchesReference(t, tagRows(tags), k, ref, g, err)
		})
	}
}

func TestTextMatchesBruteForce(t *testing.T) {
	texts := topicTexts(300, 80, 5, 14)
	texts[3] = "the and of"
	ref := refTextCosine(texts)
	for _, k := range []int{1, 4, 12, 0} {
		t.Run(fmt.Sprintf("k=%d", k), func(t *testing.T) {
			g, err := Text(texts, k)
			checkSparseMatchesReference(t, Builder{}.textRows(texts), k, ref, g, err)
		})
	}
}

func TestTiesGoToSmallerIndex(t *testing.T) {
	// Items 0-3 have identical tags (cosine 1 with each other), item 4 is
	// different. With k = 2 each of 0-3 keeps the two smallest other indices
	// (ties go to the smaller item index), so 2-3 is not an edge: worked
	// by hand.
	tags := [][]string{{"a"}, {"a"}, {"a"}, {"a"}, {"b"}}
	g, err := Tags(tags, 2)
	if err != nil {
		t.Fatal(err)
	}
	checkGraph(t, g)
	want := map[[2]int32]float64{{0, 1}: 1, {0, 2}: 1, {1, 2}: 1, {0, 3}: 1, {1, 3}: 1}
	compareEdges(t, edgeMap(g), want, 1e-15)
}
