package solve

import (
	"errors"
	"runtime"
	"sort"
	"sync"
	"sync/atomic"

	"github.com/ramify-tax/ramify/internal/disjoint"
	"github.com/ramify-tax/ramify/solve/graph"
)

// The constrained top-down construction. It is the recursive sparsest-cut
// scheme of Dasgupta ("A cost function for similarity-based hierarchical
// clustering", STOC 2016) — split each set where the uniform sparsity
// ψ(A,B) = w(A,B)/(|A|·|B|) is smallest, then recurse — with hard triplet
// and cluster constraints carried top-down as in Chatziafratis, Niazadeh &
// Charikar ("Hierarchical clustering with structural constraints", ICML
// 2018, arXiv 1805.09476): items that the constraints hold together (the
// components of the Aho graph of BUILD) become super-nodes that no split
// may cut, weighted by their sizes, so ψ becomes w(A,B)/(m(A)·m(B)). The
// spectral sweep that finds the cut is a heuristic for ψ, not the
// approximation algorithms those papers analyse.
//
// Each recursion set S is a segment order[lo:hi] of one leaf permutation,
// kept in ascending leaf order until it is finished. Per set:
//
//  1. the Aho graph of the constraints active in S is built by union-find;
//     with Stability, previous categories are joined on top of it (soft:
//     softUnions); the components are super-nodes (with masses = their
//     sizes), which no split may cut;
//  2. small sets are finished by an exact subset DP over leaves that only
//     splits along unions of Aho components (optimal for the subtree);
//  3. otherwise G[S] is contracted onto the super-nodes; disconnected parts
//     are split apart at zero cost; two super-nodes force the split; a few
//     super-nodes are split by the DP over super-nodes; the rest by the
//     Fiedler vector of the contracted graph and a sweep over uniform
//     sparsity with masses, refined by single super-node moves;
//  4. both sides are pushed on an explicit work stack with the constraints
//     they hold whole.
//
// A split is recorded as the depth of its node at the gap between the two
// sides in the final permutation, so the binary tree is the Cartesian tree
// of those gap depths (treeFromGaps). Every step costs O(|S| + edges of
// G[S] + active constraints), with buffers reused across sets; sets are
// processed by parallel workers, with the same result for any number.

const (
	// leafDPLimit: sets of at most this many leaves are finished exactly.
	// The DP costs about 3^s/2 steps, so 10 keeps it cheap at n = 10^5.
	leafDPLimit = 10
	// superDPLimit: at most this many super-nodes are split by the DP over
	// super-nodes instead of the spectral sweep.
	superDPLimit = 10
)

type constructParams struct {
	seed     uint64
	progress func(stage string, done, total int)
	// leafDP and superDP override the limits above (0 = default; a value
	// of 1 turns the DP off, which tests use to check the spectral path).
	leafDP, superDP int
	// prior and stability: the previous outline's categories and how
	// strongly they hold together (see softUnions).
	prior     [][]int32
	stability float64
	// noGuide turns off the average-linkage second opinion (guide.go).
	noGuide bool
	// shared, if set, holds the guide of an earlier solve of the same
	// items to use instead of building one (Shared); keep, if set, is
	// filled with this solve's.
	shared, keep *Shared
	// cutSteps bounds the Krylov dimension of the spectral splits
	// (0: cutMaxSteps).
	cutSteps int
}

// construct builds the binary tree. c must be consistent.
func construct(g *graph.CSR, c *Constraints, p constructParams) (*Tree, error) {
	n := g.N
	if p.leafDP == 0 {
		p.leafDP = leafDPLimit
	}
	if p.superDP == 0 {
		p.superDP = superDPLimit
	}
	if p.progress == nil {
		p.progress = func(string, int, int) {}
	}
	b := &builder{g: g, n: n, params: p}
	b.compile(c)
	if n == 1 {
		return NewTree(1), nil
	}
	switch {
	case !p.noGuide && p.shared != nil && p.shared.guide != nil:
		ready := make(chan struct{})
		close(ready)
		b.guideReady, b.guide = ready, p.shared.guide
	case !p.noGuide:
		// The guide is built beside the first splits: the largest sets
		// come first and keep one worker busy alone for a while, and
		// nothing reads the guide before the first spectral split has
		// its own cut (tryGuide waits for it there).
		ready := make(chan struct{})
		b.guideReady = ready
		go func() {
			defer close(ready)
			b.guide = newGuide(g)
		}()
		defer func() { <-ready }()
	}
	b.order = make([]int32, n)
	for i := range b.order {
		b.order[i] = int32(i)
	}
	b.gapDepth = make([]int32, n)
	b.uf = make(disjoint.Sets, n)
	b.local = make([]int32, n)
	b.side = make([]int8, n)
	if err := b.runWorkers(); err != nil {
		return nil, err
	}
	if p.keep != nil && b.guideReady != nil {
		<-b.guideReady
		p.keep.guide = b.guide
	}
	p.progress("construct", n, n)
	return treeFromGaps(n, b.order, b.gapDepth), nil
}

