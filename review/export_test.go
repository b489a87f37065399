package review

import (
	"errors"
	"fmt"
	"slices"

	"github.com/ramify-tax/ramify/solve"
	"github.com/ramify-tax/ramify/solve/graph"
)

// Functions that only the tests call, kept out of the built package.

// BuildCommittee solves size trees, each on a copy of g whose every edge
// weight is multiplied by an independent Exp(1) draw — the Bayesian
// bootstrap of the edges. (Poisson(1) counts, the classical bootstrap,
// would drop a third of the edges and tear a k-nearest-neighbour graph
// apart; exponential weights keep every edge and vary its strength.)
// Every tree honours c, with the limits of opt; opt.Prior and
// opt.Stability are ignored, so that support measures the data and the
// decisions, not the pull of the previous version. Tree b draws its
// weights, and seeds its solve, from seed and b alone. opt.Progress, if
// set, is told how many trees are done (see solveMembers).
func BuildCommittee(g *graph.CSR, c *solve.Constraints, opt solve.Options, size int, seed uint64) (*Committee, error) {
	if g == nil || g.N == 0 {
		return nil, errors.New("review: the committee needs a non-empty graph")
	}
	if size < 2 {
		return nil, fmt.Errorf("review: a committee needs at least 2 trees, not %d", size)
	}
	progress := opt.Progress
	opt.Prior, opt.Stability, opt.Progress = nil, 0, nil
	edges := g.Edges()
	trees, binary, err := solveMembers(size, progress, func(b int) (*solve.Tree, *solve.Tree, error) {
		return solveReplicate(g.N, edges, c, opt, replicateSeed(seed, b))
	})
	if err != nil {
		return nil, err
	}
	return newCommittee(g.N, trees, binary), nil
}

// NewCommittee wraps trees that were built elsewhere (tests, or a caller
// with its own perturbation); every tree must be over n leaves. Support is
// then measured on the same trees.
func NewCommittee(n int, trees []*solve.Tree) (*Committee, error) {
	if len(trees) == 0 {
		return nil, errors.New("review: a committee needs trees")
	}
	for i, t := range trees {
		if t == nil || t.N != n {
			return nil, fmt.Errorf("review: committee tree %d is not over %d items", i, n)
		}
	}
	return newCommittee(n, trees, trees), nil
}

// Doubt is what a triplet of items is worth reviewing in tree t: the share
// of committee trees that arrange it otherwise than t does, times the
// share of all items in the category of t where the three meet (a wrong
// triplet high up the tree drags many others with it). A committee tree
// that resolves a triplet t leaves unresolved, or the other way round,
// counts a quarter: that is a finer or coarser grouping, not a
// contradiction. A packet's score is the mean doubt of its triplets.
func (c *Committee) Doubt(t *solve.Tree, items []int32) float64 {
	if len(items) < 3 {
		return 0
	}
	d := &drawer{t: t, c: c, tx: newLeafIndex(t)}
	return d.meanDoubt(items)
}

// Support is the share of committee trees whose binary hierarchy holds the
// given items as a cluster, up to NearMatch (see Assessment.Support).
func (c *Committee) Support(items []int32) float64 {
	held := 0
	pos := make([]int32, 0, len(items))
	for _, ix := range c.binary {
		pos = pos[:0]
		for _, x := range items {
			if ix.pos[x] >= 0 {
				pos = append(pos, ix.pos[x])
			}
		}
		slices.Sort(pos)
		if len(pos) == len(items) && ix.holds(pos) {
			held++
		}
	}
	return float64(held) / float64(len(c.binary))
}

// MajorityDisagreement is the share of votes that do not go to the most
// popular class, 1 − max/B (L. C. Freeman's variation ratio, Elementary
// Applied Statistics, 1965); 0 for no votes.
func MajorityDisagreement(votes []int) float64 {
	total, best := 0, 0
	for _, v := range votes {
		total += v
		best = max(best, v)
	}
	if total == 0 {
		return 0
	}
	return 1 - float64(best)/float64(total)
}
