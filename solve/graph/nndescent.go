package graph

import (
	"math/rand/v2"
	"runtime"
	"sync"

	"github.com/ramify-tax/ramify/internal/splitmix"
)

// space is a set of items with a symmetric similarity score (higher =
// closer). score(i, j) and score(j, i) must be bit-identical.
type space interface {
	len() int
	score(i, j int) float64
	// newRowScorer returns scratch state for scoring one item against many.
	newRowScorer() rowScorer
}

// rowScorer scores a fixed item against many others, faster than
// space.score and with bit-identical results.
type rowScorer interface {
	fix(i int)
	with(j int) float64
	unfix()
}

// nnDescentParams are NN-Descent's knobs. Zero fields take the defaults
// below.
type nnDescentParams struct {
	k    int
	seed uint64
	// sampleRate is ρ: each round joins at most ρ·k new forward and ρ·k
	// reverse neighbours per item.
	sampleRate float64
	// delta stops the search when fewer than delta·n·k pool entries changed
	// in a round (the default 0.001 is the common one).
	delta    float64
	maxIters int
	// positiveOnly ignores candidates scoring 0 or less: they can never
	// become edges (cosine similarities), and on sparse data, where most
	// pairs score exactly 0, letting them in would only churn the pools of
	// items with few true neighbours and delay convergence.
	positiveOnly bool
}

const (
	defaultSampleRate = 1.0
	defaultDelta      = 0.001
	defaultMaxIters   = 30
	// joinChunk is the number of items whose local joins are computed
	// against one frozen state of the pools before the proposed updates are
	// applied. Fixed, like blockRows, so results do not depend on the number
	// of cores.
	joinChunk = 16 * blockRows
)

// Stream labels keep the per-item random streams of the phases apart.
const (
	phaseInit uint64 = iota + 1
	phaseSample
	phaseReverse
)

// initFunc fills item v's empty pool with first guesses.
type initFunc func(sp space, h *knnHeaps, w *nnWorker, v int)

// nnWorker is one goroutine's scratch state, kept for a whole search.
type nnWorker struct {
	pcg     *rand.PCG
	rng     *rand.Rand
	scorer  rowScorer
	newL    []int32
	oldL    []int32
	scratch []int32
	updates []proposal // the current block's proposals (a buffer of the search)
}

func newNNWorker(sp space) *nnWorker {
	pcg := rand.NewPCG(0, 0)
	return &nnWorker{pcg: pcg, rng: rand.New(pcg), scorer: sp.newRowScorer()}
}

// reseed gives item v in a phase of a round its own random stream, so the
// draws depend on (seed, round, phase, item) only, never on which goroutine
// handles the item or in which order.
func (w *nnWorker) reseed(seed uint64, round int, phase uint64, v int) {
	w.pcg.Seed(seed, splitmix.Mix(uint64(round)<<40^phase<<32^uint64(v)))
}

// proposal is a pair whose similarity beat the entry threshold of at least
// one side's pool when it was computed.
type proposal struct {
	a, b int32
	s    float64
}

