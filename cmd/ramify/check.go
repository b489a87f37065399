package main

import (
	"bytes"
	"fmt"
	"strconv"

	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/solve"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/solve/regen"
	"github.com/spf13/pflag"
)

func init() {
	register(&command{
		name:    "check",
		summary: "validate every file; the CI gate for pull requests",
		help: `Reads ramify.toml, the items, vectors and links, every constraint file
and the committed taxonomy, and reports every problem found, each as
FILE:LINE:COL: what is wrong (exit status 2).

Then it checks that the taxonomy is current (exit status 1 otherwise):
every item is placed exactly once, the outline was not reshaped by hand
since ramify wrote it (run "ramify absorb" to record such edits), the
constraints agree with each other, the outline honours every one of them,
and it is what "ramify solve" would write now.

Inputs that are not read (a linked, hidden or nested constraint file, or
one named *.TOML) are warnings; --strict makes them problems.

check never writes a file. Like every command, it first finishes an
absorb that was interrupted (its journal) and removes temporary files a
killed run left behind.`,
		bind: withOptions(func(fs *pflag.FlagSet, o *checkOptions) {
			fs.BoolVar(&o.strict, "strict", false, "treat warnings (inputs that are not read) as problems")
		}, runCheck),
	})
}

type checkOptions struct {
	strict bool
}

// checkReport is check's --json report; release's holds it too. A field
// left nil was not reached: the check before it failed.
type checkReport struct {
	Categories  *int          `json:"categories,omitempty"`
	Constraints recordCounts  `json:"constraints"`
	Current     *bool         `json:"current,omitempty"`
	Depth       *int          `json:"depth,omitempty"`
	Items       int           `json:"items"`
	RecordsGone *int          `json:"records_gone,omitempty"`
	RecordsNew  *int          `json:"records_new,omitempty"`
	Warnings    []problemJSON `json:"warnings,omitempty"`
	// SideBySideNotKept names the side-by-side answers that another
	// record keeps from holding in full (solve says how many).
	SideBySideNotKept []recordJSON `json:"side_by_side_not_kept,omitempty"`
}

// recordJSON is a constraint record named in a --json report.
type recordJSON struct {
	By   string `json:"by"`
	File string `json:"file"`
	Kind string `json:"kind"`
	Line int    `json:"line"`
	Note string `json:"note"`
}

func recordsJSON(recs []regen.Record) []recordJSON {
	var out []recordJSON
	for _, r := range recs {
		out = append(out, recordJSON{By: r.By, File: r.Pos.File, Kind: r.Kind, Line: r.Pos.Line, Note: r.Note})
	}
	return out
}

func runCheck(e *env, o *checkOptions, args []string) error {
	if err := noArguments("check", args, ""); err != nil {
		return err
	}
	p, ds := repo.Load(e.dir())
	if len(ds) > 0 {
		return ds
	}
	if o.strict && len(p.Warnings) > 0 {
		return p.Warnings
	}
	rep := &checkReport{}
	e.result = rep
	sol, err := checkRepository(e, p, rep)
	if err != nil {
		return err
	}
	root := p.Outline.Root
	counts := countRecords(p.Constraints)
	e.say("ok: %s in %s (depth %d); %s, all holding", plural(len(p.Items), "item", "items"), plural(root.CountCategories(), "category", "categories"), root.Depth(), describeRecords(counts))
	if n := len(sol.SideBySideNotKept); n > 0 {
		// Not a failure: every record holds, and the outline is what solve
		// writes; but an answer's side-by-side part yields to the records.
		e.say("note: %s not kept in full: parting the items would break another record", plural(n, "side-by-side answer", "side-by-side answers"))
		for _, i := range sol.SideBySideNotKept {
			r := sol.Compiled.Records[i]
			e.say("  %s", describeRecord(r))
			rep.SideBySideNotKept = append(rep.SideBySideNotKept, recordJSON{By: r.By, File: r.Pos.File, Kind: r.Kind, Line: r.Pos.Line, Note: r.Note})
		}
	}
	return nil
}

