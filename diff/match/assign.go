package match

// Assign solves the assignment behind Clusters: every old cluster
// (row) is matched to a new cluster (column) or to its private "unmatched"
// column, at least total cost. It returns, per row, the index in g.Edges of
// its pair, or -1 when the row stays unmatched.
//
// Successive shortest paths with potentials: reduced costs
// w + potRow[r] − potCol[c] stay ≥ 0 (matched pairs at 0), Dijkstra from a
// free row finds the nearest free column at reduced distance D, settled
// vertices v get pot[v] += dist[v] − D (which keeps every reduced cost
// non-negative and makes the path tight), and the path is flipped.
func Assign(rows, cols int, g Candidates) []int {
	s := &assignment{
		g:        g,
		rows:     rows,
		cols:     cols,
		potRow:   make([]cost, rows),
		potCol:   make([]cost, cols+rows),
		colOfRow: make([]int32, rows),
		rowOfCol: make([]int32, cols+rows),
		edgeOf:   make([]int, rows),
		distRow:  make([]cost, rows),
		distCol:  make([]cost, cols+rows),
		fromRow:  make([]int32, cols+rows),
		fromEdge: make([]int, cols+rows),
		doneRow:  make([]bool, rows),
		doneCol:  make([]bool, cols+rows),
	}
	for i := range s.colOfRow {
		s.colOfRow[i], s.edgeOf[i], s.distRow[i] = -1, -1, infCost
	}
	for i := range s.rowOfCol {
		s.rowOfCol[i], s.distCol[i] = -1, infCost
	}
	for r := range rows {
		if g.Start[r] < g.Start[r+1] {
			s.augment(int32(r))
		}
	}
	return s.edgeOf
}

type assignment struct {
	g          Candidates
	rows, cols int

	potRow, potCol []cost
	colOfRow       []int32 // -1 while unmatched
	rowOfCol       []int32
	edgeOf         []int // the pair each row is matched by; -1 for none

	// Search state, reset after every augmentation.
	distRow, distCol []cost
	fromRow          []int32 // the row a column was reached from
	fromEdge         []int   // through which pair (-1: the private column)
	doneRow, doneCol []bool
	touchedRow       []int32
	touchedCol       []int32
	heap             costHeap
}

// dummy is the private "unmatched" column of row r.
func (s *assignment) dummy(r int32) int32 { return int32(s.cols) + r }

func (s *assignment) reachCol(c, r int32, e int, d cost) {
	if s.doneCol[c] || !d.less(s.distCol[c]) {
		return
	}
	if s.distCol[c] == infCost {
		s.touchedCol = append(s.touchedCol, c)
	}
	s.distCol[c], s.fromRow[c], s.fromEdge[c] = d, r, e
	s.heap.push(heapItem{d, int32(s.rows) + c})
}

func (s *assignment) augment(src int32) {
	s.distRow[src] = cost{}
	s.touchedRow = append(s.touchedRow, src)
	s.heap.push(heapItem{cost{}, src})
	target := int32(-1)
	var reach cost
	for s.heap.len() > 0 && target < 0 {
		it := s.heap.pop()
		if it.v < int32(s.rows) {
			r := it.v
			if s.doneRow[r] || it.d != s.distRow[r] {
				continue
			}
			s.doneRow[r] = true
			base := s.distRow[r].add(s.potRow[r])
			for e := s.g.Start[r]; e < s.g.Start[r+1]; e++ {
				c := s.g.Edges[e].Col
				s.reachCol(c, r, e, base.add(s.g.Edges[e].w).sub(s.potCol[c]))
			}
			c := s.dummy(r)
			s.reachCol(c, r, -1, base.add(unmatchedCost).sub(s.potCol[c]))
			continue
		}
		c := it.v - int32(s.rows)
		if s.doneCol[c] || it.d != s.distCol[c] {
			continue
		}
		s.doneCol[c] = true
		r := s.rowOfCol[c]
		if r < 0 {
			target, reach = c, s.distCol[c]
			break
		}
		// A matched pair has reduced cost 0 back to its row.
		if s.distRow[r] == infCost {
			s.touchedRow = append(s.touchedRow, r)
		}
		s.distRow[r] = s.distCol[c]
		s.heap.push(heapItem{s.distRow[r], r})
	}
	// Potentials: settled vertices move by dist − D, the others stay.
	for _, r := range s.touchedRow {
		if s.doneRow[r] {
			s.potRow[r] = s.potRow[r].add(minCost(s.distRow[r], reach)).sub(reach)
		}
	}
	for _, c := range s.touchedCol {
		if s.doneCol[c] {
			s.potCol[c] = s.potCol[c].add(minCost(s.distCol[c], reach)).sub(reach)
		}
	}
	// Flip the path from target back to src.
	for c := target; ; {
		r := s.fromRow[c]
		prev := s.colOfRow[r]
		s.colOfRow[r], s.rowOfCol[c] = c, r
		s.edgeOf[r] = s.fromEdge[c]
		if r == src {
			break
		}
		c = prev
	}
	for _, r := range s.touchedRow {
		s.distRow[r], s.doneRow[r] = infCost, false
	}
	for _, c := range s.touchedCol {
		s.distCol[c], s.doneCol[c] = infCost, false
	}
	s.touchedRow, s.touchedCol = s.touchedRow[:0], s.touchedCol[:0]
	s.heap.items = s.heap.items[:0]
}

// heapItem is a vertex (rows first, then columns) at a tentative distance.
type heapItem struct {
	d cost
	v int32
}

// costHeap is a binary min-heap ordered by distance, then vertex, so that
// the search order — and with it every tie — is fixed.
type costHeap struct{ items []heapItem }

func (h *costHeap) len() int { return len(h.items) }

func before(a, b heapItem) bool {
	if a.d != b.d {
		return a.d.less(b.d)
	}
	return a.v < b.v
}

func (h *costHeap) push(it heapItem) {
	h.items = append(h.items, it)
	i := len(h.items) - 1
	for i > 0 {
		p := (i - 1) / 2
		if !before(h.items[i], h.items[p]) {
			break
		}
		h.items[i], h.items[p] = h.items[p], h.items[i]
		i = p
	}
}

func (h *costHeap) pop() heapItem {
	top := h.items[0]
	last := len(h.items) - 1
	h.items[0] = h.items[last]
	h.items = h.items[:last]
	i := 0
	for {
		l, r, m := 2*i+1, 2*i+2, i
		if l < last && before(h.items[l], h.items[m]) {
			m = l
		}
		if r < last && before(h.items[r], h.items[m]) {
			m = r
		}
		if m == i {
			return top
		}
		h.items[i], h.items[m] = h.items[m], h.items[i]
		i = m
	}
}
