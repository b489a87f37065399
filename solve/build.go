package solve

import (
	"sort"

	"github.com/ramify-tax/ramify/internal/disjoint"
)

// BUILD (A. V. Aho, Y. Sagiv, T. G. Szymanski & J. D. Ullman, "Inferring
// a tree from lowest common ancestors with an application to the
// optimization of relational expressions", SIAM J. Comput. 10(3), 1981)
// extended with cluster constraints: a cluster C is displayed iff ab|c for
// all a, b ∈ C and c ∉ C, so rather than expand it into triplets BUILD
// unions C whole. At a set S the Aho graph joins
// a and b for every triplet ab|c with a, b, c ∈ S, and all of C for every
// cluster C ⊊ S; its components become the children of S. If the graph is
// connected the constraints restricted to S are inconsistent. A triplet
// whose c lands in another component than a, b is displayed from then on
// and dropped; one that stays whole is handed to the child holding it, so
// every triplet is active at exactly one split and a run costs
// O((n + |R|) · depth) with one union-find pass per set.

// Build runs BUILD on leaves 0..n-1 and returns the (generally multiway)
// tree it produces, which displays every constraint, or ok = false when the
// constraints are inconsistent. Children are ordered by smallest leaf.
// Leaf ids must lie in 0..n-1.
func Build(n int, c *Constraints) (*Tree, bool) {
	p := compileBuild(n, c, nil)
	if p.selfConflict >= 0 {
		return nil, false
	}
	t, fail := p.run(true)
	if fail != nil {
		return nil, false
	}
	return t, true
}

// Consistent decides whether some tree on leaves 0..n-1 displays every
// constraint. When none does, it also returns a minimal conflicting set of
// record indices, ascending: the records together are inconsistent, and
// dropping any one of them leaves a consistent set. The set is found by
// shrinking BUILD's failure witness (the records whose Aho edges connect
// the failing set) to a fixed point and then running a deletion filter, one
// BUILD per record, over the survivors; it is deterministic.
func Consistent(n int, c *Constraints) (bool, []int) {
	p := compileBuild(n, c, nil)
	if p.selfConflict >= 0 {
		return false, []int{p.selfConflict}
	}
	_, fail := p.run(false)
	if fail == nil {
		return true, nil
	}
	// Shrink: the witness of a failing BUILD on the witness records alone
	// is again inconsistent and no larger.
	set := fail
	for {
		q := compileBuild(n, c, recordFilter(set))
		_, f := q.run(false)
		if f == nil || len(f) >= len(set) {
			break
		}
		set = f
	}
	// Deletion filter: drop each record whose removal keeps the rest
	// inconsistent.
	keep := append([]int(nil), set...)
	for _, r := range set {
		trial := make([]int, 0, len(keep))
		for _, k := range keep {
			if k != r {
				trial = append(trial, k)
			}
		}
		q := compileBuild(n, c, recordFilter(trial))
		if q.selfConflict >= 0 {
			keep = trial
			continue
		}
		if _, f := q.run(false); f != nil {
			keep = trial
		}
	}
	return false, keep
}

func recordFilter(records []int) map[int]bool {
	m := make(map[int]bool, len(records))
	for _, r := range records {
		m[r] = true
	}
	return m
}

// buildProblem is a constraint set compiled for BUILD over a compact leaf
// universe: only leaves some selected record mentions take part, because
// leaves no constraint mentions can always be added to a displaying tree
// (as extra children of its root) without changing what it displays.
type buildProblem struct {
	n        int     // size of the compact universe
	leafOf   []int32 // compact id → original leaf id (ascending)
	trips    []Triplet
	clusters [][]int32 // deduplicated, ascending, compact ids, size ≥ 2
	clusRec  []int
	// selfConflict is the record of a triplet ab|a (never displayable), or -1.
	selfConflict int
}

