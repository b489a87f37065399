package diff

import (
	"math"
	"math/rand/v2"
	"sort"

	"github.com/ramify-tax/ramify/internal/naivelca"
	"github.com/ramify-tax/ramify/solve/hier"
)

// bruteTripletAgreement compares all C(n,3) triples: O(n³ · depth).
func bruteTripletAgreement(a, b *hier.Tree) float64 {
	n := int32(a.N)
	if n < 3 {
		return 1
	}
	na, nb := naivelca.New(a.Parents()), naivelca.New(b.Parents())
	same, all := 0, 0
	for p := int32(0); p < n; p++ {
		for q := p + 1; q < n; q++ {
			for r := q + 1; r < n; r++ {
				all++
				if na.Topology(p, q, r) == nb.Topology(p, q, r) {
					same++
				}
			}
		}
	}
	return float64(same) / float64(all)
}

// bruteClusters lists the distinct non-trivial leaf sets as sorted keys.
func bruteClusters(t *hier.Tree) map[string]bool {
	out := map[string]bool{}
	for _, v := range t.PostOrder() {
		if t.IsLeaf(v) {
			continue
		}
		ls := t.Leaves(v)
		if len(ls) < 2 || len(ls) >= t.N {
			continue
		}
		sort.Slice(ls, func(i, j int) bool { return ls[i] < ls[j] })
		key := make([]byte, 0, 4*len(ls))
		for _, l := range ls {
			key = append(key, byte(l>>24), byte(l>>16), byte(l>>8), byte(l))
		}
		out[string(key)] = true
	}
	return out
}

func bruteRF(a, b *hier.Tree) int {
	ca, cb := bruteClusters(a), bruteClusters(b)
	d := 0
	for k := range ca {
		if !cb[k] {
			d++
		}
	}
	for k := range cb {
		if !ca[k] {
			d++
		}
	}
	return d
}

// bruteCophenetic computes Pearson's r over all pairs in float64, the
// textbook two-pass way.
func bruteCophenetic(a, b *hier.Tree) (float64, bool) {
	na, nb := naivelca.New(a.Parents()), naivelca.New(b.Parents())
	sa, sb := a.Sizes(), b.Sizes()
	var xs, ys []float64
	for p := int32(0); p < int32(a.N); p++ {
		for q := p + 1; q < int32(a.N); q++ {
			xs = append(xs, float64(sa[na.LCA(p, q)]))
			ys = append(ys, float64(sb[nb.LCA(p, q)]))
		}
	}
	if len(xs) == 0 {
		return 0, false
	}
	mean := func(v []float64) float64 {
		s := 0.0
		for _, x := range v {
			s += x
		}
		return s / float64(len(v))
	}
	mx, my := mean(xs), mean(ys)
	var sxy, sxx, syy float64
	for i := range xs {
		dx, dy := xs[i]-mx, ys[i]-my
		sxy += dx * dy
		sxx += dx * dx
		syy += dy * dy
	}
	if sxx == 0 || syy == 0 {
		return 0, false
	}
	return sxy / math.Sqrt(sxx*syy), true
}

// randomTree builds a random tree on n leaves: random binary merges, then
// each internal node is contracted into its parent with probability
// collapse (making it multiway), and with probability unary a single-child
// node is inserted above a node.
func randomTree(rng *rand.Rand, n int, collapse, unary float64) *hier.Tree {
	// Merge random pairs into a binary tree, as parent lists.
	type node struct{ kids []int }
	nodes := make([]node, n)
	active := make([]int, n)
	for i := range active {
		active[i] = i
	}
	for len(active) > 1 {
		i := rng.IntN(len(active))
		j := rng.IntN(len(active) - 1)
		if j >= i {
			j++
		}
		nodes = append(nodes, node{kids: []int{active[i], active[j]}})
		id := len(nodes) - 1
		if i > j {
			i, j = j, i
		}
		active[i] = id
		active = append(active[:j], active[j+1:]...)
	}
	root := active[0]
	t := hier.NewTree(n)
	var build func(v int) []int32
	// build returns the ids to hang under the parent: a contracted node
	// hands up its children instead of itself.
	build = func(v int) []int32 {
		if v < n {
			return []int32{int32(v)}
		}
		var kids []int32
		for _, c := range nodes[v].kids {
			kids = append(kids, build(c)...)
		}
		if v != root && rng.Float64() < collapse {
			return kids
		}
		id := t.Add(kids...)
		if rng.Float64() < unary {
			id = t.Add(id)
		}
		return []int32{id}
	}
	top := build(root)
	if n == 1 {
		t.Root = 0
	} else {
		t.Root = top[0]
	}
	return t
}
