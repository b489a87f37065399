package graph

import (
	"fmt"
	"math/rand/v2"
	"os"
	"testing"
)

// Benchmarks: go test -bench . -benchmem ./solve/graph; the 100,000-item
// NN-Descent runs only with RAMIFY_BIG=1. Data: 16-dimensional Gaussian
// mixtures (20 clusters) and tag sets (vocabulary 500, 5 tags per item,
// 50 topics), k = 15. NN-Descent runs report the tie-aware neighbour
// recall on 500 sampled items against their exact lists.

const benchK = 15

func benchSizes(big bool) []int {
	if big {
		if os.Getenv("RAMIFY_BIG") != "1" {
			return []int{20000}
		}
		return []int{20000, 100000}
	}
	return []int{1000, 10000, 20000}
}

// A graphBuild builds one source's graph with the builder it is given,
// on data made beforehand.
type graphBuild func(bd Builder) (*CSR, error)

// timeBuild times build with bd and returns the last graph.
func timeBuild(b *testing.B, bd Builder, build graphBuild) *CSR {
	var g *CSR
	for b.Loop() {
		g, _ = build(bd)
	}
	return g
}

// benchExact times the exact search at every size on the data input makes
// for it (outside the timing), and reports the graph's edges.
func benchExact(b *testing.B, input func(n int) graphBuild) {
	for _, n := range benchSizes(false) {
		build := input(n)
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			g := timeBuild(b, Builder{K: benchK, Search: SearchExact}, build)
			b.ReportMetric(float64(g.NumEdges()), "edges")
		})
	}
}

func BenchmarkExactVectors(b *testing.B) {
	benchExact(b, func(n int) graphBuild {
		vals := clusteredVectors(n, 16, 20, 51)
		return func(bd Builder) (*CSR, error) { return bd.Vectors(vals, n, 16, Cosine) }
	})
}

func BenchmarkExactTags(b *testing.B) {
	benchExact(b, func(n int) graphBuild {
		tags := topicTags(n, 500, 50, 5, 52)
		return func(bd Builder) (*CSR, error) { return bd.Tags(tags) }
	})
}

func BenchmarkExactText(b *testing.B) {
	benchExact(b, func(n int) graphBuild {
		texts := topicTexts(n, 1000, 50, 53)
		return func(bd Builder) (*CSR, error) { return bd.Text(texts) }
	})
}

// sampleItems draws m distinct items of n, seeded.
func sampleItems(n, m int, seed uint64) []int32 {
	rng := rand.New(rand.NewPCG(seed, 4))
	perm := rng.Perm(n)[:min(m, n)]
	out := make([]int32, len(perm))
	for i, v := range perm {
		out[i] = int32(v)
	}
	return out
}

// reportSampledRecall reports the recall of the approximate lists against
// the exact lists of the sampled items, and the edges of the graph g.
func reportSampledRecall(b *testing.B, g *CSR, approx, exact *neighborLists, sample []int32) {
	b.ReportMetric(listRecall(approx, exact, func(i int) int { return int(sample[i]) }), "recall")
	b.ReportMetric(float64(g.NumEdges()), "edges")
}

// approxBuilder is the NN-Descent benchmarks' builder.
var approxBuilder = Builder{K: benchK, Search: SearchApprox, Seed: DefaultSeed}

func BenchmarkNNDescentVectors(b *testing.B) {
	for _, n := range benchSizes(true) {
		vals := clusteredVectors(n, 16, 20, 54)
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			g := timeBuild(b, approxBuilder, func(bd Builder) (*CSR, error) { return bd.Vectors(vals, n, 16, Cosine) })
			b.StopTimer()
			x, d := standardize(vals, nil, n, 16)
			normalizeRows(x, n, d)
			r := &denseRows[float64]{n: n, d: d, x: x}
			sample := sampleItems(n, 500, 55)
			reportSampledRecall(b, g, approxDense(r, benchK, DefaultSeed), exactDense(r, benchK, sample), sample)
		})
	}
}

func BenchmarkNNDescentTags(b *testing.B) {
	for _, n := range benchSizes(true) {
		tags := topicTags(n, 500, 50, 5, 56)
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			g := timeBuild(b, approxBuilder, func(bd Builder) (*CSR, error) { return bd.Tags(tags) })
			b.StopTimer()
			rows := tagRows(tags)
			sample := sampleItems(n, 500, 57)
			reportSampledRecall(b, g, approxSparse(rows, benchK, DefaultSeed), exactSparse(rows, benchK, sample), sample)
		})
	}
}

// BenchmarkMedianWeight1M is the normalisation Combine does on a links
// graph of a million random edges.
func BenchmarkMedianWeight1M(b *testing.B) {
	rng := rand.New(rand.NewPCG(5, 6))
	const n = 200_000
	edges := make([]Edge, 1_000_000)
	for i := range edges {
		u := rng.Int32N(n)
		v := (u + 1 + rng.Int32N(n-1)) % n
		edges[i] = Edge{u, v, rng.Float64()}
	}
	g, err := FromEdges(n, edges)
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		MedianWeight(g)
	}
}
