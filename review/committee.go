package review

import (
	"errors"
	"fmt"
	"math/rand/v2"
	"sync"

	"github.com/ramify-tax/ramify/internal/splitmix"
	"github.com/ramify-tax/ramify/solve"
	"github.com/ramify-tax/ramify/solve/graph"
)

// DefaultCommitteeSize is the number of committee trees when the settings
// do not say.
const DefaultCommitteeSize = 20

// committeeWorkers is how many committee trees are solved at once. It is a
// fixed number, not the machine's core count, and every tree depends only
// on its own seed, so the committee is the same on every machine and for
// any GOMAXPROCS.
const committeeWorkers = 4

// Committee is a set of trees solved under the same constraints on randomly
// reweighted copies of one similarity graph — the bootstrap support of
// phylogenetics (J. Felsenstein, "Confidence limits on phylogenies: an
// approach using the bootstrap", Evolution 39(4), 1985) with the Bayesian
// bootstrap's weights (D. B. Rubin, "The Bayesian bootstrap", Ann. Statist.
// 9(1), 1981) in place of resampling — and the committee of query by
// committee (H. S. Seung, M. Opper & H. Sompolinsky, "Query by committee",
// COLT 1992): where they agree, the data and the decisions fix the tree
// firmly; where they differ, a reviewer's answer is worth most.
type Committee struct {
	N int // items
	// Trees are the folded taxonomies, Binary the binary hierarchies they
	// were folded from, in seed order.
	Trees, Binary []*solve.Tree
	index, binary []*leafIndex
}

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

// solveMembers solves the committee's size members on committeeWorkers
// goroutines, member b by solveOne(b), and returns their taxonomies and
// binary trees in member order, or the first error. progress, if not nil,
// is told ("committee of trees", members done, size) after each member,
// from one goroutine at a time.
func solveMembers(size int, progress func(stage string, done, total int), solveOne func(b int) (taxonomy, binary *solve.Tree, err error)) ([]*solve.Tree, []*solve.Tree, error) {
	trees := make([]*solve.Tree, size)
	binary := make([]*solve.Tree, size)
	errs := make([]error, size)
	jobs := make(chan int)
	var wg sync.WaitGroup
	var mu sync.Mutex
	done := 0
	for range min(committeeWorkers, size) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for b := range jobs {
				trees[b], binary[b], errs[b] = solveOne(b)
				if progress != nil {
					mu.Lock()
					done++
					progress("committee of trees", done, size)
					mu.Unlock()
				}
			}
		}()
	}
	for b := range size {
		jobs <- b
	}
	close(jobs)
	wg.Wait()
	for _, err := range errs {
		if err != nil {
			return nil, nil, err
		}
	}
	return trees, binary, nil
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

func newCommittee(n int, trees, binary []*solve.Tree) *Committee {
	c := &Committee{N: n, Trees: trees, Binary: binary, index: make([]*leafIndex, len(trees)), binary: make([]*leafIndex, len(binary))}
	for i, t := range trees {
		c.index[i] = newLeafIndex(t)
	}
	for i, t := range binary {
		if i < len(trees) && t == trees[i] {
			c.binary[i] = c.index[i]
		} else {
			c.binary[i] = newLeafIndex(t)
		}
	}
	return c
}

// Size is the number of trees.
func (c *Committee) Size() int { return len(c.Trees) }

// replicateSeed mixes the committee seed with a replicate number
// (SplitMix64's finaliser), so neighbouring replicates get unrelated
// streams.
func replicateSeed(seed uint64, b int) uint64 {
	return splitmix.Mix(seed + uint64(b+1)*splitmix.Gamma)
}

func solveReplicate(n int, edges []graph.Edge, c *solve.Constraints, opt solve.Options, seed uint64) (taxonomy, binary *solve.Tree, err error) {
	rng := rand.New(rand.NewPCG(seed, 0x636f6d6d6974)) // "commit"
	scaled := make([]graph.Edge, len(edges))
	for i, e := range edges {
		scaled[i] = graph.Edge{A: e.A, B: e.B, W: float64(e.W * rng.ExpFloat64())}
	}
	g, err := graph.FromEdges(n, scaled)
	if err != nil {
		return nil, nil, err
	}
	opt.Seed = seed
	res, err := solve.Solve(g, c, opt)
	if err != nil {
		return nil, nil, err
	}
	return res.Taxonomy, res.Binary, nil
}
