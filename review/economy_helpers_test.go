package review

import (
	"math"
	"math/rand/v2"
	"sort"

	"github.com/ramify-tax/ramify/solve/graph"
	"github.com/ramify-tax/ramify/solve/planted"
)

// fuzzyGraph draws a similarity graph for a planted hierarchy whose levels
// are less distinct than solve/planted's own graph: each item draws per
// partners, the level ℓ of each draw (0 = root, D = bottom category) with
// probability ∝ decay^(D−ℓ) — decay > 1 favours high levels, so many
// edges cross categories — and the partner uniformly in its level-ℓ
// category. Edge weights follow planted's rule, (1 + common depth)/(1 + D),
// times log-normal noise exp(sigma·Z). Solving such a graph recovers the
// hierarchy only partly, which leaves reviewers something to fix.
func fuzzyGraph(in *planted.Instance, per int, decay, sigma float64, seed uint64) *graph.CSR {
	r := rand.New(rand.NewPCG(seed, 0x66757a7a79)) // "fuzzy"
	d := in.Depth
	pow := func(e int) int {
		p := 1
		for ; e > 0; e-- {
			p *= in.Branching
		}
		return p
	}
	order := make([]int32, in.N)
	for i := range order {
		order[i] = int32(i)
	}
	sort.SliceStable(order, func(a, b int) bool { return in.Bottom[order[a]] < in.Bottom[order[b]] })
	bottoms := pow(d)
	start := make([]int, bottoms+1)
	for _, b := range in.Bottom {
		start[b+1]++
	}
	for c := range bottoms {
		start[c+1] += start[c]
	}
	cum := make([]float64, d+1)
	total := 0.0
	for l := 0; l <= d; l++ {
		total += math.Pow(decay, float64(d-l))
		cum[l] = total
	}
	var edges []graph.Edge
	for i := range in.N {
		for range per {
			level := min(sort.SearchFloat64s(cum, r.Float64()*total), d)
			span := pow(d - level)
			c := in.Ancestor(i, level)
			lo, hi := start[c*span], start[(c+1)*span]
			j := order[lo+r.IntN(hi-lo)]
			if int(j) == i {
				continue
			}
			w := float64(1+in.CommonDepth(i, int(j))) / float64(1+d) * math.Exp(sigma*r.NormFloat64())
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
