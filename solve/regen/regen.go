// Package regen regenerates the taxonomy of a repository loaded by
// format/repo: it compiles the constraint records into the solver's
// triplets and clusters, builds the similarity graph and the committee's
// views of the items, solves (a local re-solve of the previous outline
// when the change is small, a rebuild otherwise), names the categories
// and carries their concept identifiers, and formats the outline.
package regen

import (
	"errors"
	"fmt"
	"path"
	"slices"
	"strings"
	"time"

	"github.com/ramify-tax/ramify/diff/concept"
	"github.com/ramify-tax/ramify/diff/match"
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/solve"
	"github.com/ramify-tax/ramify/solve/graph"
	"github.com/ramify-tax/ramify/solve/naming"
)

// Seed fixes every pseudo-random choice of a regeneration, so the same
// inputs give the same outline on every machine.
const Seed uint64 = 0x7261_6d69_6679

// CommitteeOptions are the solver options of a regeneration without the
// pull toward the previous outline: what the review committee solves each
// of its trees with, so that support measures the data and the decisions
// alone.
func CommitteeOptions(p *repo.Repo) solve.Options {
	return solve.Options{
		MinSize:     p.Settings.Taxonomy.MinSize,
		MaxChildren: p.Settings.Taxonomy.MaxChildren,
		MaxDepth:    p.Settings.Taxonomy.MaxDepth,
		Seed:        Seed,
	}
}

// Method chooses how the tree is built.
type Method string

const (
	// MethodConstrained is the constrained top-down construction under
	// Dasgupta's cost; the default.
	MethodConstrained Method = "constrained"
	// MethodAverage is plain average linkage on the same graph, the
	// baseline; it ignores the constraints.
	MethodAverage Method = "average"
)

// Solution is a regenerated taxonomy with what the report needs.
type Solution struct {
	Root     *format.Category
	Text     []byte // the outline file, canonical, with header
	Graph    *graph.CSR
	Tree     *solve.Tree // the multiway tree over item indices
	Cost     float64
	Compiled *Compiled
	// Violated lists the records the tree breaks (only possible with the
	// average-linkage baseline).
	Violated []int
	Seconds  float64
	// Mode is how the tree came about (ModeKept, ModeLocal, ModeRebuild);
	// Reason says why it was rebuilt.
	Mode, Reason string
	// Placed counts the items a local re-solve took out and put back;
	// Joined the categories it added over existing ones; Regions the
	// sizes of the subtrees it had to re-solve whole.
	Placed  int
	Joined  int
	Regions []int
	// SideBySideNotKept lists the side-by-side shapes (record indices)
	// whose categories could not all keep their entries side by side
	// without breaking another record (solve.KeepSideBySide).
	SideBySideNotKept []int
	// PartedSideBySide is set when items that answers lay side by side
	// were moved up to where they meet (solve.KeepSideBySide).
	PartedSideBySide bool
}

// ConflictError says that the constraint records cannot all hold; Records
// is a minimal conflicting set (dropping any one of them resolves it).
type ConflictError struct {
	Records []Record
}

func (e *ConflictError) Error() string {
	return fmt.Sprintf("%d constraint records contradict each other", len(e.Records))
}

// RegenOptions steer Regenerate.
type RegenOptions struct {
	Method Method
	// Rebuild solves from scratch (with the stability pull toward the
	// previous outline) even when a local re-solve would do.
	Rebuild  bool
	Progress func(stage string, done, total int)
	// Named, when set, is called with the new categories once they are
	// named and in canonical order, while the outline is printed from
	// them (a report of what moved need not wait for the text). It must
	// only read root; Regenerate returns after it does.
	Named func(root *format.Category)
}

// Modes of a regeneration (Solution.Mode).
const (
	// ModeKept: nothing forced a change; the previous tree stands.
	ModeKept = "kept"
	// ModeLocal: the previous tree was repaired where the change forces
	// it (solve.Repair).
	ModeLocal = "local"
	// ModeRebuild: solved from scratch.
	ModeRebuild = "rebuild"
)

