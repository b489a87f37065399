package solve

import (
	"errors"

	"github.com/ramify-tax/ramify/solve/graph"
)

// Baseline is plain average linkage (UPGMA) on g, folded into a taxonomy
// by the same rules as Solve but with no constraints: the yardstick the
// constrained construction is measured against.
func Baseline(g *graph.CSR, opt Options) (*Result, error) {
	if g == nil || g.N == 0 {
		return nil, errors.New("solve: empty graph")
	}
	progress := opt.Progress
	if progress == nil {
		progress = func(string, int, int) {}
	}
	binary := AverageLinkageGraph(g)
	if binary == nil {
		return nil, errors.New("solve: average linkage needs a symmetric graph")
	}
	none := &Constraints{}
	tax := fold(g, binary, none, foldParams{
		minSize:     opt.MinSize,
		maxChildren: opt.MaxChildren,
		maxDepth:    opt.MaxDepth,
		ratio:       foldTightness,
		browsable:   true,
	}, progress)
	return &Result{Binary: binary, Taxonomy: tax}, nil
}
