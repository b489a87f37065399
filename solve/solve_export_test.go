package solve

import (
	"math/rand/v2"
	"testing"

	"github.com/ramify-tax/ramify/solve/graph"
)

// Hooks for the external tests (package solve_test), which need the
// planted generator and so cannot live inside package solve.

// SolveSpectralOnlyForTest runs Solve with the exact subset DP switched
// off, so every split comes from the components, forced splits or the
// Fiedler sweep.
func SolveSpectralOnlyForTest(g *graph.CSR, c *Constraints, opt Options) (*Result, error) {
	return solveWith(g, c, opt, constructParams{leafDP: 1, superDP: 1})
}

// MustGraph builds a CSR from edges, failing the test on error.
func MustGraph(tb testing.TB, n int, edges []graph.Edge) *graph.CSR {
	tb.Helper()
	g, err := graph.FromEdges(n, edges)
	if err != nil {
		tb.Fatal(err)
	}
	return g
}

// RandomWeightedGraph is G(n, p), every pair present with probability p,
// with weights uniform in (0, 1], drawn from PCG(seed, stream).
func RandomWeightedGraph(tb testing.TB, seed, stream uint64, n int, p float64) *graph.CSR {
	r := rand.New(rand.NewPCG(seed, stream))
	var es []graph.Edge
	for i := 0; i < n; i++ {
		for j := i + 1; j < n; j++ {
			if r.Float64() < p {
				es = append(es, graph.Edge{A: int32(i), B: int32(j), W: 1 - r.Float64()})
			}
		}
	}
	return MustGraph(tb, n, es)
}

// RandomGraph returns a connected graph on n vertices, drawn from
// PCG(seed, stream): a random spanning path plus extra random edges,
// weights in (0.1, 2.1).
func RandomGraph(tb testing.TB, seed, stream uint64, n, extra int) *graph.CSR {
	r := rand.New(rand.NewPCG(seed, stream))
	perm := r.Perm(n)
	var es []graph.Edge
	for i := 0; i+1 < n; i++ {
		es = append(es, graph.Edge{A: int32(perm[i]), B: int32(perm[i+1]), W: 0.1 + 2*r.Float64()})
	}
	for k := 0; k < extra; k++ {
		a, b := r.IntN(n), r.IntN(n)
		es = append(es, graph.Edge{A: int32(a), B: int32(b), W: 0.1 + 2*r.Float64()})
	}
	return MustGraph(tb, n, es)
}

// FrontierPassForTest runs one frontier re-arrangement pass on t in place,
// at the depth the solver uses for t.N leaves, and returns how many moves
// it applied and the cost they saved.
func FrontierPassForTest(g *graph.CSR, t *Tree, c *Constraints) (int, float64) {
	k, saved, _ := frontierPass(g, t, c, nil, frontierDepth(t.N), nil)
	return k, saved
}

// FrontierPassesForTest runs up to passes frontier passes on t in place,
// as improveRotations does (stopping at a pass that moves nothing), with
// the memo of earlier passes when remember is set, and returns the moves
// each pass applied.
func FrontierPassesForTest(g *graph.CSR, t *Tree, c *Constraints, passes int, remember bool) []int {
	var memo *frontierMemo
	if remember {
		memo = newFrontierMemo(t.NumNodes())
	}
	var moves []int
	for range passes {
		k, _, _ := frontierPass(g, t, c, nil, frontierDepth(t.N), memo)
		moves = append(moves, k)
		if k == 0 {
			break
		}
	}
	return moves
}
