package graph

import "sort"

// neighborLists holds each item's chosen neighbours before symmetrisation:
// row r lists ids[off[r]:off[r+1]] with their scores (higher = closer) in
// sims at the same positions, best first unless stated otherwise.
type neighborLists struct {
	n    int
	off  []int64
	ids  []int32
	sims []float64
}

func (l *neighborLists) row(r int) ([]int32, []float64) {
	a, b := l.off[r], l.off[r+1]
	return l.ids[a:b], l.sims[a:b]
}

// rowIDs is row r's ids alone, for lists built without scores.
func (l *neighborLists) rowIDs(r int) []int32 {
	return l.ids[l.off[r]:l.off[r+1]]
}

// rowFiller appends the neighbours of item i to ids/sims and returns the
// grown slices. It may use its scratch state freely.
type rowFiller[S any] func(state S, i int, ids []int32, sims []float64) ([]int32, []float64)

// blockFiller computes the rows of one block of items, appending them to
// out in the order of items.
type blockFiller[S any] func(state S, items []int32, out *rowBlock)

// rowBlock collects the rows of one block: row lengths, then the entries of
// all rows back to back.
type rowBlock struct {
	lens []int32
	ids  []int32
	sims []float64
}

// computeRows computes the rows of the given items (all of 0..n-1 when
// items is nil) row by row; see computeBlocks.
func computeRows[S any](n int, items []int32, newState func() S, fill rowFiller[S]) *neighborLists {
	return computeBlocks(n, items, newState, func(s S, block []int32, out *rowBlock) {
		for _, i := range block {
			before := len(out.ids)
			out.ids, out.sims = fill(s, int(i), out.ids, out.sims)
			out.lens = append(out.lens, int32(len(out.ids)-before))
		}
	})
}

// computeBlocks computes the rows of the given items (all of 0..n-1 when
// items is nil) in fixed blocks on all cores and concatenates the blocks in
// row order, so the result does not depend on GOMAXPROCS. Row r of the
// result belongs to items[r] (or to r when items is nil).
func computeBlocks[S any](n int, items []int32, newState func() S, fill blockFiller[S]) *neighborLists {
	count := n
	if items != nil {
		count = len(items)
	}
	outs := make([]rowBlock, numBlocks(count))
	parallelBlocks(len(outs), newState, func(s S, b int) {
		lo, hi := blockRange(b, count)
		var block []int32
		if items != nil {
			block = items[lo:hi]
		} else {
			block = make([]int32, hi-lo)
			for r := range block {
				block[r] = int32(lo + r)
			}
		}
		o := rowBlock{lens: make([]int32, 0, hi-lo)}
		fill(s, block, &o)
		outs[b] = o
	})
	total := 0
	for _, o := range outs {
		total += len(o.ids)
	}
	l := &neighborLists{n: count, off: make([]int64, count+1), ids: make([]int32, 0, total), sims: make([]float64, 0, total)}
	r := 0
	for b := range outs {
		for _, ln := range outs[b].lens {
			l.off[r+1] = l.off[r] + int64(ln)
			r++
		}
		l.ids = append(l.ids, outs[b].ids...)
		l.sims = append(l.sims, outs[b].sims...)
		outs[b] = rowBlock{} // let the block's memory go early
	}
	return l
}

