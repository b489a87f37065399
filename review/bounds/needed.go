package bounds

// maxAuditSearch bounds the search of MoreCleanAudits: past ten million
// audits the gate is out of reach for any practical purpose.
const maxAuditSearch = 10_000_000

// MoreCleanAudits is the smallest number j ≥ 0 of further clean audits
// (answered "ok") after which, with x rejected of n, the upper end of the
// two-sided Clopper–Pearson interval at level is at most maxRate and the
// audits number at least minAudits: the least j with
//
//	hi(x, n+j) ≤ maxRate  and  n+j ≥ minAudits.
//
// hi(x, m) falls as m grows with x fixed (a Beta quantile whose second
// parameter grows), so the answer is found by doubling and then
// bisection. It returns −1 when no number up to ten million will do
// (maxRate 0 with x > 0, or a rate too small to reach).
//
// With x = 0 the bound has the closed form hi = 1 − (α/2)^(1/m), so the
// fewest clean audits that can pass the gate at all is
// ⌈ln(α/2) / ln(1 − maxRate)⌉: 36 for maxRate 0.10 at 95%.
func MoreCleanAudits(x, n int, maxRate, level float64, minAudits int) int {
	checkCounts(x, n, level)
	ok := func(j int) bool {
		m := n + j
		if m < minAudits || m == 0 {
			return false
		}
		_, hi := ClopperPearson(x, m, level)
		return hi <= maxRate
	}
	if ok(0) {
		return 0
	}
	hi := 1
	for !ok(hi) {
		if hi > maxAuditSearch {
			return -1
		}
		hi *= 2
	}
	lo := hi / 2 // !ok(lo) or lo == 0, and ok(0) is false
	for hi-lo > 1 {
		mid := lo + (hi-lo)/2
		if ok(mid) {
			hi = mid
		} else {
			lo = mid
		}
	}
	return hi
}

// MinCleanAudits is the fewest audits, all clean, that can pass a gate of
// maxRate at level: MoreCleanAudits(0, 0, maxRate, level, 0).
func MinCleanAudits(maxRate, level float64) int {
	return MoreCleanAudits(0, 0, maxRate, level, 0)
}
