package solve

import (
	"math"
	"math/bits"

	"github.com/ramify-tax/ramify/solve/graph"
)

// MaxExactItems is the largest graph the subset dynamic programme accepts.
// Time grows like 3^n and memory like 2^n: on a 2-core machine n = 16
// takes about 0.1 s and n = 18 about 2 s.
const MaxExactItems = 18

// OptimalCost returns the minimum Dasgupta cost over all trees on g's
// vertices and a binary tree attaining it, by dynamic programming over
// subsets, O(3^n) time and O(2^n) memory:
//
//	OPT({v}) = 0
//	OPT(S)   = min over A ⊂ S with min(S) ∈ A ≠ S of OPT(A) + OPT(S\A) + |S|·w(A, S\A)
//
// The recurrence is the node form of Dasgupta's cost (STOC 2016) applied
// at the root. Some optimal tree is binary — contracting a child u into
// its parent v changes the cost by (|L(v)|−|L(u)|)·c(u) ≥ 0, c(u) the
// weight between u's children, so refining never costs more — hence the
// minimum over binary trees is the minimum over all trees. Among equally
// good splits the first in the enumeration order is kept, so the tree is
// deterministic. It returns (NaN, nil) when g is nil or has more than
// MaxExactItems vertices. It is meant as a test oracle.
func OptimalCost(g *graph.CSR) (float64, *Tree) {
	d := newOracleDP(g, nil, false)
	if d == nil {
		return math.NaN(), nil
	}
	return d.solve()
}

// WorstCost is the maximum Dasgupta cost over all binary trees on g's
// vertices (the same programme with max instead of min), used to
// normalise a cost as (cost − OPT)/(MAX − OPT). NaN when g is nil or
// too large.
func WorstCost(g *graph.CSR) float64 {
	d := newOracleDP(g, nil, true)
	if d == nil {
		return math.NaN()
	}
	c, _ := d.solve()
	return c
}

// OptimalConstrained is OptimalCost restricted to the trees that display
// every constraint of c. A binary tree displays them iff at every node S
// its split cuts no connected component of the Aho graph of S (Aho,
// Sagiv, Szymanski & Ullman, SIAM J. Comput. 1981): vertices S, an edge
// a–b for every triplet ab|c with a, b, c all in S, and every cluster
// constraint C ⊊ S held together whole. So the programme only splits S
// between unions of those components. ok is false when no tree displays
// all constraints, when a constraint names a leaf outside the graph, or
// when g is nil or too large.
func OptimalConstrained(g *graph.CSR, c *Constraints) (cost float64, t *Tree, ok bool) {
	if c == nil {
		c = &Constraints{}
	}
	for _, tr := range c.Triplets {
		if !exactLeafOK(g, tr.A) || !exactLeafOK(g, tr.B) || !exactLeafOK(g, tr.C) {
			return math.NaN(), nil, false
		}
	}
	for _, cl := range c.Clusters {
		for _, l := range cl.Leaves {
			if !exactLeafOK(g, l) {
				return math.NaN(), nil, false
			}
		}
	}
	d := newOracleDP(g, c, false)
	if d == nil {
		return math.NaN(), nil, false
	}
	cost, t = d.solve()
	if t == nil {
		return math.Inf(1), nil, false
	}
	return cost, t, true
}

func exactLeafOK(g *graph.CSR, v int32) bool {
	return g != nil && v >= 0 && int(v) < g.N
}

// oracleDP holds the tables of the programme. Sets are bit masks over the
// n ≤ MaxExactItems vertices.
type oracleDP struct {
	n     int
	worst bool       // maximise instead of minimise
	inner []float64  // inner[S] = total weight of edges inside S
	value []float64  // value[S] = best cost of a tree on S (±Inf: none)
	split []uint32   // split[S] = the side A of the best split of S
	trips [][3]int32 // triplet constraints (a, b, c)
	clus  []uint32   // cluster constraints as masks, |C| ≥ 2
}

