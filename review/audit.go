package review

import (
	"math/rand/v2"
	"slices"
)

// UniformSubset draws k distinct numbers of 0..n−1, every k-subset equally
// likely, by Floyd's algorithm: for j = n−k .. n−1 take a uniform t ≤ j,
// or j itself when t is already taken. It uses exactly k draws from rng and
// returns the subset sorted. k is clamped to 0..n.
func UniformSubset(rng *rand.Rand, n, k int) []int32 {
	k = max(0, min(k, n))
	taken := make(map[int32]bool, k)
	out := make([]int32, 0, k)
	for j := n - k; j < n; j++ {
		t := int32(rng.IntN(j + 1))
		if taken[t] {
			t = int32(j)
		}
		taken[t] = true
		out = append(out, t)
	}
	slices.Sort(out)
	return out
}
