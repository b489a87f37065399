package solve

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"github.com/ramify-tax/ramify/solve/graph"
	"github.com/ramify-tax/ramify/solve/hier"
)

// Options steer Solve. Zero values mean "no limit" / "off".
type Options struct {
	// MinSize: a category with fewer items is folded into its parent unless
	// a constraint needs it or the fold would exceed MaxChildren.
	MinSize int
	// MaxChildren bounds the subcategories of a category (items placed
	// directly in it are not counted); folding never exceeds it (the binary
	// tree it starts from has two children everywhere).
	MaxChildren int
	// MaxDepth bounds how many categories may nest on a path from the root
	// (the root, which is the outline file itself, is not counted): an item
	// sits at tree depth at most MaxDepth+1. Folding goes on until every path
	// fits or no legal fold is left.
	MaxDepth int
	// Seed fixes the spectral start vectors and every other pseudo-random
	// choice.
	Seed uint64
	// Stability in (0, 1] holds the categories of Prior together while the
	// similarity graph still backs them (softUnions in supernodes.go): a
	// previous category stays one piece as long as its edge density is at
	// least (1 − Stability) times that of the set it is cut from, and the
	// fold keeps the nodes that reproduce previous categories. 0 = off.
	Stability float64
	// Prior lists the leaf sets of the previous outline's categories.
	Prior [][]int32
	// CutSteps bounds the Lanczos steps of each spectral split of the
	// construction (0: the default of 40). The review committee's members
	// take fewer: the split is the sweep of whatever vector Lanczos ends
	// at, so fewer steps give a rougher split, never a broken record, and
	// the improvement passes after the construction still run in full.
	CutSteps int
	// KeepShared asks for Result.Shared, what later solves of reweighted
	// copies of the same graph may reuse; SharedFrom, if set, is such a
	// Shared from a solve of the same items (see Shared).
	KeepShared bool
	SharedFrom *Shared
	// Progress, if set, is told how far each stage has come. Stages, in
	// order: "constraints", "construct" (done = items placed), "improve",
	// "fold". It is called from one goroutine at a time.
	Progress func(stage string, done, total int)
}

// Result is what Solve produces.
type Result struct {
	// Binary is the constrained binary hierarchy after local improvement.
	Binary *Tree
	// Taxonomy is Binary folded into a multiway tree of categories, with
	// the side-by-side statements kept as far as the records allow
	// (KeepSideBySide).
	Taxonomy *Tree
	// Shared is set when Options.KeepShared asked for it.
	Shared *Shared
}

// ConflictError reports inconsistent constraints: Records is a minimal
// conflicting set of record indices (dropping any one makes the rest
// consistent), ascending.
type ConflictError struct {
	Records []int
}

func (e *ConflictError) Error() string {
	parts := make([]string, len(e.Records))
	for i, r := range e.Records {
		parts[i] = fmt.Sprint(r)
	}
	return "solve: constraints conflict (records " + strings.Join(parts, ", ") + ")"
}

// Solve builds the taxonomy for g under the constraints c (nil: none).
// Consistency is decided first, before any clustering; inconsistent
// constraints give a *ConflictError. The binary tree is built top-down
// (construct.go), improved by rotations (improve.go) and re-arranged
// subtree tops (frontier.go), and folded into the multiway taxonomy
// (fold.go); every step keeps every constraint.
func Solve(g *graph.CSR, c *Constraints, opt Options) (*Result, error) {
	return solveWith(g, c, opt, constructParams{})
}

