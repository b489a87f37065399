package shape

import (
	"maps"
	"slices"

	"github.com/ramify-tax/ramify/format"
)

// A packet shows its items under the names of the full tree, and a
// reviewer who moves an item under "Wine" says that it belongs in the
// category Wine, not only that it sits nearer the packet's other wines
// than its other items. Taken one answer at a time, that second meaning is
// all a shape keeps. Linked decides the first across answers: a category
// name that an editor typed (not a provisional "~ " name) stands for one
// category of the taxonomy, so
//
//   - every item placed under Name in any answer lies in Name's category;
//   - Name lies inside Other when some answer shows it below Other, and
//     the two are apart when some answer shows them side by side;
//   - two categories apart hold none of each other's items.
//
// A name is left out when the answers contradict that reading of it: it
// appears twice in one answer, lies both inside and apart from another
// name (or inside itself), or shares an item with a name it lies apart
// from. What is left yields, for each pair of names apart, triplets that
// keep their categories apart: with a₁ < … < a_k the items of one and
// m₁ < … < m_l the other's,
//
//	aᵢ aᵢ₊₁ | m₁ for i < k   and   mⱼ mⱼ₊₁ | a₁ for j < l.
//
// The first set keeps every item of the first name below the lowest
// common ancestor of a₁…a_k (the largest of the nested lca(aᵢ, aᵢ₊₁), all
// ancestors of a shared item) and m₁ outside it; the second the converse.
// Two nodes of a tree are nested or apart, and neither can hold the
// other, so the two categories are apart. Only the widest pairs are
// listed: a pair apart whose names both lie inside a pair apart follows
// from it, because a name's items include those of the names inside it.

// Budgets of Linked, so that answers from an untrusted change cannot make
// it costly: the closure of the name relations grows with the cube of the
// names, so past maxLinkedNames distinct typed names nothing is linked;
// and at most MaxTripletsPerItem triplets per answered item are listed
// (pairs past that are left out whole).
const maxLinkedNames = 1024

// Answer is one shape record's outline with its record number.
type Answer struct {
	Tree   *format.Category
	Record int
}

// Link is what one pair of names apart means: the triplets that keep
// their categories apart, and the latest record among those that placed
// the triplets' items under the two names.
type Link struct {
	Names    [2]string
	Triplets [][3]int32
	Record   int
}

// Linked yields a Link for each widest pair of names apart (see above),
// in name order. idx maps item ids to indices; unknown ids are skipped.
func Linked(answers []Answer, idx func(string) (int32, bool), yield func(Link)) {
	l := readAnswers(answers, idx)
	if l == nil {
		return
	}
	answered := map[int32]bool{}
	for _, m := range l.all {
		for x := range m {
			answered[x] = true
		}
	}
	budget := MaxTripletsPerItem * len(answered)
	for _, p := range l.widestApart() {
		need := len(l.all[p[0]]) + len(l.all[p[1]]) - 2
		if need > budget {
			return
		}
		budget -= need
		yield(l.link(p[0], p[1]))
	}
}

// readAnswers reads the answers' names and closes their relations; nil
// past the names budget.
func readAnswers(answers []Answer, idx func(string) (int32, bool)) *linker {
	l := newLinker()
	for _, ans := range answers {
		l.read(ans, idx)
	}
	if len(l.members) > maxLinkedNames {
		return nil
	}
	l.close()
	return l
}

// Named is a typed name the answers agree on (see Linked): the items
// placed under it or under a name inside it, and the items known to lie
// outside it (those of the names apart from it), both ascending. The
// category it names is the lowest that holds Items and none of Outside.
type Named struct {
	Name           string
	Items, Outside []int32
}

// NamedSets lists, in name order, the typed names the answers agree on,
// for the names to land on one category each instead of one per answer.
func NamedSets(answers []Answer, idx func(string) (int32, bool)) []Named {
	l := readAnswers(answers, idx)
	if l == nil {
		return nil
	}
	var out []Named
	for _, n := range slices.Sorted(maps.Keys(l.members)) {
		outside := map[int32]bool{}
		for m := range l.apart[n] {
			for x := range l.all[m] {
				outside[x] = true
			}
		}
		out = append(out, Named{Name: n, Items: slices.Sorted(maps.Keys(l.all[n])), Outside: slices.Sorted(maps.Keys(outside))})
	}
	return out
}

type linker struct {
	// members[name][item] is the latest record that placed item under name
	// (directly or below a category inside it in that answer).
	members map[string]map[int32]int
	inside  map[string]map[string]bool // inside[n][p]: n lies inside p
	apart   map[string]map[string]bool // symmetric
	bad     map[string]bool
	all     map[string]map[int32]int // members with those of the names inside (gather)
}

func newLinker() *linker {
	return &linker{members: map[string]map[int32]int{}, inside: map[string]map[string]bool{}, apart: map[string]map[string]bool{}, bad: map[string]bool{}}
}

func typed(c *format.Category) bool { return c.Name != "" && !c.Provisional }