// compileBuild selects the records in keep (all when keep is nil) and maps
// their leaves to the compact universe. With keep == nil the universe is all
// n leaves, so that Build can return a tree over them.
func compileBuild(n int, c *Constraints, keep map[int]bool) *buildProblem {
	p := &buildProblem{selfConflict: -1}
	if c == nil {
		c = &Constraints{}
	}
	compact := make(map[int32]int32)
	use := func(leaf int32) int32 {
		if keep == nil {
			return leaf
		}
		if id, ok := compact[leaf]; ok {
			return id
		}
		id := int32(len(compact))
		compact[leaf] = id
		return id
	}
	// Compact ids are assigned in ascending order of the original id so that
	// "smallest leaf" means the same in both universes.
	if keep != nil {
		var leaves []int32
		for _, t := range c.Triplets {
			if keep[t.Record] {
				leaves = append(leaves, t.A, t.B, t.C)
			}
		}
		for _, cl := range c.Clusters {
			if keep[cl.Record] {
				leaves = append(leaves, cl.Leaves...)
			}
		}
		sort.Slice(leaves, func(i, j int) bool { return leaves[i] < leaves[j] })
		for _, l := range leaves {
			use(l)
		}
		p.n = len(compact)
		p.leafOf = make([]int32, p.n)
		for l, id := range compact {
			p.leafOf[id] = l
		}
	} else {
		p.n = n
	}
	for _, t := range c.Triplets {
		if keep != nil && !keep[t.Record] {
			continue
		}
		if t.C == t.A || t.C == t.B {
			if p.selfConflict < 0 || t.Record < p.selfConflict {
				p.selfConflict = t.Record
			}
			continue
		}
		if t.A == t.B {
			continue // aa|c holds in every tree
		}
		p.trips = append(p.trips, Triplet{use(t.A), use(t.B), use(t.C), t.Record})
	}
	for _, cl := range c.Clusters {
		if keep != nil && !keep[cl.Record] {
			continue
		}
		ls := make([]int32, len(cl.Leaves))
		for i, l := range cl.Leaves {
			ls[i] = use(l)
		}
		ls = sortedUnique(ls)
		if len(ls) < 2 {
			continue // a single leaf is always a node
		}
		p.clusters = append(p.clusters, ls)
		p.clusRec = append(p.clusRec, cl.Record)
	}
	return p
}

// buildTask is one recursion set: order[lo:hi] are its leaves (ascending),
// trip[tlo:thi] and clus[clo:chi] its active constraints, node its id.
type buildTask struct {
	lo, hi, tlo, thi, clo, chi int
	node                       int32
}

// run executes BUILD. On failure it returns the records whose Aho edges
// connect the failing set (ascending, without repeats).
func (p *buildProblem) run(wantTree bool) (*Tree, []int) {
	if p.n == 0 {
		return NewTree(0), nil
	}
	br := newBuildRun(p, wantTree)
	root := int32(0)
	if p.n > 1 && wantTree {
		root = br.t.Add()
	}
	stack := []buildTask{{0, p.n, 0, len(br.trip), 0, len(br.clus), root}}
	for len(stack) > 0 {
		tk := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		if tk.hi-tk.lo < 2 {
			continue
		}
		nc, witness := br.ahoComponents(tk)
		if nc == 1 {
			return nil, uniqueInts(witness)
		}
		br.partition(tk, nc)
		childTasks := br.children(tk, nc)
		for k := len(childTasks) - 1; k >= 0; k-- {
			stack = append(stack, childTasks[k])
		}
	}
	if wantTree {
		br.t.Root = root
	}
	return br.t, nil
}

// buildRun is the state of one run of BUILD: the leaf order and the
// active constraints, whose segments the recursion sets own, and the
// scratch of the current set.
type buildRun struct {
	p          *buildProblem
	order      []int32
	trip       []int32
	clus       []int32
	uf         disjoint.Sets
	compOf     []int32 // leaf → child index within the current set
	firstOf    []int32
	tmp        []int32
	counts     []int
	tripCounts []int
	clusCounts []int
	t          *Tree // nil unless a tree is wanted
}

