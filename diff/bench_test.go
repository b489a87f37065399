package diff

import (
	"fmt"
	"math/rand/v2"
	"strconv"
	"testing"

	"github.com/ramify-tax/ramify/diff/match"
	"github.com/ramify-tax/ramify/internal/taxgen"
)

// BenchmarkCompare100k measures the project's speed target: a semantic diff
// of two 100,000-item taxonomies (depth 4–5, about 5,000 categories) that
// differ in 1% of the items, in under 2 s on a 2-core machine.
func BenchmarkCompare100k(b *testing.B) {
	for _, shape := range []struct{ depth, fanout int }{{4, 10}, {5, 7}} {
		rng := rand.New(rand.NewPCG(41, 42))
		old := taxgen.Taxonomy(rng, 100_000, shape.depth, shape.fanout)
		new := taxgen.Perturb(rng, old, 0.01, 20)
		b.Run(fmt.Sprintf("depth=%d/categories=%d", shape.depth, old.CountCategories()), func(b *testing.B) {
			for b.Loop() {
				Compare(old, new)
			}
		})
	}
}

func BenchmarkMetrics(b *testing.B) {
	for _, n := range []int{1000, 5000} {
		rng := rand.New(rand.NewPCG(43, uint64(n)))
		old := taxgen.Taxonomy(rng, n, 3, 6)
		c := newComparison(old, taxgen.Perturb(rng, old, 0.05, 0))
		ta, tb := c.old.solveTree(c.oldCat), c.new.solveTree(c.newCat)
		b.Run("TripletAgreement/n="+strconv.Itoa(n), func(b *testing.B) {
			for b.Loop() {
				TripletAgreement(ta, tb)
			}
		})
		b.Run("RF/n="+strconv.Itoa(n), func(b *testing.B) {
			for b.Loop() {
				RF(ta, tb)
			}
		})
		b.Run("Cophenetic/n="+strconv.Itoa(n), func(b *testing.B) {
			for b.Loop() {
				CopheneticCorrelation(ta, tb)
			}
		})
	}
}

func BenchmarkMatchClusters(b *testing.B) {
	rng := rand.New(rand.NewPCG(44, 45))
	old := taxgen.Taxonomy(rng, 100_000, 4, 8)
	c := newComparison(old, taxgen.Perturb(rng, old, 0.01, 0))
	b.ResetTimer()
	for b.Loop() {
		match.Clusters(c.old.members[1:], c.new.members[1:], MatchJaccard)
	}
}
