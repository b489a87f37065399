package graph

// sparseRows stores L2-normalised sparse vectors (one per item) in
// compressed rows: row i has term ids idx[off[i]:off[i+1]] in increasing
// order and their weights in val.
type sparseRows struct {
	n, nTerms int
	off       []int64
	idx       []int32
	val       []float64
}

func (s *sparseRows) row(i int) ([]int32, []float64) {
	a, b := s.off[i], s.off[i+1]
	return s.idx[a:b:b], s.val[a:b:b]
}

// sparseDot sums a·b over the shared terms in increasing term order. The
// inverted-index search accumulates the same products in the same order, so
// both give bit-identical similarities. The explicit conversion stops the
// compiler fusing multiply and add (FMA), which some platforms would do.
func sparseDot(ai []int32, av []float64, bi []int32, bv []float64) float64 {
	s := 0.0
	p, q := 0, 0
	for p < len(ai) && q < len(bi) {
		switch {
		case ai[p] < bi[q]:
			p++
		case ai[p] > bi[q]:
			q++
		default:
			s += float64(av[p] * bv[q])
			p++
			q++
		}
	}
	return s
}

// score is the similarity of items i and j (cosine of their rows).
func (s *sparseRows) score(i, j int) float64 {
	ai, av := s.row(i)
	bi, bv := s.row(j)
	return sparseDot(ai, av, bi, bv)
}

func (s *sparseRows) len() int { return s.n }

func (s *sparseRows) newRowScorer() rowScorer {
	return &sparseScorer{rows: s, dense: make([]float64, s.nTerms)}
}

// sparseScorer scatters the fixed row into a dense term array, so scoring
// another row is one branch-free pass over its terms. Terms the rows do not
// share add exactly +0, so the sum has the same bits as sparseDot's merge
// (same products, same increasing term order).
type sparseScorer struct {
	rows  *sparseRows
	dense []float64
	fixed int
}

func (c *sparseScorer) fix(i int) {
	c.fixed = i
	idx, val := c.rows.row(i)
	for p, t := range idx {
		c.dense[t] = val[p]
	}
}

func (c *sparseScorer) with(j int) float64 {
	idx, val := c.rows.row(j)
	s := 0.0
	for p, t := range idx {
		s += float64(c.dense[t] * val[p])
	}
	return s
}

func (c *sparseScorer) unfix() {
	idx, _ := c.rows.row(c.fixed)
	for _, t := range idx {
		c.dense[t] = 0
	}
}

// postings is the inverted index of sparseRows: for each term, the items
// holding it in increasing order, with their weights.
type postings struct {
	off   []int64
	items []int32
	val   []float64
}

func buildPostings(s *sparseRows) *postings {
	p := &postings{off: make([]int64, s.nTerms+1)}
	for _, t := range s.idx {
		p.off[t+1]++
	}
	for t := 0; t < s.nTerms; t++ {
		p.off[t+1] += p.off[t]
	}
	p.items = make([]int32, len(s.idx))
	p.val = make([]float64, len(s.idx))
	pos := append([]int64(nil), p.off[:s.nTerms]...)
	for i := 0; i < s.n; i++ {
		ids, vals := s.row(i)
		for k, t := range ids {
			p.items[pos[t]] = int32(i)
			p.val[pos[t]] = vals[k]
			pos[t]++
		}
	}
	return p
}

func (p *postings) list(t int32) ([]int32, []float64) {
	a, b := p.off[t], p.off[t+1]
	return p.items[a:b], p.val[a:b]
}

// sparseScratch is one worker's accumulator for the inverted-index search:
// acc[j] is valid only when stamp[j] equals the current row's mark, which
// saves clearing n entries per row.
type sparseScratch struct {
	acc     []float64
	stamp   []int32
	touched []int32
	top     *topK
}

// exactSparse finds, for each listed item (all when items is nil), its k
// most similar items (k = 0: every item with a positive similarity), only
// ever looking at items that share a term with it. Cost Σ_t df_t²; memory
// O(n) per worker plus the output.
func exactSparse(s *sparseRows, k int, items []int32) *neighborLists {
	post := buildPostings(s)
	newState := func() *sparseScratch {
		return &sparseScratch{acc: make([]float64, s.n), stamp: make([]int32, s.n), top: newTopK(k)}
	}
	return computeRows(s.n, items, newState, func(w *sparseScratch, i int, ids []int32, sims []float64) ([]int32, []float64) {
		mark := int32(i + 1)
		// The scratch slices live in locals through the hot loop, so the
		// compiler neither reloads them nor re-checks vs's bounds.
		acc, stamp, touched := w.acc, w.stamp, w.touched[:0]
		ti, tv := s.row(i)
		tv = tv[:len(ti)]
		for p, t := range ti {
			x := tv[p]
			js, vs := post.list(t)
			vs = vs[:len(js)]
			for q, j := range js {
				if stamp[j] != mark {
					stamp[j] = mark
					acc[j] = 0
					touched = append(touched, j)
				}
				acc[j] += float64(x * vs[q])
			}
		}
		w.touched = touched
		if k == 0 {
			for _, j := range w.touched {
				if int(j) != i && w.acc[j] > 0 {
					ids = append(ids, j)
					sims = append(sims, w.acc[j])
				}
			}
			return ids, sims
		}
		for _, j := range w.touched {
			if int(j) != i && w.top.admits(w.acc[j], j) {
				w.top.push(w.acc[j], j)
			}
		}
		return w.top.appendBestFirst(ids, sims)
	})
}
