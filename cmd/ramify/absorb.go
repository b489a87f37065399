package main

import (
	"os"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/review"
	"github.com/ramify-tax/ramify/solve/regen"
	"github.com/spf13/pflag"
)

func init() {
	register(&command{
		name:    "absorb",
		summary: "record answered review packets and hand edits of the taxonomy as constraints",
		help: `Reads every packet in reviews/open/ and the taxonomy outline, and records
what reviewers and editors decided:

  verdict: ok       the grouping shown was right; the packet moves to
                    reviews/done/ with its verdict, reviewer and date
  verdict: fixed    the packet's tree, as the reviewer rearranged it, becomes
                    a shape constraint in constraints/review-PACKET.toml
                    (with the reviewer, the date, the packet and the
                    taxonomy it was drawn from); the packet moves to
                    reviews/done/
  verdict: pending  left alone

reviews/done/ is the audit log: one file per answered packet, so two
branches that absorb different packets merge without conflict.

A hand edit of the outline (lines moved to other categories) is recorded
as at most three triplet records per moved item, in
constraints/edit-HASH.toml, so that the next "ramify solve" keeps each
item where the editor put it; renamed categories keep their new names.
To see what moved, absorb needs the tree ramify last wrote: it looks for
it in git (HEAD, then earlier commits of the outline) by its "# structure"
line. Outside git, or when git no longer has it, pass a copy of that tree
with --base FILE. absorb then rewrites the outline with a fresh structure
line; run "ramify solve" next.

The reviewer is the packet's "reviewer:" line, else --by, else git's
user.name. Any malformed packet, unknown item or contradiction with the
recorded constraints is reported with its file and line, and then
nothing is written.`,
		bind: withOptions(func(fs *pflag.FlagSet, o *absorbOptions) {
			fs.StringVar(&o.by, "by", "", "who made the decisions (default: each packet's reviewer, else git config user.name)")
			fs.StringVar(&o.base, "base", "", "the outline ramify last wrote, for hand edits outside git (a file in the repository)")
			addDateFlag(fs, &o.date, "the date the decisions are recorded on")
		}, runAbsorb),
	})
}

type absorbOptions struct {
	by   string
	base string // the outline ramify last wrote, for a hand edit outside git
	date string
}

// absorbReport is absorb's --json report, once everything is written.
type absorbReport struct {
	Absorbed []absorbedJSON `json:"absorbed"`
	Edit     *editJSON      `json:"edit"` // nil: no hand edit
	// EditAgainst are the earlier records the hand edit goes against.
	EditAgainst []recordJSON `json:"edit_against,omitempty"`
	Pending     int          `json:"pending"`
}

// editJSON is a hand edit of the outline in absorb's report.
type editJSON struct {
	Base            string        `json:"base"`
	Constraints     string        `json:"constraints"` // "" when nothing needed pinning
	From            string        `json:"from"`
	Moved           []moveJSON    `json:"moved"`
	MovedCategories []catMoveJSON `json:"moved_categories"`
	To              string        `json:"to"`
}

type moveJSON struct {
	Item string `json:"item"`
	From string `json:"from"`
	To   string `json:"to"`
	Pins int    `json:"pins"`
}

type catMoveJSON struct {
	From  string   `json:"from"`
	To    string   `json:"to"`
	Items []string `json:"items"`
	Shape bool     `json:"shape"`
}

// absorbWrite is one file absorb writes (or, with remove, deletes).
type absorbWrite struct {
	rel    string
	data   []byte
	remove bool
}

type absorbedJSON struct {
	Packet     string `json:"packet"`
	Reason     string `json:"reason"`
	Verdict    string `json:"verdict"`
	Reviewer   string `json:"reviewer"`
	Done       string `json:"done"`
	Constraint string `json:"constraint,omitempty"`
	// SideBySide counts the triplets of the packet as drawn that a
	// "fixed" answer lays side by side (review.SideBySide), which its
	// shape keeps with side_by_side = true.
	SideBySide int `json:"side_by_side,omitempty"`
}

