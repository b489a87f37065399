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

func BenchmarkExactVectors(b *testing.B) {
	for _, n := range benchSizes(false) {
		vals := clusteredVectors(n, 16, 20, 51)
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			bd := Builder{K: benchK, Search: SearchExact}
			var g *CSR
			for b.Loop() {
				g, _ = bd.Vectors(vals, n, 16, Cosine)
			}
			b.ReportMetric(float64(g.NumEdges()), "edges")
		})
	}
}

func BenchmarkExactTags(b *testing.B) {
	for _, n := range benchSizes(false) {
		tags := topicTags(n, 500, 50, 5, 52)
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			bd := Builder{K: benchK, Search: SearchExact}
			var g *CSR
			for b.Loop() {
				g, _ = bd.Tags(tags)
			}
			b.ReportMetric(float64(g.NumEdges()), "edges")
		})
	}
}

func BenchmarkExactText(b *testing.B) {
	for _, n := range benchSizes(false) {
		texts := topicTexts(n, 1000, 50, 53)
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			bd := Builder{K: benchK, Search: SearchExact}
			var g *CSR
			for b.Loop() {
				g, _ = bd.Text(texts)
			}
			b.ReportMetric(float64(g.NumEdges()), "edges")
		})
	}
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

func BenchmarkNNDescentVectors(b *testing.B) {
	for _, n := range benchSizes(true) {
		vals := clusteredVectors(n, 16, 20, 54)
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			bd := Builder{K: benchK, Search: SearchApprox, Seed: DefaultSeed}
			var g *CSR
			for b.Loop() {
				g, _ = bd.Vectors(vals, n, 16, Cosine)
			}
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
			bd := Builder{K: benchK, Search: SearchApprox, Seed: DefaultSeed}
			var g *CSR
			for b.Loop() {
				g, _ = bd.Tags(tags)
			}
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
