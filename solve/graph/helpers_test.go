package graph

import (
	"fmt"
	"math"
	"math/rand/v2"
	"sort"
	"testing"
)

// checkGraph asserts the CSR invariants every builder promises: offsets
// well formed, rows strictly increasing, no self-loops, weights positive and
// finite, and every edge stored in both rows with the same weight.
func checkGraph(t *testing.T, g *CSR) {
	t.Helper()
	if len(g.Offsets) != g.N+1 || g.Offsets[0] != 0 || int(g.Offsets[g.N]) != len(g.Targets) || len(g.Targets) != len(g.Weights) {
		t.Fatalf("malformed CSR: N=%d offsets=%d targets=%d weights=%d", g.N, len(g.Offsets), len(g.Targets), len(g.Weights))
	}
	for u := 0; u < g.N; u++ {
		if g.Offsets[u+1] < g.Offsets[u] {
			t.Fatalf("row %d: offsets decrease", u)
		}
		ts, ws := g.Neighbors(u)
		for p, v := range ts {
			switch {
			case v < 0 || int(v) >= g.N:
				t.Fatalf("row %d: target %d out of range", u, v)
			case int(v) == u:
				t.Fatalf("row %d: self-loop", u)
			case p > 0 && ts[p-1] >= v:
				t.Fatalf("row %d: targets not strictly increasing at %d", u, p)
			case !(ws[p] > 0) || math.IsInf(ws[p], 0):
				t.Fatalf("edge %d-%d: weight %v", u, v, ws[p])
			case g.Weight(int(v), u) != ws[p]:
				t.Fatalf("edge %d-%d: weight %v one way, %v the other", u, v, ws[p], g.Weight(int(v), u))
			}
		}
	}
}

// edgeMap lists each undirected edge once, keyed by (min, max).
func edgeMap(g *CSR) map[[2]int32]float64 {
	m := map[[2]int32]float64{}
	for _, e := range g.Edges() {
		m[[2]int32{e.A, e.B}] = e.W
	}
	return m
}

// bruteUnionKNN is the reference union-kNN graph from a full similarity
// matrix: each i keeps its k best j (higher rank first, ties by smaller j;
// k = 0 keeps all), an edge exists when either side keeps the other, and
// its weight is weight(i, j) where positive.
func bruteUnionKNN(n, k int, rank func(i, j int) float64, weight func(i, j int) float64) map[[2]int32]float64 {
	m := map[[2]int32]float64{}
	for i := 0; i < n; i++ {
		js := make([]int, 0, n-1)
		for j := 0; j < n; j++ {
			if j != i {
				js = append(js, j)
			}
		}
		sort.SliceStable(js, func(a, b int) bool { return rank(i, js[a]) > rank(i, js[b]) })
		if k > 0 && len(js) > k {
			js = js[:k]
		}
		for _, j := range js {
			if w := weight(i, j); w > 0 {
				m[[2]int32{int32(min(i, j)), int32(max(i, j))}] = w
			}
		}
	}
	return m
}

// compareEdges asserts two edge maps have the same keys and weights within
// a relative tolerance.
func compareEdges(t *testing.T, got, want map[[2]int32]float64, tol float64) {
	t.Helper()
	for e, w := range want {
		g, ok := got[e]
		if !ok {
			t.Errorf("missing edge %v (want weight %v)", e, w)
			continue
		}
		if math.Abs(g-w) > tol*math.Max(1, math.Abs(w)) {
			t.Errorf("edge %v: weight %v, want %v", e, g, w)
		}
	}
	for e, w := range got {
		if _, ok := want[e]; !ok {
			t.Errorf("extra edge %v (weight %v)", e, w)
		}
	}
}

