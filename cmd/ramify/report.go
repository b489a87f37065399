package main

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/ramify-tax/ramify/diff"
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/binding"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/review"
	"github.com/ramify-tax/ramify/review/report"
	"github.com/ramify-tax/ramify/solve/regen"
	"github.com/spf13/pflag"
)

// defaultReportFile is where the report goes, in the repository.
const defaultReportFile = "report.html"

func init() {
	register(&command{
		name:    "report",
		summary: "write the taxonomy as one HTML page to browse, search and judge",
		help: `Writes one self-contained HTML file (style and script inline, nothing
fetched from the network; it opens from disk in any browser): the tree,
collapsed to its top level, every category with its item count and a
mark on provisional names; items with label, tags and description when
opened; a search box over item ids, labels and category names that opens
the path to what it finds; and for every item and category the records
that bind it (kind, file:line, who, when, why).

It also shows what changed since a base version — items moved, added
and removed, categories created, dissolved, renamed, split and merged,
the facts "ramify diff" reports — marked in the tree. The base is
--since (a git revision, REV:PATH, or an outline file, as for diff); by
default the last release tag (a tag with a manifest in releases/), else
the last committed version of the outline that differs from the one in
the folder.

The review state comes from reviews/: open packets with their reason and
items, and the audit tally with its exact 95% interval against the
release gate. With --support it solves the committee of trees (as
"ramify review status" does) and shows each category's support as a
number and a bar, the least supported listed first; without it the page
says support was not computed.

The page is written atomically to report.html in the repository, or to
--out. It works in light and dark mode by the system setting and from
the keyboard: / jumps to the search, the arrow keys move through the
tree, Enter opens and closes a row.`,
		bind: withOptions(func(fs *pflag.FlagSet, o *reportOptions) {
			fs.StringVar(&o.out, "out", "", "write the page to `FILE` (default report.html in the repository)")
			fs.StringVar(&o.since, "since", "", "show changes since `REV` (a git revision, REV:PATH or an outline file)")
			fs.BoolVar(&o.support, "support", false, "compute each category's committee support (solves the committee)")
			fs.StringVar(&o.title, "title", "", "the page's `title` (default: the repository folder's name)")
		}, runReport),
	})
}

type reportOptions struct {
	out, since, title string
	support           bool
}

// reportPageJSON is report's --json report, once the page is written.
type reportPageJSON struct {
	Bytes      int    `json:"bytes"`
	Categories int    `json:"categories"`
	Items      int    `json:"items"`
	Moved      *int   `json:"moved,omitempty"` // with a base to compare with
	Out        string `json:"out"`
	Since      string `json:"since"`
	Support    bool   `json:"support"`
}

func runReport(e *env, o *reportOptions, args []string) error {
	if err := noArguments("report", args, ""); err != nil {
		return err
	}
	p, ds := repo.Load(e.dir())
	if len(ds) > 0 {
		return ds
	}
	if p.Outline == nil {
		return failf("%s does not exist yet; run `ramify solve` first, then report", p.Settings.Taxonomy.File)
	}
	in, err := reportInput(e, o, p)
	if err != nil {
		return err
	}
	progress := e.progressFunc()
	if progress != nil {
		progress("writing the report", 0, 1)
	}
	page := report.Build(in)
	var buf bytes.Buffer
	if err := page.WriteHTML(&buf); err != nil {
		return err
	}
	out := o.out
	shownOut := out
	if out == "" {
		out = filepath.Join(p.Dir, defaultReportFile)
		shownOut = defaultReportFile
	}
	err = format.WriteFileAtomic(out, buf.Bytes(), 0o644)
	e.endProgress()
	if err != nil {
		return err
	}
	rep := &reportPageJSON{Out: shownOut, Bytes: buf.Len(), Items: len(page.Items), Categories: len(page.Cats) - 1, Since: in.Base, Support: in.Support != nil}
	if in.Changes != nil {
		moved := len(in.Changes.Moved)
		rep.Moved = &moved
	}
	e.result = rep
	e.say("wrote %s: %s in %s, %s", shownOut, plural(len(page.Items), "item", "items"), plural(len(page.Cats)-1, "category", "categories"), sizeText(buf.Len()))
	if in.Base != "" {
		e.say("changes since %s: %s moved, %d added, %d removed", in.Base, plural(len(in.Changes.Moved), "item", "items"), len(in.Changes.Added), len(in.Changes.Removed))
	} else if in.BaseNote != "" {
		e.say("no changes shown: %s", in.BaseNote)
	}
	if in.Support == nil {
		e.say("support not computed (add --support)")
	}
	return nil
}

