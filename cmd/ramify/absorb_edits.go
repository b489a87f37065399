package main

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io/fs"
	"slices"
	"strings"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/review"
	"github.com/ramify-tax/ramify/solve"
	"github.com/ramify-tax/ramify/solve/regen"
)

// absorbHistoryDepth bounds how many earlier commits of the outline absorb
// searches for the tree ramify last wrote.
const absorbHistoryDepth = 50

// handEdit is a hand edit of the outline, ready to be recorded.
type handEdit struct {
	base  string // where the tree ramify wrote came from
	moves []review.Move
	// catMoves are the categories moved whole, one shape each.
	catMoves []review.CategoryMove
	file     *format.ConstraintFile // nil when nothing needs pinning
	text     []byte
	outline  []byte // the outline rewritten with a fresh structure line
	from     string // structure hash ramify wrote
	to       string // structure hash of the edited tree
	// overridden lists earlier records the edited outline breaks.
	overridden []regen.Record
}

// absorbHandEdit records a hand edit of the outline, or returns nil when
// there is none.
func absorbHandEdit(e *env, p *repo.Repo, baseFile string, names *reviewerNames, date string) (*handEdit, error) {
	if p.Outline == nil || !p.Outline.Edited() {
		if baseFile != "" {
			e.notice("--base %s is not needed: %s was not reshaped by hand", baseFile, p.Settings.Taxonomy.File)
		}
		return nil, nil
	}
	if ms := p.OutlineMembership(); len(ms) > 0 {
		return nil, outlineMembershipError(ms, p.Settings.Taxonomy.File+" does not place exactly the repository's items; fix the lines named, then absorb")
	}
	rel := p.Settings.Taxonomy.File
	edited := p.Outline.Root
	base, where, err := findBaseOutline(p, baseFile)
	if err != nil {
		return nil, err
	}
	by := names.get()
	if by == "" {
		return nil, usagef("who made the hand edit of %s? pass --by NAME (or set git's user.name)", rel)
	}
	affinity, err := itemAffinity(p)
	if err != nil {
		return nil, err
	}
	h := &handEdit{base: where, moves: review.PinMoves(base, edited, affinity),
		catMoves: review.PinCategoryMoves(base, edited, affinity),
		from:     p.Outline.Structure, to: format.StructureHash(edited)}
	cf, pinOf, shapeOf := h.pins(by, date)
	if len(cf.Triplets)+len(cf.Shapes) > 0 {
		if err := h.placeFile(cf, pinOf, shapeOf, rel, edited); err != nil {
			return nil, err
		}
	}
	// The edited outline now holds the new records too: listing them makes
	// a later removal of the edit file let the moved items go again.
	records := append(slices.Clone(p.Outline.Records), repo.RecordKeysOf(h.file)...)
	h.outline = format.FormatOutlineRecords(edited.Clone(), records)
	h.overridden = brokenByEdit(p, edited)
	return h, nil
}

// itemAffinity is the similarity of two items by id (0 for an unknown
// one); the similarities pick the representatives the solver will find
// hardest to move (see review.PinMoves).
func itemAffinity(p *repo.Repo) (func(a, b string) float64, error) {
	g, err := regen.Graph(p, regen.Seed)
	if err != nil {
		return nil, err
	}
	return func(a, b string) float64 {
		i, okA := p.Index[a]
		j, okB := p.Index[b]
		if !okA || !okB {
			return 0
		}
		return g.Weight(i, j)
	}, nil
}

// pins writes the edit's decisions as records by by on date: the triplets
// that pin each moved item and a shape for each category moved whole.
// pinOf names, per triplet, the moved item it pins; shapeOf, per shape,
// the moved category's first item.
func (h *handEdit) pins(by, date string) (cf *format.ConstraintFile, pinOf, shapeOf []string) {
	cf = &format.ConstraintFile{}
	for _, m := range h.moves {
		note := fmt.Sprintf("moved by hand from %s to %s", pathOrTop(m.From), pathOrTop(m.To))
		for _, t := range m.Pins {
			t.Provenance = format.Provenance{By: by, Date: date, Note: note}
			cf.Triplets = append(cf.Triplets, t)
			pinOf = append(pinOf, m.Item)
		}
	}
	for _, m := range h.catMoves {
		if m.Shape == nil {
			continue
		}
		s := *m.Shape
		s.Structure = h.from
		s.Provenance = format.Provenance{By: by, Date: date,
			Note: fmt.Sprintf("category moved by hand from %s to %s, with its %s", pathOrTop(m.From), pathOrTop(m.To), plural(len(m.Items), "item", "items"))}
		cf.Shapes = append(cf.Shapes, s)
		shapeOf = append(shapeOf, m.Items[0])
	}
	// Two moves can pick the same triplet, and one can say what others
	// imply: keep each decision once.
	pinOf = prunePins(cf, pinOf)
	return cf, pinOf, shapeOf
}

