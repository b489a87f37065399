package main

import (
	"bytes"
	"errors"
	"fmt"
	"strings"

	"github.com/ramify-tax/ramify/diff"
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/solve/regen"
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
		bind: withOptions(func(fs *pflag.FlagSet, o *solveOptions) {
			fs.StringVar(&o.method, "method", "constrained", "how to build the tree: constrained or average")
			fs.BoolVar(&o.dryRun, "dry-run", false, "report what would change without writing the outline")
			fs.StringVar(&o.out, "out", "", "write the tree to this `FILE` in the repository and leave the taxonomy alone")
			fs.BoolVar(&o.replace, "replace", false, "with --method average: replace the taxonomy even though the baseline breaks records")
			fs.BoolVar(&o.rebuild, "rebuild", false, "solve from scratch instead of changing only what the new inputs force")
		}, runSolve),
	})
}

type solveOptions struct {
	method  string
	dryRun  bool
	out     string
	replace bool
	rebuild bool
}

// solveReport is solve's --json report, filled once the tree is solved.
type solveReport struct {
	Added           *int               `json:"added,omitempty"` // with a previous outline
	Categories      int                `json:"categories"`
	Constraints     solveConstraints   `json:"constraints"`
	Cost            float64            `json:"cost"`
	Depth           int                `json:"depth"`
	Edges           int                `json:"edges"`
	Items           int                `json:"items"`
	Joined          int                `json:"joined"`
	Mode            string             `json:"mode"`
	Moved           []string           `json:"moved"`
	MovedCategories []categoryMoveJSON `json:"moved_categories"`
	Out             string             `json:"out,omitempty"`
	Placed          int                `json:"placed"`
	RebuildReason   string             `json:"rebuild_reason,omitempty"`
	// Regions lists, by their item counts, the subtrees a local re-solve
	// solved again whole because no single placement kept every record.
	Regions []int `json:"regions"`
	// SideBySideNotKept counts the side-by-side answers another record
	// kept from holding in full.
	SideBySideNotKept int     `json:"side_by_side_not_kept"`
	Removed           *int    `json:"removed,omitempty"` // with a previous outline
	Seconds           float64 `json:"seconds"`
	Written           *bool   `json:"written,omitempty"` // nil when solve stopped before writing
}

// solveConstraints counts the records by kind, as check prints them; the
// triplets the solver works with (shapes stand for many) apart.
type solveConstraints struct {
	Groups int `json:"groups"`
	// LinkedTriplets counts the triplets that link answers through the
	// category names typed in them (regen.Compiled.Linked).
	LinkedTriplets int `json:"linked_triplets"`
	Records        int `json:"records"`
	Satisfied      int `json:"satisfied"`
	Shapes         int `json:"shapes"`
	SolverTriplets int `json:"solver_triplets"`
	Triplets       int `json:"triplets"`
	Violated       int `json:"violated"`
}

