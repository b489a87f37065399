// Package round rounds the floats that reports and manifests print, so
// that they do not change in the last bits from one platform to another.
package round

import (
	"math"
	"strconv"
)

// Sig rounds x to n significant digits.
func Sig(x float64, n int) float64 {
	if x == 0 || math.IsNaN(x) || math.IsInf(x, 0) {
		return x
	}
	v, _ := strconv.ParseFloat(strconv.FormatFloat(x, 'g', n, 64), 64)
	return v
}
