package main

import (
	"fmt"
	"sort"
	"strings"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/binding"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/review/explain"
	"github.com/ramify-tax/ramify/solve/regen"
	"github.com/spf13/pflag"
)

// Sizes above which explain does not solve again by default: the taxonomy
// without records (one solve), and without each record that names the
// item (one solve per record).
const (
	explainFreeLimit   = 20000
	explainDecideLimit = 5000
	explainMaxDecide   = 12
)

func init() {
	register(&command{
		name:    "explain",
		summary: "say why items or categories sit where they do",
		usage:   "ITEM... | CATEGORY/...",
		help: `For an item: its path; the records that name it (kind, file:line, who,
when, why, and what each asks of it), and whether each one decides its
place (solving without that record alone puts it elsewhere); its
strongest neighbours inside its category and outside it, each with its
similarity in the combined graph and in each source's graph (tags, text,
vectors, links); with --support, the committee support of each category
above it; and where solve would put it with no records at all. Both
questions are answered with stability off, from the data and the records
alone: the pull toward the current outline would keep everything where
the records put it.

For a category (an argument ending in "/", a path such as
"Garden/Pruning/" or a name that is unique): its most distinctive tags
and words against the rest of its parent (where a provisional name comes
from), how similar its items are to each other and to the rest of the
parent, its nearest sibling, the records it carries out and, with
--support, its committee support.

Finding what decides needs a solve per record and what happens without
records one more; above 5,000 items (20,000 for the second) they are
skipped unless --solve is given; --no-solve skips them always.`,
		bind: withOptions(func(fs *pflag.FlagSet, o *explainOptions) {
			fs.BoolVar(&o.support, "support", false, "show committee support (solves the committee)")
			fs.BoolVar(&o.solve, "solve", false, "solve without records even for a large taxonomy")
			fs.BoolVar(&o.noSolve, "no-solve", false, "do not solve without records")
		}, runExplain),
	})
}

type explainOptions struct {
	support bool
	solve   bool // solve without records at any size
	noSolve bool // never solve without records
}

// explainReport is explain's --json report: one *explain.Item or
// *explain.Category per argument, in their order.
type explainReport struct {
	Explained []any `json:"explained"`
}

func runExplain(e *env, o *explainOptions, args []string) error {
	if len(args) == 0 {
		return usagef("name at least one item, or a category ending in /")
	}
	if o.solve && o.noSolve {
		return usagef("--solve and --no-solve ask for opposite things; give one")
	}
	p, ds := repo.Load(e.dir())
	if len(ds) > 0 {
		return ds
	}
	if p.Outline == nil {
		return failf("%s does not exist yet; run `ramify solve` first, then explain", p.Settings.Taxonomy.File)
	}
	// Check every argument before any solving.
	var cats []*format.Category
	var catPaths [][]string
	for _, a := range args {
		if strings.HasSuffix(a, "/") {
			c, path, err := explain.FindCategory(p.Outline.Root, a)
			if err != nil {
				return usagef("%v", err)
			}
			cats, catPaths = append(cats, c), append(catPaths, path)
			continue
		}
		if _, ok := p.Index[a]; !ok {
			_, err := explain.ExplainItem(explain.Input{Project: p}, a)
			return usagef("%v", err)
		}
		cats, catPaths = append(cats, nil), append(catPaths, nil)
	}
	in, err := explainInput(e, o, p)
	if err != nil {
		return err
	}
	var reports []any
	for i, a := range args {
		if cats[i] != nil {
			c := explain.ExplainCategory(in, cats[i], catPaths[i])
			reports = append(reports, c)
			continue
		}
		item, err := explain.ExplainItem(in, a)
		if err != nil {
			return err
		}
		if len(in.Records.ForItem(a)) > explainMaxDecide && !o.solve {
			item, err = explain.ExplainItem(noDecide(in), a)
			if err != nil {
				return err
			}
		}
		reports = append(reports, item)
	}
	e.endProgress()
	e.result = &explainReport{Explained: reports}
	for i, r := range reports {
		if i > 0 {
			e.say("")
		}
		switch x := r.(type) {
		case *explain.Item:
			sayItem(e, x, in.Free != nil)
		case *explain.Category:
			sayCategory(e, x)
		}
	}
	return nil
}