// reportInput gathers what the page shows: the tree and its records, the
// review state, the changes since the base and, with --support, the
// committee's support.
func reportInput(e *env, o *reportOptions, p *repo.Repo) (report.Input, error) {
	structure := format.StructureHash(p.Outline.Root)
	in := report.Input{
		Title:     reportTitle(o, p),
		Root:      p.Outline.Root,
		Structure: structure,
		Items:     p.Items,
		Index:     p.Index,
		Records:   binding.New(p.Constraints),
		Gate:      report.Gate{MinAudits: p.Settings.Release.MinAudits, MaxRejectRate: p.Settings.Release.MaxRejectRate},
	}
	open, ds := readPackets(p.Dir, review.OpenDir)
	done, dds := readPackets(p.Dir, review.DoneDir)
	if ds = append(ds, dds...); len(ds) > 0 {
		return in, ds
	}
	for _, a := range open {
		pk := a.Packet
		in.Open = append(in.Open, report.OpenPacket{File: a.File, Reason: pk.Reason, Drawn: pk.Drawn, Verdict: pk.Verdict, Current: pk.From == structure, Items: a.Items()})
	}
	packets := make([]*format.Packet, len(done))
	for i, a := range done {
		packets[i] = a.Packet
	}
	audits := review.SummarizeAudits(packets, p.Outline.Root)
	in.Audits = &audits

	if err := reportBase(p, o.since, &in); err != nil {
		return in, err
	}
	if o.support {
		if _, err := currentTaxonomy(p, "ask for support"); err != nil {
			return in, err
		}
		support, trees, err := categorySupport(e, p, structure)
		if err != nil {
			return in, err
		}
		in.Support, in.Trees = support, trees
	}
	return in, nil
}

func reportTitle(o *reportOptions, p *repo.Repo) string {
	if t := o.title; t != "" {
		return t
	}
	abs, err := filepath.Abs(p.Dir)
	if err != nil {
		abs = p.Dir
	}
	return filepath.Base(abs) + " taxonomy"
}

func sizeText(n int) string {
	switch {
	case n >= 1<<20:
		return strconv.FormatFloat(float64(n)/(1<<20), 'f', 1, 64) + " MB"
	case n >= 1<<10:
		return strconv.FormatFloat(float64(n)/(1<<10), 'f', 1, 64) + " KB"
	}
	return plural(n, "byte", "bytes")
}

// reportBase finds the version to show changes against and diffs it with
// the current outline. No base (no git, no earlier version) is not an
// error; the page then says why it shows no changes.
func reportBase(p *repo.Repo, since string, in *report.Input) error {
	var side *diffSide
	if since != "" {
		s, err := loadDiffSide(p.Dir, since)
		if err != nil {
			return err
		}
		side = s
	} else {
		s, note, err := defaultBase(p)
		if err != nil {
			return err
		}
		if s == nil {
			in.BaseNote = note
			return nil
		}
		side = s
	}
	old, err := parseTreeText(side.name, side.data)
	if err != nil {
		return format.AsDiags(err, side.name)
	}
	in.Base = side.name
	in.Changes = diff.Compare(old, p.Outline.Root)
	return nil
}

// defaultBase is the last release tag's outline, else the last committed
// outline that differs from the one in the folder. It returns nil and a
// note when there is none.
func defaultBase(p *repo.Repo) (*diffSide, string, error) {
	if _, err := gitTopLevel(p.Dir); err != nil {
		if errors.Is(err, errNotGitRepo) || errors.Is(err, errNoGit) {
			return nil, "the repository is not under git, so there is no earlier version; pass --since FILE to compare with one", nil
		}
		return nil, "", err
	}
	rel := p.Settings.Taxonomy.File
	if tag := lastReleaseTag(p.Dir); tag != "" {
		if data, err := readAtRevision(p.Dir, tag, rel, format.MaxOutlineBytes); err == nil {
			return &diffSide{name: tag + ":" + rel, data: data}, "", nil
		}
	}
	out, err := runGit(p.Dir, gitOutputLimit, "log", "--format=%H", "-n", "50", "--", "./"+rel)
	if err != nil {
		return nil, "", err
	}
	commits := strings.Fields(string(out))
	for _, c := range commits {
		data, err := readAtRevision(p.Dir, c, rel, format.MaxOutlineBytes)
		if err != nil {
			continue
		}
		if !bytes.Equal(data, p.OutlineText) {
			return &diffSide{name: c[:12] + ":" + rel, data: data}, "", nil
		}
	}
	if len(commits) == 0 {
		return nil, rel + " has no commit yet, so there is no earlier version to compare with", nil
	}
	return nil, "no committed version of " + rel + " differs from the one in the folder", nil
}

// lastReleaseTag is the most recent tag that names a release of the
// repository (one with a manifest releases/TAG.toml), or "".
func lastReleaseTag(dir string) string {
	out, err := runGit(dir, gitOutputLimit, "for-each-ref", "--sort=-creatordate", "--format=%(refname:short)", "refs/tags")
	if err != nil {
		return ""
	}
	for _, tag := range strings.Fields(string(out)) {
		if checkRevision(tag) != "" {
			continue
		}
		if _, err := os.Stat(filepath.Join(dir, "releases", tag+".toml")); err == nil {
			return tag
		}
	}
	return ""
}

// categorySupport solves the committee and measures every category of the
// committed outline against it.
func categorySupport(e *env, p *repo.Repo, structure string) (map[*format.Category]float64, int, error) {
	committee, err := reviewCommittee(e, p, structure)
	if err != nil {
		return nil, 0, err
	}
	tree, nodes := regen.CategoryNodes(p.Outline.Root, p.Index, len(p.Items))
	assessment := committee.Assess(tree)
	out := map[*format.Category]float64{}
	p.Outline.Root.Walk(func(c *format.Category, depth int) bool {
		if v, ok := nodes[c]; ok && depth > 0 && !tree.IsLeaf(v) {
			out[c] = assessment.Support[v]
		}
		return true
	})
	return out, committee.Size(), nil
}
