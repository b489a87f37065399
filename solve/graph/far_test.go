package graph

import (
	"math"
	"runtime"
	"testing"

	"gonum.org/v1/gonum/floats"
)

// Far partners add edges to the cosine kNN graph and change none of it:
// every neighbour edge stays with its weight, every added edge carries the
// cosine of its two z-scored items (reference: gonum v0.17.0 floats.Dot
// and floats.Norm), each item adds at most DefaultFarPartners edges, and
// the same seed gives the same graph at any GOMAXPROCS.
func TestFarPartnersAddSampledCosines(t *testing.T) {
	const n, dim = 400, 5
	values := clusteredVectors(n, dim, 6, 21)
	z := gonumZScores(values, n, dim)
	cos := func(i, j int32) float64 {
		return floats.Dot(z[i], z[j]) / (floats.Norm(z[i], 2) * floats.Norm(z[j], 2))
	}
	near, err := Builder{K: 10, Seed: 3}.Vectors(values, n, dim, Cosine)
	if err != nil {
		t.Fatal(err)
	}
	build := func(procs int) *CSR {
		defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(procs))
		g, err := Builder{K: 10, Seed: 3, FarPartners: DefaultFarPartners}.Vectors(values, n, dim, Cosine)
		if err != nil {
			t.Fatal(err)
		}
		return g
	}
	far := build(1)
	checkGraph(t, far)
	if diff := sameCSR(far, build(4)); diff != "" {
		t.Errorf("GOMAXPROCS 1 and 4 give different graphs: %s", diff)
	}
	nearEdges, farEdges := edgeMap(near), edgeMap(far)
	for e, w := range nearEdges {
		if farEdges[e] != w {
			t.Fatalf("neighbour edge %v: weight %v, was %v", e, farEdges[e], w)
		}
	}
	added := make([]int, n)
	for e, w := range farEdges {
		if _, ok := nearEdges[e]; ok {
			continue
		}
		if want := max(cos(e[0], e[1]), 0); !(math.Abs(w-want) <= 1e-9) {
			t.Fatalf("far edge %v: weight %v, cosine %v", e, w, want)
		}
		added[e[0]]++
		added[e[1]]++
	}
	total := 0
	for _, a := range added {
		total += a
	}
	// An edge counts for both its ends; each end drew it at most once.
	if total == 0 || total > 2*n*DefaultFarPartners {
		t.Errorf("%d far edge ends over %d items, want between 1 and %d", total, n, 2*n*DefaultFarPartners)
	}
	other, err := Builder{K: 10, Seed: 4, FarPartners: DefaultFarPartners}.Vectors(values, n, dim, Cosine)
	if err != nil {
		t.Fatal(err)
	}
	if sameCSR(far, other) == "" {
		t.Error("seeds 3 and 4 drew the same far partners")
	}
}