// read takes one answer's facts: its named categories' items, and which
// of them lie inside or apart from which.
func (l *linker) read(ans Answer, idx func(string) (int32, bool)) {
	type named struct {
		name  string
		items []int32
		above []string // typed names above it in this answer
	}
	var all []named
	seen := map[string]bool{}
	var walk func(c *format.Category, above []string) []int32
	walk = func(c *format.Category, above []string) []int32 {
		here := above
		if typed(c) {
			if seen[c.Name] {
				l.bad[c.Name] = true
			}
			seen[c.Name] = true
			here = append(slices.Clip(above), c.Name)
		}
		var items []int32
		for _, id := range c.Items {
			if i, ok := idx(id); ok {
				items = append(items, i)
			}
		}
		for _, k := range c.Children {
			items = append(items, walk(k, here)...)
		}
		if typed(c) {
			all = append(all, named{c.Name, items, above})
		}
		return items
	}
	walk(ans.Tree, nil)
	for _, n := range all {
		m := l.members[n.name]
		if m == nil {
			m = map[int32]int{}
			l.members[n.name] = m
		}
		for _, x := range n.items {
			m[x] = max(m[x], ans.Record)
		}
		for _, p := range n.above {
			add(l.inside, n.name, p)
		}
	}
	for i, a := range all {
		for _, b := range all[i+1:] {
			if a.name != b.name && !slices.Contains(a.above, b.name) && !slices.Contains(b.above, a.name) {
				add(l.apart, a.name, b.name)
				add(l.apart, b.name, a.name)
			}
		}
	}
}

func add(rel map[string]map[string]bool, a, b string) {
	if rel[a] == nil {
		rel[a] = map[string]bool{}
	}
	rel[a][b] = true
}

// close makes inside transitive, carries apart down to the names inside
// each side, gives each name the items of the names inside it, and drops
// the names the answers contradict, until none is left to drop.
func (l *linker) close() {
	for {
		l.transitive()
		l.gather()
		dropped := false
		for _, n := range slices.Sorted(maps.Keys(l.members)) {
			if l.bad[n] {
				continue
			}
			if l.inside[n][n] {
				l.bad[n] = true
			}
			for p := range l.inside[n] {
				if l.apart[n][p] {
					l.bad[n], l.bad[p] = true, true
				}
			}
			for m := range l.apart[n] {
				if n != m && shares(l.all[n], l.all[m]) {
					l.bad[n], l.bad[m] = true, true
				}
			}
		}
		for n := range l.bad {
			if l.members[n] != nil {
				l.forget(n)
				dropped = true
			}
		}
		if !dropped {
			return
		}
	}
}

// transitive closes inside under composition and spreads apart to the
// names inside either side.
func (l *linker) transitive() {
	for changed := true; changed; {
		changed = false
		for n, ps := range l.inside {
			for p := range ps {
				for q := range l.inside[p] {
					if !ps[q] {
						ps[q], changed = true, true
					}
				}
			}
			for p := range ps {
				for m := range l.apart[p] {
					if !l.apart[n][m] {
						add(l.apart, n, m)
						add(l.apart, m, n)
						changed = true
					}
				}
			}
		}
	}
}

// forget removes a name from every relation.
func (l *linker) forget(n string) {
	delete(l.members, n)
	delete(l.inside, n)
	delete(l.apart, n)
	for _, rel := range []map[string]map[string]bool{l.inside, l.apart} {
		for _, m := range rel {
			delete(m, n)
		}
	}
}

// gather gives each name its items with those of every name inside it,
// each with the latest record that placed it.
func (l *linker) gather() {
	l.all = map[string]map[int32]int{}
	for n, m := range l.members {
		l.all[n] = maps.Clone(m)
	}
	for k, ps := range l.inside {
		for p := range ps {
			if l.all[p] == nil {
				continue
			}
			for x, r := range l.members[k] {
				l.all[p][x] = max(l.all[p][x], r)
			}
		}
	}
}

func shares(a, b map[int32]int) bool {
	for x := range a {
		if _, ok := b[x]; ok {
			return true
		}
	}
	return false
}

// widestApart lists the pairs of names apart, each once and in name
// order, whose names lie inside no pair apart: with n inside p and p apart
// from m, the pair (n, m) follows from (p, m).
func (l *linker) widestApart() [][2]string {
	var out [][2]string
	for _, n := range slices.Sorted(maps.Keys(l.apart)) {
		for _, m := range slices.Sorted(maps.Keys(l.apart[n])) {
			if n >= m || l.implied(n, m) || l.implied(m, n) {
				continue
			}
			out = append(out, [2]string{n, m})
		}
	}
	return out
}

// implied reports whether a name that holds n is apart from m.
func (l *linker) implied(n, m string) bool {
	for p := range l.inside[n] {
		if l.apart[p][m] {
			return true
		}
	}
	return false
}

// link lists the triplets that keep the categories of n and m apart
// (see the comment above Linked).
func (l *linker) link(n, m string) Link {
	a, b := l.all[n], l.all[m]
	as, bs := slices.Sorted(maps.Keys(a)), slices.Sorted(maps.Keys(b))
	out := Link{Names: [2]string{n, m}, Record: -1}
	chain := func(xs []int32, rec map[int32]int, other int32, otherRec int) {
		for i := 0; i+1 < len(xs); i++ {
			out.Triplets = append(out.Triplets, [3]int32{xs[i], xs[i+1], other})
			out.Record = max(out.Record, rec[xs[i]], rec[xs[i+1]], otherRec)
		}
	}
	chain(as, a, bs[0], b[bs[0]])
	chain(bs, b, as[0], a[as[0]])
	return out
}
