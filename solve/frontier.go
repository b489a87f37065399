package solve

import (
	"math/bits"
	"sort"

	"github.com/ramify-tax/ramify/solve/graph"
)

// Re-arrangement of subtree tops. Rotations only see three blocks. The
// wider move takes, at a node v, the frontier of its subtree at depth d
// (at most 2^d blocks: the nodes d levels below v, or leaves above that)
// and replaces the top of the subtree by the optimal binary tree over the
// blocks, found by the subset DP with the block sizes as masses; the blocks
// themselves are kept whole. The cost of the top is Σ |L(a)|·w(children of
// a) over its internal nodes a, and every edge whose LCA lies in it joins
// two blocks, so the DP's optimum is exactly the best top. Constraints
// enter the DP as block-level Aho masks: a triplet whose three leaves lie
// in three blocks, and a cluster constraint (or previous category) that is
// a node of the top. Rotations are the three-block case.

// frontierDepth returns the depth d of the move for a tree on n leaves:
// 3 (eight blocks, 3^8 DP steps per node) while that stays cheap, else 2.
func frontierDepth(n int) int {
	if n <= 30000 {
		return 3
	}
	return 2
}

// topRegion is the top of v's subtree: its internal nodes in pre-order
// (v first) and its frontier blocks left to right.
type topRegion struct {
	nodes  []int32
	blocks []int32
}

func regionOf(t *Tree, v int32, depth int) topRegion {
	var r topRegion
	type frame struct {
		v int32
		d int
	}
	stack := []frame{{v, 0}}
	for len(stack) > 0 {
		f := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		if t.IsLeaf(f.v) || f.d == depth {
			r.blocks = append(r.blocks, f.v)
			continue
		}
		r.nodes = append(r.nodes, f.v)
		kids := t.Kids[f.v]
		for i := len(kids) - 1; i >= 0; i-- {
			stack = append(stack, frame{kids[i], f.d + 1})
		}
	}
	return r
}

// frontierMove is an improving re-arrangement: the DP's splits (block
// masks, pre-order) for the region of v.
type frontierMove struct {
	gain   float64
	v      int32
	region topRegion
	splits []uint32 // for each DP node in pre-order: its left part
	masks  []uint32 // and its own block set
}

// frontierMemo carries each node's best move from one pass to the next.
// A node's move depends only on its region: the region's nodes and blocks,
// the blocks' leaf sets and the edges, pins and triplets whose LCA lies in
// its top. A move rewires only its region's nodes and keeps the leaf set of
// its root and of every block, so a region none of whose nodes the last
// pass rewired is the same region over the same leaves, and the DP would
// give the same move bit for bit (the edges of a bucket come in the order
// of their lower end, whatever the layout). Later passes therefore solve
// the DP only at nodes within depth−1 levels above a rewired one.
type frontierMemo struct {
	known   []bool // known[v]: move[v] and has[v] hold v's result
	has     []bool
	move    []frontierMove
	changed []bool // the nodes the last pass rewired
}

func newFrontierMemo(nodes int) *frontierMemo {
	return &frontierMemo{known: make([]bool, nodes), has: make([]bool, nodes), move: make([]frontierMove, nodes)}
}

// clean reports whether the memo holds v's move for its region reg.
func (m *frontierMemo) clean(v int32, reg topRegion) bool {
	if m == nil || !m.known[v] {
		return false
	}
	if m.changed != nil {
		for _, x := range reg.nodes {
			if m.changed[x] {
				return false
			}
		}
	}
	return true
}

