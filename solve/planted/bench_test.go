package planted

import (
	"fmt"
	"os"
	"testing"

	"github.com/ramify-tax/ramify/solve"
)

// Benchmarks of the solve package's cost and average-linkage baseline on
// planted graphs (kept here because solve's own tests cannot import this
// package). Run with: go test -bench . -benchmem ./solve/planted/
// (RAMIFY_BIG=1 adds the 100,000-item linkage run).

func BenchmarkCost100k(b *testing.B) {
	in := Generate(1, 100000, 4, 5)
	trees := map[string]*solve.Tree{
		"planted":   in.Tree,
		"caterpill": caterpillar(in.N), // depth n: the worst case for LCA walks
	}
	for _, name := range []string{"planted", "caterpill"} {
		t := trees[name]
		b.Run(fmt.Sprintf("%s/m=%d", name, in.Graph.NumEdges()), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				solve.Cost(in.Graph, t)
			}
		})
	}
}

func caterpillar(n int) *solve.Tree {
	t := solve.NewTree(n)
	cur := int32(0)
	for i := 1; i < n; i++ {
		cur = t.Add(cur, int32(i))
	}
	return t
}

func BenchmarkAverageLinkageGraph(b *testing.B) {
	sizes := []int{1000, 10000}
	if os.Getenv("RAMIFY_BIG") == "1" {
		sizes = append(sizes, 100000)
	}
	for _, n := range sizes {
		in := Generate(1, n, 4, 5)
		b.Run(fmt.Sprintf("n=%d/m=%d", n, in.Graph.NumEdges()), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				solve.AverageLinkageGraph(in.Graph)
			}
		})
	}
}
