package solve

import (
	"math"
	"math/bits"

	"github.com/ramify-tax/ramify/solve/graph"
)

// splitBySuperDP takes the top split of the optimal tree over super-nodes
// treated as atoms with masses.
func (w *constructWorker) splitBySuperDP(h *graph.CSR) {
	k := h.N
	w.dp.reset(k)
	for u := 0; u < k; u++ {
		w.dp.mass[u] = w.mass[u]
		for e := h.Offsets[u]; e < h.Offsets[u+1]; e++ {
			w.dp.weight[u*k+int(h.Targets[e])] = h.Weights[e]
		}
	}
	w.dp.solve(nil)
	top := w.dp.split[(1<<k)-1]
	for u := 0; u < k; u++ {
		if top&(1<<u) != 0 {
			w.sideU[u] = 0
		} else {
			w.sideU[u] = 1
		}
	}
}

// finishExact solves the set's whole subtree by the constrained subset DP
// and writes its leaves and gaps.
func (b *builder) finishExact(w *constructWorker, tk ctask) {
	set := b.order[tk.lo:tk.hi]
	s := len(set)
	for i, l := range set {
		b.local[l] = int32(i)
	}
	w.dp.reset(s)
	for i, l := range set {
		w.dp.mass[i] = 1
		ts, ws := b.g.Neighbors(int(l))
		for e, t := range ts {
			if w.mark[t] == w.stamp {
				w.dp.weight[i*s+int(b.local[t])] = ws[e]
			}
		}
	}
	var aho *ahoMasks
	if tk.thi > tk.tlo || tk.chi > tk.clo || tk.ghi > tk.glo {
		aho = &ahoMasks{}
		for _, ti := range b.trip[tk.tlo:tk.thi] {
			tr := b.trips[ti]
			a, bb, c := uint32(1)<<b.local[tr.A], uint32(1)<<b.local[tr.B], uint32(1)<<b.local[tr.C]
			aho.pairs = append(aho.pairs, [2]uint32{a | bb, a | bb | c})
		}
		for _, ci := range b.clus[tk.clo:tk.chi] {
			var m uint32
			for _, l := range b.clusters[ci] {
				m |= 1 << b.local[l]
			}
			aho.clusters = append(aho.clusters, m)
		}
		for i, l := range set {
			if b.covered != nil && b.covered[l] {
				aho.covered |= 1 << i
			}
		}
		for _, gi := range b.grp[tk.glo:tk.ghi] {
			var m uint32
			for _, l := range b.groups[gi] {
				m |= 1 << b.local[l]
			}
			aho.soft = append(aho.soft, m)
		}
	}
	w.dp.solve(aho)
	leaves := append([]int32(nil), set...)
	type frame struct {
		mask  uint32
		start int
		depth int32
	}
	stack := []frame{{uint32(1)<<s - 1, 0, tk.depth}}
	for len(stack) > 0 {
		f := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		if bits.OnesCount32(f.mask) == 1 {
			set[f.start] = leaves[bits.TrailingZeros32(f.mask)]
			continue
		}
		left := w.dp.split[f.mask]
		right := f.mask &^ left
		nl := bits.OnesCount32(left)
		b.gapDepth[tk.lo+f.start+nl] = f.depth
		stack = append(stack, frame{right, f.start + nl, f.depth + 1}, frame{left, f.start, f.depth + 1})
	}
}

// ahoMasks are constraints over at most 32 atoms as bit masks: a triplet
// ab|c as (a|b, a|b|c), a cluster as its mask; soft are previous
// categories, joined in a set while it holds covered atoms outside them
// (softUnions), unless that would leave the set no split.
type ahoMasks struct {
	pairs    [][2]uint32
	clusters []uint32
	soft     []uint32
	covered  uint32
	hard     []uint32
}

