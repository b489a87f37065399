package solve

import "github.com/ramify-tax/ramify/solve/graph"

// Hooks for the external tests (package solve_test), which need the
// planted generator and so cannot live inside package solve.

// SolveSpectralOnlyForTest runs Solve with the exact subset DP switched
// off, so every split comes from the components, forced splits or the
// Fiedler sweep.
func SolveSpectralOnlyForTest(g *graph.CSR, c *Constraints, opt Options) (*Result, error) {
	return solveWith(g, c, opt, constructParams{leafDP: 1, superDP: 1})
}