func runAbsorb(e *env, o *absorbOptions, args []string) error {
	if err := noArguments("absorb", args, ""); err != nil {
		return err
	}
	date, err := reviewDate(o.date)
	if err != nil {
		return err
	}
	p, ds := repo.Load(e.dir())
	if len(ds) > 0 {
		return ds
	}
	open, ds := readPackets(p.Dir, review.OpenDir)
	if len(ds) > 0 {
		return ds
	}
	names := &reviewerNames{dir: p.Dir, flag: o.by}
	plan, err := planAnswers(p, open, names, date)
	if err != nil {
		return err
	}
	writes, added, absorbed := plan.writes, plan.added, plan.absorbed
	edit, err := absorbHandEdit(e, p, o.base, names, date)
	if err != nil {
		return err
	}
	if edit != nil {
		if edit.file != nil {
			added = append(added, edit.file)
			writes = append(writes, absorbWrite{rel: edit.file.File, data: edit.text})
		}
		writes = append(writes, absorbWrite{rel: p.Settings.Taxonomy.File, data: edit.outline})
	}
	if err := checkAbsorbed(e, p, added); err != nil {
		return err
	}
	if err := commitWrites(p.Dir, writes); err != nil {
		return err
	}
	reportAbsorb(e, p, absorbed, edit, plan.pending)
	return nil
}

// parsedConstraintFile prints a new constraint file and reads it back, so
// that the records checked are exactly those written.
func parsedConstraintFile(rel string, cf *format.ConstraintFile) (*format.ConstraintFile, []byte, format.Diags) {
	cf.File = rel
	text := format.FormatConstraints(cf)
	parsed, err := format.ParseConstraints(rel, text)
	if err != nil {
		return nil, nil, format.AsDiags(err, rel)
	}
	return parsed, text, nil
}

// checkAbsorbed fails when the new records contradict the recorded ones,
// naming the smallest conflicting set.
func checkAbsorbed(e *env, p *repo.Repo, added []*format.ConstraintFile) error {
	if len(added) == 0 {
		return nil
	}
	p.Constraints = append(p.Constraints, added...)
	compiled := regen.Compile(p)
	if err := compiled.Consistent(len(p.Items)); err != nil {
		return solveError(e, err)
	}
	return nil
}

func reportAbsorb(e *env, p *repo.Repo, absorbed []absorbedJSON, edit *handEdit, pending int) {
	rep := &absorbReport{Absorbed: absorbed, Pending: pending}
	e.result = rep
	for _, a := range absorbed {
		switch {
		case a.Constraint != "":
			e.say("recorded %s (fixed by %s) as %s; moved it to %s", a.Packet, a.Reviewer, a.Constraint, a.Done)
		default:
			e.say("moved %s (%s by %s) to %s", a.Packet, a.Verdict, a.Reviewer, a.Done)
		}
	}
	if edit != nil {
		reportHandEdit(e, rep, p, edit)
	}
	if pending > 0 {
		e.say("%s still pending in %s", plural(pending, "packet", "packets"), review.OpenDir)
	}
	if len(absorbed) == 0 && edit == nil {
		e.say("nothing to absorb: no answered packets and no hand edits")
		return
	}
	recorded := edit != nil
	for _, a := range absorbed {
		recorded = recorded || a.Constraint != ""
	}
	if recorded {
		e.say("next: run `ramify solve` to regenerate %s under the new records", p.Settings.Taxonomy.File)
	}
}

// reviewerNames finds who made a decision when a file does not say: --by,
// else git config user.name (asked once).
type reviewerNames struct {
	dir, flag string
	asked     bool
	git       string
}

func (r *reviewerNames) get() string {
	if r.flag != "" {
		return r.flag
	}
	if !r.asked {
		r.asked = true
		r.git = gitUserName(r.dir)
	}
	return r.git
}

func fileExists(path string) bool {
	_, err := os.Lstat(path)
	return err == nil
}

// lineStarting is the line of the first line starting with prefix, or 1.
func lineStarting(data []byte, prefix string) int {
	line := 1
	start := 0
	for i := 0; i <= len(data); i++ {
		if i == len(data) || data[i] == '\n' {
			if len(data[start:i]) >= len(prefix) && string(data[start:start+len(prefix)]) == prefix {
				return line
			}
			line++
			start = i + 1
		}
	}
	return 1
}
