package bounds

import "gonum.org/v1/gonum/mathext"

// Functions that only the tests call, kept out of the built package.

// ClopperPearsonUpper is the exact one-sided upper confidence bound for a
// binomial proportion: the largest p that level-confidence does not rule
// out after x failures in n trials,
//
//	hi = B⁻¹(level; x+1, n−x)   (1 when x = n).
//
// This is the bound a release gate compares with its maximum reject rate.
// For x = 0 it equals 1 − (1−level)^(1/n), close to 3/n at level 0.95
// (the "rule of three"). With n = 0 it is 1. It panics on the same
// programming errors as ClopperPearson.
func ClopperPearsonUpper(x, n int, level float64) float64 {
	checkCounts(x, n, level)
	if x == n {
		return 1
	}
	return mathext.InvRegIncBeta(float64(x+1), float64(n-x), level)
}
