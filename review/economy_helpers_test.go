package review

import (
	"math"
	"math/rand/v2"

	"github.com/ramify-tax/ramify/solve/graph"
	"github.com/ramify-tax/ramify/solve/planted"
)

// fuzzyGraph draws a similarity graph for a planted hierarchy whose levels
// are less distinct than solve/planted's own graph: each item draws per
// partners, the level ℓ of each draw (0 = root, D = bottom category) with
// probability ∝ decay^(D−ℓ) — decay > 1 favours high levels, so many
// edges cross categories — and the partner uniformly in its level-ℓ
// category (planted's Categories and Levels). Edge weights are planted's
// Affinity, (1 + common depth)/(1 + D), times log-normal noise
// exp(sigma·Z). Solving such a graph recovers the hierarchy only partly,
// which leaves reviewers something to fix.
func fuzzyGraph(in *planted.Instance, per int, decay, sigma float64, seed uint64) *graph.CSR {
	r := rand.New(rand.NewPCG(seed, 0x66757a7a79)) // "fuzzy"
	cats := in.Categories()
	levels := in.Levels(decay)
	var edges []graph.Edge
	for i := range in.N {
		for range per {
			m := cats.Members(i, levels.Draw(r))
			j := m[r.IntN(len(m))]
			if int(j) == i {
				continue
			}
			w := in.Affinity(i, int(j)) * math.Exp(sigma*r.NormFloat64())
			edges = append(edges, graph.Edge{A: int32(i), B: j, W: w})
		}
	}
	g, err := graph.FromEdges(in.N, edges)
	if err != nil {
		panic(err) // unreachable: ids and weights are valid by construction
	}
	return g
}

type testGraph struct {
	n int
	g *graph.CSR
}

func plantedGraphSeed(t interface{ Helper() }, seed uint64) testGraph {
	t.Helper()
	in := planted.Generate(seed, 120, 3, 2)
	return testGraph{in.N, in.Graph}
}
