package graph

import "sort"

// better reports whether candidate (s1, id1) ranks above (s2, id2): a higher
// score first, and on equal scores the smaller item index. This total order
// makes "the k best" a well-defined set whatever order candidates arrive in.
func better(s1 float64, id1 int32, s2 float64, id2 int32) bool {
	return s1 > s2 || (s1 == s2 && id1 < id2)
}

// topK keeps the k best candidates seen so far in a binary heap whose root
// is the worst kept candidate, so a candidate that cannot enter is rejected
// with one comparison.
type topK struct {
	k    int
	ids  []int32
	sims []float64
}

func newTopK(k int) *topK {
	return &topK{k: k, ids: make([]int32, 0, k), sims: make([]float64, 0, k)}
}

func (h *topK) reset() {
	h.ids = h.ids[:0]
	h.sims = h.sims[:0]
}

// admits reports whether (s, id) would enter the kept set.
func (h *topK) admits(s float64, id int32) bool {
	return len(h.ids) < h.k || better(s, id, h.sims[0], h.ids[0])
}

// push offers a candidate; the caller guarantees ids are not repeated.
func (h *topK) push(s float64, id int32) {
	if len(h.ids) < h.k {
		h.ids = append(h.ids, id)
		h.sims = append(h.sims, s)
		siftUp(h.ids, h.sims, len(h.ids)-1)
		return
	}
	if !better(s, id, h.sims[0], h.ids[0]) {
		return
	}
	h.ids[0], h.sims[0] = id, s
	siftDown(h.ids, h.sims, 0)
}

// appendBestFirst appends the kept candidates, best first, and empties h.
func (h *topK) appendBestFirst(ids []int32, sims []float64) ([]int32, []float64) {
	start := len(ids)
	ids = append(ids, h.ids...)
	sims = append(sims, h.sims...)
	sortBestFirst(ids[start:], sims[start:])
	h.reset()
	return ids, sims
}

// The heap helpers order a worst-at-root heap over parallel slices.

func siftUp(ids []int32, sims []float64, i int) {
	for i > 0 {
		p := (i - 1) / 2
		if !better(sims[p], ids[p], sims[i], ids[i]) {
			return
		}
		ids[p], ids[i] = ids[i], ids[p]
		sims[p], sims[i] = sims[i], sims[p]
		i = p
	}
}

func siftDown(ids []int32, sims []float64, i int) {
	n := len(ids)
	for {
		w := i
		l, r := 2*i+1, 2*i+2
		if l < n && better(sims[w], ids[w], sims[l], ids[l]) {
			w = l
		}
		if r < n && better(sims[w], ids[w], sims[r], ids[r]) {
			w = r
		}
		if w == i {
			return
		}
		ids[w], ids[i] = ids[i], ids[w]
		sims[w], sims[i] = sims[i], sims[w]
		i = w
	}
}

// sortBestFirst sorts parallel slices by the ranking order. Usual rows are
// short (k entries) and take an allocation-free insertion sort; long rows
// (all-pairs mode) take the library sort.
func sortBestFirst(ids []int32, sims []float64) {
	if len(ids) > 32 {
		sort.Sort(rankedPair{parallelRows{ids, sims}})
		return
	}
	insertionSort(ids, sims, func(i, j int) bool { return better(sims[i], ids[i], sims[j], ids[j]) })
}

// rankedPair sorts parallel id/score slices best first.
type rankedPair struct{ parallelRows }

func (r rankedPair) Less(i, j int) bool {
	return better(r.ws[i], r.ids[i], r.ws[j], r.ids[j])
}