// placeFile names the edit's constraint file by the two structure hashes,
// parses what will be written, and points each record at the moved item's
// line in the outline (rel), where the editor can change it when it
// conflicts.
func (h *handEdit) placeFile(cf *format.ConstraintFile, pinOf, shapeOf []string, rel string, edited *format.Category) error {
	sum := sha256.Sum256([]byte("ramify edit\n" + h.from + "\n" + h.to))
	frel := format.ConstraintsDir + "/" + repo.HandEditPrefix + hex.EncodeToString(sum[:6]) + ".toml"
	parsed, text, ds := parsedConstraintFile(frel, cf)
	if len(ds) > 0 {
		return ds
	}
	lines := itemLines(edited)
	for i := range parsed.Triplets {
		parsed.Triplets[i].Pos = format.Pos{File: rel, Line: lines[pinOf[i]], Col: 1}
	}
	for i := range parsed.Shapes {
		parsed.Shapes[i].Pos = format.Pos{File: rel, Line: lines[shapeOf[i]], Col: 1}
	}
	h.file, h.text = parsed, text
	return nil
}

// brokenByEdit lists the recorded decisions the edited outline itself
// breaks. They stay in force: the next solve honours both them and the new
// pins, which can reshape the tree around the edit, so the editor is told
// which earlier record to remove if the edit replaces it.
func brokenByEdit(p *repo.Repo, edited *format.Category) []regen.Record {
	compiled := regen.Compile(p)
	tree := regen.FromCategory(edited, p.Index, len(p.Items))
	var out []regen.Record
	for _, i := range solve.Satisfies(tree, compiled.Constraints) {
		out = append(out, compiled.Records[i])
	}
	return out
}

// itemLines maps every item of a parsed outline to its line.
func itemLines(root *format.Category) map[string]int {
	out := map[string]int{}
	root.Walk(func(c *format.Category, _ int) bool {
		for i, id := range c.Items {
			if i < len(c.ItemLines) {
				out[id] = c.ItemLines[i]
			}
		}
		return true
	})
	return out
}

// prunePins drops the triplets of cf that review.PruneRecords finds
// redundant, and returns pinOf (the moved item of each triplet) for the
// triplets kept.
func prunePins(cf *format.ConstraintFile, pinOf []string) []string {
	type tagged struct {
		t    format.Triplet
		item string
	}
	before := make([]tagged, len(cf.Triplets))
	for i, t := range cf.Triplets {
		before[i] = tagged{t, pinOf[i]}
	}
	review.PruneRecords(cf)
	var out []string
	j := 0
	for _, t := range cf.Triplets {
		for before[j].t.Pair != t.Pair || before[j].t.Out != t.Out {
			j++
		}
		out = append(out, before[j].item)
		j++
	}
	return out
}

func pathOrTop(p string) string {
	if p == "" {
		return "the top level"
	}
	return p
}

// findBaseOutline finds the tree ramify last wrote: the one whose shape
// has the structure hash in the edited outline's header. It comes from
// --base (base), or from git.
func findBaseOutline(p *repo.Repo, base string) (*format.Category, string, error) {
	rel := p.Settings.Taxonomy.File
	want := p.Outline.Structure
	if base != "" {
		if msg := format.CheckRepoPath(base); msg != "" {
			return nil, "", usagef("--base: %s", msg)
		}
		full, err := repo.Resolve(p.Dir, base)
		if err != nil {
			return nil, "", usagef("--base: %v", err)
		}
		data, err := format.ReadFileLimited(full, base, format.MaxOutlineBytes)
		if errors.Is(err, fs.ErrNotExist) {
			return nil, "", usagef("--base %s: no such file in the repository", base)
		}
		if err != nil {
			return nil, "", format.AsDiags(err, base)
		}
		o, err := format.ParseOutline(base, data)
		if err != nil {
			return nil, "", format.AsDiags(err, base)
		}
		if got := format.StructureHash(o.Root); got != want {
			return nil, "", failf("--base %s has structure %s, but %s says ramify last wrote structure %s; pass the outline ramify wrote", base, got, rel, want)
		}
		return o.Root, base, nil
	}
	intro := fmt.Sprintf("%s was reshaped by hand; to record the edit, absorb compares it with the tree ramify last wrote (structure %s).", rel, want)
	if _, err := gitTopLevel(p.Dir); err != nil {
		reason := "this folder is not in a git repository"
		if errors.Is(err, errNoGit) {
			reason = "git is not installed"
		}
		return nil, "", &failure{lines: []string{intro,
			reason + ", so that tree cannot be looked up.",
			"Put a copy of the outline ramify wrote in the repository and run `ramify absorb --base FILE`."}}
	}
	for _, rev := range outlineRevisions(p.Dir, rel) {
		data, err := readAtRevision(p.Dir, rev, rel, format.MaxOutlineBytes)
		if err != nil {
			continue
		}
		o, err := format.ParseOutline(rev+":"+rel, data)
		if err != nil || format.StructureHash(o.Root) != want {
			continue
		}
		where := rev
		if len(where) > 12 {
			where = where[:12]
		}
		return o.Root, "git " + where, nil
	}
	return nil, "", &failure{lines: []string{intro,
		fmt.Sprintf("git has no version of %s with that structure (HEAD and the last %d commits that changed it were searched).", rel, absorbHistoryDepth),
		"Put a copy of the outline ramify wrote in the repository and run `ramify absorb --base FILE`."}}
}

