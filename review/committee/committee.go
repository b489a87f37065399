// Package committee solves the review committee of a loaded repository:
// the views of its items and its compiled records (from solve/regen) fed
// to package review's committee and its cache. It is the one place that
// joins the two, so review itself never needs to know a repository.
package committee

import (
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/review"
	"github.com/ramify-tax/ramify/solve/graph"
	"github.com/ramify-tax/ramify/solve/regen"
)

// Solve solves the review committee for the repository's current
// taxonomy, as `review draw` and `review status` do: the committee size of
// the settings (review.DefaultCommitteeSize when unset), members solved
// from the repository's views of the items (regen.GraphViews,
// review.BuildViewCommittee) under the compiled records, and a seed taken
// from the structure hash, so the same taxonomy always gets the same
// committee; a committee solved before from the same inputs is read back
// from the committee cache (review.CachedViewCommittee). progress may be
// nil.
// A conflict among the records comes back as the solver's
// *solve.ConflictError, naming records by their compiled number.
func Solve(p *repo.Repo, structure string, progress func(stage string, done, total int)) (*review.Committee, *regen.Compiled, error) {
	if progress != nil {
		progress("similarity graph", 0, 1)
	}
	views, err := regen.GraphViews(p, regen.Seed)
	if err != nil {
		return nil, nil, err
	}
	compiled := regen.Compile(p)
	opt := regen.CommitteeOptions(p)
	opt.Progress = progress
	if progress != nil {
		progress("committee of trees", 0, 1)
	}
	size := p.Settings.Review.Committee
	if size < 2 {
		size = review.DefaultCommitteeSize
	}
	graphs := make([]*graph.CSR, len(views))
	for i, v := range views {
		graphs[i] = v.Graph
	}
	c, err := review.CachedViewCommittee(review.CommitteeCacheDir(), graphs, compiled.Constraints, opt, size, review.Seed(structure))
	return c, compiled, err
}