// LocalShare is the largest share of the items that may be new or gone
// for a local re-solve; a larger change rebuilds the tree.
const LocalShare = 0.10

// Regenerate solves the taxonomy from the repository's inputs. progress may
// be nil. The previous outline (if any) gives names and, with stability,
// a pull toward the previous shape.
func Regenerate(p *repo.Repo, method Method, progress func(stage string, done, total int)) (*Solution, error) {
	return RegenerateWith(p, RegenOptions{Method: method, Progress: progress})
}

// RegenerateWith solves the taxonomy. What stability means: among the
// trees that satisfy every record, ramify writes the previous tree changed
// only where the change of inputs forces it — new items placed, items that
// a new or changed record names moved as little as the records need, items
// a removed record held let go, removed items dropped in place — and among
// such repairs the one whose Dasgupta cost rises least (solve.Repair). The
// stability setting is how much costlier (1 + stability times) an item's
// old place may be than its best one and still keep it, and the strength
// of the pull toward the previous tree when the tree is rebuilt. A rebuild
// happens with --rebuild, on the first solve, after an import, and when
// over LocalShare of the items are new or gone; Solution.Mode and Reason
// say which happened and why.
func RegenerateWith(p *repo.Repo, ro RegenOptions) (*Solution, error) {
	start := time.Now()
	progress := ro.Progress
	if len(p.Items) == 0 {
		return nil, errors.New("there are no items yet; add some to " + itemsFilesText(p))
	}
	compiled := Compile(p)
	if progress != nil {
		progress("similarity graph", 0, 1)
	}
	keys := p.RecordKeys()
	// The graph and the plan of a local re-solve read the repository
	// only, so they are made at once; each is what it would be alone.
	var g *graph.CSR
	var err error
	done := make(chan struct{})
	go func() {
		defer close(done)
		g, err = Graph(p, Seed)
	}()
	plan, reason := planLocal(p, ro, keys, compiled)
	<-done
	if err != nil {
		return nil, err
	}
	if progress != nil {
		progress("similarity graph", 1, 1)
	}
	opt := CommitteeOptions(p)
	opt.Stability = p.Settings.Taxonomy.Stability
	opt.Progress = progress
	ids := p.ItemIDs()
	sol := &Solution{Graph: g, Compiled: compiled}
	tree, err := solveTree(p, ro, g, compiled, opt, ids, plan, reason, sol)
	if err != nil {
		return nil, err
	}
	// The cost and the records' check read the tree only, while naming
	// and formatting work on the categories made from it: they run at
	// once, and each gives what it would alone.
	costDone := make(chan struct{})
	go func() {
		defer close(costDone)
		sol.Cost = solve.Cost(g, tree)
		sol.Violated = solve.Satisfies(tree, compiled.Constraints)
	}()
	root := ToCategory(tree, ids)
	var prev *format.Category
	if p.Outline != nil {
		prev = p.Outline.Root
	}
	// Names and concept identifiers pass from the previous outline by one
	// matching; it depends only on the members, which naming leaves alone.
	var carried []match.Pair
	matched := make([]concept.Matched, 0, 1+len(p.NameSources))
	if prev != nil {
		carried = naming.Carried(prev, root)
		matched = append(matched, concept.Matched{Prev: prev, Pairs: carried})
	}
	nameCategories(p, root, prev, carried, compiled.Linked > 0)
	for _, src := range p.NameSources {
		if src != nil {
			matched = append(matched, concept.Matched{Prev: src, Pairs: naming.Carried(src, root)})
		}
	}
	concept.CarryMatched(root, matched...)
	sol.Root, sol.Tree = root, tree
	root.Sort()
	namedDone := make(chan struct{})
	go func() {
		defer close(namedDone)
		if ro.Named != nil {
			ro.Named(root)
		}
	}()
	sol.Text = format.FormatSortedOutlineRecords(root, keys)
	<-namedDone
	<-costDone
	sol.Seconds = time.Since(start).Seconds()
	return sol, nil
}

