package review

import (
	"math"
	"testing"

	"github.com/ramify-tax/ramify/format"
)

func TestSummarizeAudits(t *testing.T) {
	const current, older = "0123456789ab", "ba9876543210"
	var done []*format.Packet
	add := func(n int, reason, from, verdict string) {
		for range n {
			done = append(done, &format.Packet{Reason: reason, From: from, Verdict: verdict})
		}
	}
	add(16, format.ReasonAudit, current, format.VerdictOK)
	add(4, format.ReasonAudit, current, format.VerdictFixed)
	add(3, format.ReasonAudit, older, format.VerdictFixed)       // another tree
	add(5, format.ReasonUncertain, current, format.VerdictFixed) // drawn where the tree is weak
	add(2, format.ReasonAudit, current, format.VerdictPending)
	s := SummarizeAudits(done, current)
	if s.Audits != 20 || s.Rejected != 4 || s.Older != 3 || s.Uncertain != 5 || s.UncertainFixed != 5 {
		t.Fatalf("summary %+v", s)
	}
	// 4 rejections in 20 audits: exact 95% interval [0.0573339971,
	// 0.4366140030], R's binom.confint(method = "exact") as stored in
	// statsmodels' test results (METHODS.md 9, [P]).
	if s.Rate != 0.2 || math.Abs(s.Lo-0.0573339971) > 1e-8 || math.Abs(s.Hi-0.4366140030) > 1e-8 {
		t.Errorf("rate %v, interval [%.10f, %.10f]", s.Rate, s.Lo, s.Hi)
	}
	// No audits at all: nothing is known, [0, 1].
	none := SummarizeAudits(nil, current)
	if none.Audits != 0 || none.Lo != 0 || none.Hi != 1 || none.Rate != 0 {
		t.Errorf("empty summary %+v", none)
	}
	// 0 of 30 rejected: upper end 0.1157033082 (METHODS.md 9, same source).
	done = nil
	add(30, format.ReasonAudit, current, format.VerdictOK)
	if s := SummarizeAudits(done, current); s.Lo != 0 || math.Abs(s.Hi-0.1157033082) > 1e-8 {
		t.Errorf("0/30: [%v, %.10f]", s.Lo, s.Hi)
	}
}
