package solve

// hardUnions resets the union-find on the set and joins the Aho graph's
// edges: a–b for each active triplet ab|c, all of C for each cluster C ⊊ S.
func (b *builder) hardUnions(tk ctask) {
	set := b.order[tk.lo:tk.hi]
	for _, l := range set {
		b.uf[l] = l
	}
	for _, ti := range b.trip[tk.tlo:tk.thi] {
		tr := b.trips[ti]
		b.uf.Union(tr.A, tr.B)
	}
	for _, ci := range b.clus[tk.clo:tk.chi] {
		cl := b.clusters[ci]
		if len(cl) < len(set) {
			for _, l := range cl[1:] {
				b.uf.Union(cl[0], l)
			}
		}
	}
}

// superNodes numbers the union-find components of the set in order of
// their smallest leaf (a root is the smallest leaf of its component, since
// union keeps the smaller root) and records them in b.local and w.first.
func (b *builder) superNodes(w *constructWorker, set []int32) int {
	k := 0
	w.first = w.first[:0]
	for _, l := range set {
		r := b.uf.Find(l)
		if r == l {
			b.local[l] = int32(k)
			w.first = append(w.first, l)
			k++
		} else {
			b.local[l] = b.local[r]
		}
	}
	return k
}

// softUnions holds the previous outline's categories together (Stability:
// the previous outline pulls the new tree toward itself, so that adding a
// few items changes little else). A previous category P in the set is
// joined into one super-node while the set still holds previously
// categorised items outside P — so P survives as a node, and new items may
// still join it once the recursion reaches P's own set — provided the
// similarity graph still backs it: P's edge density inside G[S] must be at
// least (1 − Stability) times the density of the whole set. Joining only
// coarsens the Aho components, so it never breaks a constraint. It reports
// whether any category was joined.
func (b *builder) softUnions(w *constructWorker, tk ctask) bool {
	set := b.order[tk.lo:tk.hi]
	covered := 0
	for _, l := range set {
		if b.covered[l] {
			covered++
		}
	}
	setDensity := b.density(w.mark, set, w.stamp)
	if w.gmark == nil {
		w.gmark = make([]int32, b.n)
	}
	joined := false
	// Groups are sorted largest first, so a category nested in one joined
	// before is already whole and costs only the check below.
	for _, gi := range b.grp[tk.glo:tk.ghi] {
		grp := b.groups[gi]
		if len(grp) >= covered {
			continue // P is all the categorised items here: nothing to keep apart
		}
		root := b.uf.Find(grp[0])
		whole := true
		for _, l := range grp[1:] {
			if b.uf.Find(l) != root {
				whole = false
				break
			}
		}
		if whole {
			continue
		}
		w.gstamp++
		for _, l := range grp {
			w.gmark[l] = w.gstamp
		}
		if b.density(w.gmark, grp, w.gstamp) < (1-b.params.stability)*setDensity {
			continue
		}
		for _, l := range grp[1:] {
			b.uf.Union(grp[0], l)
		}
		joined = true
	}
	return joined
}

// density is the weight of the edges among members (marked with stamp)
// over the number of member pairs.
func (b *builder) density(mark []int32, members []int32, stamp int32) float64 {
	if len(members) < 2 {
		return 0
	}
	total := 0.0
	for _, l := range members {
		ts, ws := b.g.Neighbors(int(l))
		for e, t := range ts {
			if mark[t] == stamp {
				total += ws[e]
			}
		}
	}
	pairs := float64(len(members)) * float64(len(members)-1)
	return total / pairs // each edge was counted from both ends
}

// contract builds the contracted graph of G[S] onto the k super-nodes,
// their masses (leaf counts) and volumes (weighted degree inside G[S],
// edges within the super-node included).
func (b *builder) contract(w *constructWorker, tk ctask, k int) {
	set := b.order[tk.lo:tk.hi]
	w.memOff = growInt32(w.memOff, k+1)
	for i := range w.memOff {
		w.memOff[i] = 0
	}
	for _, l := range set {
		w.memOff[b.local[l]+1]++
	}
	for i := 0; i < k; i++ {
		w.memOff[i+1] += w.memOff[i]
	}
	w.member = growInt32(w.member, len(set))
	w.accPos = growInt32(w.accPos, k)
	cursor := w.accPos // borrowed as fill cursor first
	copy(cursor, w.memOff[:k])
	for _, l := range set {
		u := b.local[l]
		w.member[cursor[u]] = l
		cursor[u]++
	}
	for i := range w.accPos {
		w.accPos[i] = -1
	}
	if cap(w.hOff) < k+1 {
		w.hOff = make([]int64, k+1, k+1+k/4)
	}
	w.hOff = w.hOff[:k+1]
	w.hTgt = w.hTgt[:0]
	w.hW = w.hW[:0]
	w.mass = grow(w.mass, k)
	w.vol = grow(w.vol, k)
	g := b.g
	for u := 0; u < k; u++ {
		w.hOff[u] = int64(len(w.hTgt))
		rowStart := len(w.hTgt)
		vol := 0.0
		members := w.member[w.memOff[u]:w.memOff[u+1]]
		for _, l := range members {
			lo, hi := g.Offsets[l], g.Offsets[l+1]
			for e := lo; e < hi; e++ {
				t := g.Targets[e]
				if w.mark[t] != w.stamp {
					continue
				}
				wt := g.Weights[e]
				vol += wt
				v := b.local[t]
				if int(v) == u {
					continue
				}
				if p := w.accPos[v]; p >= 0 {
					w.hW[p] += wt
				} else {
					w.accPos[v] = int32(len(w.hTgt))
					w.hTgt = append(w.hTgt, v)
					w.hW = append(w.hW, wt)
				}
			}
		}
		for _, v := range w.hTgt[rowStart:] {
			w.accPos[v] = -1
		}
		w.mass[u] = float64(len(members))
		w.vol[u] = vol
	}
	w.hOff[k] = int64(len(w.hTgt))
}
