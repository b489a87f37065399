package solve_test

import (
	"fmt"
	"math/rand/v2"
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

// BenchmarkFrontierPass times one pass of the frontier re-arrangement
// (frontier.go) on the average-linkage tree of a planted hierarchy, which
// leaves it many improving moves, with and without triplet records drawn
// from the planted tree. Each run starts from a fresh copy of the tree.
func BenchmarkFrontierPass(b *testing.B) {
	for _, bc := range []struct {
		n, triplets int
	}{{1000, 0}, {10000, 0}, {10000, 500}} {
		b.Run(fmt.Sprintf("n=%d/triplets=%d", bc.n, bc.triplets), func(b *testing.B) {
			in := planted.Generate(1, bc.n, 4, 4)
			start := solve.AverageLinkageGraph(in.Graph)
			c := plantedTriplets(in, start, bc.triplets)
			b.ReportAllocs()
			b.ResetTimer()
			moves := 0
			for i := 0; i < b.N; i++ {
				b.StopTimer()
				t := cloneTree(start)
				b.StartTimer()
				moves, _ = solve.FrontierPassForTest(in.Graph, t, c)
			}
			b.StopTimer()
			if moves == 0 {
				b.Fatal("the pass found no improving move on the average-linkage tree")
			}
			b.ReportMetric(float64(moves), "moves")
		})
	}
}

// plantedTriplets returns k triplets ab|c that the planted tree and t
// both display (the pass runs on trees that keep their records): a and b
// share a bottom category, c lies under another top-level one.
func plantedTriplets(in *planted.Instance, t *solve.Tree, k int) *solve.Constraints {
	if k == 0 {
		return nil
	}
	r := rand.New(rand.NewPCG(in.Seed, 0x74726970))
	byBottom := map[int32][]int32{}
	for i, bt := range in.Bottom {
		byBottom[bt] = append(byBottom[bt], int32(i))
	}
	draw := &solve.Constraints{}
	for len(draw.Triplets) < 8*k {
		a := int32(r.IntN(in.N))
		same := byBottom[in.Bottom[a]]
		b := same[r.IntN(len(same))]
		c := int32(r.IntN(in.N))
		if b == a || in.Ancestor(int(a), 1) == in.Ancestor(int(c), 1) {
			continue
		}
		draw.Triplets = append(draw.Triplets, solve.Triplet{A: a, B: b, C: c, Record: len(draw.Triplets)})
	}
	broken := map[int]bool{}
	for _, rec := range solve.Satisfies(t, draw) {
		broken[rec] = true
	}
	kept := &solve.Constraints{}
	for _, tr := range draw.Triplets {
		if !broken[tr.Record] && len(kept.Triplets) < k {
			tr.Record = len(kept.Triplets)
			kept.Triplets = append(kept.Triplets, tr)
		}
	}
	return kept
}

func cloneTree(t *solve.Tree) *solve.Tree {
	out := solve.NewTree(t.N)
	out.Kids = make([][]int32, len(t.Kids))
	for i, k := range t.Kids {
		out.Kids[i] = append([]int32(nil), k...)
	}
	out.Root = t.Root
	return out
}
