package diff

import (
	"math/big"
	"math/bits"
)

// u128 is an unsigned 128-bit accumulator. Sums over all pairs of a
// 100,000-leaf tree of products of cluster sizes reach about 10^19, past
// int64, and float sums would depend on the order of addition; exact
// integers keep the measures exact and the same on every platform.
type u128 struct{ hi, lo uint64 }

// addMul adds a·b.
func (s *u128) addMul(a, b uint64) {
	h, l := bits.Mul64(a, b)
	var c uint64
	s.lo, c = bits.Add64(s.lo, l, 0)
	s.hi += h + c
}

// big returns the sum as a big.Int.
func (s u128) big() *big.Int {
	v := new(big.Int).SetUint64(s.hi)
	v.Lsh(v, 64)
	return v.Or(v, new(big.Int).SetUint64(s.lo))
}

// choose2 is C(k, 2).
func choose2(k int64) int64 { return k * (k - 1) / 2 }

// choose3 is C(k, 3).
func choose3(k int64) int64 {
	if k < 3 {
		return 0
	}
	return k * (k - 1) / 2 * (k - 2) / 3
}
