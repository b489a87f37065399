package match

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/google/go-cmp/cmp"
)

// jaccardExampleSets realises a Jaccard matrix of our own, small enough to
// check by hand, with actual leaf sets: rows A, B, C (old) × columns X, Y, Z
// (new), J = [[.6,.5,0],[.5,0,.1],[0,.4,.3]]. The block sizes were found by
// an exact rational LP (the equations (1+J)|o∩n| = J(|o|+|n|) are linear in
// the block sizes); the test checks the resulting matrix exactly.
func jaccardExampleSets() (old, new [][]int32) {
	blocks := []struct {
		old, new []int // indices into A,B,C and X,Y,Z
		size     int
	}{
		{nil, []int{2}, 320},
		{[]int{0}, []int{0, 1}, 165},
		{[]int{1}, []int{0}, 67},
		{[]int{1}, []int{0, 2}, 65},
		{[]int{2}, []int{2}, 33},
		{[]int{2}, []int{1, 2}, 132},
		{[]int{0, 1}, []int{0}, 33},
	}
	old, new = make([][]int32, 3), make([][]int32, 3)
	leaf := int32(0)
	for _, b := range blocks {
		for range b.size {
			for _, o := range b.old {
				old[o] = append(old[o], leaf)
			}
			for _, n := range b.new {
				new[n] = append(new[n], leaf)
			}
			leaf++
		}
	}
	return old, new
}

func jaccard(a, b []int32) (inter, union int) {
	i, j := 0, 0
	for i < len(a) && j < len(b) {
		switch {
		case a[i] == b[j]:
			inter++
			i++
			j++
		case a[i] < b[j]:
			i++
		default:
			j++
		}
	}
	return inter, len(a) + len(b) - inter
}

func TestMatchClustersJaccardExample(t *testing.T) {
	old, new := jaccardExampleSets()
	// The sets realise the matrix exactly (tenths as integers).
	want := [3][3]int{{6, 5, 0}, {5, 0, 1}, {0, 4, 3}}
	for r := range 3 {
		for c := range 3 {
			inter, union := jaccard(old[r], new[c])
			if inter*10 != want[r][c]*union {
				t.Fatalf("J(%c,%c) = %d/%d, want 0.%d", "ABC"[r], "XYZ"[c], inter, union, want[r][c])
			}
		}
	}
	// By brute force over all 3! assignments (not a published value): the
	// optimum is A–Y, B–X, C–Z with total 1.3 (unique).
	got := Clusters(old, new, 0)
	wantPairs := []Pair{{0, 1, 0.5}, {1, 0, 0.5}, {2, 2, 0.3}}
	if diff := cmp.Diff(wantPairs, got); diff != "" {
		t.Errorf("Clusters(τ=0) mismatch (-want +got):\n%s", diff)
	}
	total := 0.0
	for _, p := range got {
		total += p.Jaccard
	}
	if math.Abs(total-1.3) > 1e-12 {
		t.Errorf("matched total = %v, want 1.3", total)
	}
	// Greedy by largest overlap takes A–X first and ends at 1.1 (by hand).
	if g := greedyTotal(old, new); math.Abs(g-1.1) > 1e-12 {
		t.Errorf("greedy total = %v, want 1.1", g)
	}
	// τ = 0.35 applied after matching drops C–Z only.
	got = Clusters(old, new, 0.35)
	if diff := cmp.Diff(wantPairs[:2], got); diff != "" {
		t.Errorf("Clusters(τ=0.35) mismatch (-want +got):\n%s", diff)
	}
}

// greedyTotal repeatedly takes the largest remaining overlap.
func greedyTotal(old, new [][]int32) float64 {
	type e struct {
		r, c int
		j    float64
	}
	var es []e
	for r := range old {
		for c := range new {
			if i, u := jaccard(old[r], new[c]); i > 0 {
				es = append(es, e{r, c, float64(i) / float64(u)})
			}
		}
	}
	slices.SortStableFunc(es, func(a, b e) int {
		if a.j > b.j {
			return -1
		}
		if a.j < b.j {
			return 1
		}
		return 0
	})
	usedR, usedC := map[int]bool{}, map[int]bool{}
	total := 0.0
	for _, x := range es {
		if !usedR[x.r] && !usedC[x.c] {
			usedR[x.r], usedC[x.c] = true, true
			total += x.j
		}
	}
	return total
}

// bruteBest enumerates every matching of the rows into the columns (or
// none) and returns the best objective: total rounded weight, then total
// rounded squared weight, as weightCost defines them.
func bruteBest(old, new [][]int32) cost {
	best := cost{-1, -1, 0}
	used := make([]bool, len(new))
	var rec func(r int, acc cost)
	rec = func(r int, acc cost) {
		if r == len(old) {
			if best.less(acc) {
				best = acc
			}
			return
		}
		rec(r+1, acc)
		for c := range new {
			if used[c] {
				continue
			}
			i, u := jaccard(old[r], new[c])
			if i == 0 {
				continue
			}
			w := weightCost(int64(i), int64(u))
			used[c] = true
			rec(r+1, acc.add(cost{weightScale - w.a, weightScale - w.b, 0}))
			used[c] = false
		}
	}
	rec(0, cost{})
	return best
}

func randomSets(rng *rand.Rand, k, universe int) [][]int32 {
	sets := make([][]int32, k)
	for i := range sets {
		for l := range universe {
			if rng.IntN(3) == 0 {
				sets[i] = append(sets[i], int32(l))
			}
		}
	}
	return sets
}

