package solve

// maxAddTree is a segment tree over positions with range add and range
// maximum.
type maxAddTree struct {
	n        int
	mx, lazy []int
}

func newMaxAddTree(vals []int) *maxAddTree {
	n := len(vals)
	s := &maxAddTree{n: n, mx: make([]int, 4*n), lazy: make([]int, 4*n)}
	var build func(node, lo, hi int)
	build = func(node, lo, hi int) {
		if hi-lo == 1 {
			s.mx[node] = vals[lo]
			return
		}
		mid := (lo + hi) / 2
		build(2*node, lo, mid)
		build(2*node+1, mid, hi)
		s.mx[node] = max(s.mx[2*node], s.mx[2*node+1])
	}
	build(1, 0, n)
	return s
}

func (s *maxAddTree) add(lo, hi, d int) { s.addRange(1, 0, s.n, lo, hi, d) }

func (s *maxAddTree) addRange(node, nlo, nhi, lo, hi, d int) {
	if hi <= nlo || nhi <= lo {
		return
	}
	if lo <= nlo && nhi <= hi {
		s.mx[node] += d
		s.lazy[node] += d
		return
	}
	mid := (nlo + nhi) / 2
	s.addRange(2*node, nlo, mid, lo, hi, d)
	s.addRange(2*node+1, mid, nhi, lo, hi, d)
	s.mx[node] = max(s.mx[2*node], s.mx[2*node+1]) + s.lazy[node]
}

func (s *maxAddTree) max(lo, hi int) int { return s.query(1, 0, s.n, lo, hi) }

func (s *maxAddTree) query(node, nlo, nhi, lo, hi int) int {
	if hi <= nlo || nhi <= lo {
		return -1 << 40 // below any depth, and safe to add to
	}
	if lo <= nlo && nhi <= hi {
		return s.mx[node]
	}
	mid := (nlo + nhi) / 2
	return max(s.query(2*node, nlo, mid, lo, hi), s.query(2*node+1, mid, nhi, lo, hi)) + s.lazy[node]
}
