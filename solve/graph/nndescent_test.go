package graph

import (
	"fmt"
	"testing"
)

// Recall targets: Dong, Charikar & Li (WWW 2011) report, in their
// abstract, typically above 90% recall; we require at least that on seeded data.

func denseTestRows(n, dim int, gaussian bool, seed uint64) *denseRows[float64] {
	x, d := standardize(clusteredVectors(n, dim, 20, seed), nil, n, dim)
	if !gaussian {
		normalizeRows(x, n, d)
	}
	return &denseRows[float64]{n: n, d: d, x: x, gaussian: gaussian}
}

// checkRecallTarget logs the recall of the approximate lists against the
// exact ones over all items and fails below the 0.9 target.
func checkRecallTarget(t *testing.T, approx, exact *neighborLists) {
	t.Helper()
	rec := listRecall(approx, exact, func(r int) int { return r })
	t.Logf("neighbour recall %.4f", rec)
	if rec < 0.9 {
		t.Errorf("recall %.4f < 0.9", rec)
	}
}

func TestNNDescentRecallVectors(t *testing.T) {
	for _, gaussian := range []bool{false, true} {
		t.Run(fmt.Sprintf("gaussian=%v", gaussian), func(t *testing.T) {
			r := denseTestRows(5000, 16, gaussian, 21)
			const k = 15
			checkRecallTarget(t, approxDense(r, k, 1), exactDense(r, k, nil))
		})
	}
}

func TestNNDescentRecallTags(t *testing.T) {
	tags := topicTags(5000, 500, 50, 5, 22)
	rows := tagRows(tags)
	const k = 15
	checkRecallTarget(t, approxSparse(rows, k, 1), exactSparse(rows, k, nil))
}
