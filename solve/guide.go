package solve

import (
	"math/bits"
	"slices"

	"github.com/ramify-tax/ramify/solve/graph"
)

// guide is a second opinion for the top-down splits: the average-linkage
// tree of the whole graph. A spectral sweep is only as good as the
// approximate eigenvector it orders by, and on large graphs with nearly
// equal eigenvalues (several equally strong splits) the vector mixes them;
// the agglomerative tree sees local structure the vector blurs. At every
// spectral split the guide's split of the same set is scored too, and the
// one with the lower uniform sparsity ψ is taken, so the construction is
// never steered by a worse cut than the baseline would make there.
//
// The tree is kept as its leaves in depth-first order with, between each
// two consecutive leaves, the depth of their lowest common ancestor. The
// guide's split of any leaf set is then the gap of least depth between its
// members in that order (a range-minimum query).
type guide struct {
	pos []int32   // leaf → position in depth-first order
	rmq [][]int32 // rmq[j][i] = min gap depth over gaps i .. i+2^j−1
}

// newGuide builds the guide from average linkage on g (nil when the graph
// has fewer than three vertices, where there is nothing to guide).
func newGuide(g *graph.CSR) *guide {
	if g.N < 3 {
		return nil
	}
	t := AverageLinkageGraph(g)
	if t == nil {
		return nil
	}
	n := t.N
	gd := &guide{pos: make([]int32, n)}
	gaps := make([]int32, 0, n-1)
	// Iterative depth-first walk; a gap is recorded at node v between the
	// last leaf of one child and the first leaf of the next.
	type frame struct {
		v     int32
		depth int32
		next  int
	}
	stack := []frame{{t.Root, 0, 0}}
	placed := int32(0)
	for len(stack) > 0 {
		f := &stack[len(stack)-1]
		if t.IsLeaf(f.v) {
			gd.pos[f.v] = placed
			placed++
			stack = stack[:len(stack)-1]
			continue
		}
		if f.next < len(t.Kids[f.v]) {
			if f.next > 0 {
				gaps = append(gaps, f.depth)
			}
			c := t.Kids[f.v][f.next]
			f.next++
			stack = append(stack, frame{c, f.depth + 1, 0})
			continue
		}
		stack = stack[:len(stack)-1]
	}
	if int(placed) != n || len(gaps) != n-1 {
		return nil // not a tree over every leaf; run without a guide
	}
	gd.rmq = [][]int32{gaps}
	for span := 1; 2*span <= len(gaps); span *= 2 {
		prev := gd.rmq[len(gd.rmq)-1]
		next := make([]int32, len(prev)-span)
		for i := range next {
			next[i] = min(prev[i], prev[i+span])
		}
		gd.rmq = append(gd.rmq, next)
	}
	return gd
}

// minGap is the least gap depth over gaps lo..hi (inclusive).
func (gd *guide) minGap(lo, hi int32) int32 {
	j := bits.Len32(uint32(hi-lo+1)) - 1
	return min(gd.rmq[j][lo], gd.rmq[j][hi-(1<<j)+1])
}

// threshold returns the guide's split of the leaves: those with position
// below the returned value form one side. ok is false for fewer than two
// leaves. buf is scratch space.
func (gd *guide) threshold(leaves []int32, buf []int32) (cut int32, ok bool, out []int32) {
	buf = buf[:0]
	for _, l := range leaves {
		buf = append(buf, gd.pos[l])
	}
	if len(buf) < 2 {
		return 0, false, buf
	}
	slices.Sort(buf)
	best := int32(-1)
	for j := 0; j+1 < len(buf); j++ {
		d := gd.minGap(buf[j], buf[j+1]-1)
		if best < 0 || d < best {
			best, cut = d, buf[j+1]
		}
	}
	return cut, true, buf
}

// tryGuide replaces the spectral split in w.sideU by the guide's split of
// the same set when that has lower ψ after the same refinement. Super-nodes
// go to the side holding most of their members.
func (b *builder) tryGuide(w *constructWorker, h *graph.CSR) {
	if b.guideReady == nil {
		return
	}
	<-b.guideReady
	if b.guide == nil {
		return
	}
	k := h.N
	psiSpectral := cutSparsity(h, w.sideU, w.mass)
	cut, ok, buf := b.guide.threshold(w.member[:w.memOff[k]], w.tmp)
	w.tmp = buf
	if !ok {
		return
	}
	spectral := slices.Clone(w.sideU[:k])
	var count [2]int
	for u := 0; u < k; u++ {
		below := 0
		members := w.member[w.memOff[u]:w.memOff[u+1]]
		for _, l := range members {
			if b.guide.pos[l] < cut {
				below++
			}
		}
		if 2*below >= len(members) {
			w.sideU[u] = 0
		} else {
			w.sideU[u] = 1
		}
		count[w.sideU[u]]++
	}
	if count[0] == 0 || count[1] == 0 {
		copy(w.sideU, spectral)
		return
	}
	w.refineCut(h)
	if !(cutSparsity(h, w.sideU, w.mass) < psiSpectral*(1-1e-12)) {
		copy(w.sideU, spectral)
	}
}

// cutSparsity is ψ = w(A,B)/(m(A)·m(B)) of the split side on h.
func cutSparsity(h *graph.CSR, side []int8, mass []float64) float64 {
	var m [2]float64
	cut := 0.0
	for u := 0; u < h.N; u++ {
		m[side[u]] += mass[u]
		if side[u] != 0 {
			continue
		}
		for e := h.Offsets[u]; e < h.Offsets[u+1]; e++ {
			if side[h.Targets[e]] != 0 {
				cut += h.Weights[e]
			}
		}
	}
	if m[0] == 0 || m[1] == 0 {
		return 0
	}
	return cut / float64(m[0]*m[1])
}