// runWorkers processes the work stack with one worker per available CPU
// (at most maxConstructWorkers). The result does not depend on how many
// run or in which order they take tasks: every set owns its segments of
// the shared arrays and its leaves' entries, and nothing it computes
// depends on other sets.
func (b *builder) runWorkers() error {
	workers := min(runtime.GOMAXPROCS(0), maxConstructWorkers)
	var (
		mu       sync.Mutex
		cond     = sync.NewCond(&mu)
		stack    = []ctask{{0, b.n, 0, len(b.trip), 0, len(b.clus), 0, len(b.grp), 0}}
		busy     = 0
		done     = 0
		reported = 0
		firstErr error
		idle     atomic.Int32
	)
	var wg sync.WaitGroup
	for i := 0; i < workers; i++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			w := newConstructWorker(b.n)
			w.sp.helpers = helpers{&idle}
			w.sp.maxSteps = b.params.cutSteps
			mu.Lock()
			for {
				for len(stack) == 0 && busy > 0 && firstErr == nil {
					idle.Add(1)
					cond.Wait()
					idle.Add(-1)
				}
				if len(stack) == 0 || firstErr != nil {
					mu.Unlock()
					cond.Broadcast()
					return
				}
				tk := stack[len(stack)-1]
				stack = stack[:len(stack)-1]
				busy++
				mu.Unlock()
				kids, finished, err := b.process(w, tk)
				mu.Lock()
				busy--
				if err != nil && firstErr == nil {
					firstErr = err
				}
				stack = append(stack, kids...)
				done += finished
				if done-reported >= b.n/100+1 {
					b.params.progress("construct", done, b.n)
					reported = done
				}
				cond.Broadcast()
			}
		}()
	}
	wg.Wait()
	return firstErr
}

// maxConstructWorkers caps the parallelism of the construction.
const maxConstructWorkers = 8

type ctask struct {
	lo, hi, tlo, thi, clo, chi int
	glo, ghi                   int // soft groups in grp
	depth                      int32
}

// builder holds the state shared by all recursion sets; each set owns its
// segments of order, trip and clus and its leaves' entries in uf, local and
// side.
type builder struct {
	g      *graph.CSR
	n      int
	params constructParams
	guide  *guide // the average-linkage second opinion; nil when off
	// guideReady is closed once guide is set (nil: no guide is built).
	guideReady <-chan struct{}
	trips      []Triplet // non-trivial triplets (three distinct leaves)
	clusters   [][]int32 // deduplicated, ascending, at least two leaves
	groups     [][]int32 // previous categories (soft), same form
	covered    []bool    // leaf lies in some previous category
	order      []int32
	gapDepth   []int32
	trip       []int32
	clus       []int32
	grp        []int32
	uf         disjoint.Sets
	local      []int32 // leaf → super-node index in its current set
	side       []int8
}

func (b *builder) compile(c *Constraints) {
	for _, t := range c.Triplets {
		if t.A == t.B {
			continue
		}
		b.trips = append(b.trips, t)
	}
	for _, cl := range c.Clusters {
		ls := sortedUnique(append([]int32(nil), cl.Leaves...))
		if len(ls) >= 2 && len(ls) < b.n {
			b.clusters = append(b.clusters, ls)
		}
	}
	b.trip = make([]int32, len(b.trips))
	for i := range b.trip {
		b.trip[i] = int32(i)
	}
	b.clus = make([]int32, len(b.clusters))
	for i := range b.clus {
		b.clus[i] = int32(i)
	}
	if b.params.stability > 0 {
		b.covered = make([]bool, b.n)
		for _, cat := range b.params.prior {
			var ls []int32
			for _, l := range cat {
				if l >= 0 && int(l) < b.n {
					ls = append(ls, l)
				}
			}
			ls = sortedUnique(ls)
			for _, l := range ls {
				b.covered[l] = true
			}
			if len(ls) >= 2 {
				b.groups = append(b.groups, ls)
			}
		}
		sort.SliceStable(b.groups, func(i, j int) bool {
			gi, gj := b.groups[i], b.groups[j]
			if len(gi) != len(gj) {
				return len(gi) > len(gj)
			}
			return gi[0] < gj[0]
		})
		b.grp = make([]int32, len(b.groups))
		for i := range b.grp {
			b.grp[i] = int32(i)
		}
	}
}

// constructWorker is the scratch space of one worker.
type constructWorker struct {
	mark   []int32 // leaf → stamp of the set it was last seen in
	stamp  int32
	gmark  []int32 // the same for previous categories (allocated on need)
	gstamp int32
	first  []int32 // super-node → smallest leaf
	memOff []int32
	member []int32
	hOff   []int64
	hTgt   []int32
	hW     []float64
	accPos []int32
	mass   []float64
	vol    []float64
	deg    []float64
	comp   []int32
	queue  []int32
	sideU  []int8
	tmp    []int32
	sp     spectralWork
	sw     sweepWork
	dp     subsetDP
}

