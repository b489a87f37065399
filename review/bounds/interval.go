// Package bounds holds the exact binomial intervals ramify reports: the
// Clopper-Pearson interval for a reject rate estimated from random audits,
// and for triplet agreement estimated from sampled triplets.
package bounds

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mathext"
)

// ClopperPearson is the exact two-sided confidence interval for a binomial
// proportion (C. J. Clopper & E. S. Pearson, "The use of confidence or
// fiducial limits illustrated in the case of the binomial", Biometrika
// 26(4), 1934): with x failures in n trials and
// confidence level (0.95 for a 95% interval), α = 1 − level and
//
//	lo = B⁻¹(α/2; x, n−x+1)     (0 when x = 0)
//	hi = B⁻¹(1−α/2; x+1, n−x)   (1 when x = n)
//
// where B⁻¹(q; a, b) is the q-quantile of the Beta(a, b) distribution, the
// inverse of the regularised incomplete beta function. The interval is
// conservative: its coverage is at least level for every true proportion.
//
// The ends x = 0 and x = n are special-cased because a Beta parameter would
// be 0 there; with no trials at all (n = 0) nothing is known and the
// interval is [0, 1]. ClopperPearson panics if x < 0, x > n or level is not
// strictly between 0 and 1: those are programming errors, not data.
func ClopperPearson(x, n int, level float64) (lo, hi float64) {
	checkCounts(x, n, level)
	if n == 0 {
		return 0, 1
	}
	alpha := 1 - level
	lo, hi = 0, 1
	if x > 0 {
		lo = mathext.InvRegIncBeta(float64(x), float64(n-x+1), alpha/2)
	}
	if x < n {
		hi = mathext.InvRegIncBeta(float64(x+1), float64(n-x), 1-alpha/2)
	}
	return lo, hi
}

func checkCounts(x, n int, level float64) {
	if x < 0 || x > n {
		panic(fmt.Sprintf("review: %d failures in %d trials", x, n))
	}
	if !(level > 0 && level < 1) || math.IsNaN(level) {
		panic(fmt.Sprintf("review: confidence level %v is not between 0 and 1", level))
	}
}
