package main

import (
	"bytes"
	"errors"
	"fmt"
	"strings"

	"github.com/ramify-tax/ramify/diff"
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/project"
	"github.com/spf13/pflag"
)

func init() {
	register(&command{
		name:    "solve",
		summary: "regenerate the taxonomy under every constraint",
		help: `Builds the similarity graph from the items (tags, text, vectors, links as
ramify.toml says), checks that the constraint records agree with each
other, and writes the tree that fits the similarities best (Dasgupta's
cost) among the trees that honour every record. Category names are kept
from the previous outline where a category keeps its members; new ones get
a provisional name, written with "~ " in front, for an editor to confirm.

When the constraints contradict each other, solve names the smallest set
of records that cannot all hold, with file, line, author and reason, and
exits with status 1 without writing anything.

solve changes only what the change of inputs forces: new items are
placed into the existing tree, items that a new record names move as
little as the record needs, items a removed record held are let go, and
everything else stays where it was. It rebuilds the tree from scratch on
the first solve, after an import, when over a tenth of the items are new
or gone, and with --rebuild; the report says which it did.

When taxonomy.outline was reshaped by hand, solve stops and asks you to
run "ramify absorb" first, so the edit is kept as a decision.

--method average builds plain average linkage on the same graph instead:
a baseline to compare with, which ignores the constraints. solve lists the
records it breaks and writes it only elsewhere (--out FILE) or, with
--replace, over the taxonomy. --out FILE works with either method and
leaves the taxonomy alone.`,
		flags: func(fs *pflag.FlagSet, o *options) {
			o.extra["method"] = fs.String("method", "constrained", "how to build the tree: constrained or average")
			o.extra["dry-run"] = fs.Bool("dry-run", false, "report what would change without writing the outline")
			o.extra["out"] = fs.String("out", "", "write the tree to this `FILE` in the repository and leave the taxonomy alone")
			o.extra["replace"] = fs.Bool("replace", false, "with --method average: replace the taxonomy even though the baseline breaks records")
			o.extra["rebuild"] = fs.Bool("rebuild", false, "solve from scratch instead of changing only what the new inputs force")
		},
		run: runSolve,
	})
}

func runSolve(e *env, args []string) error {
	if len(args) > 0 {
		return usagef("solve takes no arguments (got %q)", args[0])
	}
	method := project.Method(*e.opt.extra["method"].(*string))
	if method != project.MethodConstrained && method != project.MethodAverage {
		return usagef("--method must be constrained or average, not %q", method)
	}
	dryRun := *e.opt.extra["dry-run"].(*bool)
	p, ds := project.Load(e.dir())
	if len(ds) > 0 {
		return ds
	}
	rel := p.Settings.Taxonomy.File
	if p.Outline != nil && p.Outline.Edited() {
		return failf("%s was reshaped by hand since ramify wrote it; run `ramify absorb` to record the edits as constraints, then solve again", rel)
	}
	if err := checkGroupNames(p); err != nil {
		return err
	}
	sol, err := p.RegenerateWith(project.RegenOptions{Method: method, Rebuild: *e.opt.extra["rebuild"].(*bool), Progress: e.progressFunc()})
	e.endProgress()
	if err != nil {
		return solveError(e, err)
	}
	var prev *format.Category
	if p.Outline != nil {
		prev = p.Outline.Root
	}
	fillSolveReport(e, p, sol, prev)
	if handled, err := solveElsewhere(e, p, sol, method, dryRun); handled {
		return err
	}
	changed := !bytes.Equal(sol.Text, p.OutlineText)
	if changed && !dryRun {
		if err := writeOutlineGuarded(p, sol.Text); err != nil {
			return err
		}
	}
	e.report["written"] = changed && !dryRun
	printSolveReport(e, p, sol)
	switch {
	case !changed:
		e.say("%s is up to date", rel)
	case dryRun:
		e.say("%s would change (dry run: nothing written)", rel)
	default:
		e.say("wrote %s", rel)
	}
	return nil
}

// solveError turns a conflict into a report that names each record.
func solveError(e *env, err error) error {
	var ce *project.ConflictError
	if !errors.As(err, &ce) {
		return err
	}
	lines := []string{fmt.Sprintf("these %d constraint records cannot all hold:", len(ce.Records))}
	var recs []conflictRecordJSON
	for _, r := range ce.Records {
		lines = append(lines, "  "+describeRecord(r))
		recs = append(recs, conflictRecordJSON{By: r.By, Date: r.Date, File: r.Pos.File, Kind: r.Kind, Line: r.Pos.Line, Note: r.Note})
	}
	lines = append(lines, "change or remove one of them; dropping any one makes the rest agree. Nothing was written.")
	return &failure{lines: lines, detail: conflictJSON{recs}}
}

