package main

import (
	"sort"
	"strings"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/review"
	"github.com/ramify-tax/ramify/solve/regen"
	"github.com/spf13/pflag"
)

// defaultStatusTop is how many of the least supported categories status
// lists.
const defaultStatusTop = 5

func init() {
	register(&command{
		name:    "review status",
		summary: "open packets, audits, the reject rate with its 95% interval, weak categories",
		help: `Lists the packets in reviews/open/ and what the answered packets in
reviews/done/ (the audit log) say about the current taxonomy:

  audits     the audit packets that answer for the current taxonomy, how
             many were rejected (verdict fixed), and the reject rate with
             its exact two-sided 95% Clopper-Pearson interval. An audit
             answers for the current taxonomy when it was drawn from it,
             or when it was answered ok on an earlier version that
             arranged its items exactly as the current one does (the same
             question, the same answer). A rejected audit stays rejected:
             its answer became a record the tree was then fitted to, so
             showing it again would prove nothing, and counting it can
             only overstate the rate. Earlier ok audits whose items are
             now arranged otherwise are not counted; "ramify review draw"
             draws their items again. Uncertain packets are never used:
             they were drawn where the tree is weakest, so they would
             overstate the rate. The last line says how many more clean
             audits would pass the release gate (release.min_audits and
             release.max_reject_rate).
  support    the least supported categories: the share of the committee's
             trees (see "ramify review draw") that group the category's
             items together at some level of their hierarchy, before it
             is folded into categories. A group counts when it and the
             category share at least 90% of their items (Jaccard overlap
             |A∩B|/|A∪B| >= 0.9), so a category of fewer than ten items
             must be matched exactly. Low support means the data and the
             records do not fix that category firmly: a good place for a
             reviewer to look. It is not the probability that the
             category is right.`,
		bind: withOptions(func(fs *pflag.FlagSet, o *statusOptions) {
			fs.IntVar(&o.top, "top", defaultStatusTop, "how many of the least supported categories to list (0: none, and no committee is solved)")
		}, runReviewStatus),
	})
}

type statusOptions struct {
	top int // how many of the least supported categories to list
}

// statusReport is review status's --json report.
type statusReport struct {
	Audits *auditsJSON `json:"audits"` // nil: no taxonomy yet
	// LeastSupported is nil when --top 0 asked for no committee or the
	// committee could not be solved; a pointer, so that an empty list
	// still shows.
	LeastSupported *[]supportJSON `json:"least_supported,omitempty"`
	Open           []openJSON     `json:"open"`
	Structure      string         `json:"structure"`
}

// auditsJSON is the audit tally of the current version.
type auditsJSON struct {
	Accepted        int       `json:"accepted"`
	Answered        int       `json:"answered"`
	Carried         int       `json:"carried"`
	Interval        []float64 `json:"interval"`
	Level           float64   `json:"level"`
	MoreCleanNeeded int       `json:"more_clean_needed"`
	Older           int       `json:"older"`
	RejectRate      float64   `json:"reject_rate"`
	Rejected        int       `json:"rejected"`
	Structure       string    `json:"structure"`
	Uncertain       int       `json:"uncertain"`
	UncertainFix    int       `json:"uncertain_fix"`
}

type openJSON struct {
	File    string `json:"file"`
	Reason  string `json:"reason"`
	From    string `json:"from"`
	Drawn   string `json:"drawn"`
	Size    int    `json:"size"`
	Verdict string `json:"verdict"`
	// Current is true when the packet was drawn from the current taxonomy.
	Current bool `json:"current"`
}

type supportJSON struct {
	Category []string `json:"category"`
	Items    int      `json:"items"`
	Support  float64  `json:"support"`
}

func runReviewStatus(e *env, o *statusOptions, args []string) error {
	if err := noArguments("review status", args, ""); err != nil {
		return err
	}
	top := o.top
	if top < 0 {
		return usagef("--top must be 0 or more, not %d", top)
	}
	p, ds := repo.Load(e.dir())
	if len(ds) > 0 {
		return ds
	}
	open, ds := readPackets(p.Dir, review.OpenDir)
	done, dds := readPackets(p.Dir, review.DoneDir)
	if ds = append(ds, dds...); len(ds) > 0 {
		return ds
	}
	structure := ""
	if p.Outline != nil {
		structure = format.StructureHash(p.Outline.Root)
	}
	rep := &statusReport{Structure: structure}
	e.result = rep
	rep.Open = reportOpen(e, open, structure)
	rep.Audits = reportAudits(e, p, done, structure)
	if top == 0 {
		return nil
	}
	if _, err := currentTaxonomy(p, "ask for support"); err != nil {
		e.notice("support: %v", err)
		rep.LeastSupported = &[]supportJSON{}
		return nil
	}
	return reportSupport(e, rep, p, structure, top)
}

