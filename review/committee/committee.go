// Package committee solves the review committee of a loaded repository:
// the views of its items and its compiled records (from solve/regen) fed
// to package review's committee and its cache. It is the one place that
// joins the two, so review itself never needs to know a repository.
package committee

import (
	"time"

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
	// Building the views reports nothing itself and takes seconds on
	// large repositories, so the stage is repeated while it runs and the
	// terminal's elapsed time keeps moving.
	stop := ticking(progress, "similarity graph")
	views, err := regen.GraphViews(p, regen.Seed)
	stop()
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

// tickEvery is how often ticking repeats its stage.
const tickEvery = 250 * time.Millisecond

// ticking calls progress(stage, 0, 1) at once and then every tickEvery
// until the returned stop is called (nothing when progress is nil). stop
// returns after the last call, so progress is never called from two
// goroutines at once.
func ticking(progress func(stage string, done, total int), stage string) (stop func()) {
	if progress == nil {
		return func() {}
	}
	progress(stage, 0, 1)
	quit, finished := make(chan struct{}), make(chan struct{})
	go func() {
		defer close(finished)
		t := time.NewTicker(tickEvery)
		defer t.Stop()
		for {
			select {
			case <-quit:
				return
			case <-t.C:
				progress(stage, 0, 1)
			}
		}
	}()
	return func() {
		close(quit)
		<-finished
	}
}
