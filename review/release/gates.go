package release

import (
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/review"
)

// Gate names a review gate of a release.
type Gate string

// The review gates, in the order they are judged.
const (
	GateOpenPackets Gate = "open packets" // a packet waits for a verdict
	GateAudits      Gate = "audits"       // too few audits answer for the tree
	GateRejectRate  Gate = "reject rate"  // the interval's upper end is too high
)

// Blocked says which review gate stops a release and what it found.
type Blocked struct {
	Gate Gate
	// Open are the packets waiting in reviews/open (GateOpenPackets).
	Open []string
	// Audits is the tally of the audit log for the tree (GateAudits and
	// GateRejectRate).
	Audits review.AuditSummary
}

// CheckOpen judges the first review gate: no packet waits for a verdict
// (open lists the paths of reviews/open). It returns nil when it passes.
func CheckOpen(open []string) *Blocked {
	if len(open) > 0 {
		return &Blocked{Gate: GateOpenPackets, Open: open}
	}
	return nil
}

// CheckAudits judges the audit gates on the tally of the released tree:
// at least s.MinAudits audits answer for it, and the upper end of the
// exact two-sided 95% Clopper–Pearson interval of their reject rate is at
// most s.MaxRejectRate. It returns nil when they pass.
func CheckAudits(audits review.AuditSummary, s format.ReleaseSettings) *Blocked {
	switch {
	case audits.Audits < s.MinAudits:
		return &Blocked{Gate: GateAudits, Audits: audits}
	case audits.Hi > s.MaxRejectRate:
		return &Blocked{Gate: GateRejectRate, Audits: audits}
	}
	return nil
}