func newOracleDP(g *graph.CSR, c *Constraints, worst bool) *oracleDP {
	if g == nil || g.N > MaxExactItems || costCheckGraph(g) != nil {
		return nil
	}
	n := g.N
	d := &oracleDP{n: n, worst: worst}
	full := 1 << n
	// inner[S] = inner[S−{l}] + w(l, S−{l}) for the lowest member l, with
	// w(l, ·) read from l's row of g.
	d.inner = make([]float64, full)
	for s := 1; s < full; s++ {
		l := bits.TrailingZeros32(uint32(s))
		rest := uint32(s) &^ (1 << l)
		w := d.inner[rest]
		ts, ws := g.Neighbors(l)
		for k, u := range ts {
			if rest&(1<<uint(u)) != 0 {
				w += ws[k]
			}
		}
		d.inner[s] = w
	}
	if c != nil {
		for _, tr := range c.Triplets {
			d.trips = append(d.trips, [3]int32{tr.A, tr.B, tr.C})
		}
		for _, cl := range c.Clusters {
			var m uint32
			for _, l := range cl.Leaves {
				m |= 1 << uint(l)
			}
			if bits.OnesCount32(m) >= 2 {
				d.clus = append(d.clus, m)
			}
		}
	}
	return d
}

// solve fills the tables in increasing order of S (every proper subset of
// S is numerically smaller) and rebuilds the tree of the full set. It
// returns a nil tree when the full set has no admissible tree.
func (d *oracleDP) solve() (float64, *Tree) {
	n := d.n
	if n == 0 {
		return 0, NewTree(0)
	}
	full := uint32(1)<<n - 1
	bad := math.Inf(1)
	if d.worst {
		bad = math.Inf(-1)
	}
	d.value = make([]float64, full+1)
	d.split = make([]uint32, full+1)
	constrained := len(d.trips) > 0 || len(d.clus) > 0
	var comps []uint32
	for s := uint32(1); s <= full; s++ {
		if s&(s-1) == 0 { // singleton
			continue
		}
		size := float64(bits.OnesCount32(s))
		best, bestA := bad, uint32(0)
		low := s & -s
		try := func(a uint32) {
			b := s &^ a
			va, vb := d.value[a], d.value[b]
			if math.IsInf(va, 0) || math.IsInf(vb, 0) {
				return
			}
			cut := d.inner[s] - d.inner[a] - d.inner[b]
			v := va + vb + float64(size*cut)
			if (!d.worst && v < best) || (d.worst && v > best) {
				best, bestA = v, a
			}
		}
		if !constrained {
			// Every A with low ∈ A ≠ S: A = low ∪ sub for the proper
			// submasks sub of S without low, largest first.
			rest := s &^ low
			for sub := (rest - 1) & rest; ; sub = (sub - 1) & rest {
				try(low | sub)
				if sub == 0 {
					break
				}
			}
		} else {
			comps = d.ahoComponents(s, comps[:0])
			// A is a union of components that contains comps[0] (the one
			// holding low, by construction) and is not all of them.
			k := len(comps)
			for pick := uint32(0); pick < (1<<(k-1))-1; pick++ {
				a := comps[0]
				for i := 1; i < k; i++ {
					if pick&(1<<(i-1)) != 0 {
						a |= comps[i]
					}
				}
				try(a)
			}
		}
		d.value[s], d.split[s] = best, bestA
	}
	if math.IsInf(d.value[full], 0) && n > 1 {
		return d.value[full], nil
	}
	t := NewTree(n)
	t.Root = d.build(t, full)
	return d.value[full], t
}

// build adds the nodes of the best tree on s to t and returns its root.
func (d *oracleDP) build(t *Tree, s uint32) int32 {
	if s&(s-1) == 0 {
		return int32(bits.TrailingZeros32(s))
	}
	a := d.split[s]
	left := d.build(t, a)
	right := d.build(t, s&^a)
	return t.Add(left, right)
}

// ahoComponents returns the connected components of the Aho graph of s as
// masks, the component of s's lowest member first.
func (d *oracleDP) ahoComponents(s uint32, out []uint32) []uint32 {
	var adj [MaxExactItems]uint32
	for _, tr := range d.trips {
		a, b, c := uint32(1)<<uint(tr[0]), uint32(1)<<uint(tr[1]), uint32(1)<<uint(tr[2])
		if s&a != 0 && s&b != 0 && s&c != 0 {
			adj[tr[0]] |= b
			adj[tr[1]] |= a
		}
	}
	for _, m := range d.clus {
		if m&s == m && m != s {
			// A star from the lowest member holds C together.
			hub := bits.TrailingZeros32(m)
			adj[hub] |= m
			for r := m; r != 0; r &= r - 1 {
				adj[bits.TrailingZeros32(r)] |= 1 << uint(hub)
			}
		}
	}
	left := s
	for left != 0 {
		comp := left & -left
		frontier := comp
		for frontier != 0 {
			v := bits.TrailingZeros32(frontier)
			frontier &^= 1 << uint(v)
			next := adj[v] & s &^ comp
			comp |= next
			frontier |= next
		}
		out = append(out, comp)
		left &^= comp
	}
	return out
}
