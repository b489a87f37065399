package main

import (
	"bytes"
	"fmt"
	"strconv"

	"github.com/ramify-tax/ramify/solve"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/project"
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
		flags: func(fs *pflag.FlagSet, o *options) {
			o.extra["strict"] = fs.Bool("strict", false, "treat warnings (inputs that are not read) as problems")
		},
		run: runCheck,
	})
}

func runCheck(e *env, args []string) error {
	if len(args) > 0 {
		return usagef("check takes no arguments (got %q)", args[0])
	}
	p, ds := project.Load(e.dir())
	if len(ds) > 0 {
		return ds
	}
	if *e.opt.extra["strict"].(*bool) && len(p.Warnings) > 0 {
		return p.Warnings
	}
	if _, err := checkRepository(e, p); err != nil {
		return err
	}
	root := p.Outline.Root
	counts := countRecords(p.Constraints)
	e.say("ok: %s in %s (depth %d); %s, all holding", plural(len(p.Items), "item", "items"), plural(root.CountCategories(), "category", "categories"), root.Depth(), describeRecords(counts))
	return nil
}

// checkRepository runs every check of `ramify check` on a loaded project
// and returns the regenerated solution (which equals the committed outline
// when it passes). release runs it as its first gate.
func checkRepository(e *env, p *project.Project) (*project.Solution, error) {
	e.report["items"] = len(p.Items)
	if len(p.Warnings) > 0 {
		e.report["warnings"] = problemsJSON(p.Warnings.Capped())
		for _, w := range p.Warnings.Capped() {
			e.notice("warning: %s", w.String())
		}
	}
	counts := countRecords(p.Constraints)
	e.report["constraints"] = counts
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
	e.report["categories"] = root.CountCategories()
	e.report["depth"] = root.Depth()
	if err := checkConstraints(e, p); err != nil {
		return nil, err
	}
	sol, err := p.Regenerate(project.MethodConstrained, e.progressFunc())
	e.endProgress()
	if err != nil {
		return nil, solveError(e, err)
	}
	// A renamed category leaves its old path in the concept block (the
	// identifiers still bind by members); solve refreshes the block, and
	// that alone is no reason to fail.
	if !bytes.Equal(sol.Text, p.OutlineText) && (p.Outline.Structure == "" || !bytes.Equal(sol.Text, format.FormatOutlineRecords(root.Clone(), p.RecordKeys()))) {
		e.report["current"] = false
		gone, fresh := recordChanges(p.Outline.Records, p.RecordKeys())
		e.report["records_gone"], e.report["records_new"] = gone, fresh
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
	e.report["current"] = true
	return sol, nil
}

// checkConstraints fails when the records contradict each other or the
// committed outline breaks one of them, naming each record.
func checkConstraints(e *env, p *project.Project) error {
	compiled := p.Compile()
	if err := compiled.Consistent(len(p.Items)); err != nil {
		return solveError(e, err)
	}
	tree := project.FromCategory(p.Outline.Root, p.Index, len(p.Items))
	violated := solve.Satisfies(tree, compiled.Constraints)
	if len(violated) == 0 {
		return nil
	}
	rel := p.Settings.Taxonomy.File
	lines := []string{fmt.Sprintf("%s breaks %s:", rel, plural(len(violated), "constraint record", "constraint records"))}
	var recs []map[string]any
	for _, i := range violated {
		r := compiled.Records[i]
		lines = append(lines, "  "+describeRecord(r))
		recs = append(recs, map[string]any{"kind": r.Kind, "file": r.Pos.File, "line": r.Pos.Line, "by": r.By, "note": r.Note})
	}
	lines = append(lines, "run `ramify solve` to regenerate it under every record")
	e.report["violated"] = recs
	return &failure{lines: lines}
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
