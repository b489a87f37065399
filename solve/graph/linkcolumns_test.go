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
