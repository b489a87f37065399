package solve

import (
	"fmt"
	"maps"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/ramify-tax/ramify/internal/naivelca"
)

// leafParents maps every reachable leaf to the sorted leaf set of its
// parent, as a string, so that two trees can be compared by where each
// item sits.
func leafHomes(t *Tree) map[int32]string { return homesWithout(t, nil) }

// homesWithout is leafHomes with the items of skip left out of every
// category: an item keeps its home when only those came or went.
func homesWithout(t *Tree, skip map[int32]bool) map[int32]string {
	parent := t.Parents()
	out := map[int32]string{}
	for _, v := range t.PostOrder() {
		if !t.IsLeaf(v) {
			continue
		}
		ls := slices.DeleteFunc(t.Leaves(parent[v]), func(l int32) bool { return skip[l] })
		slices.Sort(ls)
		key := make([]byte, 0, 4*len(ls))
		for _, l := range ls {
			key = append(key, byte(l), byte(l>>8), ',')
		}
		out[v] = string(key)
	}
	return out
}

// dropLeaves returns t without the given leaves, as the previous tree of
// a repository whose items those are new: they are unreachable.
func dropLeaves(t *Tree, drop map[int32]bool) *Tree {
	out := NewTree(t.N)
	var rec func(v int32) (int32, bool)
	rec = func(v int32) (int32, bool) {
		if t.IsLeaf(v) {
			return v, !drop[v]
		}
		var kids []int32
		for _, c := range t.Kids[v] {
			if id, ok := rec(c); ok {
				kids = append(kids, id)
			}
		}
		switch len(kids) {
		case 0:
			return 0, false
		case 1:
			return kids[0], true
		}
		return out.Add(kids...), true
	}
	if r, ok := rec(t.Root); ok {
		out.Root = r
	}
	return out
}

// Repair must give a tree over every item that satisfies every record,
// whatever the previous tree and the records: 300 random cases with
// records drawn from a hidden tree (so they are consistent), some items
// new, and a random previous tree.
func TestRepairKeepsEveryRecord(t *testing.T) {
	for trial := range 300 {
		r := rand.New(rand.NewPCG(uint64(trial), 99))
		n := 6 + r.IntN(40)
		g := RandomWeightedGraph(t, uint64(trial), dgStream, n, 0.25)
		hidden := RandomBinaryTree(r, n)
		all := allTriplets(hidden)
		c := &Constraints{}
		for i := range 1 + r.IntN(6) {
			tr := all[r.IntN(len(all))]
			tr.Record = i
			c.Triplets = append(c.Triplets, tr)
		}
		if r.IntN(2) == 0 {
			// A cluster of the hidden tree: an internal node's leaves.
			v := int32(n + r.IntN(hidden.NumNodes()-n))
			if v != hidden.Root {
				ls := hidden.Leaves(v)
				slices.Sort(ls)
				c.Clusters = append(c.Clusters, Cluster{Leaves: ls, Record: 100})
			}
		}
		res, err := Solve(g, nil, Options{MinSize: 2, MaxChildren: 6, Seed: 1})
		if err != nil {
			t.Fatal(err)
		}
		drop := map[int32]bool{}
		for x := range int32(n) {
			if r.IntN(8) == 0 {
				drop[x] = true
			}
		}
		prev := dropLeaves(res.Taxonomy, drop)
		if len(drop) == n {
			continue
		}
		got, _, err := Repair(g, c, prev, Change{}, Options{MinSize: 2, MaxChildren: 6, Seed: 1, Stability: 0.3})
		if err != nil {
			t.Fatalf("trial %d: Repair: %v", trial, err)
		}
		if bad := Satisfies(got, c); len(bad) > 0 {
			t.Fatalf("trial %d: Repair breaks records %v", trial, bad)
		}
		leaves := got.Leaves(got.Root)
		slices.Sort(leaves)
		if len(leaves) != n || leaves[0] != 0 || leaves[n-1] != int32(n-1) {
			t.Fatalf("trial %d: Repair's tree holds leaves %v, want 0..%d once each", trial, leaves, n-1)
		}
	}
}