// outlineRevisions lists the revisions to search for the tree ramify
// wrote: HEAD, then the commits that changed the outline, newest first.
// Only object ids that git printed are returned.
func outlineRevisions(dir, rel string) []string {
	if msg := format.CheckRepoPath(rel); msg != "" {
		return nil
	}
	revs := []string{"HEAD"}
	out, err := runGit(dir, gitOutputLimit, "log", "--format=%H", fmt.Sprintf("--max-count=%d", absorbHistoryDepth), "HEAD", "--", "./"+rel)
	if err != nil {
		return revs
	}
	for _, line := range strings.Split(strings.TrimSpace(string(out)), "\n") {
		if isObjectID(line) {
			revs = append(revs, line)
		}
	}
	return revs
}

// gitUserName is git's user.name for the repository at dir, or "".
func gitUserName(dir string) string {
	out, err := runGit(dir, gitOutputLimit, "config", "user.name")
	if err != nil {
		return ""
	}
	return strings.TrimSpace(string(out))
}

func reportHandEdit(e *env, rep *absorbReport, p *repo.Repo, h *handEdit) {
	rel := p.Settings.Taxonomy.File
	moves := []moveJSON{}
	for _, m := range h.moves {
		moves = append(moves, moveJSON{m.Item, m.From, m.To, len(m.Pins)})
	}
	catMoves := []catMoveJSON{}
	for _, m := range h.catMoves {
		catMoves = append(catMoves, catMoveJSON{m.From, m.To, m.Items, m.Shape != nil})
	}
	file := ""
	if h.file != nil {
		file = h.file.File
	}
	rep.Edit = &editJSON{Base: h.base, From: h.from, To: h.to, Moved: moves, MovedCategories: catMoves, Constraints: file}
	var parts []string
	if len(catMoves) > 0 {
		parts = append(parts, plural(len(catMoves), "category", "categories"))
	}
	if len(moves) > 0 || len(catMoves) == 0 {
		parts = append(parts, plural(len(moves), "item", "items"))
	}
	e.say("%s was edited by hand (compared with %s): %s moved", rel, h.base, strings.Join(parts, " and "))
	for _, m := range catMoves {
		records := "1 shape record"
		if !m.Shape {
			records = "no record"
		}
		e.say("  category %s -> %s (%s, %s)", pathOrTop(m.From), pathOrTop(m.To), plural(len(m.Items), "item", "items"), records)
		if !m.Shape {
			e.notice("no shape can pin the category %s where it was put; the next solve may move it", m.From)
		}
	}
	for _, m := range moves {
		e.say("  %s: %s -> %s (%s)", m.Item, pathOrTop(m.From), pathOrTop(m.To), plural(m.Pins, "record", "records"))
		if m.Pins == 0 {
			e.notice("no triplet can pin %s where it was put; the next solve may move it", m.Item)
		}
	}
	if file != "" {
		e.say("recorded the moves in %s", file)
	}
	if len(h.overridden) > 0 {
		e.notice("note: the edit goes against %s still in force:", plural(len(h.overridden), "earlier record", "earlier records"))
		for _, r := range h.overridden {
			e.notice("  %s", describeRecord(r))
		}
		e.notice("the next solve honours both, which can reshape the tree around the edit; remove a record above if the edit replaces it")
		rep.EditAgainst = recordsJSON(h.overridden)
	}
	e.say("rewrote %s with the edit and a fresh structure line", rel)
}