// nnDescent approximates every item's k nearest neighbours by NN-Descent
// (W. Dong, M. Charikar & K. Li, "Efficient k-nearest neighbor graph
// construction for generic similarity measures", WWW 2011): starting from
// first guesses, each round compares every item's neighbours with each
// other — a neighbour of a neighbour is likely a neighbour — and keeps the
// better pairs. Only pairs with at least one new member are compared, and each
// round samples ρ·k new forward and ρ·k reverse neighbours per item.
//
// Determinism with parallelism: every random draw comes from a stream fixed
// by (seed, round, phase, item); items are joined in fixed chunks, within a
// chunk the similarities are computed in parallel against the pools as they
// stood at the chunk's start, and the resulting proposals are applied in
// the order of the items that proposed them. Nothing depends on which
// goroutine did what, so the result is the same for any GOMAXPROCS.
func nnDescent(sp space, init initFunc, p nnDescentParams) *neighborLists {
	n, k := sp.len(), p.k
	if p.sampleRate == 0 {
		p.sampleRate = defaultSampleRate
	}
	if p.delta == 0 {
		p.delta = defaultDelta
	}
	if p.maxIters == 0 {
		p.maxIters = defaultMaxIters
	}
	sampleCap := max(1, int(p.sampleRate*float64(k)))
	h := newKnnHeaps(n, k)
	workers := make([]*nnWorker, max(1, runtime.GOMAXPROCS(0)))
	for i := range workers {
		workers[i] = newNNWorker(sp)
	}
	runBlocks(workers, numBlocks(n), func(w *nnWorker, b int) {
		lo, hi := blockRange(b, n)
		for v := lo; v < hi; v++ {
			w.reseed(p.seed, 0, phaseInit, v)
			init(sp, h, w, v)
		}
	})

	newF := make([]int32, n*sampleCap)
	newFn := make([]int32, n)
	oldF := make([]int32, n*k)
	oldFn := make([]int32, n)
	// One proposal buffer per block of a chunk, reused chunk after chunk:
	// a chunk's proposals are all applied before the next chunk starts.
	proposals := make([][]proposal, numBlocks(joinChunk))
	for round := 1; round <= p.maxIters; round++ {
		sampleForward(workers, h, p.seed, round, sampleCap, newF, newFn, oldF, oldFn)
		revNew := reverseLists(n, newF, newFn, sampleCap)
		revOld := reverseLists(n, oldF, oldFn, k)
		changed := 0
		for c0 := 0; c0 < n; c0 += joinChunk {
			c1 := min(c0+joinChunk, n)
			outs := proposals[:numBlocks(c1-c0)]
			runBlocks(workers, len(outs), func(w *nnWorker, b int) {
				lo, hi := blockRange(b, c1-c0)
				w.updates = outs[b][:0]
				for v := c0 + lo; v < c0+hi; v++ {
					w.gatherJoinLists(v, p.seed, round, sampleCap, newF[v*sampleCap:v*sampleCap+int(newFn[v])], oldF[v*k:v*k+int(oldFn[v])], revNew, revOld)
					w.localJoin(h, p.positiveOnly)
				}
				outs[b] = w.updates
			})
			changed += applyProposals(h, outs, len(workers))
		}
		if float64(changed) < p.delta*float64(n)*float64(k) {
			break
		}
	}
	return h.lists()
}

// applyProposals inserts every proposed pair into both pools, in proposal
// order, and counts the pools that changed. An insertion reads and writes
// only its target's pool, so the targets are split into contiguous stripes
// applied in parallel, each stripe taking its proposals in the same global
// order: every pool sees exactly the sequence of insertions a sequential
// pass would give it, whatever the number of stripes.
func applyProposals(h *knnHeaps, outs [][]proposal, stripes int) int {
	n := len(h.size)
	counts := make([]int, stripes)
	apply := func(st int) {
		lo, hi := int32(st*n/stripes), int32((st+1)*n/stripes)
		c := 0
		for _, ups := range outs {
			for _, u := range ups {
				if u.a >= lo && u.a < hi && h.insert(int(u.a), u.b, u.s) {
					c++
				}
				if u.b >= lo && u.b < hi && h.insert(int(u.b), u.a, u.s) {
					c++
				}
			}
		}
		counts[st] = c
	}
	var wg sync.WaitGroup
	for st := 1; st < stripes; st++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			apply(st)
		}()
	}
	apply(0)
	wg.Wait()
	total := 0
	for _, c := range counts {
		total += c
	}
	return total
}

// sampleForward splits every pool into its old entries and a random sample
// of at most sampleCap new ones, which are marked old: they take part in
// this round's join and will not be joined as new again.
func sampleForward(workers []*nnWorker, h *knnHeaps, seed uint64, round, sampleCap int, newF, newFn, oldF, oldFn []int32) {
	n := len(h.size)
	runBlocks(workers, numBlocks(n), func(w *nnWorker, b int) {
		lo, hi := blockRange(b, n)
		for v := lo; v < hi; v++ {
			ids, _, isNew := h.pool(v)
			oldFn[v] = 0
			w.scratch = w.scratch[:0]
			for p, id := range ids {
				if isNew[p] {
					w.scratch = append(w.scratch, int32(p))
				} else {
					oldF[v*h.k+int(oldFn[v])] = id
					oldFn[v]++
				}
			}
			w.reseed(seed, round, phaseSample, v)
			picked := partialShuffle(w.rng, w.scratch, sampleCap)
			newFn[v] = int32(len(picked))
			for q, p := range picked {
				newF[v*sampleCap+q] = ids[p]
				isNew[p] = false
			}
		}
	})
}

// partialShuffle moves a uniform random sample of at most m elements of xs
// to its front and returns it.
func partialShuffle(rng *rand.Rand, xs []int32, m int) []int32 {
	if len(xs) <= m {
		return xs
	}
	for i := 0; i < m; i++ {
		j := i + rng.IntN(len(xs)-i)
		xs[i], xs[j] = xs[j], xs[i]
	}
	return xs[:m]
}

