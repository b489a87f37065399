package review

import (
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