// explainInput gathers what explaining needs: the similarity graphs, the
// records, with --support the committee's support, and (unless the
// taxonomy is too large or --no-solve) the tree solved without records
// and a solver of the tree without each record.
func explainInput(e *env, o *explainOptions, p *repo.Repo) (explain.Input, error) {
	progress := e.progressFunc()
	if progress != nil {
		progress("similarity graph", 0, 1)
	}
	g, err := regen.Graph(p, regen.Seed)
	if err != nil {
		return explain.Input{}, err
	}
	sources, err := regen.SourceGraphs(p, regen.Seed)
	if err != nil {
		return explain.Input{}, err
	}
	in := explain.Input{Project: p, Graph: g, Sources: sources, Records: binding.New(p.Constraints)}
	if o.support {
		structure, err := currentTaxonomy(p, "ask for support")
		if err != nil {
			return explain.Input{}, err
		}
		if in.Support, _, err = categorySupport(e, p, structure); err != nil {
			return explain.Input{}, err
		}
	}
	n := len(p.Items)
	if !o.noSolve && (o.solve || n <= explainFreeLimit) {
		if progress != nil {
			progress("solving without records", 0, 1)
		}
		q := unpulled(p)
		q.Constraints = nil
		sol, err := regen.RegenerateWith(q, regen.RegenOptions{Method: regen.MethodConstrained, Rebuild: true})
		if err != nil {
			return explain.Input{}, err
		}
		in.Free = sol.Root
	}
	if !o.noSolve && (o.solve || n <= explainDecideLimit) {
		in.Without = solverWithout(p, len(in.Records.Records), progress)
	}
	return in, nil
}

// solverWithout solves the taxonomy without record r, once per record.
func solverWithout(p *repo.Repo, records int, progress func(stage string, done, total int)) func(r int) (*format.Category, error) {
	cache := map[int]*format.Category{}
	return func(r int) (*format.Category, error) {
		if t, ok := cache[r]; ok {
			return t, nil
		}
		if progress != nil {
			progress("solving without each record", len(cache), records)
		}
		q := unpulled(p)
		q.Constraints = withoutRecord(p.Constraints, r)
		sol, err := regen.RegenerateWith(q, regen.RegenOptions{Method: regen.MethodConstrained, Rebuild: true})
		if err != nil {
			return nil, err
		}
		cache[r] = sol.Root
		return sol.Root, nil
	}
}

// unpulled is the project with stability off: solved again, it gives the
// tree of the data and the records alone. With the pull toward the
// current outline, that outline (which the records shaped) would keep
// every item where it is. The current outline still names the
// categories.
func unpulled(p *repo.Repo) *repo.Repo {
	q := *p
	settings := *p.Settings
	settings.Taxonomy.Stability = 0
	q.Settings = &settings
	return &q
}

func noDecide(in explain.Input) explain.Input {
	in.Without = nil
	return in
}

// withoutRecord copies the constraint files leaving out record r, counted
// in the order binding.New counts them (per file: triplets, groups,
// shapes).
func withoutRecord(files []*format.ConstraintFile, r int) []*format.ConstraintFile {
	out := make([]*format.ConstraintFile, len(files))
	k := 0
	for i, f := range files {
		c := *f
		c.Triplets, c.Groups, c.Shapes = nil, nil, nil
		for _, t := range f.Triplets {
			if k != r {
				c.Triplets = append(c.Triplets, t)
			}
			k++
		}
		for _, g := range f.Groups {
			if k != r {
				c.Groups = append(c.Groups, g)
			}
			k++
		}
		for _, s := range f.Shapes {
			if k != r {
				c.Shapes = append(c.Shapes, s)
			}
			k++
		}
		out[i] = &c
	}
	return out
}

