package review

import (
	"slices"
	"strings"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/review/bounds"
)

// AuditLevel is the confidence of the reported interval.
const AuditLevel = 0.95

// AuditSummary is the audit estimate for one version of the taxonomy.
//
// The estimator. Each audit packet holds a set S of items drawn uniformly
// at random, independently of every tree, and the reviewer judged T|S, the
// tree it was drawn from restricted to S. The reject rate of a tree T′ is
// the chance that T′|S is wrong for such a random set. An audit answers
// for T′ when its verdict is a verdict on T′|S:
//
//   - drawn from T′ itself: the verdict as given;
//   - answered "ok" on an earlier tree T with T′|S identical to T|S (the
//     same triplets resolved the same way): T′ shows the reviewer the very
//     grouping they accepted, so it is accepted for T′ too. An "ok" answer
//     records nothing, so T′ does not depend on S and the set is still a
//     random set for T′;
//   - answered "fixed" on any earlier tree: it stays a rejection. Its
//     answer became a record, so T′ was fitted to S and showing S again
//     would prove nothing; counting it as accepted, or dropping it, would
//     bias the rate down, while counting it rejected can only overstate
//     it, which keeps the gate's guarantee (the true rate exceeds the
//     interval's upper end with chance at most 2.5%).
//
// An earlier "ok" audit whose projection changed is stale: its set is
// drawn again as an audit of T′ (Stale lists the sets), so every random
// set keeps one current verdict and the sample stays a uniform one.
// Each set counts once, by its most recent applicable verdict. Uncertain
// packets never enter the estimate: they were drawn where the tree is
// weakest.
type AuditSummary struct {
	Structure string
	// Audits counts the audit sets answering for this version, Rejected
	// those of them rejected; Carried how many of Audits were answered on
	// earlier versions.
	Audits, Rejected, Carried int
	// Rate is Rejected/Audits (0 without audits); Lo and Hi the exact
	// two-sided 95% Clopper–Pearson interval ([0, 1] without audits).
	Rate, Lo, Hi float64
	// Older counts the earlier audits that do not answer for this version
	// (Stale, with the sets to draw again, sorted item ids each).
	Older int
	Stale [][]string
	// Uncertain and UncertainFixed count answered uncertain packets.
	Uncertain, UncertainFixed int
}

// SummarizeAudits reads the answered packets of the audit log, in the
// order they were answered (the log's file order), for the taxonomy
// current (nil when there is none yet: then only the uncertain packets
// are counted).
func SummarizeAudits(done []*format.Packet, current *format.Category) AuditSummary {
	var s AuditSummary
	if current != nil {
		s.Structure = format.StructureHash(current)
	}
	type verdict struct {
		items            []string
		rejected, answer bool // rejected ever; answers for current
		carried          bool
		seen             int // order of the set's first audit
	}
	sets := map[string]*verdict{}
	for _, p := range done {
		if p.Verdict == format.VerdictPending {
			continue
		}
		fixed := p.Verdict == format.VerdictFixed
		if p.Reason == format.ReasonUncertain {
			s.Uncertain++
			if fixed {
				s.UncertainFixed++
			}
			continue
		}
		if current == nil {
			continue
		}
		items := p.Tree.AllItems()
		slices.Sort(items)
		key := strings.Join(items, "\x00")
		v := sets[key]
		if v == nil {
			v = &verdict{items: items, seen: len(sets)}
			sets[key] = v
		}
		switch {
		case fixed:
			v.rejected, v.answer, v.carried = true, true, p.From != s.Structure
		case v.rejected:
		case p.From == s.Structure:
			v.answer, v.carried = true, false
		case !v.answer && SameShape(Restrict(current, items), p.Tree):
			v.answer, v.carried = true, true
		}
	}
	ordered := make([]*verdict, 0, len(sets))
	for _, v := range sets {
		ordered = append(ordered, v)
	}
	slices.SortFunc(ordered, func(a, b *verdict) int { return a.seen - b.seen })
	for _, v := range ordered {
		if !v.answer {
			s.Older++
			s.Stale = append(s.Stale, v.items)
			continue
		}
		s.Audits++
		if v.rejected {
			s.Rejected++
		}
		if v.carried {
			s.Carried++
		}
	}
	s.Lo, s.Hi = bounds.ClopperPearson(s.Rejected, s.Audits, AuditLevel)
	if s.Audits > 0 {
		s.Rate = float64(s.Rejected) / float64(s.Audits)
	}
	return s
}

// MoreCleanAudits is how many more audits answered "ok" would let the
// gate pass: the reject rate's upper end at most maxRate with at least
// minAudits audits (bounds.MoreCleanAudits; −1 when out of reach).
func (s AuditSummary) MoreCleanAudits(maxRate float64, minAudits int) int {
	return bounds.MoreCleanAudits(s.Rejected, s.Audits, maxRate, AuditLevel, minAudits)
}
