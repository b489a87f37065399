package solve

import (
	"math"
	"math/bits"
	"math/rand/v2"
	"sort"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"

	"github.com/ramify-tax/ramify/solve/graph"
	"github.com/ramify-tax/ramify/solve/hier"
)

// The spectral step's pieces that only tests call: the exact Fiedler pair
// (the construction stops Lanczos early, see sparsestCut), all Laplacian
// eigenvalues, and the sweep over a given vector.

// Fiedler returns the second-smallest eigenvalue λ₂ of L x = λ B x on g and
// its eigenvector x, scaled so that xᵀBx = 1, with a canonical sign (the
// first entry that is not negligibly small is positive). mass gives b; nil
// means the weighted degrees (the normalised Laplacian). A disconnected
// graph (or one with isolated vertices) has λ₂ = 0: the vector then
// separates the component of vertex 0 from the rest, and no NaN arises.
// seed fixes the Lanczos start vector.
func Fiedler(g *graph.CSR, mass []float64, seed uint64) (float64, []float64) {
	n := g.N
	if n < 2 {
		return 0, make([]float64, n)
	}
	deg := make([]float64, n)
	for v := 0; v < n; v++ {
		deg[v] = g.Degree(v)
	}
	b := mass
	if b == nil {
		b = deg
	}
	comp, ncomp := components(g)
	if ncomp > 1 {
		return 0, componentVector(comp, b)
	}
	for _, x := range b {
		if !(x > 0) {
			panic("solve: Fiedler needs positive vertex masses")
		}
	}
	ids := make([]int32, n)
	for i := range ids {
		ids[i] = int32(i)
	}
	var sp spectralWork
	lambda, x := sp.fiedler(g, deg, b, ids, seed)
	return lambda, append([]float64(nil), x...)
}

// LaplacianEigenvalues returns all eigenvalues, ascending, of the
// combinatorial Laplacian D − W of g, or of the normalised Laplacian
// I − D^{-1/2} W D^{-1/2} when normalized is set (an isolated vertex
// contributes the eigenvalue 0 there). Dense: meant for small graphs.
func LaplacianEigenvalues(g *graph.CSR, normalized bool) []float64 {
	n := g.N
	deg := make([]float64, n)
	for v := 0; v < n; v++ {
		deg[v] = g.Degree(v)
	}
	a := mat.NewSymDense(n, nil)
	for v := 0; v < n; v++ {
		ts, ws := g.Neighbors(v)
		if normalized {
			if deg[v] > 0 {
				a.SetSym(v, v, 1)
			}
			for k, t := range ts {
				a.SetSym(v, int(t), -ws[k]/math.Sqrt(float64(deg[v]*deg[t])))
			}
			continue
		}
		a.SetSym(v, v, deg[v])
		for k, t := range ts {
			a.SetSym(v, int(t), -ws[k])
		}
	}
	var es mat.EigenSym
	if !factorizeSym(&es, a, false) {
		panic(errNoConvergence) // test code: a failure fails the test
	}
	return es.Values(nil)
}

// components labels the connected components of g in order of their
// smallest vertex.
func components(g *graph.CSR) ([]int32, int) {
	comp := make([]int32, g.N)
	for i := range comp {
		comp[i] = -1
	}
	var queue []int32
	nc := int32(0)
	for s := 0; s < g.N; s++ {
		if comp[s] >= 0 {
			continue
		}
		comp[s] = nc
		queue = append(queue[:0], int32(s))
		for len(queue) > 0 {
			u := queue[len(queue)-1]
			queue = queue[:len(queue)-1]
			ts, _ := g.Neighbors(int(u))
			for _, t := range ts {
				if comp[t] < 0 {
					comp[t] = nc
					queue = append(queue, t)
				}
			}
		}
		nc++
	}
	return comp, int(nc)
}

// componentVector is the λ = 0 "Fiedler vector" of a disconnected graph:
// constant on the component of vertex 0 and on the rest, B-orthogonal to 1,
// unit B-norm. Vertices with b ≤ 0 (isolated ones under degree masses)
// count with mass 1 so that the scale stays finite.
func componentVector(comp []int32, b []float64) []float64 {
	bb := func(i int) float64 {
		if b[i] > 0 {
			return b[i]
		}
		return 1
	}
	var m0, m1 float64
	for i := range comp {
		if comp[i] == 0 {
			m0 += bb(i)
		} else {
			m1 += bb(i)
		}
	}
	// x = α on component 0, −β elsewhere with α m0 = β m1 and
	// α² m0 + β² m1 = 1.
	alpha := math.Sqrt(m1 / (m0 * (m0 + m1)))
	beta := float64(alpha*m0) / m1
	x := make([]float64, len(comp))
	for i := range comp {
		if comp[i] == 0 {
			x[i] = alpha
		} else {
			x[i] = -beta
		}
	}
	return x
}

