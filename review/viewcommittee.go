package review

import (
	"errors"
	"fmt"

	"github.com/ramify-tax/ramify/solve"
	"github.com/ramify-tax/ramify/solve/graph"
)

// BuildViewCommittee solves size trees under the constraints c, member b
// from view b mod len(views): the first round of members from each view as
// it is, later rounds from copies whose edge weights are multiplied by
// independent Exp(1) draws (the Bayesian bootstrap of BuildCommittee).
// Members solved from different views disagree where the evidence of one
// view misleads it — a systematic error, which no reweighting of a single
// graph reveals (co-testing: Muslea, Minton & Knoblock, JAIR 2006); the
// bootstrap rounds add the noise of each view. Every member depends only
// on its view, seed and number, so the committee is the same for any
// GOMAXPROCS. opt.Progress, if set, is told how many members are done
// (see solveMembers); the members' own solves report nothing.
//
// Members are cheaper than the taxonomy's own solve: each spectral split
// runs at most memberCutSteps Lanczos steps, and a view's bootstrap
// members consult the average-linkage guide of the view's own member
// instead of building one from their reweighted copy (solve.Shared).
func BuildViewCommittee(views []*graph.CSR, c *solve.Constraints, opt solve.Options, size int, seed uint64) (*Committee, error) {
	if len(views) == 0 || views[0] == nil || views[0].N == 0 {
		return nil, errors.New("review: the committee needs a non-empty graph")
	}
	if size < 2 {
		return nil, fmt.Errorf("review: a committee needs at least 2 trees, not %d", size)
	}
	n := views[0].N
	for i, v := range views {
		if v.N != n {
			return nil, fmt.Errorf("review: view %d has %d items, not %d", i, v.N, n)
		}
	}
	progress := opt.Progress
	opt.Prior, opt.Stability, opt.Progress = nil, 0, nil
	opt.CutSteps = memberCutSteps
	edges := make([][]graph.Edge, len(views))
	for i, v := range views {
		edges[i] = v.Edges()
	}
	// A view's own member goes first and leaves its guide for the view's
	// bootstrap members (solve.Shared). solveMembers hands out members in
	// order, so every view's own member is taken before any member that
	// waits for it, and each member still depends only on its view, seed
	// and number.
	shared := make([]*solve.Shared, len(views))
	ready := make([]chan struct{}, len(views))
	for v := range ready {
		ready[v] = make(chan struct{})
	}
	trees, binary, err := solveMembers(size, progress, func(b int) (*solve.Tree, *solve.Tree, error) {
		v := b % len(views)
		s := replicateSeed(seed, b)
		if b < len(views) {
			defer close(ready[v])
			o := opt
			o.KeepShared = b+len(views) < size
			res, err := solveView(views[v], c, o, s)
			if err != nil {
				return nil, nil, err
			}
			shared[v] = res.Shared
			return res.Taxonomy, res.Binary, nil
		}
		<-ready[v]
		o := opt
		o.SharedFrom = shared[v]
		return solveReplicate(n, edges[v], c, o, s)
	})
	if err != nil {
		return nil, err
	}
	return newCommittee(n, trees, binary), nil
}

func solveView(g *graph.CSR, c *solve.Constraints, opt solve.Options, seed uint64) (*solve.Result, error) {
	opt.Seed = seed
	return solve.Solve(g, c, opt)
}

// memberCutSteps bounds the Lanczos steps of the members' spectral splits
// (solve.Options.CutSteps).
const memberCutSteps = 20
