// Package stable measures how much one new editorial decision moves: it
// adds one decision at a time to the same solved repository, runs the
// ramify commands a user would, and counts the items whose category
// changed beyond those the decision names, and the top-level categories
// that vanished although the decision names none of their items. The
// commands run through a Runner, in-process in tests and as the built
// binary in the bench command, so the measure is of what users get.
package stable

import (
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"

	"github.com/ramify-tax/ramify/diff"
	"github.com/ramify-tax/ramify/format"
)

// Runner runs one ramify command line (without the program name) and
// returns its standard output, or an error carrying what it printed.
type Runner func(args ...string) (string, error)

// Kinds are the decisions measured, one record of each kind at a time:
// a triplet the tree breaks, a group over items of two categories, a
// fixed packet (a shape record moving one of eight items to the other of
// its two categories), and a hand move of one item in the outline,
// recorded by `absorb`.
var Kinds = []string{"triplet", "group", "shape", "move"}

// Result is what the decisions of one kind moved.
type Result struct {
	Kind string
	// Shares holds, ascending, the share of the items each decision moved
	// beyond those it names.
	Shares []float64
	// Dissolved counts the top-level categories, over all decisions, that
	// ceased to be top-level categories although the decision named none
	// of their items (see moved).
	Dissolved int
}

// Median is the median share moved (the upper one of an even count).
func (r Result) Median() float64 {
	if len(r.Shares) == 0 {
		return 0
	}
	return r.Shares[len(r.Shares)/2]
}

// Max is the largest share moved.
func (r Result) Max() float64 {
	if len(r.Shares) == 0 {
		return 0
	}
	return r.Shares[len(r.Shares)-1]
}

// recordFile is the constraint file the measure writes and removes, and
// baseCopy the copy of the solved outline absorb compares a hand move
// with.
const (
	recordFile = "bench-stability.toml"
	baseCopy   = "bench-stability-base.outline"
)

// Measure adds trials decisions of one kind, each alone, to the solved
// repository in dir, solves, and measures what moved. Before each trial
// and at the end the outline is put back as it was and the files the
// decision added under constraints/ are removed, so the trials are
// independent and the repository is left as found. A decision that
// contradicts the repository's own records is skipped. The decisions are
// drawn from a stream seeded by the kind, so a run repeats exactly.
func Measure(run Runner, dir, kind string, trials int) (Result, error) {
	res := Result{Kind: kind}
	repo, root, err := openTrialRepo(run, dir)
	if err != nil {
		return res, err
	}
	b := newBaseTree(root)
	rng := rand.New(rand.NewPCG(1, uint64(len(kind))))
	for range trials {
		d, ok := b.draw(rng, kind, repo.base)
		if !ok {
			continue
		}
		after, done, err := repo.trial(&d)
		if err != nil {
			return res, err
		}
		if !done {
			continue
		}
		share, dissolved := b.moved(after, d.named)
		res.Shares = append(res.Shares, share)
		res.Dissolved += dissolved
		if err := repo.restore(); err != nil {
			return res, err
		}
	}
	slices.Sort(res.Shares)
	return res, nil
}

// trialRepo is the repository Measure works in: the solved outline as it
// was (base) and the files under constraints/ before any trial.
type trialRepo struct {
	run         Runner
	dir         string
	outlinePath string
	constraints string
	base        []byte
	before      []string
}

// openTrialRepo reads the solved repository in dir and returns it with
// the root of its outline.
func openTrialRepo(run Runner, dir string) (*trialRepo, *format.Category, error) {
	r := &trialRepo{run: run, dir: dir, outlinePath: filepath.Join(dir, "taxonomy.outline"), constraints: filepath.Join(dir, "constraints")}
	if err := os.MkdirAll(r.constraints, 0o755); err != nil {
		return nil, nil, err
	}
	base, o, err := readOutline(r.outlinePath)
	if err != nil {
		return nil, nil, err
	}
	r.base = base
	if r.before, err = listDir(r.constraints); err != nil {
		return nil, nil, err
	}
	return r, o.Root, nil
}

// restore puts the outline back as it was and removes the files a trial
// added under constraints/.
func (r *trialRepo) restore() error {
	now, err := listDir(r.constraints)
	if err != nil {
		return err
	}
	for _, name := range now {
		if !slices.Contains(r.before, name) {
			if err := os.Remove(filepath.Join(r.constraints, name)); err != nil {
				return err
			}
		}
	}
	return os.WriteFile(r.outlinePath, r.base, 0o644)
}

// trial adds decision d (a record, or a hand edit that absorb records),
// solves, and returns the new outline's root. It reports false, with the
// repository restored, when the decision contradicts the repository's own
// records.
func (r *trialRepo) trial(d *decision) (*format.Category, bool, error) {
	if d.record != "" {
		rec := d.record + "by = \"bench\"\ndate = 2026-12-02\nnote = \"stability benchmark\"\n"
		if err := os.WriteFile(filepath.Join(r.constraints, recordFile), []byte(rec), 0o644); err != nil {
			return nil, false, err
		}
	}
	if d.outline != nil {
		if ok, err := r.absorbEdit(d); !ok || err != nil {
			return nil, false, err
		}
	}
	if out, err := r.run("solve", "--dir", r.dir, "--quiet"); contradicts(out, err) {
		return nil, false, r.restore()
	} else if err != nil {
		return nil, false, err
	}
	_, o2, err := readOutline(r.outlinePath)
	if err != nil {
		return nil, false, err
	}
	return o2.Root, true, nil
}

