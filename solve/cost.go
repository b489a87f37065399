package solve

import (
	"errors"
	"fmt"
	"math"

	"github.com/ramify-tax/ramify/internal/disjoint"
	"github.com/ramify-tax/ramify/solve/graph"
	"github.com/ramify-tax/ramify/solve/hier"
)

// Cost is Dasgupta's cost of t on g (S. Dasgupta, "A cost function for
// similarity-based hierarchical clustering", STOC 2016, arXiv 1510.05043):
//
//	cost_g(t) = Σ_{i,j} w_ij·|L(lca(i,j))|
//
// summed over the edges of g, for any rooted tree (binary or multiway). It never
// panics: a malformed tree or a graph that does not fit the tree gives NaN
// (CostChecked says why). A single-leaf tree, or a graph without edges,
// costs 0.
func Cost(g *graph.CSR, t *Tree) float64 {
	c, err := CostChecked(g, t)
	if err != nil {
		return math.NaN()
	}
	return c
}

// CostChecked is Cost with the reason for a NaN.
func CostChecked(g *graph.CSR, t *Tree) (float64, error) {
	cross, err := CrossWeights(g, t)
	if err != nil {
		return math.NaN(), err
	}
	size := t.Sizes()
	// Node form of the cost, the same sum grouped by lca: Σ_v |L(v)|·(weight
	// of the edges whose lca is v), summed in node-id order with
	// compensation so the result does not depend on how large the terms are
	// relative to each other.
	var sum compensatedSum
	for v, w := range cross {
		if w != 0 {
			sum.add(float64(float64(size[v]) * w))
		}
	}
	return sum.value(), nil
}

// CrossWeights returns, for every node v of t, the total weight of the
// edges of g whose lowest common ancestor is v (0 for leaves). Row v is
// the weight that crosses between different children of v, which is what
// the node form of Dasgupta's cost, rotations and folds need.
//
// It runs Tarjan's offline LCA (R. E. Tarjan, "Applications of path
// compression on balanced trees", JACM 26(4), 1979) over the post-order of
// t's depth-first index (hier.Index): when a leaf u is reached, every
// neighbour v of u at an earlier leaf position has lca(u,v) equal to the
// highest still-open ancestor of v's union-find set. Each edge is
// therefore handled once, at its later endpoint, with O(n) extra memory
// (no LCA table is built). The walk, and hence the order of every
// floating-point addition, depends only on t and g.
func CrossWeights(g *graph.CSR, t *Tree) ([]float64, error) {
	if err := hier.Check(t); err != nil {
		return nil, err
	}
	if err := costCheckGraph(g); err != nil {
		return nil, err
	}
	x := hier.NewIndex(t)
	nodes := t.NumNodes()
	cross := make([]float64, nodes)
	comp := make([]float64, nodes) // Neumaier compensation per node
	sets := disjoint.New(nodes)
	open := make([]int32, nodes) // open[Find(v)] = highest open node of v's set
	for v := range open {
		open[v] = int32(v)
	}
	reached := func(v int32) bool { return int(v) < t.N && x.Pos[v] >= 0 }
	for _, v := range x.Post {
		if t.IsLeaf(v) && int(v) < g.N {
			p := x.Pos[v]
			ts, ws := g.Neighbors(int(v))
			for k, u := range ts {
				if !reached(u) || x.Pos[u] >= p {
					continue
				}
				l := open[sets.Find(u)]
				addCompensated(&cross[l], &comp[l], ws[k])
			}
		}
		if parent := x.Parent[v]; parent >= 0 {
			sets.Union(parent, v)
			open[sets.Find(parent)] = parent
		}
	}
	for v := range cross {
		cross[v] += comp[v]
	}
	// A vertex the walk never reached may still be isolated; only an edge
	// to it makes the tree unfit for the graph.
	for v := 0; v < g.N; v++ {
		if !reached(int32(v)) && g.Offsets[v+1] > g.Offsets[v] {
			return nil, fmt.Errorf("vertex %d has edges but is not a leaf under the root", v)
		}
	}
	return cross, nil
}

// costCheckGraph reports why g's arrays cannot be read safely.
func costCheckGraph(g *graph.CSR) error {
	if g == nil {
		return errors.New("nil graph")
	}
	if g.N < 0 || len(g.Offsets) != g.N+1 || len(g.Weights) != len(g.Targets) {
		return errors.New("graph arrays have inconsistent lengths")
	}
	if g.N == 0 {
		return nil
	}
	if g.Offsets[0] != 0 || g.Offsets[g.N] != int64(len(g.Targets)) {
		return errors.New("graph offsets do not span the targets")
	}
	for v := 0; v < g.N; v++ {
		if g.Offsets[v] > g.Offsets[v+1] {
			return fmt.Errorf("graph offsets decrease at vertex %d", v)
		}
	}
	for _, u := range g.Targets {
		if u < 0 || int(u) >= g.N {
			return fmt.Errorf("graph target %d outside 0..%d", u, g.N-1)
		}
	}
	return nil
}

// compensatedSum is a running sum with Neumaier's variant of Kahan's
// compensation, so long sums of mixed-magnitude terms stay accurate to
// about one rounding.
type compensatedSum struct{ sum, comp float64 }

func (s *compensatedSum) add(x float64) { addCompensated(&s.sum, &s.comp, x) }

func (s *compensatedSum) value() float64 { return s.sum + s.comp }

func addCompensated(sum, comp *float64, x float64) {
	t := *sum + x
	if math.Abs(*sum) >= math.Abs(x) {
		*comp += (*sum - t) + x
	} else {
		*comp += (x - t) + *sum
	}
	*sum = t
}