func newConstructWorker(n int) *constructWorker {
	return &constructWorker{mark: make([]int32, n)}
}

var errInconsistent = errors.New("solve: constraints are inconsistent")

// process splits one set and returns the child tasks and how many leaves
// it finished.
func (b *builder) process(w *constructWorker, tk ctask) ([]ctask, int, error) {
	set := b.order[tk.lo:tk.hi]
	s := len(set)
	if s == 1 {
		return nil, 1, nil
	}
	w.stamp++
	for _, l := range set {
		w.mark[l] = w.stamp
	}
	b.hardUnions(tk)
	soft := tk.ghi > tk.glo && b.softUnions(w, tk)
	k := b.superNodes(w, set)
	if k == 1 && soft {
		// The previous categories leave no split here: drop them for this
		// set (the constraints alone always leave one).
		b.hardUnions(tk)
		soft = false
		k = b.superNodes(w, set)
	}
	if k == 1 {
		return nil, 0, errInconsistent
	}
	if s <= b.params.leafDP {
		b.finishExact(w, tk)
		return nil, s, nil
	}
	b.contract(w, tk, k)
	w.sideU = growInt8(w.sideU, k)
	h := &graph.CSR{N: k, Offsets: w.hOff, Targets: w.hTgt, Weights: w.hW}
	switch nc := w.components(h); {
	case nc > 1:
		w.splitComponents(nc)
	case k == 2:
		w.sideU[0], w.sideU[1] = 0, 1
	case k <= b.params.superDP:
		w.splitBySuperDP(h)
	default:
		if err := w.splitSpectral(h, b.params.seed); err != nil {
			return nil, 0, err
		}
		b.tryGuide(w, h)
	}
	if w.sideU[0] != 0 {
		for i := range w.sideU {
			w.sideU[i] ^= 1
		}
	}
	return b.apply(w, tk), 0, nil
}

// apply partitions the set by w.sideU (left side first, each side still
// ascending), records the split and hands each side its constraints.
func (b *builder) apply(w *constructWorker, tk ctask) []ctask {
	set := b.order[tk.lo:tk.hi]
	nl := 0
	for _, l := range set {
		b.side[l] = w.sideU[b.local[l]]
		if b.side[l] == 0 {
			nl++
		}
	}
	w.partition(set, func(l int32) int32 { return int32(b.side[l]) })
	b.gapDepth[tk.lo+nl] = tk.depth

	tripSeg := b.trip[tk.tlo:tk.thi]
	tl := b.partitionTriplets(w, tripSeg)
	clusSeg := b.clus[tk.clo:tk.chi]
	cl := b.partitionClusters(w, clusSeg, nl, len(set)-nl)
	gl := b.partitionGroups(w, b.grp[tk.glo:tk.ghi])
	left := ctask{tk.lo, tk.lo + nl, tk.tlo, tk.tlo + tl[0], tk.clo, tk.clo + cl[0], tk.glo, tk.glo + gl[0], tk.depth + 1}
	right := ctask{tk.lo + nl, tk.hi, tk.tlo + tl[0], tk.tlo + tl[0] + tl[1], tk.clo + cl[0], tk.clo + cl[0] + cl[1], tk.glo + gl[0], tk.glo + gl[0] + gl[1], tk.depth + 1}
	return []ctask{right, left}
}

// partitionTriplets keeps the triplets whose three leaves fell on one side
// (left ones first); a triplet whose c was cut off is now displayed.
func (b *builder) partitionTriplets(w *constructWorker, seg []int32) [2]int {
	return w.partition(seg, func(ti int32) int32 {
		tr := b.trips[ti]
		if sd := b.side[tr.A]; sd == b.side[tr.C] {
			return int32(sd)
		}
		return -1
	})
}

// partitionGroups hands each previous category to the side that holds it
// whole; a category that was cut here is given up.
func (b *builder) partitionGroups(w *constructWorker, seg []int32) [2]int {
	return w.partition(seg, func(gi int32) int32 {
		grp := b.groups[gi]
		sd := b.side[grp[0]]
		for _, l := range grp[1:] {
			if b.side[l] != sd {
				return -1
			}
		}
		return int32(sd)
	})
}

// partitionClusters keeps the clusters that are still proper subsets of
// their side (a cluster equal to its side is now a node).
func (b *builder) partitionClusters(w *constructWorker, seg []int32, nl, nr int) [2]int {
	size := [2]int{nl, nr}
	return w.partition(seg, func(ci int32) int32 {
		cl := b.clusters[ci]
		if sd := b.side[cl[0]]; len(cl) < size[sd] {
			return int32(sd)
		}
		return -1
	})
}

// partition splits seg stably into its left (key 0) and right (key 1)
// elements, dropping those whose key is negative, and counts each side.
func (w *constructWorker) partition(seg []int32, key func(int32) int32) [2]int {
	var cnt [2]int
	stablePartition(seg, 2, key, &w.tmp, cnt[:])
	return cnt
}
