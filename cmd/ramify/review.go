package main

import (
	"os"
	"path/filepath"
	"slices"
	"strings"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/review"
	"github.com/ramify-tax/ramify/solve/regen"
	"github.com/spf13/pflag"
)

// defaultDrawCount is how many packets `review draw` writes by default.
const defaultDrawCount = 4

// maxDrawCount bounds --count.
const maxDrawCount = 100

func init() {
	register(&command{
		name:    "review",
		summary: "the review loop: draw packets, answer them, absorb, solve",
		usage:   "draw|status",
		help: `Reviewers' time is scarce, so ramify asks them about small packets: the
taxonomy restricted to a few items, keeping the categories of the full
tree that separate them, under their names, each item shown with its
label as a trailing comment ("claw-hammer  # Claw hammer, 16 oz"; the
comment is only to read, it never changes an answer). The loop:

  1. ramify review draw     writes packets to reviews/open/
  2. edit each packet       set "verdict: ok" when the grouping shown is
                            right; otherwise move lines until it is right
                            and set "verdict: fixed"; put your name after
                            "reviewer:" (or pass --by to absorb)
  3. ramify absorb          records fixed packets as shape constraints and
                            moves every answered packet to reviews/done/
  4. ramify solve           regenerates the taxonomy under the new records

"ramify review status" shows the open packets, the audits and the
estimated reject rate, and the least supported categories.`,
		run: func(e *env, args []string) error {
			if len(args) == 0 {
				return usagef("say what to do: `ramify review draw` or `ramify review status`")
			}
			return usagef("unknown review command %q; use `ramify review draw` or `ramify review status`", args[0])
		},
	})
	register(&command{
		name:    "review draw",
		summary: "write review packets where the tree is least certain, plus random audits",
		help: `Solves a committee of trees (review.committee in ramify.toml, default 20)
from different views of the items — the similarity graph solve uses, each
similarity source alone, the label channels and the descriptions apart —
and from randomly reweighted copies of each view, all under the same
constraint records, and writes packets to reviews/open/:

  uncertain  where the committee's trees arrange the items otherwise than
             the taxonomy does, weighted by how much of the tree hangs on
             it (the "score" line); each starts from the item the
             committee would move farthest and holds the places it might
             belong, and packets cover different parts of the tree
  audit      a uniformly random set of items (review.audit_share of the
             packets, rounded); their verdicts estimate how often a
             reviewer rejects the tree (see "ramify review status")

The committee and the audits are seeded from the taxonomy's structure
hash, so drawing again from the same tree gives the same packets (those
already there are left as they are) and a larger --count adds new ones
after them. Items already reviewed on this version of the taxonomy, or
waiting in packets drawn from an earlier one, are not put in uncertain
packets again; answered audits are not drawn again, except that an
audit answered ok on an earlier version whose items the current one
arranges otherwise is drawn again first (see "ramify review status"). Files are named
DATE-HASH.outline, the hash taken over the packet's items and the
structure it was drawn from.

Each packet says how to answer it; then run "ramify absorb".`,
		bind: withOptions(func(fs *pflag.FlagSet, o *drawOptions) {
			fs.IntVar(&o.count, "count", defaultDrawCount, "how many packets to write")
			fs.IntVar(&o.size, "size", 0, "items per packet (default review.size in ramify.toml)")
			addDateFlag(fs, &o.date, "the date the packets are drawn on")
		}, runReviewDraw),
	})
}

type drawOptions struct {
	count, size int
	date        string
}

// drawReport is review draw's --json report, once the packets are written.
type drawReport struct {
	Packets   []drawnJSON `json:"packets"`
	Structure string      `json:"structure"`
	Written   int         `json:"written"`
}

func runReviewDraw(e *env, o *drawOptions, args []string) error {
	if err := noArguments("review draw", args, ""); err != nil {
		return err
	}
	count := o.count
	if count < 1 || count > maxDrawCount {
		return usagef("--count must be between 1 and %d, not %d", maxDrawCount, count)
	}
	date, err := reviewDate(o.date)
	if err != nil {
		return err
	}
	p, ds := repo.Load(e.dir())
	if len(ds) > 0 {
		return ds
	}
	size := o.size
	if size == 0 {
		size = p.Settings.Review.Size
	}
	if size < format.MinShapeItems || size > 12 {
		return usagef("--size must be between %d and 12, not %d", format.MinShapeItems, size)
	}
	if size > len(p.Items) {
		return failf("a packet of %d items needs at least %d items in the taxonomy; there are %d", size, size, len(p.Items))
	}
	structure, err := currentTaxonomy(p, "draw packets")
	if err != nil {
		return err
	}
	if err := checkConstraints(e, p); err != nil {
		return err
	}
	open, ds := readPackets(p.Dir, review.OpenDir)
	done, dds := readPackets(p.Dir, review.DoneDir)
	if ds = append(ds, dds...); len(ds) > 0 {
		return ds
	}
	avoid, redraw, skipAudit := drawHistory(p, open, done, structure)
	committee, err := reviewCommittee(e, p, structure)
	if err != nil {
		return err
	}
	tree, _ := regen.CategoryNodes(p.Outline.Root, p.Index, len(p.Items))
	assessment := committee.Assess(tree)
	drafts := review.Draw(tree, committee, assessment, review.DrawOptions{
		Count:      count,
		Size:       size,
		AuditShare: p.Settings.Review.AuditShare,
		Seed:       review.Seed(structure),
		Avoid:      avoid,
		Redraw:     redraw,
		SkipAudit:  skipAudit,
	})
	// A packet is known by its hash (items and structure), whatever the
	// date in its file name.
	existing := map[string]string{}
	for _, a := range append(append([]*review.Answer(nil), open...), done...) {
		existing[review.PacketHash(a.Packet.From, a.Items())] = a.File
	}
	return writeDrafts(e, p, committee, drafts, existing, structure, date, count)
}

