package diff

import "github.com/ramify-tax/ramify/solve/hier"

// solveTree turns a flattened outline into a tree over the common items
// by hier.KeepingChains: leaf i is common item i, held by category
// catOf[i]; every category with a common item below it is a node of its
// own, single-child ones too; empty categories are dropped.
func (t *flatTree) solveTree(catOf []int) *hier.Tree {
	children := make([][]int32, len(t.cats))
	for id := 1; id < len(t.cats); id++ {
		p := t.parent[id]
		children[p] = append(children[p], int32(id))
	}
	held := make([][]int32, len(t.cats))
	for i, c := range catOf {
		held[c] = append(held[c], int32(i))
	}
	tr, _ := hier.KeepingChains(0, len(catOf), hier.Nested[int32]{
		Children: func(c int32) []int32 { return children[c] },
		Leaves:   func(c int32, buf []int32) []int32 { return append(buf, held[c]...) },
	})
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
