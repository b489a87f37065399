package solve

import (
	"sort"

	"github.com/ramify-tax/ramify/solve/graph"
)

// Local improvement of the binary tree: rotation passes, then passes of
// the wider re-arrangement move (frontier.go). Both compute the change of
// Dasgupta's cost exactly and never break a constraint.
//
// Rotations. At a node v with children u and Y, where u has children X1 and
// X2, the rotations
//
//	((X1,X2),Y) → ((X1,Y),X2)   Δcost = n_Y·w(X1,X2) − n_X2·w(X1,Y)
//	((X1,X2),Y) → ((X2,Y),X1)   Δcost = n_Y·w(X1,X2) − n_X1·w(X2,Y)
//
// change Dasgupta's cost by exactly Δ: by the node form of the cost only v
// and u change; v keeps its leaves, and u's replacement holds X1 and Y in
// place of X1 and X2 (or X2 and Y). The formulas are derived here and
// checked against full recomputation in the tests. One pass buckets every
// edge by its LCA and by the grandchild it enters (O(m) LCA queries on a
// depth-first layout), scores all rotations, and applies the improving ones
// best first as long as they do not touch a node an earlier rotation of the
// same pass changed. A rotation removes the cluster X1∪X2 and flips exactly
// the triples with one leaf in each of X1, X2, Y, so it is refused when
// X1∪X2 is a cluster constraint or some ab|c has lca(a,b) = u and c in Y.

const defaultImprovePasses = 12

// improveMinGain: passes stop once one lowers the cost by less than this
// share (later passes then only shuffle a handful of nodes).
const improveMinGain = 1e-4

// rotation is one candidate move at node v: u is v's child that is broken
// up and keep is u's child that joins the sibling.
type rotation struct {
	delta   float64
	v, u    int32
	keep    int32 // the grandchild that stays with Y: X1 in the first form
	promote int32 // the grandchild that moves up to v
}

// improveRotations applies rotation passes to the binary tree t (in place)
// until a pass saves less than the share minGain of the cost (0: until
// nothing improves) or maxPasses passes ran. t must satisfy c; it still
// does afterwards.
//
// prior (may be nil) lists previous categories: nodes that reproduce one
// (priorMatches) are kept like cluster constraints, so that stability
// survives the improvement.
func improveRotations(g *graph.CSR, t *Tree, c *Constraints, prior [][]int32, maxPasses int, minGain float64, progress func(string, int, int)) int {
	applied := 0
	for pass := 0; pass < maxPasses; pass++ {
		progress("improve", pass, maxPasses)
		k, gain, cost := rotationPass(g, t, c, prior)
		applied += k
		if k == 0 || gain < minGain*cost {
			break
		}
	}
	memo := newFrontierMemo(t.NumNodes())
	for pass := 0; pass < maxPasses; pass++ {
		k, gain, cost := frontierPass(g, t, c, prior, frontierDepth(t.N), memo)
		applied += k
		if k == 0 || gain < minGain*cost {
			break
		}
	}
	progress("improve", maxPasses, maxPasses)
	canonicalOrder(t)
	return applied
}

// lcaBuckets are the edge weights bucketed by LCA in a binary tree:
// cross[v] = w(P, Q) for v's children P, Q; leftP[v] = w(P's first child,
// Q); leftQ[v] = w(Q's first child, P).
type lcaBuckets struct {
	cross, leftP, leftQ []float64
}

func bucketEdges(g *graph.CSR, t *Tree, lay *layout) lcaBuckets {
	nodes := t.NumNodes()
	b := lcaBuckets{make([]float64, nodes), make([]float64, nodes), make([]float64, nodes)}
	forEdges(lay, g, func(p, q, v int32, wt float64) {
		b.cross[v] += wt
		if len(t.Kids[v]) != 2 {
			return
		}
		P, Q := t.Kids[v][0], t.Kids[v][1]
		if !t.IsLeaf(P) && p < lay.Hi[t.Kids[P][0]] {
			b.leftP[v] += wt
		}
		if !t.IsLeaf(Q) && q < lay.Hi[t.Kids[Q][0]] {
			b.leftQ[v] += wt
		}
	})
	return b
}

// forEdges calls f once for every edge of g, in the order of its lower
// end, with the leaf positions p ≤ q of its ends in l, their lowest common
// ancestor v and the edge's weight.
func forEdges(l *layout, g *graph.CSR, f func(p, q, v int32, w float64)) {
	for u := 0; u < g.N; u++ {
		ts, ws := g.Neighbors(u)
		for k, x := range ts {
			if int(x) <= u {
				continue
			}
			p, q := l.Pos[u], l.Pos[x]
			if p > q {
				p, q = q, p
			}
			f(p, q, l.LCAPos(p, q), ws[k])
		}
	}
}