// frontierPass applies improving re-arrangements, best first, that do not
// touch a node an earlier one of the same pass changed. It returns their
// number, the cost they saved and the cost before the pass. memo, when not
// nil, holds what earlier passes over the same tree found (frontierMemo);
// the pass updates it.
func frontierPass(g *graph.CSR, t *Tree, c *Constraints, prior [][]int32, depth int, memo *frontierMemo) (int, float64, float64) {
	if t.N < 4 {
		return 0, 0, 0
	}
	lay := newLayout(t)
	nodes := t.NumNodes()
	sc := &frontierScan{lay: lay, edges: bucketByLCA(g, lay, nodes), tripsAt: tripletsByLCA(c, lay)}
	sc.pinned, _ = constraintPins(t, c, lay)
	if len(prior) > 0 {
		for v, keep := range priorMatches(t, lay, prior) {
			sc.pinned[v] = sc.pinned[v] || keep
		}
	}
	var moves []frontierMove
	for vi := t.N; vi < nodes; vi++ {
		v := int32(vi)
		if lay.Parent[v] < 0 && v != t.Root {
			continue
		}
		reg := regionOf(t, v, depth)
		if memo.clean(v, reg) {
			if memo.has[v] {
				moves = append(moves, memo.move[v])
			}
			continue
		}
		mv, ok := sc.bestTop(v, reg)
		if memo != nil {
			memo.known[v], memo.has[v], memo.move[v] = true, ok, mv
		}
		if ok {
			moves = append(moves, mv)
		}
	}
	sort.Slice(moves, func(i, j int) bool {
		if moves[i].gain != moves[j].gain {
			return moves[i].gain > moves[j].gain
		}
		return moves[i].v < moves[j].v
	})
	applied, saved, changed := applyDisjoint(t, moves, nodes)
	if memo != nil {
		memo.changed = changed
	}
	return applied, saved, sc.edges.cost
}

// posEdge is an edge of g by the leaf positions p ≤ q of its ends.
type posEdge struct {
	p, q int32
	w    float64
}

// edgesByLCA holds g's edges bucketed by their LCA in the tree: the edges
// whose LCA is v are at[start[v]:start[v+1]]; cost is the tree's cost.
type edgesByLCA struct {
	at    []posEdge
	start []int32
	cost  float64
}

func bucketByLCA(g *graph.CSR, lay *layout, nodes int) edgesByLCA {
	start := make([]int32, nodes+1)
	var raw []posEdge
	var lcaOf []int32
	forEdges(lay, g, func(p, q, a int32, w float64) {
		raw = append(raw, posEdge{p, q, w})
		lcaOf = append(lcaOf, a)
		start[a+1]++
	})
	for v := 0; v < nodes; v++ {
		start[v+1] += start[v]
	}
	bucket := make([]posEdge, len(raw))
	fill := append([]int32(nil), start[:nodes]...)
	cost := 0.0
	for i, e := range raw {
		a := lcaOf[i]
		bucket[fill[a]] = e
		fill[a]++
		size := float64(lay.Hi[a] - lay.Lo[a])
		cost += float64(size * e.w)
	}
	return edgesByLCA{at: bucket, start: start, cost: cost}
}

// tripletsByLCA buckets the non-trivial triplets ab|c by lca(a,b,c).
func tripletsByLCA(c *Constraints, lay *layout) map[int32][]Triplet {
	tripsAt := map[int32][]Triplet{}
	if c == nil {
		return tripsAt
	}
	for _, tr := range c.Triplets {
		if tr.A == tr.B {
			continue
		}
		pa, pb, pc := lay.Pos[tr.A], lay.Pos[tr.B], lay.Pos[tr.C]
		y := lay.LCAPos(min(pa, pb, pc), max(pa, pb, pc))
		tripsAt[y] = append(tripsAt[y], tr)
	}
	return tripsAt
}

// frontierScan is what a pass knows of the tree while it looks for moves:
// its layout, its edges and triplets by LCA, the nodes that must stay
// (cluster constraints and previous categories), and the DP's scratch.
type frontierScan struct {
	lay     *layout
	edges   edgesByLCA
	tripsAt map[int32][]Triplet
	pinned  []bool
	dp      subsetDP
}

func (sc *frontierScan) size(v int32) float64 { return float64(sc.lay.Hi[v] - sc.lay.Lo[v]) }

