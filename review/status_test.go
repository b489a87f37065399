package review

import (
	"fmt"
	"math"
	"testing"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/review/bounds"
)

// auditPacket is an answered packet over its own three items, grouped as
// given (a Newick-like pair: the first two together, the third apart).
func auditPacket(reason, from, verdict string, a, b, c string) *format.Packet {
	return &format.Packet{Reason: reason, From: from, Verdict: verdict, Tree: &format.Category{
		Children: []*format.Category{{Name: "pair", Items: []string{a, b}}}, Items: []string{c},
	}}
}

func TestSummarizeAudits(t *testing.T) {
	// The current tree pairs every "x…-0" with "x…-1" and leaves "x…-2"
	// apart, for 40 triples of items.
	current := &format.Category{}
	for i := range 40 {
		current.Children = append(current.Children, &format.Category{Name: fmt.Sprint("c", i), Children: []*format.Category{
			{Name: "pair", Items: []string{fmt.Sprintf("x%d-0", i), fmt.Sprintf("x%d-1", i)}},
		}, Items: []string{fmt.Sprintf("x%d-2", i)}})
	}
	structure := format.StructureHash(current)
	const older = "ba9876543210"
	var done []*format.Packet
	next := 0
	add := func(n int, reason, from, verdict string, same bool) {
		for range n {
			a, b, c := fmt.Sprintf("x%d-0", next), fmt.Sprintf("x%d-1", next), fmt.Sprintf("x%d-2", next)
			if !same {
				a, c = c, a
			}
			done = append(done, auditPacket(reason, from, verdict, a, b, c))
			next++
		}
	}
	add(16, format.ReasonAudit, structure, format.VerdictOK, true)
	add(4, format.ReasonAudit, structure, format.VerdictFixed, false)
	add(3, format.ReasonAudit, older, format.VerdictOK, true)             // arranged as now: carried
	add(2, format.ReasonAudit, older, format.VerdictOK, false)            // arranged otherwise: stale
	add(1, format.ReasonAudit, older, format.VerdictFixed, false)         // a rejection stays one
	add(5, format.ReasonUncertain, structure, format.VerdictFixed, false) // drawn where the tree is weak
	add(2, format.ReasonAudit, structure, format.VerdictPending, true)
	s := SummarizeAudits(done, current)
	if s.Audits != 24 || s.Rejected != 5 || s.Carried != 4 || s.Older != 2 || len(s.Stale) != 2 || s.Uncertain != 5 || s.UncertainFixed != 5 {
		t.Fatalf("summary %+v", s)
	}
	if s.Stale[0][0] != "x23-0" {
		t.Errorf("stale sets %v, want the two answered on the older tree in another arrangement", s.Stale)
	}
	// Drawing a stale set again on this version and answering it ok makes
	// it count, once.
	done = append(done, auditPacket(format.ReasonAudit, structure, format.VerdictOK, "x23-0", "x23-1", "x23-2"))
	if s := SummarizeAudits(done, current); s.Audits != 25 || s.Older != 1 {
		t.Errorf("after drawing a stale set again: %+v", s)
	}
	// No audits at all: nothing is known, [0, 1].
	none := SummarizeAudits(nil, current)
	if none.Audits != 0 || none.Lo != 0 || none.Hi != 1 || none.Rate != 0 {
		t.Errorf("empty summary %+v", none)
	}
	// 4 rejections in 20 audits: exact 95% interval [0.0573339971,
	// 0.4366140030], R's binom.confint(method = "exact") as stored in
	// statsmodels' test results (published reference values; Clopper &
	// Pearson, Biometrika 26(4), 1934).
	done, next = nil, 0
	add(16, format.ReasonAudit, structure, format.VerdictOK, true)
	add(4, format.ReasonAudit, structure, format.VerdictFixed, false)
	if s := SummarizeAudits(done, current); s.Rate != 0.2 || math.Abs(s.Lo-0.0573339971) > 1e-8 || math.Abs(s.Hi-0.4366140030) > 1e-8 {
		t.Errorf("rate %v, interval [%.10f, %.10f]", s.Rate, s.Lo, s.Hi)
	}
	// 0 of 30 rejected: upper end 0.1157033082 (the same statsmodels data),
	// above the default gate of 0.10, which needs 6 more.
	done, next = nil, 0
	add(30, format.ReasonAudit, structure, format.VerdictOK, true)
	s = SummarizeAudits(done, current)
	if s.Lo != 0 || math.Abs(s.Hi-0.1157033082) > 1e-8 {
		t.Errorf("0/30: [%v, %.10f]", s.Lo, s.Hi)
	}
	if more := s.MoreCleanAudits(0.10, 20); more != 6 {
		t.Errorf("0/30 needs %d more clean audits for a 0.10 gate, want 6", more)
	}
}

// TestDefaultGateCanPass: the default release gate can be met at its own
// minimum number of audits, all clean, and not with one fewer.
func TestDefaultGateCanPass(t *testing.T) {
	r := format.DefaultSettings().Release
	if want := bounds.MinCleanAudits(r.MaxRejectRate, AuditLevel); r.MinAudits != want {
		t.Errorf("default min_audits %d, but %d clean audits are the fewest that meet max_reject_rate %v", r.MinAudits, want, r.MaxRejectRate)
	}
}