func runSolve(e *env, o *solveOptions, args []string) error {
	if err := noArguments("solve", args, ""); err != nil {
		return err
	}
	method := regen.Method(o.method)
	if method != regen.MethodConstrained && method != regen.MethodAverage {
		return usagef("--method must be constrained or average, not %q", method)
	}
	dryRun := o.dryRun
	p, ds := repo.Load(e.dir())
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
	var prev *format.Category
	if p.Outline != nil {
		prev = p.Outline.Root
	}
	// What moved is read off the named categories while the outline is
	// printed from them.
	var changes *diff.Report
	named := func(root *format.Category) {
		if prev != nil {
			changes = diff.CompareChanges(prev, root)
		}
	}
	sol, err := regen.RegenerateWith(p, regen.RegenOptions{Method: method, Rebuild: o.rebuild, Progress: e.progressFunc(), Named: named})
	e.endProgress()
	if err != nil {
		return solveError(e, err)
	}
	rep := solveReportOf(p, sol, changes)
	e.result = rep
	if handled, err := solveElsewhere(e, o, rep, p, sol); handled {
		return err
	}
	changed := !bytes.Equal(sol.Text, p.OutlineText)
	if changed && !dryRun {
		if err := writeOutlineGuarded(p, sol.Text); err != nil {
			return err
		}
	}
	written := changed && !dryRun
	rep.Written = &written
	printSolveReport(e, rep, p, sol)
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
	var ce *regen.ConflictError
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

func describeRecord(r regen.Record) string {
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

// solveReportOf is the report of sol; changes is what moved since the
// previous outline, nil when there is none.
func solveReportOf(p *repo.Repo, sol *regen.Solution, changes *diff.Report) *solveReport {
	total := sol.Compiled.Editorial()
	violated := len(sol.Compiled.EditorialViolated(sol.Violated))
	counts := countRecords(p.Constraints)
	rep := &solveReport{
		Items:      len(p.Items),
		Categories: sol.Root.CountCategories(),
		Depth:      sol.Root.Depth(),
		Cost:       roundSig(sol.Cost, 10),
		Edges:      sol.Graph.NumEdges(),
		Constraints: solveConstraints{
			Records:        total,
			Triplets:       counts.Triplets,
			Groups:         counts.Groups,
			Shapes:         counts.Shapes,
			SolverTriplets: sol.Compiled.Triplets,
			LinkedTriplets: sol.Compiled.Linked,
			Satisfied:      total - violated,
			Violated:       violated,
		},
		Moved:             []string{},
		MovedCategories:   []categoryMoveJSON{},
		Mode:              sol.Mode,
		RebuildReason:     sol.Reason,
		Placed:            sol.Placed,
		Regions:           append([]int{}, sol.Regions...),
		SideBySideNotKept: len(sol.SideBySideNotKept),
		Joined:            sol.Joined,
		Seconds:           roundSig(sol.Seconds, 3),
	}
	if changes != nil {
		rep.Moved, rep.MovedCategories = movesReport(changes)
		added, removed := len(changes.Added), len(changes.Removed)
		rep.Added, rep.Removed = &added, &removed
	}
	return rep
}

func printSolveReport(e *env, r *solveReport, p *repo.Repo, sol *regen.Solution) {
	e.say("%s in %s, depth %d", plural(len(p.Items), "item", "items"), plural(r.Categories, "category", "categories"), r.Depth)
	e.say("  cost         %s  (Dasgupta, on a graph of %d edges)", formatCost(sol.Cost), sol.Graph.NumEdges())
	c := r.Constraints
	if c.Records == 0 {
		e.say("  constraints  none recorded")
	} else if c.Violated == 0 {
		e.say("  constraints  %s, all holding", describeRecords(countRecords(p.Constraints)))
	} else {
		e.say("  constraints  %d of %s broken (the average-linkage baseline ignores them)", c.Violated, plural(c.Records, "record", "records"))
	}
	if sol.Compiled.Linked > 0 {
		e.say("  names        answers linked by the category names typed in them (%s)", plural(sol.Compiled.Linked, "triplet", "triplets"))
	}
	if n := len(sol.SideBySideNotKept); n > 0 {
		e.say("  side by side %s not kept in full: parting the items would break another record", plural(n, "answer", "answers"))
	}
	if p.Outline != nil {
		e.say("  moved        %s since the previous outline", describeMoves(len(r.Moved), r.MovedCategories))
	}
	switch sol.Mode {
	case regen.ModeRebuild:
		e.say("  solved       from scratch: %s", sol.Reason)
	case regen.ModeLocal:
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
		if sol.PartedSideBySide {
			done = append(done, "items that answers lay side by side moved up to where they meet")
		}
		e.say("  solved       locally: %s", strings.Join(done, "; "))
	case regen.ModeKept:
		e.say("  solved       locally: nothing forced a change")
	}
	e.say("  time         %.2f s", sol.Seconds)
}

func formatCost(c float64) string {
	return fmt.Sprintf("%.6g", c)
}