// components returns the component masks of the Aho graph of set, in
// order of their lowest atom.
func (a *ahoMasks) components(set uint32, buf []uint32) []uint32 {
	buf = buf[:0]
	for m := set; m != 0; m &= m - 1 {
		buf = append(buf, m&-m)
	}
	join := func(x uint32) {
		// Merge every component that meets x into the first one meeting it.
		into := -1
		out := buf[:0]
		for _, c := range buf {
			if c&x == 0 {
				out = append(out, c)
				continue
			}
			if into < 0 {
				into = len(out)
				out = append(out, c)
			} else {
				out[into] |= c
			}
		}
		buf = out
	}
	for _, p := range a.pairs {
		if p[1]&set == p[1] {
			join(p[0])
		}
	}
	for _, c := range a.clusters {
		if c&set == c && c != set {
			join(c)
		}
	}
	if len(a.soft) == 0 || len(buf) < 2 {
		return buf
	}
	a.hard = append(a.hard[:0], buf...)
	inSet := bits.OnesCount32(set & a.covered)
	for _, c := range a.soft {
		if c&set == c && bits.OnesCount32(c) < inSet {
			join(c)
		}
	}
	if len(buf) < 2 {
		buf = append(buf[:0], a.hard...)
	}
	return buf
}

// subsetDP is the exact Dasgupta optimum over subsets of at most 16 atoms
// with masses (the subset DP of OptimalCost, export_test.go):
// best[A] = min over admissible splits A = B ∪ C
// of best[B] + best[C] + m(A)·w(B, C), where B contains A's lowest atom and
// is a union of Aho components of A when constraints are given.
type subsetDP struct {
	k      int
	weight []float64 // k×k
	mass   []float64
	win    []float64 // weight inside each mask
	msum   []float64
	best   []float64
	split  []uint32
	comps  []uint32
	unions []uint32
}

func (d *subsetDP) reset(k int) {
	d.k = k
	d.weight = grow(d.weight, k*k)
	for i := range d.weight {
		d.weight[i] = 0
	}
	d.mass = grow(d.mass, k)
}

func (d *subsetDP) solve(aho *ahoMasks) {
	k := d.k
	full := 1 << k
	d.win = grow(d.win, full)
	d.msum = grow(d.msum, full)
	d.best = grow(d.best, full)
	if cap(d.split) < full {
		d.split = make([]uint32, full)
	}
	d.split = d.split[:full]
	d.win[0], d.msum[0], d.best[0] = 0, 0, 0
	for m := 1; m < full; m++ {
		low := bits.TrailingZeros32(uint32(m))
		rest := m &^ (1 << low)
		add := 0.0
		for r := rest; r != 0; r &= r - 1 {
			add += d.weight[low*k+bits.TrailingZeros32(uint32(r))]
		}
		d.win[m] = d.win[rest] + add
		d.msum[m] = d.msum[rest] + d.mass[low]
	}
	for m := 1; m < full; m++ {
		set := uint32(m)
		if set&(set-1) == 0 {
			d.best[m] = 0
			continue
		}
		if aho != nil {
			d.comps = aho.components(set, d.comps)
		} else {
			d.comps = d.comps[:0]
			for x := set; x != 0; x &= x - 1 {
				d.comps = append(d.comps, x&-x)
			}
		}
		c := len(d.comps)
		bestCost, bestSplit := math.Inf(1), uint32(0)
		nsub := 1 << (c - 1)
		if cap(d.unions) < nsub {
			d.unions = make([]uint32, nsub)
		}
		u := d.unions[:nsub]
		u[0] = 0
		for sub := 0; sub < nsub-1; sub++ {
			if sub > 0 {
				u[sub] = u[sub&(sub-1)] | d.comps[1+bits.TrailingZeros32(uint32(sub))]
			}
			left := d.comps[0] | u[sub]
			right := set &^ left
			cross := d.win[set] - d.win[left] - d.win[right]
			cost := d.best[left] + d.best[right] + float64(d.msum[set]*cross)
			if cost < bestCost {
				bestCost, bestSplit = cost, left
			}
		}
		d.best[m], d.split[m] = bestCost, bestSplit
	}
}