// solveTree makes the tree over item indices: the local re-solve of the
// previous outline when the change is small, else a rebuild, then the
// side-by-side answers kept. It records in sol how the tree came about.
func solveTree(p *repo.Repo, ro RegenOptions, g *graph.CSR, compiled *Compiled, opt solve.Options, ids []string, plan *localPlan, reason string, sol *Solution) (*solve.Tree, error) {
	var tree *solve.Tree
	var err error
	if plan != nil {
		if err := compiled.Consistent(len(p.Items)); err != nil {
			return nil, err
		}
		if opt.MaxChildren == 1 {
			return nil, errors.New("solve: max children must be at least 2")
		}
		var rep *solve.RepairReport
		opt.Prior = PriorClusters(p.Outline.Root, p.Index)
		tree, rep, err = solve.Repair(g, compiled.Constraints, plan.prev, plan.change, opt)
		if err != nil {
			return nil, err
		}
		sol.Mode, sol.Placed, sol.Joined, sol.Regions = ModeLocal, rep.Placed, rep.Joined, rep.Regions
		if rep.Placed == 0 && rep.Joined == 0 {
			sol.Mode = ModeKept
		}
		if rep.Rebuilt {
			sol.Mode, sol.Reason = ModeRebuild, "no local repair keeps every record"
		}
	} else {
		sol.Mode, sol.Reason = ModeRebuild, reason
		tree, err = rebuild(p, ro.Method, g, compiled, opt, ids)
		if err != nil {
			return nil, err
		}
	}
	// Side-by-side answers hold after solving: the items they lay side by
	// side are parted where the tree groups them, as far as the records
	// allow. A tree that keeps them is left as it is, so solve after solve
	// changes nothing.
	kept, notKept := solve.KeepSideBySide(tree, compiled.Constraints)
	if kept != tree {
		sol.PartedSideBySide = true
		if sol.Mode == ModeKept {
			sol.Mode = ModeLocal
		}
	}
	sol.SideBySideNotKept = notKept
	if err := holdsEachItemOnce(kept); err != nil {
		return nil, err
	}
	return kept, nil
}

// holdsEachItemOnce refuses a tree that misses an item or holds one
// twice. Neither can happen when the solver and the repairs are right;
// the check is cheap next to them and keeps a flaw from ever writing an
// outline that check would reject.
func holdsEachItemOnce(t *solve.Tree) error {
	seen := make([]bool, t.N)
	count := 0
	for _, l := range t.Leaves(t.Root) {
		if l < 0 || int(l) >= t.N || seen[l] {
			return fmt.Errorf("solve: internal error: the tree holds item %d twice", l)
		}
		seen[l] = true
		count++
	}
	if count != t.N {
		return fmt.Errorf("solve: internal error: the tree holds %d of %d items", count, t.N)
	}
	return nil
}

// rebuild solves from scratch. With stability, the previous outline pulls
// the new tree toward itself, so solving twice could move a few items the
// second time. Each round therefore takes the previous round's tree as
// the prior until the shape settles.
func rebuild(p *repo.Repo, method Method, g *graph.CSR, compiled *Compiled, opt solve.Options, ids []string) (*solve.Tree, error) {
	var prior *format.Category
	if p.Outline != nil {
		prior = p.Outline.Root
	}
	var tree *solve.Tree
	for round := 0; round < maxSettleRounds; round++ {
		if prior != nil {
			opt.Prior = PriorClusters(prior, p.Index)
		}
		t, err := build(p, method, g, compiled, opt)
		if err != nil {
			return nil, err
		}
		tree = t
		if opt.Stability == 0 || prior == nil {
			break
		}
		next := ToCategory(tree, ids)
		if format.StructureHash(next) == format.StructureHash(prior) {
			break
		}
		prior = next
	}
	return tree, nil
}

// localPlan is what a local re-solve starts from: the previous tree over
// the current items (new items not in it yet) and the items that removed
// records let go.
type localPlan struct {
	prev   *solve.Tree
	change solve.Change
}