// conflictJSON names a set of contradicting records in a --json report.
type conflictJSON struct {
	Conflict []conflictRecordJSON `json:"conflict"`
}

// conflictRecordJSON is one record of a contradicting set, with its date.
type conflictRecordJSON struct {
	By   string `json:"by"`
	Date string `json:"date"`
	File string `json:"file"`
	Kind string `json:"kind"`
	Line int    `json:"line"`
	Note string `json:"note"`
}

func describeRecord(r project.Record) string {
	s := fmt.Sprintf("%s:%d: %s", r.Pos.File, r.Pos.Line, r.Kind)
	if r.By != "" {
		s += " by " + r.By
	}
	if r.Date != "" {
		s += " (" + r.Date + ")"
	}
	if r.Note != "" {
		s += ": " + quoteNote(r.Note)
	}
	return s
}

func quoteNote(n string) string {
	n = strings.Join(strings.Fields(n), " ")
	if len(n) > 100 {
		n = n[:97] + "..."
	}
	return `"` + n + `"`
}

func fillSolveReport(e *env, p *project.Project, sol *project.Solution, prev *format.Category) {
	total := len(sol.Compiled.Records)
	violated := len(sol.Violated)
	e.report["items"] = len(p.Items)
	e.report["categories"] = sol.Root.CountCategories()
	e.report["depth"] = sol.Root.Depth()
	e.report["cost"] = roundSig(sol.Cost, 10)
	e.report["edges"] = sol.Graph.NumEdges()
	// Counts of records by kind, as check prints them; the triplets the
	// solver works with (shapes stand for many) are counted apart.
	counts := countRecords(p.Constraints)
	e.report["constraints"] = map[string]any{
		"records":         total,
		"triplets":        counts.Triplets,
		"groups":          counts.Groups,
		"shapes":          counts.Shapes,
		"solver_triplets": sol.Compiled.Triplets,
		"satisfied":       total - violated,
		"violated":        violated,
	}
	moved, movedCats := []string{}, []categoryMoveJSON{}
	if prev != nil {
		rep := diff.CompareChanges(prev, sol.Root)
		moved, movedCats = movesReport(rep)
		e.report["added"] = len(rep.Added)
		e.report["removed"] = len(rep.Removed)
	}
	e.report["moved"] = moved
	e.report["moved_categories"] = movedCats
	e.report["mode"] = sol.Mode
	if sol.Reason != "" {
		e.report["rebuild_reason"] = sol.Reason
	}
	e.report["placed"] = sol.Placed
	e.report["joined"] = sol.Joined
	e.report["seconds"] = roundSig(sol.Seconds, 3)
}

func printSolveReport(e *env, p *project.Project, sol *project.Solution) {
	r := e.report
	e.say("%s in %s, depth %d", plural(len(p.Items), "item", "items"), plural(r["categories"].(int), "category", "categories"), r["depth"])
	e.say("  cost         %s  (Dasgupta, on a graph of %d edges)", formatCost(sol.Cost), sol.Graph.NumEdges())
	c := r["constraints"].(map[string]any)
	if c["records"].(int) == 0 {
		e.say("  constraints  none recorded")
	} else if c["violated"].(int) == 0 {
		e.say("  constraints  %s, all holding", describeRecords(countRecords(p.Constraints)))
	} else {
		e.say("  constraints  %d of %s broken (the average-linkage baseline ignores them)", c["violated"], plural(c["records"].(int), "record", "records"))
	}
	if p.Outline != nil {
		e.say("  moved        %s since the previous outline", describeMoves(len(r["moved"].([]string)), r["moved_categories"].([]categoryMoveJSON)))
	}
	switch sol.Mode {
	case project.ModeRebuild:
		e.say("  solved       from scratch: %s", sol.Reason)
	case project.ModeLocal:
		var done []string
		if sol.Placed > 0 {
			how := "placed where the change forces"
			if len(sol.Regions) > 0 {
				how += fmt.Sprintf(", %s re-solved whole", plural(len(sol.Regions), "subtree", "subtrees"))
			}
			done = append(done, fmt.Sprintf("%s (%s)", plural(sol.Placed, "item", "items"), how))
		}
		if sol.Joined > 0 {
			done = append(done, plural(sol.Joined, "new category", "new categories")+" over existing ones, no item moved out of its category")
		}
		e.say("  solved       locally: %s", strings.Join(done, "; "))
	case project.ModeKept:
		e.say("  solved       locally: nothing forced a change")
	}
	e.say("  time         %.2f s", sol.Seconds)
}

func formatCost(c float64) string {
	return fmt.Sprintf("%.6g", c)
}