// fiedler solves the generalised problem on a connected graph g with
// degrees deg and positive measure b to full accuracy (up to
// fiedlerMaxSteps Lanczos steps). ids name the vertices for the start
// vector, so a vertex's start value does not depend on its position. The
// returned slice is owned by sp.
func (sp *spectralWork) fiedler(g *graph.CSR, deg, b []float64, ids []int32, seed uint64) (float64, []float64) {
	n := g.N
	sp.setMeasure(b)
	if n <= denseEigenLimit {
		lambda, y, err := sp.denseFiedler(g, deg)
		if err != nil {
			panic(err) // test code: a failure fails the test
		}
		return lambda, sp.toX(y)
	}
	var lambda float64
	var y []float64
	err := sp.lanczos(g, deg, b, ids, seed, min(fiedlerMaxSteps, n-1), func(theta float64, v []float64, residual float64) bool {
		lambda, y = theta, v
		return residual <= 1e-11*math.Max(1, math.Abs(theta))
	})
	if err != nil {
		panic(err) // test code: a failure fails the test
	}
	return lambda, sp.toX(y)
}

// SweepCut orders the vertices of g by x (ties by vertex id) and returns
// that order and the prefix length k (1 ≤ k < n) whose set A = order[:k]
// minimises the uniform sparsity with masses
//
//	ψ(A, B) = w(A, B) / (m(A) · m(B)),
//
// together with that ψ (ties go to the smallest k). mass nil
// means unit masses. n must be at least 2.
func SweepCut(g *graph.CSR, x, mass []float64) ([]int32, int, float64) {
	ids := make([]int32, g.N)
	for i := range ids {
		ids[i] = int32(i)
	}
	m := mass
	if m == nil {
		m = make([]float64, g.N)
		for i := range m {
			m[i] = 1
		}
	}
	var sw sweepWork
	order, k, psi := sw.sweep(g, x, m, ids)
	return append([]int32(nil), order...), k, psi
}

// AverageLinkageDist clusters n items by average linkage on the
// dissimilarity dist(i, j) (called once for each i < j; a NaN counts as
// +Inf). The cluster distance is the mean pairwise dissimilarity, kept by
// the Lance–Williams update d(k, x∪y) = (n_x·d(k,x) + n_y·d(k,y))/(n_x+n_y).
// Height[v] is the merge distance, as in scipy; UPGMA's ultrametric node
// height is half of it. The condensed matrix needs n(n−1)/2 float64s.
//
// The chain follows scipy's nn_chain step for step: a cluster lives in the
// slot of the larger of its two parents' slots; the search starts at the
// element below the top of the chain and only a strictly smaller distance,
// scanning slots upwards, replaces it. That tie rule is not optional (the
// element below wins a tie, then the smallest slot; without it the chain
// can cycle), and it
// makes the merges equal to scipy's on the same doubles.
func AverageLinkageDist(n int, dist func(i, j int) float64) *Tree {
	if n <= 1 {
		return NewTree(max(n, 0))
	}
	d := make([]float64, n*(n-1)/2)
	k := 0
	for i := 0; i < n; i++ {
		for j := i + 1; j < n; j++ {
			v := dist(i, j)
			if math.IsNaN(v) {
				v = math.Inf(1)
			}
			d[k] = v
			k++
		}
	}
	at := func(i, j int) int { // condensed index, i ≠ j
		if i > j {
			i, j = j, i
		}
		return n*i - i*(i+1)/2 + j - i - 1
	}
	size := make([]int, n) // 0 marks a dropped slot
	for i := range size {
		size[i] = 1
	}
	merges := make([]linkMerge, 0, n-1)
	chain := make([]int, 0, n)
	for len(merges) < n-1 {
		if len(chain) == 0 {
			for i := range size {
				if size[i] > 0 {
					chain = append(chain, i)
					break
				}
			}
		}
		var x, y int
		var best float64
		for {
			x = chain[len(chain)-1]
			y, best = -1, math.Inf(1)
			if len(chain) > 1 {
				y = chain[len(chain)-2]
				best = d[at(x, y)]
			}
			for i := 0; i < n; i++ {
				if size[i] == 0 || i == x {
					continue
				}
				if v := d[at(x, i)]; y < 0 || v < best {
					y, best = i, v
				}
			}
			if len(chain) > 1 && y == chain[len(chain)-2] {
				break
			}
			chain = append(chain, y)
		}
		chain = chain[:len(chain)-2]
		if x > y {
			x, y = y, x
		}
		nx, ny := size[x], size[y]
		merges = append(merges, linkMerge{int32(x), int32(y), best})
		size[x], size[y] = 0, nx+ny
		fx, fy, fxy := float64(nx), float64(ny), float64(nx+ny)
		for i := 0; i < n; i++ {
			if size[i] == 0 || i == y {
				continue
			}
			// Explicit conversions keep each product rounded (no FMA), as
			// in scipy's (size_x*d_xi + size_y*d_yi)/(size_x+size_y).
			d[at(i, y)] = (float64(fx*d[at(i, x)]) + float64(fy*d[at(i, y)])) / fxy
		}
	}
	sort.SliceStable(merges, func(i, j int) bool { return merges[i].value < merges[j].value })
	return linkageTree(n, merges)
}

