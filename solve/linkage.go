package solve

import (
	"math"
	"sort"

	"gonum.org/v1/gonum/stat"

	"github.com/ramify-tax/ramify/solve/graph"
)

// Average linkage (UPGMA: R. R. Sokal & C. D. Michener, "A statistical
// method for evaluating systematic relationships", Univ. Kansas Sci. Bull.
// 38, 1958) by the nearest-neighbour chain (J. Juan 1982, J.-P. Benzécri
// 1982; F. Murtagh, "A survey of recent advances in hierarchical
// clustering algorithms", Computer J. 26(4), 1983; D. Müllner, "Modern
// hierarchical, agglomerative clustering algorithms", arXiv 1109.2378,
// 2011). The chain is exact for reducible linkages, and average linkage is
// one: a merged cluster is never nearer to a third than both its parts.
//
// Both versions return a binary tree in the stepwise-dendrogram layout of
// scipy.cluster.hierarchy.linkage: the merges are sorted by merge value
// (stable, so equal values keep the order the chain found them in), the
// merge in row k creates node N+k, its Kids are the two merged nodes with
// the smaller id first, and Height[N+k] is the merge value (leaves 0).

// linkMerge is one merge found by the chain, named by a leaf of each side
// (any leaf identifies the cluster holding it at that point of the sorted
// sequence) and the merge value.
type linkMerge struct {
	a, b  int32
	value float64
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

// linkageTree turns sorted merges into a Tree with scipy's numbering: it
// resolves each merge's two leaves to the clusters holding them so far
// (union-find over node ids, as scipy's label step does).
func linkageTree(n int, merges []linkMerge) *Tree {
	t := NewTree(n)
	t.Height = make([]float64, n, 2*n-1)
	parent := make([]int32, n, 2*n-1)
	for i := range parent {
		parent[i] = int32(i)
	}
	find := func(x int32) int32 {
		r := x
		for parent[r] != r {
			r = parent[r]
		}
		for parent[x] != r {
			parent[x], x = r, parent[x]
		}
		return r
	}
	for _, m := range merges {
		a, b := find(m.a), find(m.b)
		if a > b {
			a, b = b, a
		}
		v := t.Add(a, b)
		parent = append(parent, v)
		parent[a], parent[b] = v, v
		t.Height = append(t.Height, m.value)
	}
	return t
}

// LinkageMatrix returns t in scipy's linkage-matrix convention, one row
// (left, right, height, size) per internal node in order of node id, with
// internal nodes renumbered N, N+1, ... in that order and left < right.
// Trees from AverageLinkageDist and AverageLinkageGraph keep their ids, so
// their rows use scipy's numbering. It returns nil unless t is binary, every
// node is reachable from the root and every child has a smaller id than
// its parent.
func LinkageMatrix(t *Tree) [][4]float64 {
	if costCheckTree(t) != nil || len(t.PostOrder()) != t.NumNodes() || t.NumNodes() != 2*t.N-1 {
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
	if costCheckTree(t) != nil || t.N < 2 || len(t.Height) < t.NumNodes() {
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

// AverageLinkageGraph clusters the vertices of a sparse similarity graph
// (nil if g is nil or not a well-formed symmetric CSR) by average linkage: s(A,B) = w(A,B)/(|A|·|B|), absent edges count 0, and
// the most similar pair merges first. Height[v] holds the similarity at
// which v's children merged, so heights fall towards the root. Clusters
// the graph does not connect stay apart until the end, when the
// components are joined at similarity 0 in order of their smallest leaf:
// ((c1, c2), c3), ...
//
// On a complete graph with w_ij = C − d_ij (C a constant above every d),
// s(A,B) = C − mean d, so the merges are those of AverageLinkageDist on d
// and the heights are C minus its heights (up to rounding, and as long as
// no two candidate merges tie).
//
// The chain runs on adjacency lists: each cluster keeps its neighbours
// with the summed weight w(A,B), sorted by cluster id. A merged cluster
// gets the next fresh id, so it is appended to its neighbours' lists and
// the order holds; entries for merged-away clusters are skipped and swept
// out once they make up half a list. Memory is O(n + m), never O(n²).
// Ties: the element below the top of the chain wins a tie, then the
// smallest cluster id (leaves keep their ids, merged clusters are numbered
// n, n+1, ... in the order the chain creates them).
func AverageLinkageGraph(g *graph.CSR) *Tree {
	if g == nil || costCheckGraph(g) != nil || !csrSymmetric(g) {
		return nil
	}
	n := g.N
	if n <= 1 {
		return NewTree(n)
	}
	h := newGraphLinkage(g)
	merges := h.run()
	sort.SliceStable(merges, func(i, j int) bool { return merges[i].value > merges[j].value })
	return linkageTree(n, merges)
}

// csrSymmetric reports whether every stored edge is stored in the other
// direction with the same weight. The chain relies on it: with asymmetric
// similarities mutual nearest neighbours need not exist.
func csrSymmetric(g *graph.CSR) bool {
	for v := 0; v < g.N; v++ {
		ts, ws := g.Neighbors(v)
		for k, u := range ts {
			if g.Weight(int(u), v) != ws[k] && !(math.IsNaN(ws[k]) && math.IsNaN(g.Weight(int(u), v))) {
				return false
			}
		}
	}
	return true
}

// graphLinkage is the state of the sparse chain.
type graphLinkage struct {
	size    []int32
	minLeaf []int32
	alive   []bool
	done    []bool // alive but without neighbours: a finished component
	nbr     [][]int32
	wt      [][]float64
	stale   []int32 // entries of nbr[c] that name dead clusters
	value   []float64
	// Cached nearest neighbour (largest similarity, smallest id); valid
	// until the cluster's list changes.
	nnOK []bool
	nnID []int32
	nnS  []float64
}

func newGraphLinkage(g *graph.CSR) *graphLinkage {
	n := g.N
	total := 2*n - 1
	h := &graphLinkage{
		size:    make([]int32, n, total),
		minLeaf: make([]int32, n, total),
		alive:   make([]bool, n, total),
		done:    make([]bool, n, total),
		nbr:     make([][]int32, n, total),
		wt:      make([][]float64, n, total),
		stale:   make([]int32, n, total),
		value:   make([]float64, n, total),
		nnOK:    make([]bool, n, total),
		nnID:    make([]int32, n, total),
		nnS:     make([]float64, n, total),
	}
	for v := 0; v < n; v++ {
		h.size[v], h.minLeaf[v], h.alive[v], h.value[v] = 1, int32(v), true, math.Inf(1)
		ts, ws := g.Neighbors(v)
		ids := make([]int32, 0, len(ts))
		w := make([]float64, 0, len(ts))
		for k, u := range ts {
			if int(u) != v && ws[k] > 0 && !math.IsInf(ws[k], 0) {
				ids = append(ids, u)
				w = append(w, ws[k])
			}
		}
		h.nbr[v], h.wt[v] = ids, w
	}
	return h
}

func (h *graphLinkage) sim(a int32, k int) float64 {
	c := h.nbr[a][k]
	return h.wt[a][k] / float64(float64(h.size[a])*float64(h.size[c]))
}

// nearest returns a's most similar live neighbour (smallest id on ties),
// or -1 when a has none.
func (h *graphLinkage) nearest(a int32) (int32, float64) {
	if h.nnOK[a] {
		return h.nnID[a], h.nnS[a]
	}
	best, bestS := int32(-1), 0.0
	for k, c := range h.nbr[a] {
		if !h.alive[c] {
			continue
		}
		if s := h.sim(a, k); best < 0 || s > bestS {
			best, bestS = c, s
		}
	}
	h.nnOK[a], h.nnID[a], h.nnS[a] = true, best, bestS
	return best, bestS
}

// simTo is s(a, c) for a live neighbour c of a (binary search; the list
// is sorted by id).
func (h *graphLinkage) simTo(a, c int32) float64 {
	ids := h.nbr[a]
	k := sort.Search(len(ids), func(i int) bool { return ids[i] >= c })
	if k < len(ids) && ids[k] == c {
		return h.sim(a, k)
	}
	return 0
}

func (h *graphLinkage) run() []linkMerge {
	n := len(h.size)
	merges := make([]linkMerge, 0, n-1)
	var roots []int32 // finished components
	chain := make([]int32, 0, 64)
	cursor := int32(0)
	for {
		if len(chain) == 0 {
			for int(cursor) < len(h.alive) && (!h.alive[cursor] || h.done[cursor]) {
				cursor++
			}
			if int(cursor) == len(h.alive) {
				break
			}
			chain = append(chain, cursor)
		}
		a := chain[len(chain)-1]
		b, s := h.nearest(a)
		if b < 0 {
			// Only a chain of one can end here: the element below the top
			// is always a live neighbour of it.
			h.done[a] = true
			roots = append(roots, a)
			chain = chain[:0]
			continue
		}
		if len(chain) > 1 {
			prev := chain[len(chain)-2]
			if prev == b || h.simTo(a, prev) == s {
				chain = chain[:len(chain)-2]
				merges = append(merges, h.merge(a, prev, s))
				continue
			}
		}
		chain = append(chain, b)
	}
	sort.Slice(roots, func(i, j int) bool { return h.minLeaf[roots[i]] < h.minLeaf[roots[j]] })
	for i := 1; i < len(roots); i++ {
		merges = append(merges, linkMerge{h.minLeaf[roots[0]], h.minLeaf[roots[i]], 0})
	}
	return merges
}

// merge joins clusters a and b into a fresh cluster and returns the merge
// record. The recorded similarity is capped by the children's: in exact
// arithmetic average linkage never merges above its parts (it is
// reducible), and the cap keeps rounding from reordering the sorted
// dendrogram.
func (h *graphLinkage) merge(a, b int32, s float64) linkMerge {
	z := int32(len(h.size))
	s = math.Min(s, math.Min(h.value[a], h.value[b]))
	ia, wa, ib, wb := h.nbr[a], h.wt[a], h.nbr[b], h.wt[b]
	ids := make([]int32, 0, len(ia)+len(ib))
	ws := make([]float64, 0, len(ia)+len(ib))
	i, j := 0, 0
	for i < len(ia) || j < len(ib) {
		var c int32
		var w float64
		switch {
		case j == len(ib) || (i < len(ia) && ia[i] < ib[j]):
			c, w = ia[i], wa[i]
			i++
		case i == len(ia) || ib[j] < ia[i]:
			c, w = ib[j], wb[j]
			j++
		default: // a neighbour of both: sum in a fixed order, a's first
			c, w = ia[i], wa[i]+wb[j]
			i++
			j++
		}
		if c == a || c == b || !h.alive[c] {
			continue
		}
		ids = append(ids, c)
		ws = append(ws, w)
	}
	h.alive[a], h.alive[b] = false, false
	h.nbr[a], h.wt[a], h.nbr[b], h.wt[b] = nil, nil, nil, nil
	h.size = append(h.size, h.size[a]+h.size[b])
	h.minLeaf = append(h.minLeaf, min(h.minLeaf[a], h.minLeaf[b]))
	h.alive = append(h.alive, true)
	h.done = append(h.done, false)
	h.nbr = append(h.nbr, ids)
	h.wt = append(h.wt, ws)
	h.stale = append(h.stale, 0)
	h.value = append(h.value, s)
	h.nnOK = append(h.nnOK, false)
	h.nnID = append(h.nnID, -1)
	h.nnS = append(h.nnS, 0)
	for k, c := range ids {
		// c's list held a, b or both; whichever it held is now stale.
		h.stale[c] += h.countIn(c, a, b)
		h.nbr[c] = append(h.nbr[c], z)
		h.wt[c] = append(h.wt[c], ws[k])
		h.nnOK[c] = false
		if 2*int(h.stale[c]) > len(h.nbr[c]) {
			h.sweep(c)
		}
	}
	return linkMerge{h.minLeaf[a], h.minLeaf[b], s}
}

// countIn counts how many of a, b appear in c's list, by binary search.
func (h *graphLinkage) countIn(c, a, b int32) int32 {
	ids := h.nbr[c]
	has := func(x int32) int32 {
		k := sort.Search(len(ids), func(i int) bool { return ids[i] >= x })
		if k < len(ids) && ids[k] == x {
			return 1
		}
		return 0
	}
	return has(a) + has(b)
}

// sweep drops the entries of c's list that name dead clusters.
func (h *graphLinkage) sweep(c int32) {
	ids, ws := h.nbr[c], h.wt[c]
	k := 0
	for i, x := range ids {
		if h.alive[x] {
			ids[k], ws[k] = x, ws[i]
			k++
		}
	}
	h.nbr[c] = append([]int32(nil), ids[:k]...)
	h.wt[c] = append([]float64(nil), ws[:k]...)
	h.stale[c] = 0
}
