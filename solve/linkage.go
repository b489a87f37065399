package solve

import (
	"math"
	"sort"

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