func newBuildRun(p *buildProblem, wantTree bool) *buildRun {
	n := p.n
	br := &buildRun{p: p}
	br.order = make([]int32, n)
	for i := range br.order {
		br.order[i] = int32(i)
	}
	br.trip = make([]int32, len(p.trips))
	for i := range br.trip {
		br.trip[i] = int32(i)
	}
	br.clus = make([]int32, 0, len(p.clusters))
	for i, cl := range p.clusters {
		if len(cl) < n {
			br.clus = append(br.clus, int32(i))
		}
	}
	br.uf = make(disjoint.Sets, n)
	br.compOf = make([]int32, n)
	br.firstOf = make([]int32, n)
	if wantTree {
		br.t = NewTree(n)
	}
	return br
}

// ahoComponents joins the Aho graph's edges on the set and numbers its
// components, which are the children, in order of their smallest leaf
// (in compOf). It returns their number and the records of the edges that
// joined two components.
func (br *buildRun) ahoComponents(tk buildTask) (int32, []int) {
	p, uf := br.p, br.uf
	set := br.order[tk.lo:tk.hi]
	for _, l := range set {
		uf[l] = l
	}
	var witness []int
	for _, ti := range br.trip[tk.tlo:tk.thi] {
		tr := p.trips[ti]
		if uf.Union(tr.A, tr.B) {
			witness = append(witness, tr.Record)
		}
	}
	for _, ci := range br.clus[tk.clo:tk.chi] {
		cl := p.clusters[ci]
		for _, l := range cl[1:] {
			if uf.Union(cl[0], l) {
				witness = append(witness, p.clusRec[ci])
			}
		}
	}
	// Children in order of their smallest leaf: set is ascending, so
	// first appearance of a root gives that order.
	nc := int32(0)
	for _, l := range set {
		r := uf.Find(l)
		if r == l {
			br.firstOf[l] = nc
			nc++
		}
	}
	if nc == 1 {
		return nc, witness
	}
	for _, l := range set {
		br.compOf[l] = br.firstOf[uf.Find(l)]
	}
	return nc, witness
}

// partition groups the set's leaves by child, and hands each constraint to
// the child that holds it whole.
func (br *buildRun) partition(tk buildTask, nc int32) {
	p, compOf := br.p, br.compOf
	set := br.order[tk.lo:tk.hi]
	br.counts = stablePartition(set, int(nc), func(l int32) int32 { return compOf[l] }, &br.tmp, br.counts)
	br.tripCounts = stablePartition(br.trip[tk.tlo:tk.thi], int(nc), func(ti int32) int32 {
		if tr := p.trips[ti]; compOf[tr.A] == compOf[tr.C] {
			return compOf[tr.A]
		}
		return -1
	}, &br.tmp, br.tripCounts)
	br.clusCounts = stablePartition(br.clus[tk.clo:tk.chi], int(nc), func(ci int32) int32 {
		if cl := p.clusters[ci]; len(cl) < br.counts[compOf[cl[0]]] {
			return compOf[cl[0]]
		}
		return -1
	}, &br.tmp, br.clusCounts)
}

// children makes the set's children (a leaf, or a new node when a tree is
// wanted), hangs them under the set's node and returns the tasks of those
// with more than one leaf, in order.
func (br *buildRun) children(tk buildTask, nc int32) []buildTask {
	lo, tlo, clo := tk.lo, tk.tlo, tk.clo
	var kids []int32
	var childTasks []buildTask
	for k := 0; k < int(nc); k++ {
		sz := br.counts[k]
		child := buildTask{lo, lo + sz, tlo, tlo + br.tripCounts[k], clo, clo + br.clusCounts[k], -1}
		if sz == 1 {
			child.node = br.order[lo]
		} else if br.t != nil {
			child.node = br.t.Add()
		}
		kids = append(kids, child.node)
		if sz > 1 {
			childTasks = append(childTasks, child)
		}
		lo += sz
		tlo += br.tripCounts[k]
		clo += br.clusCounts[k]
	}
	if br.t != nil {
		br.t.Kids[tk.node] = kids
	}
	return childTasks
}
