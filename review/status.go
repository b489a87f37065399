package review

import (
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/review/bounds"
)

// AuditLevel is the confidence of the reported interval.
const AuditLevel = 0.95

// AuditSummary is the audit estimate for one version of the taxonomy.
//
// Only audit packets drawn from that version count: an audit says how
// often a reviewer rejects the projection of a random set of items of the
// tree it was drawn from, and a regenerated tree is another tree. Audits
// of earlier versions are counted apart (Older) and uncertain packets
// never enter the estimate: they were drawn where the tree is weakest.
type AuditSummary struct {
	Structure string
	Audits    int // audit packets answered on this version
	Rejected  int // of them answered "fixed"
	// Rate is Rejected/Audits (0 without audits); Lo and Hi the exact
	// two-sided 95% Clopper–Pearson interval ([0, 1] without audits).
	Rate, Lo, Hi float64
	Older        int // audits answered on earlier versions
	// Uncertain and UncertainFixed count answered uncertain packets.
	Uncertain, UncertainFixed int
}

// SummarizeAudits reads the answered packets of the audit log for the
// version with the given structure hash.
func SummarizeAudits(done []*format.Packet, structure string) AuditSummary {
	s := AuditSummary{Structure: structure}
	for _, p := range done {
		if p.Verdict == format.VerdictPending {
			continue
		}
		fixed := p.Verdict == format.VerdictFixed
		switch {
		case p.Reason == format.ReasonUncertain:
			s.Uncertain++
			if fixed {
				s.UncertainFixed++
			}
		case p.From != structure:
			s.Older++
		default:
			s.Audits++
			if fixed {
				s.Rejected++
			}
		}
	}
	s.Lo, s.Hi = bounds.ClopperPearson(s.Rejected, s.Audits, AuditLevel)
	if s.Audits > 0 {
		s.Rate = float64(s.Rejected) / float64(s.Audits)
	}
	return s
}
