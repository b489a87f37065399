package diff

import (
	"math/rand/v2"

	"github.com/ramify-tax/ramify/solve/hier"
)

// tripletCounts are the numbers of leaf triples by how two trees resolve
// them, from which the agreement follows.
type tripletCounts struct {
	total       int64 // C(n, 3)
	sameSplit   int64 // resolved the same way in both (S)
	resolvedA   int64 // resolved in the first tree
	resolvedB   int64 // resolved in the second tree
	resolvedAll int64 // resolved in both, either way
}

// agreeing is the number of triples with the same topology in both trees:
// resolved alike, or unresolved in both. By inclusion–exclusion the triples
// unresolved in both are total − resolvedA − resolvedB + resolvedAll.
func (c tripletCounts) agreeing() int64 {
	return c.sameSplit + c.total - c.resolvedA - c.resolvedB + c.resolvedAll
}

// countTriplets counts triples of leaves by how x and y resolve them in
// O(n² log d) time and O(n) memory, d the depth of y.
//
// For a pair {a, b} let A = L_x(lca_x(a,b)) and B = L_y(lca_y(a,b)). A third
// leaf c makes ab the resolved pair ("cherry") of {a,b,c} in x exactly when
// c ∉ A, so each triple resolved in x is counted once by its cherry, and
//
//	sameSplit = Σ_{a<b} (n − |A ∪ B|)   resolvedA = Σ_{a<b} (n − |A|).
//
// A triple with cherry ab in x is resolved in y when c ∉ B (cherry ab
// there too) or c lies in P_a or P_b, the children of lca_y(a,b) that hold a
// and b (cherries ac or bc). Hence
//
//	resolvedAll = Σ_{a<b} [(n − |A ∪ B|) + |P_a \ A| + |P_b \ A|].
//
// Summing over ordered pairs turns the last two terms into one, 2·|P_a \ A|.
// Fixing a, every other leaf c gets its level k(c) on a's root path in x and
// l(c) on a's root path in y; |A ∩ B| and |A ∩ P_a| are then the numbers of
// leaves with k ≤ k(b) and l ≤ l(b) (or l(b) − 1), answered by a Fenwick
// tree over l while the leaves are added in order of k.
func countTriplets(x, y treeIndex) tripletCounts {
	n := x.N
	c := tripletCounts{total: choose3(int64(n))}
	if n < 3 {
		return c
	}
	levelY := make([]int32, n)
	sizeY := make([]int32, 0, 64)
	var pathX, pathY []int32
	var fen fenwick
	var twoSame, twoA, twoB, twoAll int64
	nn := int64(n)
	for a := int32(0); a < int32(n); a++ {
		pathY = y.ancestors(a, pathY)
		y.labelLevels(pathY, levelY)
		sizeY = sizeY[:0]
		for _, v := range pathY {
			sizeY = append(sizeY, y.Size(v))
		}
		pathX = x.ancestors(a, pathX)
		fen.reset(len(pathY))
		fen.add(0) // a itself is in every set on both paths
		for k := 1; k < len(pathX); k++ {
			x.eachNewlyCovered(pathX, k, func(b int32) { fen.add(levelY[b]) })
			sizeA := int64(x.Size(pathX[k]))
			x.eachNewlyCovered(pathX, k, func(b int32) {
				l := levelY[b]
				inter := int64(fen.atMost(l))      // |A ∩ B|
				interP := int64(fen.atMost(l - 1)) // |A ∩ P_a|
				sizeB, sizeP := int64(sizeY[l]), int64(sizeY[l-1])
				outside := nn - sizeA - sizeB + inter // leaves in neither
				twoSame += outside
				twoA += nn - sizeA
				twoB += nn - sizeB
				twoAll += outside + 2*(sizeP-interP)
			})
		}
	}
	c.sameSplit, c.resolvedA, c.resolvedB, c.resolvedAll = twoSame/2, twoA/2, twoB/2, twoAll/2
	return c
}

// tripletTopology codes how t resolves the leaves {p, q, r}: 1 for pq|r,
// 2 for pr|q, 3 for qr|p, 0 for unresolved. Of the three pairwise lowest
// common ancestors, two are the lca of all three; the third, if different,
// lies below it and names the cherry.
func tripletTopology(t *hier.LCAIndex, p, q, r int32) int {
	pq, pr, qr := t.LCA(p, q), t.LCA(p, r), t.LCA(q, r)
	switch {
	case pq == pr && pr == qr:
		return 0
	case pr == qr:
		return 1
	case pq == qr:
		return 2
	default:
		return 3
	}
}

// sampleTriplets draws samples uniformly random 3-subsets of the leaves
// (with replacement between draws) and counts them as countTriplets does:
// total is the number of draws, sameSplit those resolved alike, resolvedA
// and resolvedB those each tree resolves, and agreeing() those with the
// same topology in both trees.
func sampleTriplets(x, y *hier.LCAIndex, n, samples int, seed uint64) tripletCounts {
	rng := rand.New(rand.NewPCG(seed, samplingStream))
	c := tripletCounts{total: int64(samples)}
	for range samples {
		p := int32(rng.IntN(n))
		q := int32(rng.IntN(n - 1))
		if q >= p {
			q++
		}
		r := int32(rng.IntN(n - 2))
		lo, hi := min(p, q), max(p, q)
		if r >= lo {
			r++
		}
		if r >= hi {
			r++
		}
		tx, ty := tripletTopology(x, p, q, r), tripletTopology(y, p, q, r)
		if tx != 0 {
			c.resolvedA++
		}
		if ty != 0 {
			c.resolvedB++
		}
		if tx != 0 && ty != 0 {
			c.resolvedAll++
			if tx == ty {
				c.sameSplit++
			}
		}
	}
	return c
}

// samplingStream is the second PCG word for triplet sampling, fixed so that
// a seed alone decides the draws.
const samplingStream = 0x7472697031 // "trip1"