// bestTop solves the subset DP over the blocks of v's region and returns
// the move to its optimum when that improves on the current top.
func (sc *frontierScan) bestTop(v int32, reg topRegion) (frontierMove, bool) {
	k := len(reg.blocks)
	if k < 3 {
		return frontierMove{}, false
	}
	dp := &sc.dp
	current, aho := sc.loadTop(v, reg)
	dp.solve(aho)
	full := uint32(1)<<k - 1
	best := dp.best[full]
	if !improves(best, current) {
		return frontierMove{}, false
	}
	mv := frontierMove{gain: current - best, v: v, region: reg}
	// Record the DP tree's splits in pre-order.
	stack := []uint32{full}
	for len(stack) > 0 {
		m := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		if m&(m-1) == 0 {
			continue
		}
		left := dp.split[m]
		mv.masks = append(mv.masks, m)
		mv.splits = append(mv.splits, left)
		stack = append(stack, m&^left, left)
	}
	return mv, true
}

// loadTop fills the DP with the region's blocks (sizes as masses, the
// weights between them from the edges whose LCA lies in the top) and
// returns the top's current cost and its constraints as block masks: the
// pinned nodes below v and the triplets that span blocks.
func (sc *frontierScan) loadTop(v int32, reg topRegion) (float64, *ahoMasks) {
	lay, dp, k := sc.lay, &sc.dp, len(reg.blocks)
	blockOf := func(p int32) int {
		for i, b := range reg.blocks {
			if p < lay.Hi[b] {
				return i
			}
		}
		return k - 1
	}
	dp.reset(k)
	for i, b := range reg.blocks {
		dp.mass[i] = sc.size(b)
	}
	current := 0.0
	var aho *ahoMasks
	for _, a := range reg.nodes {
		for _, e := range sc.edges.at[sc.edges.start[a]:sc.edges.start[a+1]] {
			i, j := blockOf(e.p), blockOf(e.q)
			dp.weight[i*k+j] += e.w
			dp.weight[j*k+i] += e.w
			current += float64(sc.size(a) * e.w)
		}
		if a != v && sc.pinned[a] {
			if aho == nil {
				aho = &ahoMasks{}
			}
			var m uint32
			for i, b := range reg.blocks {
				if lay.Lo[b] >= lay.Lo[a] && lay.Hi[b] <= lay.Hi[a] {
					m |= 1 << i
				}
			}
			aho.clusters = append(aho.clusters, m)
		}
		for _, tr := range sc.tripsAt[a] {
			ba, bb, bc := blockOf(lay.Pos[tr.A]), blockOf(lay.Pos[tr.B]), blockOf(lay.Pos[tr.C])
			if ba == bb {
				continue // a and b stay together inside their block
			}
			if aho == nil {
				aho = &ahoMasks{}
			}
			pair := uint32(1)<<ba | uint32(1)<<bb
			aho.pairs = append(aho.pairs, [2]uint32{pair, pair | uint32(1)<<bc})
		}
	}
	return current, aho
}

// applyDisjoint applies the moves in their order, skipping any that
// touches a node an earlier one changed, and returns how many it applied,
// the cost they saved and which nodes they rewired.
func applyDisjoint(t *Tree, moves []frontierMove, nodes int) (int, float64, []bool) {
	changed := make([]bool, nodes)
	applied, saved := 0, 0.0
	for _, mv := range moves {
		clash := false
		for _, x := range mv.region.nodes {
			clash = clash || changed[x]
		}
		for _, x := range mv.region.blocks {
			clash = clash || changed[x]
		}
		if clash {
			continue
		}
		mv.rewire(t)
		for _, x := range mv.region.nodes {
			changed[x] = true
		}
		applied++
		saved += mv.gain
	}
	return applied, saved, changed
}

// rewire replaces the top of the region by the DP's tree. Its internal
// nodes take the region's node ids in pre-order, so v stays the root of
// its subtree.
func (mv frontierMove) rewire(t *Tree) {
	id := map[uint32]int32{}
	for i, m := range mv.masks {
		id[m] = mv.region.nodes[i]
	}
	ref := func(m uint32) int32 {
		if m&(m-1) == 0 {
			return mv.region.blocks[bits.TrailingZeros32(m)]
		}
		return id[m]
	}
	for i, m := range mv.masks {
		left := mv.splits[i]
		t.Kids[id[m]] = []int32{ref(left), ref(m &^ left)}
	}
}