// planLocal decides whether a local re-solve applies; when not, it says
// why the tree is rebuilt.
func planLocal(p *repo.Repo, ro RegenOptions, keys []format.OutlineRecord, compiled *Compiled) (*localPlan, string) {
	switch {
	case ro.Method == MethodAverage:
		return nil, "the average-linkage baseline is always built from scratch"
	case ro.Rebuild:
		return nil, "asked for with --rebuild"
	case p.Outline == nil:
		return nil, "there is no previous outline"
	case p.Outline.Structure == "":
		return nil, "the previous outline was not written by ramify (imported or made by hand)"
	}
	known := 0
	before := p.Outline.Root.AllItems()
	for _, id := range before {
		if _, ok := p.Index[id]; ok {
			known++
		}
	}
	if known == 0 {
		return nil, "no item of the previous outline is left"
	}
	gone := len(before) - known
	fresh := len(p.Items) - known
	if float64(gone+fresh) > LocalShare*float64(len(p.Items)) {
		return nil, fmt.Sprintf("%d of %d items are new or gone (over %d%%)", gone+fresh, len(p.Items), int(LocalShare*100))
	}
	current := map[string]bool{}
	for _, k := range keys {
		current[k.Key] = true
	}
	var freed []int32
	for _, r := range p.Outline.Records {
		if current[r.Key] {
			continue
		}
		for _, id := range r.Items {
			if i, ok := p.Index[id]; ok {
				freed = append(freed, int32(i))
			}
		}
	}
	slices.Sort(freed)
	// Records of hand edits are mended by moving what the editor moved.
	whole := map[int]bool{}
	for i, r := range compiled.Records {
		if strings.HasPrefix(path.Base(r.Pos.File), repo.HandEditPrefix) {
			whole[i] = true
		}
	}
	return &localPlan{
		prev:   CategoryTree(dissolveShrunk(p, p.Outline.Root), p.Index, len(p.Items)),
		change: solve.Change{Freed: slices.Compact(freed), Whole: whole},
	}, ""
}

// dissolveShrunk returns a copy of root in which every category that lost
// items (they are gone from the items files) and is left with fewer than
// min_size hands what is left to its parent: a shelf emptied down to one
// tool is no shelf any more. Categories that lost nothing stay as they are,
// however small.
func dissolveShrunk(p *repo.Repo, root *format.Category) *format.Category {
	minSize := p.Settings.Taxonomy.MinSize
	out := root.Clone()
	var rec func(c *format.Category) (known int, lost bool)
	rec = func(c *format.Category) (int, bool) {
		known, lost := 0, false
		var kids []*format.Category
		for _, ch := range c.Children {
			k, l := rec(ch)
			known += k
			lost = lost || l
			if l && k < minSize && k > 0 {
				c.Items = append(c.Items, ch.Items...)
				kids = append(kids, ch.Children...)
				continue
			}
			kids = append(kids, ch)
		}
		c.Children = kids
		for _, it := range c.Items {
			if _, ok := p.Index[it]; ok {
				known++
			} else {
				lost = true
			}
		}
		return known, lost
	}
	rec(out)
	return out
}

// maxSettleRounds bounds the rounds Regenerate spends letting a tree
// settle under its own stability pull.
const maxSettleRounds = 4

// build runs one construction with the chosen method.
func build(p *repo.Repo, method Method, g *graph.CSR, compiled *Compiled, opt solve.Options) (*solve.Tree, error) {
	if method == MethodAverage {
		res, err := solve.Baseline(g, opt)
		if err != nil {
			return nil, err
		}
		return res.Taxonomy, nil
	}
	res, err := solve.Solve(g, compiled.Constraints, opt)
	if err != nil {
		return nil, compiled.NameConflict(err)
	}
	return res.Taxonomy, nil
}

func itemsFilesText(p *repo.Repo) string {
	if len(p.Settings.Items.Files) == 1 {
		return p.Settings.Items.Files[0]
	}
	return "the items files"
}
