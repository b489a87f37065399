package solve_test

import (
	"fmt"
	"slices"
	"testing"

	"github.com/ramify-tax/ramify/solve"
	"github.com/ramify-tax/ramify/solve/planted"
)

// TestFrontierMemoChangesNothing runs the frontier passes with and without
// the memo of earlier passes from the same average-linkage trees, with and
// without triplet records, and wants the same moves in every pass and the
// same tree at the end.
func TestFrontierMemoChangesNothing(t *testing.T) {
	for _, bc := range []struct{ n, triplets int }{{2000, 0}, {2000, 200}, {4000, 0}} {
		t.Run(fmt.Sprintf("n=%d/triplets=%d", bc.n, bc.triplets), func(t *testing.T) {
			in := planted.Generate(3, bc.n, 4, 4)
			start := solve.AverageLinkageGraph(in.Graph)
			c := plantedTriplets(in, start, bc.triplets)
			fresh, kept := cloneTree(start), cloneTree(start)
			want := solve.FrontierPassesForTest(in.Graph, fresh, c, 8, false)
			got := solve.FrontierPassesForTest(in.Graph, kept, c, 8, true)
			if !slices.Equal(got, want) {
				t.Fatalf("moves per pass: with the memo %v, without %v", got, want)
			}
			if len(want) < 2 || want[1] == 0 {
				t.Fatalf("moves per pass %v: the second pass should still move something", want)
			}
			for v := range fresh.Kids {
				if !slices.Equal(fresh.Kids[v], kept.Kids[v]) {
					t.Fatalf("node %d: children %v with the memo, %v without", v, kept.Kids[v], fresh.Kids[v])
				}
			}
		})
	}
}

// BenchmarkFrontierPasses times up to eight frontier passes from the
// average-linkage tree of a planted hierarchy, as the improvement runs
// them, with and without the memo that lets later passes solve the DP only
// near the nodes the pass before rewired.
func BenchmarkFrontierPasses(b *testing.B) {
	in := planted.Generate(1, 10000, 4, 4)
	start := solve.AverageLinkageGraph(in.Graph)
	for _, remember := range []bool{false, true} {
		b.Run(fmt.Sprintf("n=10000/memo=%v", remember), func(b *testing.B) {
			var moves []int
			for b.Loop() {
				b.StopTimer()
				t := cloneTree(start)
				b.StartTimer()
				moves = solve.FrontierPassesForTest(in.Graph, t, nil, 8, remember)
			}
			b.ReportMetric(float64(len(moves)), "passes")
		})
	}
}