// absorbEdit writes d's edited outline and has absorb record it; the
// records it writes name other items as anchors, which d then names too.
// It reports false, with the repository restored, when the edit
// contradicts the repository's own records.
func (r *trialRepo) absorbEdit(d *decision) (bool, error) {
	if err := os.WriteFile(r.outlinePath, d.outline, 0o644); err != nil {
		return false, err
	}
	// absorb compares the edit with the tree ramify wrote; outside git it
	// is told where a copy of that tree is.
	basePath := filepath.Join(r.dir, baseCopy)
	if err := os.WriteFile(basePath, r.base, 0o644); err != nil {
		return false, err
	}
	out, err := r.run("absorb", "--dir", r.dir, "--quiet", "--base", baseCopy, "--by", "bench")
	os.Remove(basePath)
	if contradicts(out, err) {
		return false, r.restore()
	}
	if err != nil {
		return false, err
	}
	anchors, err := newRecordItems(r.constraints, r.before)
	if err != nil {
		return false, err
	}
	d.named = append(d.named, anchors...)
	slices.Sort(d.named)
	d.named = slices.Compact(d.named)
	return true, nil
}

func readOutline(path string) ([]byte, *format.Outline, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, nil, err
	}
	o, err := format.ParseOutline(path, data)
	return data, o, err
}

// contradicts reports whether a command refused because the decision
// contradicts the repository's own records.
func contradicts(out string, err error) bool {
	return err != nil && strings.Contains(err.Error()+out, "cannot all hold")
}

// newRecordItems lists the items named by the records of the constraint
// files in dir that are not among before.
func newRecordItems(dir string, before []string) ([]string, error) {
	now, err := listDir(dir)
	if err != nil {
		return nil, err
	}
	var items []string
	for _, name := range now {
		if slices.Contains(before, name) || !strings.HasSuffix(name, ".toml") {
			continue
		}
		data, err := os.ReadFile(filepath.Join(dir, name))
		if err != nil {
			return nil, err
		}
		f, err := format.ParseConstraints(name, data)
		if err != nil {
			return nil, err
		}
		for _, t := range f.Triplets {
			items = append(items, t.Pair[0], t.Pair[1], t.Out)
		}
		for _, g := range f.Groups {
			items = append(items, g.Items...)
		}
		for _, s := range f.Shapes {
			items = append(items, s.Tree.AllItems()...)
		}
	}
	slices.Sort(items)
	return slices.Compact(items), nil
}

func listDir(dir string) ([]string, error) {
	entries, err := os.ReadDir(dir)
	if err != nil {
		return nil, err
	}
	names := make([]string, len(entries))
	for i, e := range entries {
		names[i] = e.Name()
	}
	return names, nil
}

// baseTree is the solved tree the decisions are added to.
type baseTree struct {
	root   *format.Category
	items  []string // sorted
	parent map[string]*format.Category
	top    map[string]*format.Category // the top-level category holding an item
	up     map[*format.Category]*format.Category
	leaves []*format.Category // categories holding items, in outline order
}

func newBaseTree(root *format.Category) *baseTree {
	b := &baseTree{root: root, parent: map[string]*format.Category{}, top: map[string]*format.Category{}, up: map[*format.Category]*format.Category{}}
	root.Walk(func(c *format.Category, depth int) bool {
		for _, k := range c.Children {
			b.up[k] = c
		}
		if depth > 0 && len(c.Items) > 0 {
			b.leaves = append(b.leaves, c)
		}
		for _, it := range c.Items {
			b.parent[it] = c
		}
		return true
	})
	for _, c := range root.Children {
		for _, it := range c.AllItems() {
			b.top[it] = c
		}
	}
	b.items = root.AllItems()
	slices.Sort(b.items)
	return b
}

// decision is one drawn decision: a record to write, or an edited outline
// for absorb, and the items it names.
type decision struct {
	record  string
	outline []byte
	named   []string
}

