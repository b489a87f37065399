package match

import "math"

// cost is a lexicographically ordered triple: the matching minimises the
// first component, among equal first components the second, then the
// third. Such triples form an ordered group, so shortest paths and
// potentials work on them as on numbers.
type cost struct{ a, b, c int64 }

func (x cost) add(y cost) cost { return cost{x.a + y.a, x.b + y.b, x.c + y.c} }
func (x cost) sub(y cost) cost { return cost{x.a - y.a, x.b - y.b, x.c - y.c} }
func (x cost) less(y cost) bool {
	if x.a != y.a {
		return x.a < y.a
	}
	if x.b != y.b {
		return x.b < y.b
	}
	return x.c < y.c
}
func minCost(x, y cost) cost {
	if y.less(x) {
		return y
	}
	return x
}

// infCost is larger than any path cost (paths are at most 2·k edges of at
// most 2³⁰ each).
var infCost = cost{math.MaxInt64 / 4, math.MaxInt64 / 4, math.MaxInt64 / 4}
