package review

import (
	"math"
	"math/rand/v2"
	"slices"
	"sort"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/solve"
)

// Draft is a packet chosen but not yet written: its items (indices,
// ascending), why it was drawn and, for uncertain packets, its score (see
// Doubt).
type Draft struct {
	Reason string // format.ReasonUncertain or format.ReasonAudit
	Items  []int32
	Score  float64
}

// DrawOptions say how many packets to draw and how.
type DrawOptions struct {
	Count int // packets in all
	Size  int // items per packet
	// AuditShare of the packets (rounded to the nearest whole packet) are
	// audits: uniformly random k-subsets of all items.
	AuditShare float64
	Seed       uint64
	// Avoid marks items that no uncertain packet may hold: items of open
	// packets drawn from other versions of the tree, and items already
	// reviewed on this version. Audits ignore it, so that the audit
	// estimate stays unbiased.
	Avoid []bool
	// Redraw lists audit sets (item indices, ascending) to draw again
	// before any new one: earlier audits whose projection changed (see
	// AuditSummary). They were uniform draws, so they stay audits.
	Redraw [][]int32
	// SkipAudit, if set, reports audit sets already answered; the audit
	// stream passes over them, so drawing again after answering audits
	// gives new ones.
	SkipAudit func(items []int32) bool
}

// Pool limits of the greedy choice: how many of an item's companions in
// the tree and in each committee tree are candidates, and how many
// candidates there are at most.
const (
	poolOwn       = 16
	poolCommittee = 4
	poolCap       = 48
)

// maxMisses is how many starts in a row may fail to give a packet before
// Draw concludes that the committee agrees with the rest of the tree.
const maxMisses = 64

// streamAudit is the random stream of the audit draws.
const streamAudit = 0x6175646974 // "audit"

// AuditCount is how many of count packets are audits for a share.
func AuditCount(count int, share float64) int {
	return min(count, max(0, int(math.Floor(float64(count)*share+0.5))))
}

// Draw chooses the packets for tree t (over the committee's items): first
// the uncertain packets, most doubtful first, then the audits. Fewer
// uncertain packets than asked come back when the committee agrees with
// the rest of the tree. Both are streams fixed by the seed, the tree, the
// committee and the options: drawing again with the same inputs gives the
// same packets, and asking for more gives the same first ones.
//
// An uncertain packet starts from the free item the committee would move
// farthest (Assessment.Unsettled; ties go to items in less supported
// categories). Its candidates are the item's companions in t and in each
// committee tree — the places it might belong. The packet takes the pair
// of candidates whose triplet with the start has the most doubt, then
// grows greedily by the candidate with the most doubt summed over its
// triplets with the packet. Items are never reused across packets, and a
// start in a category that already started a packet waits until every
// other region had its turn, so packets cover different regions.
func Draw(t *solve.Tree, c *Committee, a *Assessment, opt DrawOptions) []Draft {
	size := min(opt.Size, t.N)
	if size < format.MinShapeItems || opt.Count < 1 {
		return nil
	}
	audits := AuditCount(opt.Count, opt.AuditShare)
	d := &drawer{t: t, c: c, a: a, tx: newLeafIndex(t), used: make([]bool, t.N), size: size}
	for i := range d.used {
		d.used[i] = i < len(opt.Avoid) && opt.Avoid[i]
	}
	var out []Draft
	started := map[int32]bool{} // categories that started a packet
	var later []int32
	// Growing a packet costs thousands of committee votes, so the search
	// gives up after a run of starts that found nothing to doubt.
	misses := 0
	try := func(x int32) {
		if len(out) == opt.Count-audits || d.used[x] || misses >= maxMisses {
			return
		}
		if p, ok := d.grow(x); ok {
			out = append(out, p)
			started[d.tx.parent[x]] = true
			misses = 0
		} else {
			misses++
		}
	}
	for _, x := range d.starts() {
		if started[d.tx.parent[x]] {
			later = append(later, x)
			continue
		}
		try(x)
	}
	misses = 0
	for _, x := range later {
		try(x)
	}
	taken := 0
	for _, items := range opt.Redraw {
		if taken == audits {
			break
		}
		out = append(out, Draft{Reason: format.ReasonAudit, Items: items})
		taken++
	}
	rng := rand.New(rand.NewPCG(opt.Seed, streamAudit))
	for tries := 0; taken < audits && tries < maxAuditTries*audits; tries++ {
		items := UniformSubset(rng, t.N, size)
		if opt.SkipAudit != nil && opt.SkipAudit(items) {
			continue
		}
		out = append(out, Draft{Reason: format.ReasonAudit, Items: items})
		taken++
	}
	return out
}

// maxAuditTries bounds the draws per audit packet when answered ones are
// passed over (only a tiny taxonomy could run out of new sets).
const maxAuditTries = 100