// draw makes one decision of the kind, or reports false when the tree has
// no room for one (too few categories or items).
func (b *baseTree) draw(rng *rand.Rand, kind string, base []byte) (decision, bool) {
	if len(b.items) < 4 {
		return decision{}, false
	}
	for range 1000 {
		switch kind {
		case "triplet":
			// a and c share a category, x sits elsewhere: ax|c is broken.
			a, x := b.items[rng.IntN(len(b.items))], b.items[rng.IntN(len(b.items))]
			sib := b.parent[a].Items
			if b.parent[a] == b.parent[x] || len(sib) < 2 {
				continue
			}
			c := sib[rng.IntN(len(sib))]
			if c == a {
				continue
			}
			return decision{
				record: fmt.Sprintf("[[triplet]]\npair = [%q, %q]\nout = %q\n", a, x, c),
				named:  []string{a, x, c},
			}, true
		case "group":
			// Two or three items of one category and one from another.
			c := b.leaves[rng.IntN(len(b.leaves))]
			x := b.items[rng.IntN(len(b.items))]
			if len(c.Items) < 3 || b.parent[x] == c {
				continue
			}
			named := append(pick(rng, c.Items, 2+rng.IntN(2)), x)
			return decision{record: "[[group]]\nitems = [" + quoted(named) + "]\n", named: named}, true
		case "shape":
			// A fixed packet over two neighbouring categories: up to four
			// items of each, one of the first moved to the second, recorded
			// as absorb records an answer (side by side).
			c, d, ok := b.neighbours(rng, 3, 2)
			if !ok {
				continue
			}
			from, to := pick(rng, c.Items, 4), pick(rng, d.Items, 4)
			moved := from[0]
			outline := "A/\n" + indented(from[1:]) + "B/\n" + indented(append(to, moved))
			return decision{
				record: "[[shape]]\noutline = \"\"\"\n" + outline + "\"\"\"\nside_by_side = true\n",
				named:  append(from, to...),
			}, true
		case "move":
			// A hand move of one item into a neighbouring category.
			c, d, ok := b.neighbours(rng, 2, 1)
			if !ok {
				continue
			}
			x := c.Items[rng.IntN(len(c.Items))]
			return decision{outline: moveLine(base, b.parent, x, d), named: []string{x}}, true
		}
	}
	return decision{}, false
}

// neighbours picks a category with at least nc items and another with at
// least nd: a sibling under the same parent when there is one (where an
// editor's fix usually falls), else any other.
func (b *baseTree) neighbours(rng *rand.Rand, nc, nd int) (c, d *format.Category, ok bool) {
	c = b.leaves[rng.IntN(len(b.leaves))]
	if len(c.Items) < nc {
		return nil, nil, false
	}
	var near []*format.Category
	for _, s := range b.up[c].Children {
		if s != c && len(s.Items) >= nd {
			near = append(near, s)
		}
	}
	if len(near) == 0 {
		for _, s := range b.leaves {
			if s != c && len(s.Items) >= nd {
				near = append(near, s)
			}
		}
	}
	if len(near) == 0 {
		return nil, nil, false
	}
	return c, near[rng.IntN(len(near))], true
}

// moveLine moves item x's line of the outline text to the first item
// place of category d, indented as d's items are: the edit an editor makes
// by hand, which absorb then records.
func moveLine(base []byte, parent map[string]*format.Category, x string, d *format.Category) []byte {
	lines := strings.SplitAfter(string(base), "\n")
	c := parent[x]
	from := c.ItemLines[slices.Index(c.Items, x)] - 1
	header := lines[d.Line-1]
	indent := header[:len(header)-len(strings.TrimLeft(header, " "))] + "  "
	moved := indent + strings.TrimLeft(lines[from], " ")
	lines = slices.Delete(lines, from, from+1)
	at := d.Line // the line after d's header, 0-based
	if from < at {
		at--
	}
	lines = slices.Insert(lines, at, moved)
	return []byte(strings.Join(lines, ""))
}

// moved is the share of the items not named that changed category between
// the base tree and after, and how many top-level categories of the base
// that the decision names no item of are no longer top-level categories:
// dissolved, split or merged in the semantic diff's sense (package diff),
// or moved below another category. A top-level category that only gains
// or loses an item it is still matched to stays.
func (b *baseTree) moved(after *format.Category, named []string) (share float64, dissolved int) {
	r := diff.CompareChanges(b.root, after)
	count := 0
	for _, m := range r.AllMoved() {
		if !slices.Contains(named, m.Item) {
			count++
		}
	}
	gone := map[string]bool{}
	mark := func(p diff.Path) {
		if len(p) == 1 {
			gone[p[0]] = true
		}
	}
	for _, p := range r.Dissolved {
		mark(p)
	}
	for _, s := range r.Split {
		mark(s.From)
	}
	for _, m := range r.Merged {
		for _, p := range m.From {
			mark(p)
		}
	}
	for _, m := range r.MovedCategories {
		mark(m.From)
	}
	touched := map[*format.Category]bool{}
	for _, n := range named {
		touched[b.top[n]] = true
	}
	for _, c := range b.root.Children {
		if !touched[c] && gone[c.DisplayName()] {
			dissolved++
		}
	}
	return float64(count) / float64(len(b.items)-len(named)), dissolved
}

// pick returns up to k of items, chosen at random, in random order.
func pick(rng *rand.Rand, items []string, k int) []string {
	p := slices.Clone(items)
	rng.Shuffle(len(p), func(i, j int) { p[i], p[j] = p[j], p[i] })
	return p[:min(k, len(p)):min(k, len(p))]
}

func quoted(items []string) string {
	q := make([]string, len(items))
	for i, it := range items {
		q[i] = strconv.Quote(it)
	}
	return strings.Join(q, ", ")
}

func indented(items []string) string {
	var s strings.Builder
	for _, it := range items {
		s.WriteString("  " + it + "\n")
	}
	return s.String()
}
