package solve_test

import (
	"fmt"
	"testing"

	"github.com/ramify-tax/ramify/solve"
	"github.com/ramify-tax/ramify/solve/planted"
)

// BenchmarkCost times Dasgupta's cost of the planted tree and of the
// average-linkage tree (deep and binary) on planted hierarchies.
func BenchmarkCost(b *testing.B) {
	for _, n := range []int{10000, 100000} {
		in := planted.Generate(1, n, 4, 4)
		trees := map[string]*solve.Tree{"planted": in.Tree, "avglink": solve.AverageLinkageGraph(in.Graph)}
		for _, name := range []string{"planted", "avglink"} {
			b.Run(fmt.Sprintf("%s/n=%d", name, n), func(b *testing.B) {
				b.ReportAllocs()
				for b.Loop() {
					solve.Cost(in.Graph, trees[name])
				}
			})
		}
	}
}
