package graph

import (
	"fmt"
	"runtime"
	"slices"
	"testing"
)

// TestSameGraphOnAnyGOMAXPROCS builds every source, exact and approximate,
// with one, two and three threads and requires bit-identical graphs
// (work is split into fixed chunks and combined in a fixed order, so no
// floating-point sum depends on the number of threads).
func TestSameGraphOnAnyGOMAXPROCS(t *testing.T) {
	const n = 3000
	vals := clusteredVectors(n, 8, 10, 31)
	tags := topicTags(n, 300, 30, 5, 32)
	texts := topicTexts(n, 200, 20, 33)
	approx := Builder{K: 10, Search: SearchApprox, Seed: 7}
	exact := Builder{K: 10, Search: SearchExact}
	builds := map[string]func() (*CSR, error){
		"vectors cosine exact":   func() (*CSR, error) { return exact.Vectors(vals, n, 8, Cosine) },
		"vectors gaussian exact": func() (*CSR, error) { return exact.Vectors(vals, n, 8, Gaussian) },
		"vectors cosine approx":  func() (*CSR, error) { return approx.Vectors(vals, n, 8, Cosine) },
		"vectors gaussian approx": func() (*CSR, error) {
			return approx.Vectors(vals, n, 8, Gaussian)
		},
		"tags exact":     func() (*CSR, error) { return exact.Tags(tags) },
		"tags approx":    func() (*CSR, error) { return approx.Tags(tags) },
		"tags all pairs": func() (*CSR, error) { return Tags(tags[:1500], 0) },
		"text exact":     func() (*CSR, error) { return exact.Text(texts) },
		"text approx":    func() (*CSR, error) { return approx.Text(texts) },
	}
	names := make([]string, 0, len(builds))
	for name := range builds {
		names = append(names, name)
	}
	slices.Sort(names)
	defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(0))
	for _, name := range names {
		t.Run(name, func(t *testing.T) {
			var first *CSR
			for _, procs := range []int{1, 2, 3} {
				runtime.GOMAXPROCS(procs)
				g, err := builds[name]()
				if err != nil {
					t.Fatal(err)
				}
				checkGraph(t, g)
				if first == nil {
					first = g
					continue
				}
				if diff := sameCSR(first, g); diff != "" {
					t.Fatalf("GOMAXPROCS=%d differs from GOMAXPROCS=1: %s", procs, diff)
				}
			}
		})
	}
}

// sameCSR reports the first difference between two graphs, bit for bit.
func sameCSR(a, b *CSR) string {
	switch {
	case a.N != b.N:
		return fmt.Sprintf("N %d vs %d", a.N, b.N)
	case !slices.Equal(a.Offsets, b.Offsets):
		return "offsets differ"
	case !slices.Equal(a.Targets, b.Targets):
		return "targets differ"
	case !slices.Equal(a.Weights, b.Weights):
		return "weights differ"
	}
	return ""
}

func TestSeedFixesTheApproximateGraph(t *testing.T) {
	// The same seed always gives the same approximate graph, exact search
	// ignores the seed, and the approximate graph keeps most exact edges.
	const n = 2000
	vals := clusteredVectors(n, 8, 10, 34)
	a1, _ := Builder{K: 8, Search: SearchApprox, Seed: 1}.Vectors(vals, n, 8, Cosine)
	a1again, _ := Builder{K: 8, Search: SearchApprox, Seed: 1}.Vectors(vals, n, 8, Cosine)
	if diff := sameCSR(a1, a1again); diff != "" {
		t.Errorf("same seed, different graphs: %s", diff)
	}
	e1, _ := Builder{K: 8, Search: SearchExact, Seed: 1}.Vectors(vals, n, 8, Cosine)
	e2, _ := Builder{K: 8, Search: SearchExact, Seed: 2}.Vectors(vals, n, 8, Cosine)
	if diff := sameCSR(e1, e2); diff != "" {
		t.Errorf("exact search depends on the seed: %s", diff)
	}
	if r := Recall(a1, e1); r < 0.9 {
		t.Errorf("edge recall %.4f < 0.9", r)
	}
}
