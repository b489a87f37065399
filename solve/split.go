package solve

import (
	"math"

	"github.com/ramify-tax/ramify/solve/graph"
)

// components labels the connected components of h in w.comp (in order of
// their smallest super-node) and returns their number.
func (w *constructWorker) components(h *graph.CSR) int {
	k := h.N
	w.comp = growInt32(w.comp, k)
	for i := range w.comp {
		w.comp[i] = -1
	}
	nc := int32(0)
	for s := 0; s < k; s++ {
		if w.comp[s] >= 0 {
			continue
		}
		w.comp[s] = nc
		w.queue = append(w.queue[:0], int32(s))
		for len(w.queue) > 0 {
			u := w.queue[len(w.queue)-1]
			w.queue = w.queue[:len(w.queue)-1]
			for e := h.Offsets[u]; e < h.Offsets[u+1]; e++ {
				t := h.Targets[e]
				if w.comp[t] < 0 {
					w.comp[t] = nc
					w.queue = append(w.queue, t)
				}
			}
		}
		nc++
	}
	return int(nc)
}

// splitComponents separates disconnected parts, which costs nothing: the
// components (in order of their smallest leaf) are cut at the prefix whose
// mass is closest to half, so that many small parts give a shallow tree.
func (w *constructWorker) splitComponents(nc int) {
	compMass := make([]float64, nc)
	total := 0.0
	for u, c := range w.comp {
		compMass[c] += w.mass[u]
		total += w.mass[u]
	}
	best, bestGap := 1, math.Inf(1)
	prefix := 0.0
	for i := 0; i < nc-1; i++ {
		prefix += compMass[i]
		if gap := math.Abs(2*prefix - total); gap < bestGap {
			best, bestGap = i+1, gap
		}
	}
	for u, c := range w.comp {
		if int(c) < best {
			w.sideU[u] = 0
		} else {
			w.sideU[u] = 1
		}
	}
}

// splitSpectral cuts the contracted graph at the best sweep prefix of its
// Fiedler vector. The spectral measure is the super-nodes' volume, so that
// without contraction this is the normalised Laplacian and a contracted
// super-node keeps the weight of the edges inside it; the sweep scores
// uniform sparsity with masses.
func (w *constructWorker) splitSpectral(h *graph.CSR, seed uint64) error {
	k := h.N
	w.deg = grow(w.deg, k)
	for u := 0; u < k; u++ {
		d := 0.0
		for e := h.Offsets[u]; e < h.Offsets[u+1]; e++ {
			d += h.Weights[e]
		}
		w.deg[u] = d
	}
	if err := w.sp.sparsestCut(h, w.deg, w.vol, w.mass, w.first, seed, &w.sw, w.sideU); err != nil {
		return err
	}
	w.refineCut(h)
	return nil
}