// checkRepository runs every check of `ramify check` on a loaded project
// and returns the regenerated solution (which equals the committed outline
// when it passes), filling rep as far as it gets. release runs it as its
// first gate.
func checkRepository(e *env, p *repo.Repo, rep *checkReport) (*regen.Solution, error) {
	rep.Items = len(p.Items)
	if len(p.Warnings) > 0 {
		rep.Warnings = problemsJSON(p.Warnings.Capped())
		for _, w := range p.Warnings.Capped() {
			e.notice("warning: %s", w.String())
		}
	}
	rep.Constraints = countRecords(p.Constraints)
	rel := p.Settings.Taxonomy.File
	if p.Outline == nil {
		return nil, failf("%s does not exist yet; run `ramify solve` to write it", rel)
	}
	if ms := p.OutlineMembership(); len(ms) > 0 {
		return nil, outlineMembershipError(ms, rel+" is out of date with the items; run `ramify solve`")
	}
	if p.Outline.Edited() {
		return nil, failf("%s was reshaped by hand since ramify wrote it; run `ramify absorb` to record the edits as constraints", rel)
	}
	if err := checkGroupNames(p); err != nil {
		return nil, err
	}
	root := p.Outline.Root
	categories, depth := root.CountCategories(), root.Depth()
	rep.Categories, rep.Depth = &categories, &depth
	if err := checkConstraints(e, p); err != nil {
		return nil, err
	}
	sol, err := regen.Regenerate(p, regen.MethodConstrained, e.progressFunc())
	e.endProgress()
	if err != nil {
		return nil, solveError(e, err)
	}
	// A renamed category leaves its old path in the concept block (the
	// identifiers still bind by members); solve refreshes the block, and
	// that alone is no reason to fail.
	if !bytes.Equal(sol.Text, p.OutlineText) && (p.Outline.Structure == "" || !bytes.Equal(sol.Text, format.FormatOutlineRecords(root.Clone(), p.RecordKeys()))) {
		gone, fresh := recordChanges(p.Outline.Records, p.RecordKeys())
		rep.Current, rep.RecordsGone, rep.RecordsNew = new(bool), &gone, &fresh
		why := ""
		if gone > 0 {
			why += fmt.Sprintf("; it was solved under %s that no longer %s, so what %s held is let go", plural(gone, "record", "records"), pick(gone, "exists", "exist"), pick(gone, "it", "they"))
		}
		if fresh > 0 {
			why += fmt.Sprintf("; %s not solved under yet", plural(fresh, "record is", "records are"))
		}
		return nil, failf("%s is not what `ramify solve` writes now (%s%s); run `ramify solve` and commit the result",
			rel, staleReason(root, p.OutlineText, sol.Root, sol.Text), why)
	}
	current := true
	rep.Current = &current
	return sol, nil
}

// checkConstraints fails when the records contradict each other or the
// committed outline breaks one of them, naming each record.
func checkConstraints(e *env, p *repo.Repo) error {
	compiled := regen.Compile(p)
	if err := compiled.Consistent(len(p.Items)); err != nil {
		return solveError(e, err)
	}
	tree := regen.FromCategory(p.Outline.Root, p.Index, len(p.Items))
	violated := solve.Satisfies(tree, compiled.Constraints)
	if len(violated) == 0 {
		return nil
	}
	rel := p.Settings.Taxonomy.File
	lines := []string{fmt.Sprintf("%s breaks %s:", rel, plural(len(violated), "constraint record", "constraint records"))}
	recs := make([]regen.Record, len(violated))
	for k, i := range violated {
		recs[k] = compiled.Records[i]
		lines = append(lines, "  "+describeRecord(recs[k]))
	}
	lines = append(lines, "run `ramify solve` to regenerate it under every record")
	type violatedJSON struct {
		Violated []recordJSON `json:"violated"`
	}
	return &failure{lines: lines, detail: violatedJSON{recordsJSON(recs)}}
}

// recordCounts counts constraint records by kind.
type recordCounts struct {
	Records  int `json:"records"`
	Triplets int `json:"triplets"`
	Groups   int `json:"groups"`
	Shapes   int `json:"shapes"`
}

func countRecords(files []*format.ConstraintFile) recordCounts {
	var c recordCounts
	for _, f := range files {
		c.Triplets += len(f.Triplets)
		c.Groups += len(f.Groups)
		c.Shapes += len(f.Shapes)
	}
	c.Records = c.Triplets + c.Groups + c.Shapes
	return c
}

func describeRecords(c recordCounts) string {
	return plural(c.Records, "constraint record", "constraint records") +
		" (" + plural(c.Triplets, "triplet", "triplets") + ", " +
		plural(c.Groups, "group", "groups") + ", " +
		plural(c.Shapes, "shape", "shapes") + ")"
}

// recordChanges counts the records an outline was solved under that are
// gone now, and the current records it was not solved under.
func recordChanges(solved, current []format.OutlineRecord) (gone, fresh int) {
	now := map[string]bool{}
	for _, r := range current {
		now[r.Key] = true
	}
	then := map[string]bool{}
	for _, r := range solved {
		then[r.Key] = true
		if !now[r.Key] {
			gone++
		}
	}
	for k := range now {
		if !then[k] {
			fresh++
		}
	}
	return gone, fresh
}

func pick(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}

func plural(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return strconv.Itoa(n) + " " + many
}