// symmetrize turns directed neighbour lists (no id repeated within a row,
// nor across the sets for one row; row i is the rows i of all the sets)
// into the union-kNN graph: i and j are joined when j is in i's list or i
// is in j's. weight maps a listed score to the edge weight; entries whose
// weight is not positive, and self-entries, are dropped. Because scores are
// computed symmetrically, an edge listed in both directions has the same
// weight both ways; the larger is kept anyway so the graph stays symmetric
// even if a caller's weight function is not.
// Cost and memory are linear in the number of list entries.
func symmetrize(weight func(i int, j int32, score float64) float64, sets ...*neighborLists) *CSR {
	n := sets[0].n
	entries := 0
	for _, l := range sets {
		entries += len(l.ids)
	}
	fOff := make([]int64, n+1)
	fT := make([]int32, 0, entries)
	fW := make([]float64, 0, entries)
	for i := 0; i < n; i++ {
		start := len(fT)
		for _, l := range sets {
			ids, sims := l.row(i)
			for p, j := range ids {
				if int(j) == i {
					continue
				}
				if w := weight(i, j, sims[p]); w > 0 {
					fT = append(fT, j)
					fW = append(fW, w)
				}
			}
		}
		sortByTarget(fT[start:], fW[start:])
		fOff[i+1] = int64(len(fT))
	}

	// Reverse lists by counting: visiting sources in increasing order leaves
	// every reverse row sorted by source.
	rOff := make([]int64, n+1)
	for _, j := range fT {
		rOff[j+1]++
	}
	for i := 0; i < n; i++ {
		rOff[i+1] += rOff[i]
	}
	rT := make([]int32, len(fT))
	rW := make([]float64, len(fT))
	pos := append([]int64(nil), rOff[:n]...)
	for i := 0; i < n; i++ {
		for p := fOff[i]; p < fOff[i+1]; p++ {
			j := fT[p]
			rT[pos[j]] = int32(i)
			rW[pos[j]] = fW[p]
			pos[j]++
		}
	}

	// Count the merged rows first so the graph is allocated once, exactly:
	// in the all-pairs mode the forward lists are already symmetric and a
	// guessed capacity of twice their size would waste half the memory.
	g := &CSR{N: n, Offsets: make([]int64, n+1)}
	for i := 0; i < n; i++ {
		g.Offsets[i+1] = g.Offsets[i] + int64(mergeRow(fT[fOff[i]:fOff[i+1]], fW[fOff[i]:fOff[i+1]], rT[rOff[i]:rOff[i+1]], rW[rOff[i]:rOff[i+1]], nil, nil))
	}
	g.Targets = make([]int32, g.Offsets[n])
	g.Weights = make([]float64, g.Offsets[n])
	for i := 0; i < n; i++ {
		a, b := g.Offsets[i], g.Offsets[i+1]
		mergeRow(fT[fOff[i]:fOff[i+1]], fW[fOff[i]:fOff[i+1]], rT[rOff[i]:rOff[i+1]], rW[rOff[i]:rOff[i+1]], g.Targets[a:b], g.Weights[a:b])
	}
	return g
}

// mergeRow merges two target-sorted rows without repeated targets into
// outT/outW (when not nil), keeping the larger weight for a target present
// in both, and returns the merged length.
func mergeRow(aT []int32, aW []float64, bT []int32, bW []float64, outT []int32, outW []float64) int {
	m := 0
	put := func(t int32, w float64) {
		if outT != nil {
			outT[m], outW[m] = t, w
		}
		m++
	}
	a, b := 0, 0
	for a < len(aT) || b < len(bT) {
		switch {
		case b >= len(bT) || (a < len(aT) && aT[a] < bT[b]):
			put(aT[a], aW[a])
			a++
		case a >= len(aT) || bT[b] < aT[a]:
			put(bT[b], bW[b])
			b++
		default:
			put(aT[a], max(aW[a], bW[b]))
			a++
			b++
		}
	}
	return m
}

// sortByTarget sorts a row's parallel slices by target id.
func sortByTarget(ts []int32, ws []float64) {
	if len(ts) > 32 {
		sort.Sort(byTarget{parallelRows{ts, ws}})
		return
	}
	insertionSort(ts, ws, func(i, j int) bool { return ts[i] < ts[j] })
}

// insertionSort sorts short parallel slices (rows of up to 32 entries)
// without allocating: before(i, j) says whether entry i goes before entry
// j. It is small enough for the compiler to inline together with the
// literal passed as before, so each row sort compiles to its own loop with
// the comparison in place, as fast as writing the loop out by hand.
func insertionSort(ids []int32, ws []float64, before func(i, j int) bool) {
	for i := range ids {
		for j := i; j > 0 && before(j, j-1); j-- {
			ids[j], ids[j-1] = ids[j-1], ids[j]
			ws[j], ws[j-1] = ws[j-1], ws[j]
		}
	}
}

// parallelRows are an adjacency row's targets and weights, swapped
// together; byTarget and rankedPair order them two ways.
type parallelRows struct {
	ids []int32
	ws  []float64
}

func (r parallelRows) Len() int { return len(r.ids) }
func (r parallelRows) Swap(i, j int) {
	r.ids[i], r.ids[j] = r.ids[j], r.ids[i]
	r.ws[i], r.ws[j] = r.ws[j], r.ws[i]
}

// byTarget sorts a row by target.
type byTarget struct{ parallelRows }

func (b byTarget) Less(i, j int) bool { return b.ids[i] < b.ids[j] }