func sayItem(e *env, x *explain.Item, solvedFree bool) {
	e.say("%s  %s", x.ID, x.Label)
	e.say("  in: %s", explain.PathText(x.Path))
	if len(x.Records) == 0 {
		e.say("  records: none name it; the similarities alone place it")
	} else {
		e.say("  records that name it:")
		for _, r := range x.Records {
			decides := ""
			if r.Decides != nil {
				decides = "  [does not decide its place]"
				if *r.Decides {
					decides = "  [decides its place]"
				}
			}
			e.say("    %s %s (%s): %s%s", r.Kind, r.Where, whoWhen(r.By, r.Date), r.Role, decides)
			if r.Note != "" {
				e.say("      %q", r.Note)
			}
		}
	}
	sayNeighbours(e, "  nearest in its category:", x.Inside, false)
	sayNeighbours(e, "  nearest elsewhere:", x.Outside, true)
	if x.Support != nil {
		parts := []string{}
		for _, a := range x.Support {
			parts = append(parts, fmt.Sprintf("%s %.0f%%", explain.PathText(a.Path), 100*a.Support))
		}
		e.say("  support: %s", strings.Join(parts, ", "))
	}
	if solvedFree {
		where := explain.PathText(x.WithoutRecords)
		if strings.Join(x.WithoutRecords, "\x00") == strings.Join(x.Path, "\x00") {
			where += " (the same place)"
		}
		e.say("  without any record: %s", where)
	}
}

func whoWhen(by, date string) string {
	parts := []string{}
	if by != "" {
		parts = append(parts, "by "+by)
	}
	if date != "" {
		parts = append(parts, date)
	}
	if len(parts) == 0 {
		return "no author given"
	}
	return strings.Join(parts, ", ")
}

func sayNeighbours(e *env, title string, ns []explain.Neighbour, withPath bool) {
	if len(ns) == 0 {
		e.say("%s none linked in the similarity graph", title)
		return
	}
	e.say("%s", title)
	for _, nb := range ns {
		names := make([]string, 0, len(nb.Sources))
		for s := range nb.Sources {
			names = append(names, s)
		}
		sort.Strings(names)
		src := make([]string, len(names))
		for i, s := range names {
			src[i] = fmt.Sprintf("%s %.3f", s, nb.Sources[s])
		}
		where := ""
		if withPath {
			where = "  in " + explain.PathText(nb.Path)
		}
		e.say("    %.3f  %s  %s%s  (%s)", nb.Similarity, nb.ID, nb.Label, where, strings.Join(src, ", "))
	}
}

func sayCategory(e *env, c *explain.Category) {
	name := strings.Join(c.Path, " / ")
	e.say("%s/  %s", name, plural(c.Items, "item", "items"))
	if c.Provisional {
		e.say("  the name is provisional: made up from the words below, not yet confirmed")
	}
	parts := []string{}
	for _, w := range c.Words {
		parts = append(parts, fmt.Sprintf("%s (%.0f%% here, %.0f%% in the rest of its parent)", w.Word, 100*w.Inside, 100*w.Outside))
	}
	e.say("  distinctive words and tags: %s", strings.Join(parts, "; "))
	e.say("  mean similarity of two of its items %.3f; to the rest of its parent %.3f", c.Cohesion, c.Apart)
	if c.Nearest != nil {
		e.say("  nearest sibling: %s (%.3f)", explain.PathText(c.Nearest.Path), c.Nearest.Similarity)
	}
	if len(c.Records) == 0 {
		e.say("  records: none hold it; the similarities alone make it")
	} else {
		e.say("  records that hold it:")
		for _, r := range c.Records {
			e.say("    %s %s (%s): %s", r.Kind, r.Where, whoWhen(r.By, r.Date), r.Role)
			if r.Note != "" {
				e.say("      %q", r.Note)
			}
		}
	}
	if c.Support != nil {
		e.say("  support: %.0f%%", 100**c.Support)
	}
}