// constraintPins marks the nodes no move may break: pinned[v] when L(v) is
// a cluster constraint; locked[v] when some ab|c has lca(a,b) = v and c
// inside v's parent (so v may not be dissolved into its parent).
func constraintPins(t *Tree, c *Constraints, lay *layout) (pinned, locked []bool) {
	nodes := t.NumNodes()
	pinned = make([]bool, nodes)
	locked = make([]bool, nodes)
	if c == nil {
		return
	}
	for _, cl := range c.Clusters {
		if len(cl.Leaves) == 0 {
			continue
		}
		lo, hi := lay.Pos[cl.Leaves[0]], lay.Pos[cl.Leaves[0]]
		for _, l := range cl.Leaves {
			lo, hi = min(lo, lay.Pos[l]), max(hi, lay.Pos[l])
		}
		v := lay.LCAPos(lo, hi)
		seen := map[int32]bool{}
		for _, l := range cl.Leaves {
			seen[l] = true
		}
		if int(lay.Hi[v]-lay.Lo[v]) == len(seen) {
			pinned[v] = true
		}
	}
	for _, tr := range c.Triplets {
		if tr.A == tr.B {
			continue
		}
		x := lay.LCA(tr.A, tr.B)
		p := lay.Parent[x]
		if p < 0 {
			continue
		}
		if pc := lay.Pos[tr.C]; pc >= lay.Lo[p] && pc < lay.Hi[p] {
			locked[x] = true
		}
	}
	return
}

// rotationPass runs one pass and returns the number of rotations applied,
// the cost they saved and the cost before the pass.
func rotationPass(g *graph.CSR, t *Tree, c *Constraints, prior [][]int32) (int, float64, float64) {
	if t.N < 3 {
		return 0, 0, 0
	}
	lay := newLayout(t)
	b := bucketEdges(g, t, lay)
	pinned, locked := constraintPins(t, c, lay)
	if len(prior) > 0 {
		for v, keep := range priorMatches(t, lay, prior) {
			pinned[v] = pinned[v] || keep
		}
	}
	size := func(v int32) float64 { return float64(lay.Hi[v] - lay.Lo[v]) }
	cost := 0.0
	for v, w := range b.cross {
		cost += float64(size(int32(v)) * w)
	}
	var cands []rotation
	for vi := t.N; vi < t.NumNodes(); vi++ {
		v := int32(vi)
		if len(t.Kids[v]) != 2 || (lay.Parent[v] < 0 && v != t.Root) {
			continue // not binary, or not in the tree
		}
		for _, u := range t.Kids[v] {
			if t.IsLeaf(u) || pinned[u] || locked[u] {
				continue
			}
			for _, r := range rotationsAt(t, lay, &b, v, u) {
				if improves(r.loss, r.gain) {
					cands = append(cands, rotation{r.loss - r.gain, v, u, r.keep, r.promote})
				}
			}
		}
	}
	sort.Slice(cands, func(i, j int) bool {
		if cands[i].delta != cands[j].delta {
			return cands[i].delta < cands[j].delta
		}
		if cands[i].v != cands[j].v {
			return cands[i].v < cands[j].v
		}
		return cands[i].promote < cands[j].promote
	})
	dirty := make([]bool, t.NumNodes())
	applied, saved := 0, 0.0
	for _, r := range cands {
		p := lay.Parent[r.v]
		if dirty[r.v] || dirty[r.u] || (p >= 0 && dirty[p]) {
			continue
		}
		y := t.Kids[r.v][0]
		if y == r.u {
			y = t.Kids[r.v][1]
		}
		t.Kids[r.u][0], t.Kids[r.u][1] = r.keep, y
		t.Kids[r.v][0], t.Kids[r.v][1] = r.u, r.promote
		dirty[r.v], dirty[r.u] = true, true
		if p >= 0 {
			dirty[p] = true
		}
		applied++
		saved -= r.delta
	}
	return applied, saved, cost
}

// rotationTerms is one rotation with its cost change split into the
// added loss and the saved gain (Δ = loss − gain).
type rotationTerms struct {
	loss, gain    float64
	keep, promote int32
}

// rotationsAt returns the two rotations at v that break its internal
// child u: ((X1,X2),Y) → ((X1,Y),X2) and → ((X2,Y),X1).
func rotationsAt(t *Tree, lay *layout, b *lcaBuckets, v, u int32) [2]rotationTerms {
	size := func(x int32) float64 { return float64(lay.Hi[x] - lay.Lo[x]) }
	P, Q := t.Kids[v][0], t.Kids[v][1]
	Y, wFirstY := Q, b.leftP[v]
	if u == Q {
		Y, wFirstY = P, b.leftQ[v]
	}
	X1, X2 := t.Kids[u][0], t.Kids[u][1]
	wX2Y := b.cross[v] - wFirstY
	stay := float64(size(Y) * b.cross[u]) // n_Y · w(X1,X2)
	return [2]rotationTerms{
		{stay, float64(size(X2) * wFirstY), X1, X2}, // X2 moves up
		{stay, float64(size(X1) * wX2Y), X2, X1},    // X1 moves up
	}
}

// improves reports whether a move that adds cost loss and saves gain is a
// real improvement and not rounding noise relative to the two terms.
func improves(loss, gain float64) bool {
	return gain-loss > 1e-12*(loss+gain)
}

// canonicalOrder sorts every node's children by their smallest leaf.
func canonicalOrder(t *Tree) {
	minLeaf := make([]int32, t.NumNodes())
	for _, v := range t.PostOrder() {
		if t.IsLeaf(v) {
			minLeaf[v] = v
			continue
		}
		kids := t.Kids[v]
		sort.Slice(kids, func(i, j int) bool { return minLeaf[kids[i]] < minLeaf[kids[j]] })
		minLeaf[v] = minLeaf[kids[0]]
	}
}
