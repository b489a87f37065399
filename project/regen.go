package project

import (
	"errors"
	"fmt"
	"time"

	"github.com/ramify-tax/ramify/concept"
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/solve"
	"github.com/ramify-tax/ramify/solve/graph"
)

// Seed fixes every pseudo-random choice of a regeneration, so the same
// inputs give the same outline on every machine.
const Seed uint64 = 0x7261_6d69_6679

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
}

// ConflictError says that the constraint records cannot all hold; Records
// is a minimal conflicting set (dropping any one of them resolves it).
type ConflictError struct {
	Records []Record
}

func (e *ConflictError) Error() string {
	return fmt.Sprintf("%d constraint records contradict each other", len(e.Records))
}

// Regenerate solves the taxonomy from the project's inputs. progress may
// be nil. The previous outline (if any) gives names and, with stability,
// a pull toward the previous shape.
func (p *Project) Regenerate(method Method, progress func(stage string, done, total int)) (*Solution, error) {
	start := time.Now()
	if len(p.Items) == 0 {
		return nil, errors.New("there are no items yet; add some to " + p.itemsFilesText())
	}
	compiled := p.Compile()
	if progress != nil {
		progress("similarity graph", 0, 1)
	}
	g, err := p.Graph(Seed)
	if err != nil {
		return nil, err
	}
	if progress != nil {
		progress("similarity graph", 1, 1)
	}
	opt := solve.Options{
		MinSize:     p.Settings.Taxonomy.MinSize,
		MaxChildren: p.Settings.Taxonomy.MaxChildren,
		MaxDepth:    p.Settings.Taxonomy.MaxDepth,
		Seed:        Seed,
		Stability:   p.Settings.Taxonomy.Stability,
		Progress:    progress,
	}
	ids := make([]string, len(p.Items))
	for i, it := range p.Items {
		ids[i] = it.ID
	}
	// With stability, the previous outline pulls the new tree toward
	// itself, so solving twice could move a few items the second time.
	// Each round therefore takes the previous round's tree as the prior
	// until the shape settles: the written outline is then a fixed point,
	// and solving again (or `check`) reproduces it exactly.
	var prior *format.Category
	if p.Outline != nil {
		prior = p.Outline.Root
	}
	var tree *solve.Tree
	for round := 0; round < maxSettleRounds; round++ {
		if prior != nil {
			opt.Prior = PriorClusters(prior, p.Index)
		}
		t, err := p.build(method, g, compiled, opt)
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
	root := ToCategory(tree, ids)
	var prev *format.Category
	if p.Outline != nil {
		prev = p.Outline.Root
	}
	p.nameCategories(root, prev)
	concept.Carry(root, append([]*format.Category{prev}, p.NameSources...)...)
	text := format.FormatOutline(root)
	return &Solution{
		Root:     root,
		Text:     text,
		Graph:    g,
		Tree:     tree,
		Cost:     solve.Cost(g, tree),
		Compiled: compiled,
		Violated: solve.Satisfies(tree, compiled.Constraints),
		Seconds:  time.Since(start).Seconds(),
	}, nil
}

// maxSettleRounds bounds the rounds Regenerate spends letting a tree
// settle under its own stability pull.
const maxSettleRounds = 4

// build runs one construction with the chosen method.
func (p *Project) build(method Method, g *graph.CSR, compiled *Compiled, opt solve.Options) (*solve.Tree, error) {
	if method == MethodAverage {
		res, err := solve.Baseline(g, opt)
		if err != nil {
			return nil, err
		}
		return res.Taxonomy, nil
	}
	res, err := solve.Solve(g, compiled.Constraints, opt)
	var ce *solve.ConflictError
	if errors.As(err, &ce) {
		conflict := &ConflictError{}
		for _, r := range ce.Records {
			conflict.Records = append(conflict.Records, compiled.Records[r])
		}
		return nil, conflict
	}
	if err != nil {
		return nil, err
	}
	return res.Taxonomy, nil
}

func (p *Project) itemsFilesText() string {
	if len(p.Settings.Items.Files) == 1 {
		return p.Settings.Items.Files[0]
	}
	return "the items files"
}