// checkTopLists asserts that lists hold, for every item, a correct top-k
// under the reference similarity ref (positive entries only when
// positiveOnly): every listed score matches ref, the listed scores are the
// k largest of ref's row, and nothing left out beats the last listed one.
// It is robust to ties, which two implementations may round differently.
// With k = 0 the rows may come in any order.
func checkTopLists(t *testing.T, l *neighborLists, n, k int, positiveOnly bool, ref func(i, j int) float64, tol float64) {
	t.Helper()
	for i := 0; i < n; i++ {
		var all []float64
		for j := 0; j < n; j++ {
			if j != i && (!positiveOnly || ref(i, j) > tol) {
				all = append(all, ref(i, j))
			}
		}
		sort.Sort(sort.Reverse(sort.Float64Slice(all)))
		want := len(all)
		if k > 0 {
			want = min(k, want)
		}
		ids, sims := l.row(i)
		if k == 0 {
			// The all-pairs mode lists rows in no particular order.
			ids, sims = append([]int32(nil), ids...), append([]float64(nil), sims...)
			sortBestFirst(ids, sims)
		}
		if len(ids) != want {
			t.Fatalf("item %d: %d neighbours, want %d", i, len(ids), want)
		}
		listed := map[int32]bool{}
		for p, j := range ids {
			listed[j] = true
			if math.Abs(sims[p]-ref(i, int(j))) > tol {
				t.Fatalf("item %d: score of %d is %v, reference %v", i, j, sims[p], ref(i, int(j)))
			}
			if math.Abs(sims[p]-all[p]) > tol {
				t.Fatalf("item %d: %d-th best score %v, reference %v", i, p, sims[p], all[p])
			}
		}
		if want == 0 {
			continue
		}
		last := sims[len(sims)-1]
		for j := 0; j < n; j++ {
			if j != i && !listed[int32(j)] && ref(i, j) > last+tol {
				t.Fatalf("item %d: left out %d with %v > last kept %v", i, j, ref(i, j), last)
			}
		}
	}
}

// clusteredVectors draws n points in dim dimensions around clusters centres
// (centres N(0, 3²) per coordinate, points N(centre, 1)).
func clusteredVectors(n, dim, clusters int, seed uint64) []float64 {
	rng := rand.New(rand.NewPCG(seed, 1))
	centres := make([]float64, clusters*dim)
	for p := range centres {
		centres[p] = 3 * rng.NormFloat64()
	}
	x := make([]float64, n*dim)
	for i := 0; i < n; i++ {
		c := rng.IntN(clusters)
		for d := 0; d < dim; d++ {
			x[i*dim+d] = centres[c*dim+d] + rng.NormFloat64()
		}
	}
	return x
}

// topicTags draws n tag sets of perItem distinct tags from a vocabulary of
// vocab tags: each item has one of topics topics, and each of its tags comes
// from the topic's 40 favourite tags with probability 0.8, else from the
// whole vocabulary — a skewed, clustered tag distribution.
func topicTags(n, vocab, topics, perItem int, seed uint64) [][]string {
	rng := rand.New(rand.NewPCG(seed, 2))
	names := make([]string, vocab)
	for v := range names {
		names[v] = fmt.Sprintf("tag%03d", v)
	}
	favourites := make([][]int, topics)
	for tp := range favourites {
		favourites[tp] = rng.Perm(vocab)[:min(40, vocab)]
	}
	out := make([][]string, n)
	for i := range out {
		tp := rng.IntN(topics)
		seen := map[int]bool{}
		for len(seen) < perItem {
			v := rng.IntN(vocab)
			if rng.Float64() < 0.8 {
				v = favourites[tp][rng.IntN(len(favourites[tp]))]
			}
			if !seen[v] {
				seen[v] = true
				out[i] = append(out[i], names[v])
			}
		}
	}
	return out
}

// topicTexts draws n short descriptions from invented two-syllable words,
// clustered by topic like topicTags, with repeated words and stopwords mixed
// in so raw term counts above 1 and dropped tokens both occur.
func topicTexts(n, vocab, topics int, seed uint64) []string {
	rng := rand.New(rand.NewPCG(seed, 3))
	syll := []string{"ba", "ko", "mi", "ru", "te", "lo", "na", "pi", "su", "ve", "do", "ga"}
	words := make([]string, vocab)
	for v := range words {
		words[v] = syll[v%len(syll)] + syll[(v/len(syll))%len(syll)] + syll[(v/144)%len(syll)]
	}
	favourites := make([][]int, topics)
	for tp := range favourites {
		favourites[tp] = rng.Perm(vocab)[:min(30, vocab)]
	}
	out := make([]string, n)
	for i := range out {
		tp := rng.IntN(topics)
		m := 4 + rng.IntN(8)
		s := ""
		for w := 0; w < m; w++ {
			v := rng.IntN(vocab)
			if rng.Float64() < 0.7 {
				v = favourites[tp][rng.IntN(len(favourites[tp]))]
			}
			s += words[v]
			switch rng.IntN(5) {
			case 0:
				s += ", the "
			case 1:
				s += "s and "
			default:
				s += " "
			}
		}
		out[i] = s
	}
	return out
}
