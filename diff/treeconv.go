package diff

import "github.com/ramify-tax/ramify/solve"

// solveTree turns a flattened outline into a solve.Tree over the common
// items: leaf i is common item i, held by category catOf[i]; one internal
// node per category with at least one common member; empty categories are
// dropped. Children come before parents, as solve.Tree.Add needs.
func (t *flatTree) solveTree(catOf []int) *solve.Tree {
	tr := solve.NewTree(len(catOf))
	if len(catOf) == 0 {
		return tr
	}
	node := make([]int32, len(t.cats))
	kids := make([][]int32, len(t.cats))
	for i, c := range catOf {
		kids[c] = append(kids[c], int32(i))
	}
	// Walk order lists parents before children; reversed, children first.
	for id := len(t.cats) - 1; id >= 0; id-- {
		if len(kids[id]) == 0 {
			node[id] = -1
			continue
		}
		node[id] = tr.Add(kids[id]...)
		kids[id] = nil
		if p := t.parent[id]; p >= 0 {
			kids[p] = append(kids[p], node[id])
		}
	}
	// A single common item at the root is itself the whole tree.
	if len(catOf) == 1 {
		tr.Root = 0
		return tr
	}
	tr.Root = node[0]
	return tr
}

func (c *comparison) metrics() Metrics {
	m := Metrics{CommonItems: len(c.common)}
	a, b := c.old.solveTree(c.oldCat), c.new.solveTree(c.newCat)
	if len(c.common) <= ExactTripletLimit {
		m.TripletAgreement, m.TripletExact = TripletAgreement(a, b), true
		m.TripletPrecision, m.TripletRecall = TripletScores(b, a)
	} else {
		est, lo, hi := TripletAgreementSampled(a, b, TripletSamples, TripletSeed)
		m.TripletAgreement, m.TripletInterval, m.TripletSamples = est, []float64{lo, hi}, TripletSamples
		m.TripletPrecision, m.TripletRecall = TripletScoresSampled(b, a, TripletSamples, TripletSeed)
	}
	m.RF, m.RFNormalized = RF(a, b)
	if r, ok := CopheneticCorrelation(a, b); ok {
		m.Cophenetic = &r
	}
	return m
}
