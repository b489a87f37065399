package loop

import (
	"cmp"
	"slices"

	"github.com/ramify-tax/ramify/solve"
)

// lcaDepths is the depth of the lowest common ancestor of every pair of
// leaves of a tree, row-major over n×n (the diagonal is unused). A leaf the
// tree does not reach meets every other leaf at depth 0.
func lcaDepths(t *solve.Tree) []int16 {
	n := t.N
	d := make([]int16, n*n)
	var walk func(v int32, depth int16) []int32
	walk = func(v int32, depth int16) []int32 {
		if t.IsLeaf(v) {
			return []int32{v}
		}
		var below []int32
		for _, k := range t.Kids[v] {
			sub := walk(k, depth+1)
			for _, a := range below {
				for _, b := range sub {
					d[int(a)*n+int(b)] = depth
					d[int(b)*n+int(a)] = depth
				}
			}
			below = append(below, sub...)
		}
		return below
	}
	walk(t.Root, 0)
	return d
}

// topology of the leaves a < b < c from a depth table: 0 unresolved, 1
// ab|c, 2 ac|b, 3 bc|a (the pair whose lowest common ancestor lies
// strictly deepest).
func topology(d []int16, n, a, b, c int) int8 {
	ab, ac, bc := d[a*n+b], d[a*n+c], d[b*n+c]
	switch {
	case ab > ac && ab > bc:
		return 1
	case ac > ab && ac > bc:
		return 2
	case bc > ab && bc > ac:
		return 3
	}
	return 0
}

// roundCounts compares the trees before and after a round with the
// reference over every triple of items the reference resolves.
type roundCounts struct {
	resolved int // triples the reference resolves
	// repaired: wrong before, right after; broken: right before, wrong after.
	repaired, broken int
	// wrongWith[x] counts the resolved triples holding x that after gets
	// wrong; triplesWith[x] counts the resolved triples holding x.
	wrongWith, triplesWith []int
	wrong                  int // resolved triples after gets wrong
}

// compareTriples walks every triple once: O(n³) with three table reads per
// tree, which is a second or so at the 600 items of the largest dev set.
func compareTriples(ref, before, after *solve.Tree) roundCounts {
	n := ref.N
	dr, db, da := lcaDepths(ref), lcaDepths(before), lcaDepths(after)
	rc := roundCounts{wrongWith: make([]int, n), triplesWith: make([]int, n)}
	for a := 0; a < n; a++ {
		for b := a + 1; b < n; b++ {
			for c := b + 1; c < n; c++ {
				r := topology(dr, n, a, b, c)
				if r == 0 {
					continue
				}
				rc.resolved++
				okB := topology(db, n, a, b, c) == r
				okA := topology(da, n, a, b, c) == r
				switch {
				case okA && !okB:
					rc.repaired++
				case okB && !okA:
					rc.broken++
				}
				rc.triplesWith[a]++
				rc.triplesWith[b]++
				rc.triplesWith[c]++
				if !okA {
					rc.wrong++
					rc.wrongWith[a]++
					rc.wrongWith[b]++
					rc.wrongWith[c]++
				}
			}
		}
	}
	return rc
}

// misplaced marks the items whose triples the tree gets wrong more often
// than its triples overall: the items an editor would have to move.
func (rc roundCounts) misplaced() []bool {
	out := make([]bool, len(rc.wrongWith))
	if rc.resolved == 0 {
		return out
	}
	overall := float64(rc.wrong) / float64(rc.resolved)
	for x := range out {
		if rc.triplesWith[x] > 0 {
			out[x] = float64(rc.wrongWith[x])/float64(rc.triplesWith[x]) > overall
		}
	}
	return out
}

// AUC is the area under the ROC curve of score for predicting positive:
// the probability that a random positive scores above a random negative,
// ties counting one half (the Mann–Whitney U statistic over n₊·n₋; Hanley
// & McNeil, Radiology 1982). It is 0.5 when either class is empty. A NaN
// score ranks below every number, tied with any other NaN.
func AUC(score []float64, positive []bool) float64 {
	idx := make([]int, len(score))
	for i := range idx {
		idx[i] = i
	}
	// cmp.Compare puts a NaN below every number and equal to another NaN,
	// so an undefined score ranks lowest instead of breaking the order.
	slices.SortFunc(idx, func(a, b int) int {
		if c := cmp.Compare(score[a], score[b]); c != 0 {
			return c
		}
		return a - b
	})
	// Rank sum of the positives, with tied scores sharing their mean rank.
	var pos, neg int
	rankSum := 0.0
	for i := 0; i < len(idx); {
		j := i + 1
		for j < len(idx) && cmp.Compare(score[idx[j]], score[idx[i]]) == 0 {
			j++
		}
		mean := float64(i+j+1) / 2 // ranks i+1 .. j
		for k := i; k < j; k++ {
			if positive[idx[k]] {
				pos++
				rankSum += mean
			} else {
				neg++
			}
		}
		i = j
	}
	if pos == 0 || neg == 0 {
		return 0.5
	}
	return (rankSum - float64(pos)*float64(pos+1)/2) / (float64(pos) * float64(neg))
}