// drawHistory is what the packets already drawn and answered mean for a
// new draw: the items not to put in uncertain packets again, the stale
// audits to draw again first, and which audit sets were answered already.
func drawHistory(p *repo.Repo, open, done []*review.Answer, structure string) (avoid []bool, redraw [][]int32, skipAudit func([]int32) bool) {
	// Open packets of this version are part of the stream being drawn again
	// (they come back and are left as they are); everything else that is
	// waiting or was answered on this version is not asked again.
	avoid = make([]bool, len(p.Items))
	mark := func(a *review.Answer) {
		for _, id := range a.Items() {
			if i, ok := p.Index[id]; ok {
				avoid[i] = true
			}
		}
	}
	for _, a := range open {
		if a.Packet.From != structure {
			mark(a)
		}
	}
	for _, a := range done {
		if a.Packet.From == structure {
			mark(a)
		}
	}
	// Audits of earlier versions whose projection is unchanged still
	// answer for this one; the stale ones are drawn again first, and no
	// audited set is drawn as a new one (see review.AuditSummary).
	audited := map[string]bool{}
	donePackets := make([]*format.Packet, len(done))
	for i, a := range done {
		donePackets[i] = a.Packet
		if a.Packet.Reason == format.ReasonAudit {
			audited[strings.Join(a.Items(), "\x00")] = true
		}
	}
	summary := review.SummarizeAudits(donePackets, p.Outline.Root)
	for _, set := range summary.Stale {
		if items, ok := itemIndices(p, set); ok {
			redraw = append(redraw, items)
		}
	}
	ids := p.ItemIDs()
	skipAudit = func(items []int32) bool {
		names := make([]string, len(items))
		for i, x := range items {
			names[i] = ids[x]
		}
		slices.Sort(names)
		return audited[strings.Join(names, "\x00")]
	}
	return avoid, redraw, skipAudit
}

// itemIndices maps item ids to indices, sorted; false when an item is no
// longer in the repository.
func itemIndices(p *repo.Repo, set []string) ([]int32, bool) {
	out := make([]int32, 0, len(set))
	for _, id := range set {
		i, ok := p.Index[id]
		if !ok {
			return nil, false
		}
		out = append(out, int32(i))
	}
	slices.Sort(out)
	return out, true
}

// drawnJSON is one packet in the --json report.
type drawnJSON struct {
	File   string  `json:"file"`
	Reason string  `json:"reason"`
	Score  float64 `json:"score,omitempty"`
	// Entropy is the committee's mean vote entropy over the packet's
	// triplets, in nats (0 when every committee tree agrees).
	Entropy float64  `json:"entropy"`
	Items   []string `json:"items"`
	// Written is false for a packet that was already there.
	Written bool `json:"written"`
}

func writeDrafts(e *env, p *repo.Repo, committee *review.Committee, drafts []review.Draft, existing map[string]string, structure, date string, asked int) error {
	openDir, err := repo.Resolve(p.Dir, review.OpenDir)
	if err != nil {
		return err
	}
	type planned struct {
		rel, full string
		text      []byte
		info      drawnJSON
		before    string // the file holding this packet already, if any
	}
	var plan []planned
	for _, d := range drafts {
		pk, id := review.NewPacket(d, p.Outline.Root, p.Items, structure, date)
		rel := review.OpenDir + "/" + id + ".outline"
		info := drawnJSON{File: rel, Reason: pk.Reason, Score: pk.Score, Items: pk.Tree.AllItems(),
			Entropy: roundSig(committee.Disagreement(d.Items), 4)}
		info.Items = sortedStrings(info.Items)
		_, hash, _ := review.SplitPacketID(id)
		before := existing[hash]
		if before != "" {
			info.File = before
		} else {
			existing[hash] = rel // the same set twice in one draw is written once
		}
		plan = append(plan, planned{rel, filepath.Join(openDir, id+".outline"), format.FormatPacket(pk), info, before})
	}
	if err := os.MkdirAll(openDir, 0o755); err != nil {
		return err
	}
	var report []drawnJSON
	wrote := 0
	for _, pl := range plan {
		if pl.before != "" {
			e.notice("%s was drawn before; left as it is", pl.before)
		} else {
			if err := format.WriteFileAtomic(pl.full, pl.text, 0o644); err != nil {
				return err
			}
			pl.info.Written = true
			wrote++
			if pl.info.Reason == format.ReasonUncertain {
				e.say("wrote %s  uncertain, score %.4f", pl.rel, pl.info.Score)
			} else {
				e.say("wrote %s  audit (random items)", pl.rel)
			}
		}
		report = append(report, pl.info)
	}
	if report == nil {
		report = []drawnJSON{}
	}
	e.result = &drawReport{Structure: structure, Packets: report, Written: wrote}
	if uncertain := countReason(drafts, format.ReasonUncertain); uncertain < asked-review.AuditCount(asked, p.Settings.Review.AuditShare) {
		e.say("the committee agrees with the rest of the tree: %s drawn", plural(uncertain, "uncertain packet", "uncertain packets"))
	}
	if wrote > 0 {
		e.say("answer each packet (its first lines say how), then run `ramify absorb`")
	}
	return nil
}

func countReason(ds []review.Draft, reason string) int {
	n := 0
	for _, d := range ds {
		if d.Reason == reason {
			n++
		}
	}
	return n
}
