// Package match pairs the clusters of two versions of a taxonomy by their
// overlap: the maximum-weight assignment on Jaccard values that diff's
// category matching, the name carrying of solve/naming and concept's
// identifiers share. It imports only the standard library.
package match

import (
	"fmt"
	"slices"
)

// Pair is one old cluster matched to one new cluster, with their Jaccard
// overlap |old ∩ new| / |old ∪ new|.
type Pair struct {
	Old, New int
	Jaccard  float64
}

// Clusters pairs old clusters with new ones so that the total Jaccard
// overlap is as large as possible — a maximum-weight bipartite matching
// (H. W. Kuhn, "The Hungarian method for the assignment problem", Naval
// Res. Logist. Q. 2, 1955; J. Munkres, "Algorithms for the assignment and
// transportation problems", J. SIAM 5, 1957) — and then keeps the pairs
// whose overlap is at least minJaccard. The threshold is applied after
// matching, by design: a weak pair still takes part in the optimum, and a
// cluster whose best partner is taken elsewhere is left unmatched rather
// than given a worse partner that would lower the total.
//
// old and new hold leaf sets, each sorted ascending without repeats. Only
// pairs that share a leaf are candidates, found through an inverted index
// in time Σ_leaves (#old sets holding it × #new sets holding it).
//
// Ties are broken deterministically: weights are Jaccard values rounded to
// 2⁻³⁰; among matchings of equal total weight the one with the larger sum
// of squared weights wins (it prefers one strong pair to two middling
// ones), and any tie left is decided by the fixed order of the search (old
// clusters in index order, the smaller index first on equal distance).
//
// The assignment is solved by successive shortest augmenting paths with
// node potentials (the Hungarian method in the sparse form of Jonker &
// Volgenant 1987), each old cluster also having a private "unmatched"
// option of weight 0. Every search starts at one old cluster and stops at
// the first free partner, so it stays inside its component of the
// candidate graph; the worst case is O(k·(E + k) log k) for a component
// with k clusters and E candidate pairs, and on two versions of a
// taxonomy most searches end after one step.
//
// The result is sorted by Old.
func Clusters(old, new [][]int32, minJaccard float64) []Pair {
	cand := FindCandidates(old, new, nil)
	matchOf := Assign(len(old), len(new), cand)
	var out []Pair
	for r, e := range matchOf {
		if e < 0 {
			continue
		}
		c := cand.Edges[e]
		j := float64(c.Inter) / float64(c.Union)
		if j >= minJaccard {
			out = append(out, Pair{Old: r, New: int(c.Col), Jaccard: j})
		}
	}
	return out
}

// Candidate is a pair of clusters that share at least one leaf: the new
// cluster Col and the sizes of their intersection and union.
type Candidate struct {
	Col          int32
	Inter, Union int64
	w            cost // 2·scale − weight, lexicographic (see weightCost)
}

// Candidates is the candidate pairs in compressed rows: the pairs of
// old cluster r are Edges[Start[r]:Start[r+1]], by increasing column.
type Candidates struct {
	Start []int
	Edges []Candidate
}

func checkSorted(sets [][]int32, which string) int32 {
	top := int32(-1)
	for i, s := range sets {
		for k, v := range s {
			if v < 0 || k > 0 && v <= s[k-1] {
				panic(fmt.Sprintf("match: %s cluster %d is not sorted without repeats", which, i))
			}
		}
		if len(s) > 0 {
			top = max(top, s[len(s)-1])
		}
	}
	return top
}

// FindCandidates lists the pairs of clusters that share leaves. differ, if not
// nil, marks pairs that a third criterion should avoid when the weights
// tie (Compare: pairs whose names differ).
func FindCandidates(old, new [][]int32, differ func(r, c int) bool) Candidates {
	top := max(checkSorted(old, "old"), checkSorted(new, "new"))
	// Inverted index of the new sets: holders[leafStart[l]:leafStart[l+1]].
	leafStart := make([]int, top+2)
	for _, s := range new {
		for _, l := range s {
			leafStart[l+1]++
		}
	}
	for l := 1; l < len(leafStart); l++ {
		leafStart[l] += leafStart[l-1]
	}
	holders := make([]int32, leafStart[len(leafStart)-1])
	fill := slices.Clone(leafStart)
	for j, s := range new {
		for _, l := range s {
			holders[fill[l]] = int32(j)
			fill[l]++
		}
	}
	g := Candidates{Start: make([]int, len(old)+1)}
	count := make([]int64, len(new))
	var touched []int32
	for r, s := range old {
		touched = touched[:0]
		for _, l := range s {
			for _, j := range holders[leafStart[l]:leafStart[l+1]] {
				if count[j] == 0 {
					touched = append(touched, j)
				}
				count[j]++
			}
		}
		slices.Sort(touched)
		for _, j := range touched {
			inter := count[j]
			union := int64(len(s)) + int64(len(new[j])) - inter
			w := weightCost(inter, union)
			if differ != nil && differ(r, int(j)) {
				w.c = 1
			}
			g.Edges = append(g.Edges, Candidate{Col: j, Inter: inter, Union: union, w: w})
			count[j] = 0
		}
		g.Start[r+1] = len(g.Edges)
	}
	return g
}

// weightScale is the resolution of the matching weights, 2³⁰.
const weightScale = 1 << 30

// weightCost turns a Jaccard value into a cost to minimise: the rounded
// weight q = J·2³⁰ and its square q² (rescaled) become the cost
// (2³⁰ − q, 2³⁰ − q², 0), compared lexicographically. Integer arithmetic
// makes ties exact and the result the same on every platform.
func weightCost(inter, union int64) cost {
	q := (inter<<30 + union/2) / union
	q2 := (q*q + weightScale/2) >> 30
	return cost{weightScale - q, weightScale - q2, 0}
}

// unmatchedCost is the cost of leaving an old cluster without a partner:
// the cost of a pair of weight 0 that a tie-break would avoid.
var unmatchedCost = cost{weightScale, weightScale, 1}