func reportOpen(e *env, open []*review.Answer, structure string) []openJSON {
	list := []openJSON{}
	pending := 0
	for _, a := range open {
		pk := a.Packet
		list = append(list, openJSON{a.File, pk.Reason, pk.From, pk.Drawn, pk.Size, pk.Verdict, pk.From == structure})
		if pk.Verdict == format.VerdictPending {
			pending++
		}
	}
	e.say("open packets: %d (%d waiting for a verdict, %d answered and not yet absorbed)", len(open), pending, len(open)-pending)
	for _, o := range list {
		note := ""
		if !o.Current {
			note = "  (drawn from an earlier version)"
		}
		e.say("  %s  %-9s %-7s %s%s", o.File, o.Reason, o.Verdict, o.Drawn, note)
	}
	return list
}

func reportAudits(e *env, p *repo.Repo, done []*review.Answer, structure string) *auditsJSON {
	packets := make([]*format.Packet, len(done))
	for i, a := range done {
		packets[i] = a.Packet
	}
	if structure == "" {
		e.say("audits: there is no taxonomy yet; run `ramify solve`")
		return nil
	}
	s := review.SummarizeAudits(packets, p.Outline.Root)
	r := p.Settings.Release
	more := s.MoreCleanAudits(r.MaxRejectRate, r.MinAudits)
	tally := &auditsJSON{
		Structure:       s.Structure,
		Answered:        s.Audits,
		Rejected:        s.Rejected,
		Accepted:        s.Audits - s.Rejected,
		RejectRate:      roundSig(s.Rate, 6),
		Interval:        []float64{roundSig(s.Lo, 6), roundSig(s.Hi, 6)},
		Level:           review.AuditLevel,
		Older:           s.Older,
		Carried:         s.Carried,
		Uncertain:       s.Uncertain,
		UncertainFix:    s.UncertainFixed,
		MoreCleanNeeded: more,
	}
	if s.Audits == 0 {
		e.say("audits on this version (%s): none answered yet; draw some with `ramify review draw`", structure)
	} else {
		e.say("audits on this version (%s): %d answered, %d rejected", structure, s.Audits, s.Rejected)
		if s.Carried > 0 {
			e.say("  %s answered on earlier versions whose items this version arranges as then", plural(s.Carried, "audit", "audits"))
		}
		e.say("  reject rate  %.1f%%, 95%% interval %.1f%% to %.1f%% (exact, Clopper-Pearson)", 100*s.Rate, 100*s.Lo, 100*s.Hi)
	}
	if s.Older > 0 {
		e.say("  %s of earlier versions not counted: this version arranges their items otherwise; `ramify review draw` draws them again", plural(s.Older, "audit", "audits"))
	}
	switch {
	case more == 0:
		e.say("release gate: passes (at most %.1f%% rejected, at least %d audits)", 100*r.MaxRejectRate, r.MinAudits)
	case more > 0:
		e.say("release gate: %s would pass it (at most %.1f%% rejected, at least %d audits)", plural(more, "more clean audit", "more clean audits"), 100*r.MaxRejectRate, r.MinAudits)
	default:
		e.say("release gate: out of reach after %d rejections (release.max_reject_rate %.1f%%)", s.Rejected, 100*r.MaxRejectRate)
	}
	if s.Uncertain > 0 {
		e.say("uncertain packets answered: %d (%d fixed); never part of the estimate", s.Uncertain, s.UncertainFixed)
	}
	return tally
}

func reportSupport(e *env, rep *statusReport, p *repo.Repo, structure string, top int) error {
	committee, err := reviewCommittee(e, p, structure)
	if err != nil {
		return err
	}
	tree, nodes := regen.CategoryNodes(p.Outline.Root, p.Index, len(p.Items))
	assessment := committee.Assess(tree)
	type row struct {
		path    []string
		items   int
		support float64
	}
	var rows []row
	var walk func(c *format.Category, path []string)
	walk = func(c *format.Category, path []string) {
		for _, ch := range c.Children {
			sub := append(append([]string(nil), path...), ch.DisplayName())
			if v, ok := nodes[ch]; ok && !tree.IsLeaf(v) {
				rows = append(rows, row{sub, ch.Size(), assessment.Support[v]})
			}
			walk(ch, sub)
		}
	}
	walk(p.Outline.Root, nil)
	sort.SliceStable(rows, func(i, j int) bool {
		if rows[i].support != rows[j].support {
			return rows[i].support < rows[j].support
		}
		return strings.Join(rows[i].path, "\x00") < strings.Join(rows[j].path, "\x00")
	})
	rows = rows[:min(top, len(rows))]
	list := []supportJSON{}
	e.say("least supported categories (share of %d committee trees holding each):", p.Settings.Review.Committee)
	for _, r := range rows {
		list = append(list, supportJSON{r.path, r.items, roundSig(r.support, 4)})
		e.say("  %4.0f%%  %s  (%s)", 100*r.support, strings.Join(r.path, " / "), plural(r.items, "item", "items"))
	}
	rep.LeastSupported = &list
	return nil
}
