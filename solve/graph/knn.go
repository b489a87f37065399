package graph

// This file routes each source to exact or approximate neighbour search.

// effectiveK is the list length searched for: K clamped to n-1, with 0
// standing for all pairs.
func effectiveK(k, n int) int {
	if k >= n-1 {
		return max(n-1, 0)
	}
	return k
}

// approximate reports whether to use NN-Descent for n items keeping k.
func (b Builder) approximate(n, k int) bool {
	if k == 0 || k >= n-1 {
		return false
	}
	switch b.Search {
	case SearchExact:
		return false
	case SearchApprox:
		return true
	}
	return n > ExactLimit
}

// sparseGraph is the kNN graph of cosine similarity between sparse rows,
// exact through the inverted index or by NN-Descent.
func (b Builder) sparseGraph(rows *sparseRows) (*CSR, error) {
	if err := b.checkK(rows.n); err != nil {
		return nil, err
	}
	k := effectiveK(b.K, rows.n)
	var lists *neighborLists
	if b.approximate(rows.n, k) {
		lists = approxSparse(rows, k, b.Seed)
	} else {
		lists = exactSparse(rows, k, nil)
	}
	return symmetrize(cosineWeight, lists), nil
}

// cosineWeight keeps positive cosines as edge weights; the rest are not
// edges.
func cosineWeight(_ int, _ int32, score float64) float64 {
	return max(score, 0)
}

// denseLists searches k neighbours per item, exactly or by NN-Descent.
func denseLists[T Float](b Builder, r *denseRows[T], k int) *neighborLists {
	if b.approximate(r.n, k) {
		return approxDense(r, k, b.Seed)
	}
	return exactDense(r, k, nil)
}

// approxSparse is NN-Descent on sparse rows. Similarities between tag sets
// and short texts take few distinct values, and the plateaus slow the
// local search down; keeping half as many candidates again as needed and
// returning the best k raised the measured recall on topic-clustered tag
// sets from 0.94 to 0.98 at 20,000 items (see the benchmarks).
func approxSparse(rows *sparseRows, k int, seed uint64) *neighborLists {
	pool := k + (k+1)/2
	if pool >= rows.n-1 {
		return exactSparse(rows, k, nil)
	}
	lists := nnDescent(rows, sparseInit(rows), nnDescentParams{k: pool, seed: seed, positiveOnly: true})
	return truncateRows(lists, k)
}

// approxDense is NN-Descent on dense points from random first guesses.
func approxDense[T Float](r *denseRows[T], k int, seed uint64) *neighborLists {
	return nnDescent(r, randomInit, nnDescentParams{k: k, seed: seed, positiveOnly: !r.gaussian})
}