type drawer struct {
	t    *solve.Tree
	c    *Committee
	a    *Assessment
	tx   *leafIndex
	used []bool
	size int
}

// doubt is how likely an answer on the triplet a|b|x repairs the tree:
// the share of committee trees that resolve it otherwise, scaled by the
// size of the category where the three meet (a wrong triplet high in the
// tree misleads more items).
//
// A committee tree that resolves a triplet the tree leaves flat counts as
// fully as a contradiction: the answer will very likely resolve it, and
// the tree then gains a triplet it did not have (recall). A committee
// tree that leaves flat what the tree resolves counts for nothing: it
// only says the member is coarser there, not that the tree is wrong, and
// on the dev sets (see docs/methods.md) counting it drew packets whose
// answers repaired about a third fewer triplets.
func (d *drawer) doubt(a, b, x int32) float64 {
	here := d.tx.topology(a, b, x)
	against := 0.0
	for _, ix := range d.c.index {
		switch there := ix.topology(a, b, x); {
		case there == here, there == topoStar:
		default:
			against++
		}
	}
	if against == 0 {
		return 0
	}
	meet := max(d.tx.size[d.tx.lca(a, b)], d.tx.size[d.tx.lca(a, x)])
	return float64(against/float64(len(d.c.index))) * float64(meet) / float64(d.t.N)
}

func (d *drawer) meanDoubt(items []int32) float64 {
	sum, count := 0.0, 0
	for i := 0; i < len(items); i++ {
		for j := i + 1; j < len(items); j++ {
			for k := j + 1; k < len(items); k++ {
				sum += d.doubt(items[i], items[j], items[k])
				count++
			}
		}
	}
	return sum / float64(count)
}

// starts lists the free items that may start a packet, most unsettled
// first, then those in less supported categories, then by index. An item
// the committee would not move, in a category every committee tree holds
// (or at the top level), starts nothing.
func (d *drawer) starts() []int32 {
	support := func(x int32) float64 {
		p := d.tx.parent[x]
		if p == d.t.Root {
			return 1
		}
		return d.a.Support[p]
	}
	var xs []int32
	for x := int32(0); int(x) < d.t.N; x++ {
		if !d.used[x] && d.tx.parent[x] >= 0 && (d.a.Unsettled[x] > 0 || support(x) < 1) {
			xs = append(xs, x)
		}
	}
	sort.SliceStable(xs, func(i, j int) bool {
		ui, uj := d.a.Unsettled[xs[i]], d.a.Unsettled[xs[j]]
		if ui != uj {
			return ui > uj
		}
		return support(xs[i]) < support(xs[j])
	})
	return xs
}

// grow builds one packet from start, or reports false when there are too
// few free candidates or nothing the committee doubts.
func (d *drawer) grow(start int32) (Draft, bool) {
	pool := d.pool(start)
	if len(pool) < d.size-1 {
		return Draft{}, false
	}
	bestDoubt, bi, bj := -1.0, -1, -1
	for i := range pool {
		for j := i + 1; j < len(pool); j++ {
			if v := d.doubt(start, pool[i], pool[j]); v > bestDoubt {
				bestDoubt, bi, bj = v, i, j
			}
		}
	}
	if bi < 0 {
		return Draft{}, false
	}
	packet := []int32{start, pool[bi], pool[bj]}
	for len(packet) < d.size {
		best, bestGain := int32(-1), -1.0
		for _, x := range pool {
			if slices.Contains(packet, x) {
				continue
			}
			gain := 0.0
			for i := range packet {
				for j := i + 1; j < len(packet); j++ {
					gain += d.doubt(packet[i], packet[j], x)
				}
			}
			if gain > bestGain {
				best, bestGain = x, gain
			}
		}
		packet = append(packet, best)
	}
	slices.Sort(packet)
	score := d.meanDoubt(packet)
	if score == 0 {
		return Draft{}, false
	}
	for _, x := range packet {
		d.used[x] = true
	}
	return Draft{Reason: format.ReasonUncertain, Items: packet, Score: score}, true
}

// pool lists the free candidates for a packet started at x, without x:
// up to poolOwn of its companions in t, then up to poolCommittee of its
// companions in each committee tree, evenly spread over each category's
// items, at most poolCap in all, in that order.
func (d *drawer) pool(x int32) []int32 {
	seen := map[int32]bool{x: true}
	var out []int32
	take := func(mates []int32, k int) {
		step := max(1, len(mates)/k)
		taken := 0
		for i := 0; i < len(mates) && taken < k && len(out) < poolCap; i += step {
			y := mates[i]
			if !seen[y] && !d.used[y] {
				seen[y] = true
				out = append(out, y)
				taken++
			}
		}
	}
	take(d.tx.leaves(d.tx.parent[x]), poolOwn)
	for _, ix := range d.c.index {
		if p := ix.parent[x]; p >= 0 {
			take(ix.leaves(p), poolCommittee)
		}
	}
	return out
}
