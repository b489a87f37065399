package graph

import (
	"math/rand/v2"
	"testing"

	"github.com/google/go-cmp/cmp"
)

// LinkColumns builds the same graph as Links over the same links as Edge
// values, with weights widened from float32, leaving out links to ids
// that are not vertices.
func TestLinkColumnsIsLinks(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 6))
	const n, ids, m = 50, 60, 400
	vertex := make([]int32, ids)
	for k := range vertex {
		vertex[k] = int32(r.IntN(n + 10)) // some ids are not vertices
		if vertex[k] >= n {
			vertex[k] = -1
		}
	}
	a, b := make([]int32, m), make([]int32, m)
	w := make([]float32, m)
	var edges []Edge
	for k := range m {
		a[k], b[k] = int32(r.IntN(ids)), int32(r.IntN(ids))
		w[k] = float32(r.Float64() + 0.01)
		if va, vb := vertex[a[k]], vertex[b[k]]; va >= 0 && vb >= 0 {
			edges = append(edges, Edge{A: va, B: vb, W: float64(w[k])})
		}
	}
	want, err := Links(n, edges)
	if err != nil {
		t.Fatal(err)
	}
	got, err := LinkColumns(n, vertex, a, b, w)
	if err != nil {
		t.Fatal(err)
	}
	if d := cmp.Diff(want, got); d != "" {
		t.Errorf("LinkColumns differs from Links (-want +got):\n%s", d)
	}
	w[3] = 0
	if _, err := LinkColumns(n, vertex, a, b, w); err == nil {
		t.Error("a weight of 0 was accepted")
	}
}

// Rows built in parts are the rows of one pass: the same entries, in the
// same order, with duplicates summed in the same order, for any number of
// parts; edges to unknown vertices, self-loops and zero weights dropped
// alike.
func TestEdgeRowsInPartsAreOnePass(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	for _, n := range []int{2, 3, 17, 500} {
		m := 20 * n
		a, b, w := make([]int32, m), make([]int32, m), make([]float64, m)
		for k := range m {
			a[k], b[k] = int32(rng.IntN(n+1))-1, int32(rng.IntN(n))
			w[k] = float64(rng.IntN(4)) * (1 + rng.Float64()) // some 0, many repeats
			if k%7 == 0 && k > 0 {
				a[k], b[k] = b[k-1], a[k-1] // the same pair the other way round
			}
		}
		edge := func(k int) (int32, int32, float64) { return a[k], b[k], w[k] }
		want := fromEdgeFuncParts(n, m, edge, 1)
		for parts := 2; parts <= min(n, 5); parts++ {
			if diff := cmp.Diff(want, fromEdgeFuncParts(n, m, edge, parts)); diff != "" {
				t.Errorf("n %d in %d parts (-one pass +parts):\n%s", n, parts, diff)
			}
		}
	}
}

// BenchmarkLinkColumns1M builds the graph of seven million links over a
// million items, the second end of each at random, as a large
// repository's links are.
func BenchmarkLinkColumns1M(b *testing.B) {
	const n, m = 1_000_000, 7_000_000
	rng := rand.New(rand.NewPCG(1, 2))
	vertex := make([]int32, n)
	for i := range vertex {
		vertex[i] = int32(i)
	}
	ca, cb, w := make([]int32, m), make([]int32, m), make([]float32, m)
	for k := range m {
		ca[k], cb[k], w[k] = int32(k/7), int32(rng.IntN(n)), 0.5+rng.Float32()
	}
	for b.Loop() {
		if _, err := LinkColumns(n, vertex, ca, cb, w); err != nil {
			b.Fatal(err)
		}
	}
}