// solveWith is Solve with the construction's internal limits exposed, so
// that tests can switch the exact DP off and check the spectral path.
func solveWith(g *graph.CSR, c *Constraints, opt Options, cp constructParams) (*Result, error) {
	if g == nil || g.N == 0 {
		return nil, errors.New("solve: empty graph")
	}
	if c == nil {
		c = &Constraints{}
	}
	if err := checkLeaves(g.N, c); err != nil {
		return nil, err
	}
	if opt.MaxChildren == 1 {
		return nil, errors.New("solve: max children must be at least 2")
	}
	progress := opt.Progress
	if progress == nil {
		progress = func(string, int, int) {}
	}
	progress("constraints", 0, 1)
	if ok, recs := Consistent(g.N, c); !ok {
		return nil, &ConflictError{Records: recs}
	}
	progress("constraints", 1, 1)
	if opt.Stability > 0 {
		cp.prior, cp.stability = opt.Prior, math.Min(opt.Stability, 1)
	}
	cp.seed, cp.progress = opt.Seed, progress
	cp.cutSteps = max(opt.CutSteps, 0)
	if s := opt.SharedFrom; s != nil && s.n == g.N {
		cp.shared = s
	}
	if opt.KeepShared {
		cp.keep = &Shared{n: g.N}
	}
	binary, err := construct(g, c, cp)
	if err != nil {
		return nil, err
	}
	improveRotations(g, binary, c, priorForFold(opt), defaultImprovePasses, improveMinGain, progress)
	tax := fold(g, binary, c, foldParams{
		minSize:     opt.MinSize,
		maxChildren: opt.MaxChildren,
		maxDepth:    opt.MaxDepth,
		ratio:       foldTightness,
		prior:       priorForFold(opt),
		stability:   opt.Stability,
		browsable:   true,
	}, progress)
	// The solver builds without the side-by-side statements; the
	// taxonomy keeps them afterwards as far as the records allow.
	tax, _ = KeepSideBySide(tax, c)
	return &Result{Binary: binary, Taxonomy: tax, Shared: cp.keep}, nil
}

func checkLeaves(n int, c *Constraints) error {
	bad := func(l int32) bool { return l < 0 || int(l) >= n }
	for _, t := range c.Triplets {
		if bad(t.A) || bad(t.B) || bad(t.C) {
			return fmt.Errorf("solve: record %d names an item outside 0..%d", t.Record, n-1)
		}
	}
	for _, cl := range c.Clusters {
		for _, l := range cl.Leaves {
			if bad(l) {
				return fmt.Errorf("solve: record %d names an item outside 0..%d", cl.Record, n-1)
			}
		}
	}
	for _, s := range c.SideBySide {
		for _, b := range s.Branches {
			for _, l := range b {
				if bad(l) {
					return fmt.Errorf("solve: record %d names an item outside 0..%d", s.Record, n-1)
				}
			}
		}
	}
	return nil
}

// Satisfies returns the indices of the records that t violates (ascending,
// each once): a triplet ab|c is violated unless lca(a,b) lies strictly below
// lca(a,b,c); a cluster unless its leaves are exactly the leaf set of a
// node. t may be multiway.
func Satisfies(t *Tree, c *Constraints) []int {
	if c == nil {
		return nil
	}
	lay := newLayout(t)
	bad := map[int]bool{}
	outside := func(l int32) bool { return l < 0 || int(l) >= t.N || lay.Pos[l] < 0 }
	for _, tr := range c.Triplets {
		if outside(tr.A) || outside(tr.B) || outside(tr.C) {
			bad[tr.Record] = true
			continue
		}
		if tr.A == tr.B {
			continue
		}
		if tr.C == tr.A || tr.C == tr.B {
			bad[tr.Record] = true
			continue
		}
		x := lay.LCA(tr.A, tr.B)
		y := lay.LCAPos(min(lay.Pos[tr.A], lay.Pos[tr.B], lay.Pos[tr.C]), max(lay.Pos[tr.A], lay.Pos[tr.B], lay.Pos[tr.C]))
		if x == y {
			bad[tr.Record] = true
		}
	}
	for _, cl := range c.Clusters {
		if len(cl.Leaves) == 0 {
			bad[cl.Record] = true
			continue
		}
		lo, hi := int32(1<<30), int32(-1)
		seen := map[int32]bool{}
		ok := true
		for _, l := range cl.Leaves {
			if outside(l) {
				ok = false
				break
			}
			seen[l] = true
			lo = min(lo, lay.Pos[l])
			hi = max(hi, lay.Pos[l])
		}
		if !ok {
			bad[cl.Record] = true
			continue
		}
		v := lay.LCAPos(lo, hi)
		if int(lay.Hi[v]-lay.Lo[v]) != len(seen) {
			bad[cl.Record] = true
		}
	}
	out := make([]int, 0, len(bad))
	for r := range bad {
		out = append(out, r)
	}
	return uniqueInts(out)
}

// layout is the depth-first leaf order with O(1) lowest common ancestors
// that the construction, the moves and the folding read trees by.
type layout = hier.LCAIndex

func newLayout(t *Tree) *layout { return hier.NewLCAIndex(t) }
