package solve_test

import (
	"fmt"
	"os"
	"testing"

	"github.com/ramify-tax/ramify/solve"
	"github.com/ramify-tax/ramify/solve/planted"
)

// BenchmarkSolve runs the whole pipeline on planted hierarchies (branching
// 4, depth 4, about ten partner draws per item: 3–10 edges per item after
// merging). It reports the Dasgupta cost of the binary tree relative to
// average linkage on the same graph (cost/avglink; below 1 is better, the
// project's target is ≤ 1) and of the folded taxonomy relative to the
// planted tree (tax/planted). n = 100,000 runs only with RAMIFY_BIG=1.
func BenchmarkSolve(b *testing.B) {
	sizes := []int{1000, 10000}
	if os.Getenv("RAMIFY_BIG") == "1" {
		sizes = append(sizes, 100000)
	}
	for _, n := range sizes {
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			in := planted.Generate(1, n, 4, 4)
			avg := solve.Cost(in.Graph, solve.AverageLinkageGraph(in.Graph))
			truth := solve.Cost(in.Graph, in.Tree)
			opt := solve.Options{MinSize: 3, MaxChildren: 12, MaxDepth: 6, Seed: 1}
			b.ReportAllocs()
			b.ResetTimer()
			var res *solve.Result
			for i := 0; i < b.N; i++ {
				var err error
				res, err = solve.Solve(in.Graph, nil, opt)
				if err != nil {
					b.Fatal(err)
				}
			}
			b.StopTimer()
			b.ReportMetric(solve.Cost(in.Graph, res.Binary)/avg, "cost/avglink")
			b.ReportMetric(solve.Cost(in.Graph, res.Taxonomy)/truth, "tax/planted")
		})
	}
}
