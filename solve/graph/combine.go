package graph

import (
	"fmt"
	"math"
	"math/bits"
	"slices"
)

// Combine adds similarity graphs over the same items: each part is first
// divided by its median positive edge weight, so that a typical edge weighs
// 1 in every source and the weights say how much each source counts, then
// the parts are summed with those weights. A part without edges, or with
// weight 0, contributes nothing. The result is summed in part order for
// every edge, so it is deterministic and exactly symmetric. Scaling all
// weights by one factor (e.g. making them sum to 1) scales the Dasgupta
// cost of every tree alike and so does not change which tree is best.
func Combine(parts []*CSR, weights []float64) (*CSR, error) {
	n, err := checkParts(parts, weights)
	if err != nil {
		return nil, err
	}
	scale := make([]float64, len(parts))
	for p, g := range parts {
		if med := MedianWeight(g); med > 0 {
			scale[p] = weights[p] / med
		}
	}
	room := 0
	for _, g := range parts {
		room += len(g.Targets)
	}
	out := &CSR{N: n, Offsets: make([]int64, n+1), Targets: make([]int32, 0, room), Weights: make([]float64, 0, room)}
	if len(parts) == 1 {
		appendRescaled(out, parts[0], scale[0])
		return out, nil
	}
	appendMerged(out, parts, scale)
	return out, nil
}

// checkParts says what is wrong with the parts and weights Combine was
// given, or returns the parts' item count.
func checkParts(parts []*CSR, weights []float64) (int, error) {
	if len(parts) == 0 {
		return 0, fmt.Errorf("combine: no graphs")
	}
	if len(weights) != len(parts) {
		return 0, fmt.Errorf("combine: %d graphs but %d weights", len(parts), len(weights))
	}
	n := -1
	for p, g := range parts {
		if g == nil {
			return 0, fmt.Errorf("combine: graph %d is missing", p)
		}
		if n >= 0 && g.N != n {
			return 0, fmt.Errorf("combine: graph %d has %d items, graph 0 has %d", p, g.N, n)
		}
		n = g.N
		if w := weights[p]; math.IsNaN(w) || math.IsInf(w, 0) || w < 0 {
			return 0, fmt.Errorf("combine: weight %d must be finite and >= 0, got %v", p, w)
		}
	}
	return n, nil
}

// appendRescaled fills out, which has no edges yet, with one source: its
// graph scaled by sc, with the weights the merge would sum (0 + x is x).
func appendRescaled(out, g *CSR, sc float64) {
	if sc <= 0 {
		return
	}
	for i := 0; i < out.N; i++ {
		for e := g.Offsets[i]; e < g.Offsets[i+1]; e++ {
			if w := float64(sc * g.Weights[e]); w > 0 {
				out.Targets = append(out.Targets, g.Targets[e])
				out.Weights = append(out.Weights, w)
			}
		}
		out.Offsets[i+1] = int64(len(out.Targets))
	}
}

// appendMerged fills out, which has no edges yet, with the sum of the
// scaled parts, row by row: each row merges the parts' sorted rows,
// summing an edge's weights in part order.
func appendMerged(out *CSR, parts []*CSR, scale []float64) {
	heads := make([]int64, len(parts))
	for i := 0; i < out.N; i++ {
		for p, g := range parts {
			heads[p] = g.Offsets[i]
		}
		for {
			// The smallest target among the parts' unread entries of row i.
			t := int32(-1)
			for p, g := range parts {
				if scale[p] > 0 && heads[p] < g.Offsets[i+1] {
					if c := g.Targets[heads[p]]; t < 0 || c < t {
						t = c
					}
				}
			}
			if t < 0 {
				break
			}
			w := 0.0
			for p, g := range parts {
				if scale[p] > 0 && heads[p] < g.Offsets[i+1] && g.Targets[heads[p]] == t {
					w += float64(scale[p] * g.Weights[heads[p]])
					heads[p]++
				}
			}
			if w > 0 {
				out.Targets = append(out.Targets, t)
				out.Weights = append(out.Weights, w)
			}
		}
		out.Offsets[i+1] = int64(len(out.Targets))
	}
}

// MedianWeight is the median of g's positive edge weights, each undirected
// edge counted once (the mean of the two middle ones for an even count), or
// 0 when g has no edges.
func MedianWeight(g *CSR) float64 {
	ws := make([]float64, 0, len(g.Targets)/2)
	for u := 0; u < g.N; u++ {
		ts, w := g.Neighbors(u)
		for p, t := range ts {
			if int(t) > u && w[p] > 0 {
				ws = append(ws, w[p])
			}
		}
	}
	if len(ws) == 0 {
		return 0
	}
	// Selection finds the middle in linear time, where sorting millions of
	// weights took most of a re-solve's graph build; the values are the
	// ones a sort would put there.
	m := len(ws) / 2
	mid := selectKth(ws, m)
	if len(ws)%2 == 1 {
		return mid
	}
	return slices.Max(ws[:m])/2 + mid/2
}

// selectKth reorders ws so that ws[k] holds the value a sort would put
// there, every value before it no greater and every value after it no
// smaller, and returns ws[k] (Hoare's FIND, with a median-of-three pivot;
// past 2·log₂ n rounds of bad pivots the rest is sorted, so the worst case
// stays O(n log n)).
func selectKth(ws []float64, k int) float64 {
	lo, hi := 0, len(ws)-1
	for budget := 2 * bits.Len(uint(len(ws))); lo < hi; budget-- {
		if budget == 0 {
			slices.Sort(ws[lo : hi+1])
			break
		}
		mid := lo + (hi-lo)/2
		if ws[mid] < ws[lo] {
			ws[mid], ws[lo] = ws[lo], ws[mid]
		}
		if ws[hi] < ws[lo] {
			ws[hi], ws[lo] = ws[lo], ws[hi]
		}
		if ws[hi] < ws[mid] {
			ws[hi], ws[mid] = ws[mid], ws[hi]
		}
		pivot := ws[mid]
		i, j := lo, hi
		for i <= j {
			for ws[i] < pivot {
				i++
			}
			for ws[j] > pivot {
				j--
			}
			if i <= j {
				ws[i], ws[j] = ws[j], ws[i]
				i++
				j--
			}
		}
		// Now ws[lo..j] <= pivot <= ws[i..hi], and ws[j+1..i-1] == pivot.
		switch {
		case k <= j:
			hi = j
		case k >= i:
			lo = i
		default:
			return ws[k]
		}
	}
	return ws[k]
}