// reverseLists (ids only, no scores) inverts per-item lists (item v's list is
// lists[v*width : v*width+counts[v]]): row u of the result holds every v
// whose list names u, in increasing order of v.
func reverseLists(n int, lists, counts []int32, width int) *neighborLists {
	r := &neighborLists{n: n, off: make([]int64, n+1)}
	for v := 0; v < n; v++ {
		for _, u := range lists[v*width : v*width+int(counts[v])] {
			r.off[u+1]++
		}
	}
	for u := 0; u < n; u++ {
		r.off[u+1] += r.off[u]
	}
	r.ids = make([]int32, r.off[n])
	pos := append([]int64(nil), r.off[:n]...)
	for v := 0; v < n; v++ {
		for _, u := range lists[v*width : v*width+int(counts[v])] {
			r.ids[pos[u]] = int32(v)
			pos[u]++
		}
	}
	return r
}

// gatherJoinLists builds v's new and old join lists: its sampled new and
// its old forward neighbours, each with a random sample of at most
// sampleCap of the items that list v the same way. An item in both lists is
// kept only as new, so no pair is compared twice.
func (w *nnWorker) gatherJoinLists(v int, seed uint64, round, sampleCap int, fwdNew, fwdOld []int32, revNew, revOld *neighborLists) {
	w.reseed(seed, round, phaseReverse, v)
	w.newL = append(w.newL[:0], fwdNew...)
	rn := revNew.rowIDs(v)
	w.scratch = append(w.scratch[:0], rn...)
	for _, u := range partialShuffle(w.rng, w.scratch, sampleCap) {
		if !containsID(w.newL, u) {
			w.newL = append(w.newL, u)
		}
	}
	w.oldL = w.oldL[:0]
	for _, u := range fwdOld {
		if !containsID(w.newL, u) {
			w.oldL = append(w.oldL, u)
		}
	}
	ro := revOld.rowIDs(v)
	w.scratch = append(w.scratch[:0], ro...)
	for _, u := range partialShuffle(w.rng, w.scratch, sampleCap) {
		if !containsID(w.newL, u) && !containsID(w.oldL, u) {
			w.oldL = append(w.oldL, u)
		}
	}
}

func containsID(xs []int32, x int32) bool {
	for _, y := range xs {
		if y == x {
			return true
		}
	}
	return false
}

// localJoin compares every new-new and new-old pair of the current join
// lists and records those that could improve either pool. It only reads the
// pools.
func (w *nnWorker) localJoin(h *knnHeaps, positiveOnly bool) {
	for a, u1 := range w.newL {
		w.scorer.fix(int(u1))
		for _, u2 := range w.newL[a+1:] {
			w.propose(h, u1, u2, positiveOnly)
		}
		for _, u2 := range w.oldL {
			w.propose(h, u1, u2, positiveOnly)
		}
		w.scorer.unfix()
	}
}

func (w *nnWorker) propose(h *knnHeaps, u1, u2 int32, positiveOnly bool) {
	s := w.scorer.with(int(u2))
	if positiveOnly && s <= 0 {
		return
	}
	if h.admits(int(u1), s, u2) || h.admits(int(u2), s, u1) {
		w.updates = append(w.updates, proposal{u1, u2, s})
	}
}

// randomInit fills v's pool with k distinct random other items.
func randomInit(sp space, h *knnHeaps, w *nnWorker, v int) {
	fillRandom(sp, h, w, v)
}

// fillRandom tops v's pool up to k entries with random other items; it
// needs k < n-1, which the callers guarantee.
func fillRandom(sp space, h *knnHeaps, w *nnWorker, v int) {
	n := sp.len()
	for int(h.size[v]) < h.k {
		j := w.rng.IntN(n)
		if j != v {
			h.insert(v, int32(j), sp.score(v, j))
		}
	}
}

// sparseInit seeds each item's pool from the inverted index: items sharing
// a term with it, drawn at random from each of its terms' posting lists,
// then random items if the pool is still short. With sparse data most
// random pairs share nothing (similarity 0), and a purely random start
// would leave the local joins no gradient to follow.
func sparseInit(rows *sparseRows) initFunc {
	post := buildPostings(rows)
	return func(sp space, h *knnHeaps, w *nnWorker, v int) {
		terms, _ := rows.row(v)
		if len(terms) > 0 {
			per := (h.k + len(terms) - 1) / len(terms)
			for _, t := range terms {
				items, _ := post.list(t)
				for d := 0; d < per && len(items) > 1; d++ {
					j := int(items[w.rng.IntN(len(items))])
					if j != v {
						h.insert(v, int32(j), sp.score(v, j))
					}
				}
			}
		}
		fillRandom(sp, h, w, v)
	}
}
