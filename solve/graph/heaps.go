package graph

import "math"

// knnHeaps is NN-Descent's working graph: for every item a bounded pool of
// at most k neighbours kept as a worst-at-root heap, each entry flagged new
// until it has taken part in a local join.
type knnHeaps struct {
	k     int
	ids   []int32
	sims  []float64
	isNew []bool
	size  []int32
	// bar[v] is the entry a candidate must beat to enter v's pool: its root
	// when full, below everything otherwise. Kept apart so the hot
	// admission test touches one small record instead of three arrays.
	bar []poolBar
}

type poolBar struct {
	s  float64
	id int32
}

var openBar = poolBar{s: math.Inf(-1), id: math.MaxInt32}

func newKnnHeaps(n, k int) *knnHeaps {
	h := &knnHeaps{k: k, ids: make([]int32, n*k), sims: make([]float64, n*k), isNew: make([]bool, n*k), size: make([]int32, n), bar: make([]poolBar, n)}
	for v := range h.bar {
		h.bar[v] = openBar
	}
	return h
}

// pool returns v's entries (shared slices).
func (h *knnHeaps) pool(v int) ([]int32, []float64, []bool) {
	a := v * h.k
	b := a + int(h.size[v])
	return h.ids[a:b], h.sims[a:b], h.isNew[a:b]
}

// admits reports whether (s, id) would enter v's pool, ignoring whether id
// is already there. It only reads, so many goroutines may call it at once.
func (h *knnHeaps) admits(v int, s float64, id int32) bool {
	b := h.bar[v]
	return better(s, id, b.s, b.id)
}

// insert puts id into v's pool as a new entry when it is not v itself, not
// already there, and better than the worst kept entry (or the pool has
// room). It reports whether the pool changed.
func (h *knnHeaps) insert(v int, id int32, s float64) bool {
	if int(id) == v || !h.admits(v, s, id) {
		return false
	}
	ids, _, _ := h.pool(v)
	for _, x := range ids {
		if x == id {
			return false
		}
	}
	a := v * h.k
	m := int(h.size[v])
	if m < h.k {
		h.ids[a+m], h.sims[a+m], h.isNew[a+m] = id, s, true
		h.size[v]++
		h.siftUp(a, m)
	} else {
		h.ids[a], h.sims[a], h.isNew[a] = id, s, true
		h.siftDown(a, m, 0)
	}
	if int(h.size[v]) == h.k {
		h.bar[v] = poolBar{s: h.sims[a], id: h.ids[a]}
	}
	return true
}

func (h *knnHeaps) swap(a, i, j int) {
	h.ids[a+i], h.ids[a+j] = h.ids[a+j], h.ids[a+i]
	h.sims[a+i], h.sims[a+j] = h.sims[a+j], h.sims[a+i]
	h.isNew[a+i], h.isNew[a+j] = h.isNew[a+j], h.isNew[a+i]
}

// worseAt reports whether entry i of the pool at a ranks below entry j.
func (h *knnHeaps) worseAt(a, i, j int) bool {
	return better(h.sims[a+j], h.ids[a+j], h.sims[a+i], h.ids[a+i])
}

func (h *knnHeaps) siftUp(a, i int) {
	for i > 0 {
		p := (i - 1) / 2
		if !h.worseAt(a, i, p) {
			return
		}
		h.swap(a, i, p)
		i = p
	}
}

func (h *knnHeaps) siftDown(a, m, i int) {
	for {
		w := i
		if l := 2*i + 1; l < m && h.worseAt(a, l, w) {
			w = l
		}
		if r := 2*i + 2; r < m && h.worseAt(a, r, w) {
			w = r
		}
		if w == i {
			return
		}
		h.swap(a, i, w)
		i = w
	}
}

// lists returns every pool best first.
func (h *knnHeaps) lists() *neighborLists {
	n := len(h.size)
	l := &neighborLists{n: n, off: make([]int64, n+1)}
	for v := 0; v < n; v++ {
		ids, sims, _ := h.pool(v)
		start := len(l.ids)
		l.ids = append(l.ids, ids...)
		l.sims = append(l.sims, sims...)
		sortBestFirst(l.ids[start:], l.sims[start:])
		l.off[v+1] = int64(len(l.ids))
	}
	return l
}