// On random small instances the matching reaches the brute-force optimum
// of the lexicographic objective, is a matching, and only uses real
// overlaps.
func TestMatchClustersMatchesBruteForce(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 12))
	for trial := range 300 {
		old := randomSets(rng, 1+rng.IntN(6), 4+rng.IntN(8))
		new := randomSets(rng, 1+rng.IntN(6), 4+rng.IntN(8))
		got := Clusters(old, new, 0)
		var obj cost
		seenNew := map[int]bool{}
		for i, p := range got {
			if i > 0 && p.Old <= got[i-1].Old || seenNew[p.New] {
				t.Fatalf("trial %d: not a sorted matching: %v", trial, got)
			}
			seenNew[p.New] = true
			in, un := jaccard(old[p.Old], new[p.New])
			if in == 0 || p.Jaccard != float64(in)/float64(un) {
				t.Fatalf("trial %d: pair %v has overlap %d/%d", trial, p, in, un)
			}
			w := weightCost(int64(in), int64(un))
			obj = obj.add(cost{weightScale - w.a, weightScale - w.b, 0})
		}
		if want := bruteBest(old, new); obj != want {
			t.Fatalf("trial %d: objective %v, brute force %v\nold %v\nnew %v\ngot %v", trial, obj, want, old, new, got)
		}
		if again := Clusters(old, new, 0); !slices.Equal(got, again) {
			t.Fatalf("trial %d: second run differs", trial)
		}
	}
}

// Exact ties: two identical new sets for one old set; the first (smaller
// index) wins, every run. (Ties of the total broken by the sum of squares
// are covered by the brute-force test, whose objective includes them.)
// A perfect pair gives way when two weaker pairs add up to more.
func TestMatchClustersTies(t *testing.T) {
	old := [][]int32{{1, 2}}
	new := [][]int32{{1, 2}, {1, 2}}
	if got := Clusters(old, new, 0); len(got) != 1 || got[0].New != 0 {
		t.Errorf("Clusters with two equal candidates = %v, want old 0 → new 0", got)
	}
	// old0 = {1,2}, old1 = {3,4}; new0 = {1,2,3,4}, new1 = {1,2}.
	// Matchings: {o0–n1 (1), o1–n0 (.5)} = 1.5 beats {o0–n0 (.5)} = .5.
	got := Clusters([][]int32{{1, 2}, {3, 4}}, [][]int32{{1, 2, 3, 4}, {1, 2}}, 0)
	want := []Pair{{0, 1, 1}, {1, 0, 0.5}}
	if diff := cmp.Diff(want, got); diff != "" {
		t.Errorf("mismatch (-want +got):\n%s", diff)
	}
}

func TestMatchClustersEdgeCases(t *testing.T) {
	if got := Clusters(nil, nil, 0.5); len(got) != 0 {
		t.Errorf("Clusters(nil, nil) = %v", got)
	}
	if got := Clusters([][]int32{{}, {1}}, [][]int32{{2}}, 0); len(got) != 0 {
		t.Errorf("disjoint or empty sets matched: %v", got)
	}
	defer func() {
		if recover() == nil {
			t.Error("unsorted set did not panic")
		}
	}()
	Clusters([][]int32{{2, 1}}, nil, 0)
}

// dpBest is the exact optimum by dynamic programming over subsets of used
// columns: fine for up to a dozen columns.
func dpBest(old, new [][]int32) cost {
	nc := len(new)
	w := make([][]cost, len(old))
	ok := make([][]bool, len(old))
	for r := range old {
		w[r], ok[r] = make([]cost, nc), make([]bool, nc)
		for c := range new {
			if i, u := jaccard(old[r], new[c]); i > 0 {
				x := weightCost(int64(i), int64(u))
				w[r][c], ok[r][c] = cost{weightScale - x.a, weightScale - x.b, 0}, true
			}
		}
	}
	best := make([]cost, 1<<nc) // best[mask] after the rows so far
	for m := range best {
		best[m] = cost{-1 << 62, 0, 0}
	}
	best[0] = cost{}
	for r := range old {
		next := slices.Clone(best)
		for m, v := range best {
			if v.a < 0 {
				continue
			}
			for c := range nc {
				if m&(1<<c) == 0 && ok[r][c] {
					if cand := v.add(w[r][c]); next[m|1<<c].less(cand) {
						next[m|1<<c] = cand
					}
				}
			}
		}
		best = next
	}
	top := cost{-1 << 62, 0, 0}
	for _, v := range best {
		if top.less(v) {
			top = v
		}
	}
	return top
}

// Larger instances, including nested (taxonomy-like) sets that make long
// augmenting paths, against the subset DP.
func TestMatchClustersMatchesSubsetDP(t *testing.T) {
	rng := rand.New(rand.NewPCG(13, 14))
	nested := func(k, universe int) [][]int32 {
		// Random intervals of a line: laminar-ish, heavily overlapping.
		sets := make([][]int32, k)
		for i := range sets {
			a := rng.IntN(universe)
			b := a + 1 + rng.IntN(universe-a)
			for l := a; l < b; l++ {
				sets[i] = append(sets[i], int32(l))
			}
		}
		return sets
	}
	for trial := range 150 {
		var old, new [][]int32
		if trial%2 == 0 {
			old, new = nested(4+rng.IntN(8), 30), nested(4+rng.IntN(8), 30)
		} else {
			old, new = randomSets(rng, 4+rng.IntN(8), 20), randomSets(rng, 4+rng.IntN(8), 20)
		}
		var obj cost
		for _, p := range Clusters(old, new, 0) {
			in, un := jaccard(old[p.Old], new[p.New])
			w := weightCost(int64(in), int64(un))
			obj = obj.add(cost{weightScale - w.a, weightScale - w.b, 0})
		}
		if want := dpBest(old, new); obj != want {
			t.Fatalf("trial %d: objective %v, subset DP %v", trial, obj, want)
		}
	}
}