// LinkageMatrix returns t in scipy's linkage-matrix convention, one row
// (left, right, height, size) per internal node in order of node id, with
// internal nodes renumbered N, N+1, ... in that order and left < right.
// Trees from AverageLinkageDist and AverageLinkageGraph keep their ids, so
// their rows use scipy's numbering. It returns nil unless t is binary, every
// node is reachable from the root and every child has a smaller id than
// its parent.
func LinkageMatrix(t *Tree) [][4]float64 {
	if hier.Check(t) != nil || len(t.PostOrder()) != t.NumNodes() || t.NumNodes() != 2*t.N-1 {
		return nil
	}
	id := make([]float64, t.NumNodes())
	for v := 0; v < t.N; v++ {
		id[v] = float64(v)
	}
	size := t.Sizes()
	rows := make([][4]float64, 0, t.N-1)
	for v := t.N; v < t.NumNodes(); v++ {
		kids := t.Kids[v]
		if len(kids) != 2 || int(kids[0]) >= v || int(kids[1]) >= v {
			return nil
		}
		h := 0.0
		if v < len(t.Height) {
			h = t.Height[v]
		}
		l, r := id[kids[0]], id[kids[1]]
		if l > r {
			l, r = r, l
		}
		id[v] = float64(t.N + len(rows))
		rows = append(rows, [4]float64{l, r, h, float64(size[v])})
	}
	return rows
}

// CopheneticCorrelation is the Pearson correlation (gonum stat.Correlation)
// between the cophenetic values Height[lca(i,j)] and dist(i,j) over all
// pairs i < j (Sokal & Rohlf's measure of how well a dendrogram keeps the
// input dissimilarities). It needs O(n²) memory; NaN when either vector is
// constant, the tree is malformed or has fewer than two leaves.
func CopheneticCorrelation(t *Tree, dist func(i, j int) float64) float64 {
	if hier.Check(t) != nil || t.N < 2 || len(t.Height) < t.NumNodes() {
		return math.NaN()
	}
	n := t.N
	pair := func(i, j int32) int {
		if i > j {
			i, j = j, i
		}
		return n*int(i) - int(i)*(int(i)+1)/2 + int(j) - int(i) - 1
	}
	coph := make([]float64, n*(n-1)/2)
	filled := 0
	leaves := make([][]int32, t.NumNodes())
	for _, v := range t.PostOrder() {
		if t.IsLeaf(v) {
			leaves[v] = []int32{v}
			continue
		}
		var acc []int32
		for _, c := range t.Kids[v] {
			for _, a := range acc {
				for _, b := range leaves[c] {
					coph[pair(a, b)] = t.Height[v]
					filled++
				}
			}
			acc = append(acc, leaves[c]...)
			leaves[c] = nil
		}
		leaves[v] = acc
	}
	if filled != len(coph) {
		return math.NaN()
	}
	d := make([]float64, len(coph))
	for i := 0; i < n; i++ {
		for j := i + 1; j < n; j++ {
			d[pair(int32(i), int32(j))] = dist(i, j)
		}
	}
	return stat.Correlation(coph, d, nil)
}

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

// RandomBinaryTree joins random pairs of subtrees until one is left; the
// tests of this package and of solve_test draw their hidden trees with it.
func RandomBinaryTree(r *rand.Rand, n int) *Tree {
	t := NewTree(n)
	pool := make([]int32, n)
	for i := range pool {
		pool[i] = int32(i)
	}
	for len(pool) > 1 {
		i := r.IntN(len(pool))
		a := pool[i]
		pool[i] = pool[len(pool)-1]
		pool = pool[:len(pool)-1]
		j := r.IntN(len(pool))
		pool[j] = t.Add(a, pool[j])
	}
	if n > 0 {
		t.Root = pool[0]
	}
	return t
}
