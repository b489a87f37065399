package diff

import (
	"fmt"

	"github.com/ramify-tax/ramify/review/bounds"
	"github.com/ramify-tax/ramify/solve/hier"
)

// TripletAgreement is the share of the C(n, 3) leaf triples whose induced
// topology — ab|c, ac|b, bc|a or unresolved — is the same in both trees:
// 1 − d/C(n,3) for the rooted triplet distance d of Critchlow, Pearl & Qian
// (1996). Both trees are over the leaves 0..n−1, binary or multiway; single-
// child nodes change nothing. With fewer than three leaves there is nothing
// to disagree on and the agreement is 1.
//
// The count is exact, in O(n² log d) time for depth d and O(n) memory:
// triples resolved the same way in both trees by counting, for each pair,
// the leaves outside both its lca clusters (derived in countTriplets and
// checked against brute force), plus the triples unresolved in both by
// inclusion–exclusion
// (see countTriplets). For large n use TripletAgreementSampled.
// It panics if the trees are over different numbers of leaves or malformed.
func TripletAgreement(a, b *hier.Tree) float64 {
	mustMatch(a, b)
	if a.N < 3 {
		return 1
	}
	c := countTriplets(newTreeIndex(a), newTreeIndex(b))
	return float64(c.agreeing()) / float64(c.total)
}

// TripletAgreementSampled estimates TripletAgreement from samples triples
// drawn uniformly at random (with replacement) by a PCG generator seeded
// with seed, and returns the estimate with its exact 95% Clopper–Pearson
// interval. Each sample costs O(1) after O(m log m) preparation; 10,000
// samples give an interval about ±0.01 wide at worst. With fewer than three
// leaves it returns 1, 1, 1. It panics if samples < 1.
func TripletAgreementSampled(a, b *hier.Tree, samples int, seed uint64) (est, lo, hi float64) {
	mustMatch(a, b)
	if samples < 1 {
		panic(fmt.Sprintf("diff: %d triplet samples", samples))
	}
	if a.N < 3 {
		return 1, 1, 1
	}
	x, y := newTreeIndex(a), newTreeIndex(b)
	agree := int(sampleTriplets(x.WithLCA(), y.WithLCA(), a.N, samples, seed).agreeing())
	lo, hi = bounds.ClopperPearson(agree, samples, 0.95)
	return float64(agree) / float64(samples), lo, hi
}

// RF is the rooted Robinson–Foulds distance (Robinson & Foulds 1981): the
// number of non-trivial clusters — leaf sets of at least two leaves and not
// all of them — found in one tree but not the other, |C(a) Δ C(b)|.
// Clusters repeated along single-child chains count once.
//
// normalized divides by |C(a)| + |C(b)|, so it runs from 0 (same clusters)
// to 1 (none shared); it is 0 when neither tree has a non-trivial cluster.
// (Some tools halve the distance instead; ramify does not.) Two binary trees
// on n leaves are at most 2(n−2) apart.
//
// Clusters are hashed in O(n) (XOR of random per-leaf keys) and every hash
// match is confirmed as set equality, so the result is exact.
func RF(a, b *hier.Tree) (dist int, normalized float64) {
	mustMatch(a, b)
	x, y := newTreeIndex(a), newTreeIndex(b)
	na, nb, shared := rfCounts(a, b, x, y)
	dist = na + nb - 2*shared
	if na+nb > 0 {
		normalized = float64(dist) / float64(na+nb)
	}
	return dist, normalized
}

// CopheneticCorrelation is Pearson's correlation, over all leaf pairs
// {i, j}, between |L(lca(i, j))| in a and in b (Sokal & Rohlf 1962, with
// the lca's size as cophenetic value because taxonomies carry no heights;
// it is the quantity Dasgupta's cost weighs). ok is false when either
// vector is constant (for instance a star, or fewer than three leaves) and
// the correlation is undefined.
//
// The sums are exact integers; shallow trees take time proportional to the
// number of intersecting node pairs, deep ones O(n²).
func CopheneticCorrelation(a, b *hier.Tree) (float64, bool) {
	mustMatch(a, b)
	return cophenetic(a, b, newTreeIndex(a), newTreeIndex(b))
}

// TripletScores compares a tree with a reference over the same leaves by
// the triples each resolves (a rooted tree resolves {a,b,c} as the pair
// whose lowest common ancestor is strictly deepest): recall is the share
// of the triples ref resolves that tree resolves the same way, precision
// the share of the triples tree resolves that ref resolves the same way.
// A tree that resolves nothing has precision 1 by convention; so does a
// reference that resolves nothing for recall. The counts are exact, by the
// pair method of TripletAgreement, in O(n² log d) time and O(n) memory.
// It panics if the trees are over different numbers of leaves.
func TripletScores(tree, ref *hier.Tree) (precision, recall float64) {
	mustMatch(tree, ref)
	if tree.N < 3 {
		return 1, 1
	}
	return countTriplets(newTreeIndex(tree), newTreeIndex(ref)).scores()
}

// TripletScoresSampled estimates TripletScores from samples random triples
// drawn as TripletAgreementSampled draws them (same seed, same triples).
// It panics if samples < 1.
func TripletScoresSampled(tree, ref *hier.Tree, samples int, seed uint64) (precision, recall float64) {
	mustMatch(tree, ref)
	if samples < 1 {
		panic(fmt.Sprintf("diff: %d triplet samples", samples))
	}
	if tree.N < 3 {
		return 1, 1
	}
	x, y := newTreeIndex(tree), newTreeIndex(ref)
	return sampleTriplets(x.WithLCA(), y.WithLCA(), tree.N, samples, seed).scores()
}

// scores are precision (of the first tree's resolved triples, the share
// the second resolves alike) and recall (the converse), 1 when there is
// nothing to share.
func (c tripletCounts) scores() (precision, recall float64) {
	precision, recall = 1, 1
	if c.resolvedA > 0 {
		precision = float64(c.sameSplit) / float64(c.resolvedA)
	}
	if c.resolvedB > 0 {
		recall = float64(c.sameSplit) / float64(c.resolvedB)
	}
	return precision, recall
}