// With no change at all, Repair returns the previous tree as it is.
func TestRepairWithoutChangeKeepsTheTree(t *testing.T) {
	g := RandomWeightedGraph(t, 7, dgStream, 30, 0.3)
	res, err := Solve(g, nil, Options{MinSize: 2, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	got, rep, err := Repair(g, nil, res.Taxonomy, Change{}, Options{Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Placed != 0 {
		t.Errorf("Repair placed %d items, want 0", rep.Placed)
	}
	if a, b := leafHomes(res.Taxonomy), leafHomes(got); !maps.Equal(a, b) {
		t.Errorf("Repair without change moved items")
	}
}

// A triplet that the previous tree breaks moves only its own items: every
// other item keeps the leaf set of its category, up to the items the
// record names, in the median trial (the project's stability target: one
// record moves at most 1% of the items beyond those it names, median).
func TestRepairMovesOnlyWhatARecordNames(t *testing.T) {
	var shares []float64
	for trial := range 50 {
		r := rand.New(rand.NewPCG(uint64(trial), 5))
		n := 30 + r.IntN(30)
		g := RandomWeightedGraph(t, uint64(1000+trial), dgStream, n, 0.2)
		res, err := Solve(g, nil, Options{MinSize: 3, MaxChildren: 8, Seed: 1})
		if err != nil {
			t.Fatal(err)
		}
		prev := res.Taxonomy
		// A triplet prev resolves the other way (or not at all).
		var tr Triplet
		found := false
		l := naivelca.New(prev.Parents())
		for range 200 {
			p := r.Perm(n)
			a, b, o := int32(p[0]), int32(p[1]), int32(p[2])
			if l.Depth[l.LCA(a, b)] <= l.Depth[l.LCA(a, o)] {
				tr, found = Triplet{A: a, B: b, C: o}, true
				break
			}
		}
		if !found {
			continue
		}
		c := &Constraints{Triplets: []Triplet{tr}}
		got, _, err := Repair(g, c, prev, Change{}, Options{MinSize: 3, MaxChildren: 8, Seed: 1, Stability: 0.3})
		if err != nil {
			t.Fatal(err)
		}
		if bad := Satisfies(got, c); len(bad) > 0 {
			t.Fatalf("trial %d: record broken", trial)
		}
		named := map[int32]bool{tr.A: true, tr.B: true, tr.C: true}
		before, after := leafHomes(prev), leafHomes(got)
		moved, total := 0, 0
		for x, h := range before {
			if named[x] {
				continue
			}
			total++
			if stripNamed(h, named) != stripNamed(after[x], named) {
				moved++
			}
		}
		shares = append(shares, float64(moved)/float64(total))
	}
	slices.Sort(shares)
	if len(shares) == 0 {
		t.Fatal("no trial found a triplet the tree breaks")
	}
	if med := shares[len(shares)/2]; med > 0.01 {
		t.Errorf("a triplet moved a median %.1f%% of the items it does not name, want at most 1%%", 100*med)
	}
}

func stripNamed(home string, named map[int32]bool) string {
	var out []byte
	for i := 0; i+2 < len(home)+1 && i+3 <= len(home); i += 3 {
		l := int32(home[i]) | int32(home[i+1])<<8
		if !named[l] {
			out = append(out, home[i:i+3]...)
		}
	}
	return string(out)
}

// A reviewer's packet answer (a shape over a few items, here the hidden
// tree restricted to 8 items, written as all of its triplets) is mended by
// moving some of its items: every record holds, and when no subtree had to
// be re-solved, every item that no packet names keeps its category. Packets come
// two a round for four rounds, each round repairing the last one's tree
// under all the packets so far, with no limits and with the defaults of
// the design (min_size 3, max_children 12, max_depth 6), from the tree
// Solve gives.
func TestRepairMendsAShapeInPlace(t *testing.T) {
	for _, tc := range []struct {
		name string
		opt  Options
	}{
		{"no limits", Options{MinSize: 1}},
		{"design defaults", Options{MinSize: 3, MaxChildren: 12, MaxDepth: 6}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			regions, moved, packets := 0, 0, 0
			kept, untouched := 0, 0 // categories no packet names, in rounds with a re-solve
			for trial := range 60 {
				r := rand.New(rand.NewPCG(uint64(trial), 7))
				n := 30 + r.IntN(60)
				g := RandomWeightedGraph(t, uint64(trial), dgStream, n, 0.2)
				first, err := Solve(g, nil, tc.opt)
				if err != nil {
					t.Fatal(err)
				}
				prev := first.Taxonomy
				hidden := RandomBinaryTree(r, n)
				all := allTriplets(hidden)
				c := &Constraints{}
				touched := map[int32]bool{} // items some packet named
				for round := range 4 {
					for p := range 2 {
						packet := map[int32]bool{}
						for len(packet) < 8 {
							packet[int32(r.IntN(n))] = true
						}
						for _, tr := range all {
							if packet[tr.A] && packet[tr.B] && packet[tr.C] {
								tr.Record = 2*round + p
								c.Triplets = append(c.Triplets, tr)
							}
						}
						maps.Copy(touched, packet)
					}
					packets += 2
					got, rep, err := Repair(g, c, prev, Change{}, tc.opt)
					if err != nil {
						t.Fatal(err)
					}
					if bad := Satisfies(got, c); len(bad) > 0 {
						t.Fatalf("trial %d round %d: the repaired tree breaks records %v", trial, round, bad)
					}
					if len(rep.Regions) > 0 || rep.Rebuilt {
						regions++
						k, all := keptCategories(prev, got, touched)
						kept += k
						untouched += all
					} else {
						before, after := homesWithout(prev, touched), homesWithout(got, touched)
						for x := range int32(n) {
							if before[x] != after[x] && !touched[x] {
								moved++
							}
						}
					}
					prev = got
				}
			}
			// Random packets on a random hidden tree disagree with the
			// solved tree far more than a reviewer's do; how often a round
			// still needs a subtree re-solved is measured by cmd/bench/reviewloop.
			t.Logf("%d of %d rounds needed a subtree re-solved; they kept %d of %d categories that hold no packet item", regions, packets/2, kept, untouched)
			if untouched > 0 && float64(kept) < 0.85*float64(untouched) {
				t.Errorf("re-solved subtrees kept %d of %d categories that hold no packet item, want at least 85%%", kept, untouched)
			}
			if moved > 0 {
				t.Errorf("%d items outside the packets changed category", moved)
			}
		})
	}
}

// keptCategories counts the categories of prev with two or more items and
// none of skip, and how many of them are categories of got too.
func keptCategories(prev, got *Tree, skip map[int32]bool) (kept, all int) {
	sets := func(t *Tree) map[string]bool {
		out := map[string]bool{}
		for _, v := range t.PostOrder() {
			if t.IsLeaf(v) || v == t.Root {
				continue
			}
			ls := t.Leaves(v)
			if len(ls) < 2 || slices.ContainsFunc(ls, func(l int32) bool { return skip[l] }) {
				continue
			}
			slices.Sort(ls)
			out[fmt.Sprint(ls)] = true
		}
		return out
	}
	after := sets(got)
	for k := range sets(prev) {
		all++
		if after[k] {
			kept++
		}
	}
	return kept, all
}

// A record over many items (two categories kept apart, as linked answers
// compile) that the tree breaks at one item is mended by moving that item,
// not by re-solving the subtree where its sixty items meet: the tree
// holds A's items and B's apart but one, which sits among B's.
func TestRepairMendsAWideRecordByMovingWhatBreaksIt(t *testing.T) {
	const half = 30
	n := 2 * half
	g := RandomWeightedGraph(t, 77, dgStream, n, 0.2)
	var c Constraints
	for i := int32(0); i+1 < half; i++ {
		c.Triplets = append(c.Triplets, Triplet{A: i, B: i + 1, C: half})
		c.Triplets = append(c.Triplets, Triplet{A: half + i, B: half + i + 1, C: 0})
	}
	stray := int32(half - 1)
	prev := NewTree(n)
	var as, bs []int32
	for x := int32(0); x < int32(n); x++ {
		if x < half && x != stray {
			as = append(as, x)
		} else {
			bs = append(bs, x)
		}
	}
	prev.Root = prev.Add(prev.Add(as...), prev.Add(bs...))
	if len(Satisfies(prev, &c)) == 0 {
		t.Fatal("the previous tree should break the record")
	}
	got, rep, err := Repair(g, &c, prev, Change{}, Options{MinSize: 3, MaxChildren: 8, Seed: 1, Stability: 0.3})
	if err != nil {
		t.Fatal(err)
	}
	if bad := Satisfies(got, &c); len(bad) > 0 {
		t.Fatal("record broken after repair")
	}
	if len(rep.Regions) > 0 || rep.Rebuilt {
		t.Errorf("re-solved subtrees %v (rebuilt %v); moving the stray item mends the record", rep.Regions, rep.Rebuilt)
	}
	before, after := leafHomes(prev), leafHomes(got)
	only := map[int32]bool{stray: true}
	for x := range before {
		if x != stray && stripNamed(before[x], only) != stripNamed(after[x], only) {
			t.Errorf("item %d moved; only %d had to", x, stray)
		}
	}
}
