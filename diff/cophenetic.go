package diff

import (
	"math"
	"math/big"
	"slices"

	"github.com/ramify-tax/ramify/solve/hier"
)

// pairMoments are the sums over all leaf pairs {i, j} of the cophenetic
// value s = |L(lca(i, j))| of one tree: Σs and Σs².
type pairMoments struct{ sum, sumSq u128 }

// momentsOf counts, for every internal node v, the pairs whose lca is v:
// C(|v|, 2) minus the pairs inside each child.
func momentsOf(t *hier.Tree, x treeIndex) pairMoments {
	var m pairMoments
	for _, v := range x.Post {
		if int(v) < x.N {
			continue
		}
		s := int64(x.Size(v))
		pairs := choose2(s)
		for _, c := range t.Kids[v] {
			pairs -= choose2(int64(x.Size(c)))
		}
		m.sum.addMul(uint64(s), uint64(pairs))
		m.sumSq.addMul(uint64(s*s), uint64(pairs))
	}
	return m
}

// crossSum is Σ_{i<j} |L_x(lca_x(i,j))| · |L_y(lca_y(i,j))|.
//
// For shallow trees (taxonomies) it telescopes: with g(w) = |parent(w)| −
// |w| for every non-root node w, n − |L(lca(i,j))| = Σ g(w) over the
// non-root nodes w holding both i and j, so
//
//	Σ_{i<j} (n − s_x)(n − s_y) = Σ_{w, v} g_x(w) g_y(v) C(|w ∩ v|, 2),
//
// summed over pairs of internal non-root nodes that share at least two
// leaves. Those intersections come from the leaves grouped by their two
// parents, walking both ancestor chains once per group. When the chains
// are long (deep binary trees) that walk could cost more than visiting
// every pair, and the pair scan is used instead.
func crossSum(x, y treeIndex, mx, my pairMoments) *big.Int {
	n := x.N
	type group struct{ px, py int32 }
	counts := make(map[group]int64)
	for c := int32(0); c < int32(n); c++ {
		counts[group{x.Parent[c], y.Parent[c]}]++
	}
	work := int64(0)
	for g := range counts {
		work += int64(x.Depth[g.px]) * int64(y.Depth[g.py])
	}
	if work > int64(n)*int64(n)/2 {
		return crossSumByPairs(x, y)
	}
	groups := make([]group, 0, len(counts))
	for g := range counts {
		groups = append(groups, g)
	}
	// Integer sums do not depend on order; sorting keeps memory access
	// (and any future float arithmetic) reproducible.
	slices.SortFunc(groups, func(a, b group) int {
		if a.px != b.px {
			return int(a.px - b.px)
		}
		return int(a.py - b.py)
	})
	shared := make(map[uint64]int64)
	for _, g := range groups {
		k := counts[g]
		for w := g.px; x.Parent[w] >= 0; w = x.Parent[w] {
			for v := g.py; y.Parent[v] >= 0; v = y.Parent[v] {
				shared[uint64(w)<<32|uint64(v)] += k
			}
		}
	}
	var tele u128
	for key, inter := range shared {
		w, v := int32(key>>32), int32(key&0xffffffff)
		gx := int64(x.Size(x.Parent[w]) - x.Size(w))
		gy := int64(y.Size(y.Parent[v]) - y.Size(v))
		tele.addMul(uint64(gx*gy), uint64(choose2(inter)))
	}
	// Σ s_x s_y = Σ (n−s_x)(n−s_y) − n²·C(n,2) + n·Σs_x + n·Σs_y.
	nb := big.NewInt(int64(n))
	out := tele.big()
	out.Sub(out, new(big.Int).Mul(new(big.Int).Mul(nb, nb), big.NewInt(choose2(int64(n)))))
	out.Add(out, new(big.Int).Mul(nb, mx.sum.big()))
	out.Add(out, new(big.Int).Mul(nb, my.sum.big()))
	return out
}

// crossSumByPairs visits every ordered pair once per tree path: for each
// leaf a, the lca sizes with all other leaves follow from a's root paths.
func crossSumByPairs(x, y treeIndex) *big.Int {
	n := x.N
	levelY := make([]int32, n)
	var pathX, pathY []int32
	var twice u128
	for a := int32(0); a < int32(n); a++ {
		pathY = y.ancestors(a, pathY)
		y.labelLevels(pathY, levelY)
		pathX = x.ancestors(a, pathX)
		for k := 1; k < len(pathX); k++ {
			sx := uint64(x.Size(pathX[k]))
			x.eachNewlyCovered(pathX, k, func(b int32) {
				twice.addMul(sx, uint64(y.Size(pathY[levelY[b]])))
			})
		}
	}
	out := twice.big()
	return out.Rsh(out, 1)
}

// cophenetic computes Pearson's r between the cophenetic vectors of x and
// y from exact integer moments:
//
//	r = (P·Σxy − Σx·Σy) / √((P·Σx² − (Σx)²)(P·Σy² − (Σy)²)),  P = C(n, 2).
func cophenetic(a, b *hier.Tree, x, y treeIndex) (float64, bool) {
	n := x.N
	if n < 2 {
		return 0, false
	}
	mx, my := momentsOf(a, x), momentsOf(b, y)
	p := big.NewInt(choose2(int64(n)))
	sx, sy := mx.sum.big(), my.sum.big()
	cov := new(big.Int).Mul(p, crossSum(x, y, mx, my))
	cov.Sub(cov, new(big.Int).Mul(sx, sy))
	varX := new(big.Int).Mul(p, mx.sumSq.big())
	varX.Sub(varX, new(big.Int).Mul(sx, sx))
	varY := new(big.Int).Mul(p, my.sumSq.big())
	varY.Sub(varY, new(big.Int).Mul(sy, sy))
	if varX.Sign() <= 0 || varY.Sign() <= 0 {
		return 0, false
	}
	c, _ := new(big.Float).SetInt(cov).Float64()
	vx, _ := new(big.Float).SetInt(varX).Float64()
	vy, _ := new(big.Float).SetInt(varY).Float64()
	r := c / (math.Sqrt(vx) * math.Sqrt(vy))
	return math.Max(-1, math.Min(1, r)), true
}
