package solve

import (
	"github.com/ramify-tax/ramify/solve/graph"
)

// refinePasses bounds the local refinement of a sweep cut.
const refinePasses = 3

// refineCut improves the split in w.sideU by moving single super-nodes
// across it while that lowers ψ = w(A,B)/(m(A)·m(B)): a sweep is only as
// good as the approximate eigenvector it orders by, and a few O(m) passes
// repair what the vector got slightly wrong. Super-nodes are visited in
// index order and never split; neither side is ever emptied.
func (w *constructWorker) refineCut(h *graph.CSR) {
	k := h.N
	// Weight from each super-node to side 0 and to side 1 (the degree and
	// volume buffers are free again and are reused for them).
	w.deg, w.vol = grow(w.deg, k), grow(w.vol, k)
	wt0, wt1 := w.deg, w.vol
	for u := range wt0 {
		wt0[u], wt1[u] = 0, 0
	}
	var mass [2]float64
	cut := 0.0
	for u := 0; u < k; u++ {
		mass[w.sideU[u]] += w.mass[u]
		for e := h.Offsets[u]; e < h.Offsets[u+1]; e++ {
			t := h.Targets[e]
			if w.sideU[t] == 0 {
				wt0[u] += h.Weights[e]
			} else {
				wt1[u] += h.Weights[e]
			}
		}
	}
	for u := 0; u < k; u++ {
		if w.sideU[u] == 0 {
			cut += wt1[u]
		}
	}
	count := [2]int{}
	for u := 0; u < k; u++ {
		count[w.sideU[u]]++
	}
	psi := cut / float64(mass[0]*mass[1])
	for pass := 0; pass < refinePasses; pass++ {
		moved := 0
		for u := 0; u < k; u++ {
			from := w.sideU[u]
			if count[from] == 1 {
				continue
			}
			own, other := wt0[u], wt1[u]
			if from == 1 {
				own, other = wt1[u], wt0[u]
			}
			newCut := cut - other + own
			m := w.mass[u]
			var m0, m1 float64
			if from == 0 {
				m0, m1 = mass[0]-m, mass[1]+m
			} else {
				m0, m1 = mass[0]+m, mass[1]-m
			}
			newPsi := newCut / float64(m0*m1)
			if !(newPsi < psi*(1-1e-12)) {
				continue
			}
			to := from ^ 1
			w.sideU[u] = to
			count[from]--
			count[to]++
			mass[0], mass[1] = m0, m1
			cut, psi = newCut, newPsi
			for e := h.Offsets[u]; e < h.Offsets[u+1]; e++ {
				t := h.Targets[e]
				if to == 1 {
					wt0[t] -= h.Weights[e]
					wt1[t] += h.Weights[e]
				} else {
					wt1[t] -= h.Weights[e]
					wt0[t] += h.Weights[e]
				}
			}
			moved++
		}
		if moved == 0 {
			break
		}
	}
}
