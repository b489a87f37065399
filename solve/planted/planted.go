// Package planted generates test instances with a known hierarchy: a
// multiway category tree over n items, a sparse similarity graph whose
// edges follow that tree, and vectors whose Euclidean geometry follows it.
// Benchmarks and recovery tests use them; everything is seeded.
//
// The model. Categories form a complete tree with the given branching
// factor and depth (depth is lowered, if needed, until there are no more
// bottom categories than items). The items are dealt to the bottom
// categories round-robin in a seeded random order, so every bottom
// category holds ⌊n/B^D⌋ or ⌈n/B^D⌉ items and item ids say nothing about
// the hierarchy. The true tree has the categories as internal nodes (a
// category with a single member is replaced by that member).
//
// Graph: each item draws EdgesPerItem partners. For each draw a level ℓ
// of the item's ancestry is picked with probability ∝ Decay^(D−ℓ) (ℓ = D
// is its bottom category, 0 the root), and the partner is uniform among
// the other items of the level-ℓ category. The edge weight is
// (1 + depth of the deepest common category)/(1 + D) times log-normal
// noise exp(Noise·Z), Z standard normal, so edges are both more likely
// and heavier inside deeper common categories. Repeated pairs add up.
// Finally the components, if more than one, are chained in order of their
// smallest item by one edge each (weight as above), so the graph is
// connected.
//
// Vectors (Dim coordinates): every category at level ℓ ≥ 1 gets an
// offset with independent N(0, Spread^(2(ℓ−1))) coordinates; an item is
// the sum of its ancestors' offsets plus N(0, (Jitter·Spread^(D−1))²)
// noise, so items sharing deeper categories are closer.
package planted

import (
	"math"
	"math/rand/v2"
	"sort"

	"github.com/ramify-tax/ramify/internal/disjoint"
	"github.com/ramify-tax/ramify/solve"
	"github.com/ramify-tax/ramify/solve/graph"
)

// Model parameters of Generate.
const (
	EdgesPerItem = 10   // partner draws per item
	Decay        = 0.25 // relative chance of a partner one level higher up
	Noise        = 0.3  // log-normal sd of edge weights
	Dim          = 16   // vector coordinates
	Spread       = 0.4  // offset scale ratio between consecutive levels
	Jitter       = 0.3  // item noise relative to the bottom level's offsets
)

// Stream constants give each part of the model its own PCG stream, so a
// change in one part leaves the others' random numbers alone.
const (
	streamAssign  = 0x61737369676e // "assign"
	streamEdges   = 0x6564676573   // "edges"
	streamVectors = 0x766563       // "vec"
)

// Instance is one generated problem.
type Instance struct {
	Seed      uint64
	N         int
	Branching int
	Depth     int // after lowering, see the package comment
	// Bottom[i] is the index (0..Branching^Depth−1) of item i's bottom
	// category; its ancestor at level ℓ is Bottom[i] / Branching^(Depth−ℓ).
	Bottom  []int32
	Tree    *solve.Tree
	Graph   *graph.CSR
	Vectors [][]float64
}

// Generate builds the instance for the given seed, n ≥ 1 items, branching
// ≥ 2 (smaller values are raised to 2) and depth ≥ 0. It returns nil for
// n < 1.
func Generate(seed uint64, n int, branching, depth int) *Instance {
	if n < 1 {
		return nil
	}
	branching = max(branching, 2)
	depth = max(depth, 0)
	for depth > 0 && pow(branching, depth) > n {
		depth--
	}
	in := &Instance{Seed: seed, N: n, Branching: branching, Depth: depth}
	in.assign()
	in.buildTree()
	in.buildGraph()
	in.buildVectors()
	return in
}

func pow(b, e int) int {
	p := 1
	for ; e > 0; e-- {
		p *= b
	}
	return p
}

// assign deals the items to bottom categories round-robin in random order.
func (in *Instance) assign() {
	r := rand.New(rand.NewPCG(in.Seed, streamAssign))
	bottoms := pow(in.Branching, in.Depth)
	in.Bottom = make([]int32, in.N)
	for k, item := range r.Perm(in.N) {
		in.Bottom[item] = int32(k % bottoms)
	}
}

// Ancestor is the index of item i's category at level ℓ (0 = root).
func (in *Instance) Ancestor(i, level int) int {
	return int(in.Bottom[i]) / pow(in.Branching, in.Depth-level)
}

// CommonDepth is the level of the deepest category holding both i and j
// (Depth when they share a bottom category, 0 when only the root).
func (in *Instance) CommonDepth(i, j int) int {
	a, b := int(in.Bottom[i]), int(in.Bottom[j])
	level := in.Depth
	for a != b {
		a /= in.Branching
		b /= in.Branching
		level--
	}
	return level
}

// buildTree creates the category tree bottom-up, level by level.
func (in *Instance) buildTree() {
	t := solve.NewTree(in.N)
	bottoms := pow(in.Branching, in.Depth)
	members := make([][]int32, bottoms)
	for i := 0; i < in.N; i++ { // ascending, so members are sorted
		members[in.Bottom[i]] = append(members[in.Bottom[i]], int32(i))
	}
	nodes := make([]int32, bottoms) // node of each category at the current level
	for c, m := range members {
		nodes[c] = group(t, m)
	}
	for level := in.Depth - 1; level >= 0; level-- {
		up := make([]int32, len(nodes)/in.Branching)
		for c := range up {
			up[c] = group(t, nodes[c*in.Branching:(c+1)*in.Branching])
		}
		nodes = up
	}
	t.Root = nodes[0]
	in.Tree = t
}

// group adds a node over kids, or returns the only kid.
func group(t *solve.Tree, kids []int32) int32 {
	if len(kids) == 1 {
		return kids[0]
	}
	return t.Add(kids...)
}

// Categories lays the items out by bottom category, so that every category
// at every level holds one contiguous range of them.
type Categories struct {
	in    *Instance
	order []int32 // items by bottom category, ascending within one
	start []int   // bottom category c holds order[start[c]:start[c+1]]
}

// Categories returns the instance's items laid out by category.
func (in *Instance) Categories() *Categories {
	order := make([]int32, in.N)
	for i := range order {
		order[i] = int32(i)
	}
	sort.SliceStable(order, func(a, b int) bool { return in.Bottom[order[a]] < in.Bottom[order[b]] })
	bottoms := pow(in.Branching, in.Depth)
	start := make([]int, bottoms+1)
	for _, b := range in.Bottom {
		start[b+1]++
	}
	for c := 0; c < bottoms; c++ {
		start[c+1] += start[c]
	}
	return &Categories{in, order, start}
}

// Members lists the items of item i's category at level ℓ (0 = root),
// i among them, by bottom category and then by id: a shared slice, not
// to be modified.
func (cs *Categories) Members(i, level int) []int32 {
	span := pow(cs.in.Branching, cs.in.Depth-level)
	c := cs.in.Ancestor(i, level)
	return cs.order[cs.start[c*span]:cs.start[(c+1)*span]]
}

// Levels draws levels ℓ = 0..Depth of an item's ancestry with probability
// ∝ decay^(Depth−ℓ): decay < 1 favours the bottom categories.
type Levels struct {
	cum   []float64 // cum[ℓ] is the sum of the weights of levels 0..ℓ
	total float64
}

// Levels returns the level draw for decay.
func (in *Instance) Levels(decay float64) Levels {
	d := in.Depth
	cum := make([]float64, d+1)
	total := 0.0
	for l := 0; l <= d; l++ {
		total += math.Pow(decay, float64(d-l))
		cum[l] = total
	}
	return Levels{cum, total}
}

// Draw draws one level from r (one Float64).
func (ls Levels) Draw(r *rand.Rand) int {
	return min(sort.SearchFloat64s(ls.cum, r.Float64()*ls.total), len(ls.cum)-1)
}

// Affinity is the noiseless weight of an edge between items i and j,
// (1 + depth of their deepest common category)/(1 + Depth).
func (in *Instance) Affinity(i, j int) float64 {
	return float64(1+in.CommonDepth(i, j)) / float64(1+in.Depth)
}

// buildGraph draws the edges described in the package comment.
func (in *Instance) buildGraph() {
	r := rand.New(rand.NewPCG(in.Seed, streamEdges))
	cats := in.Categories()
	levels := in.Levels(Decay)
	weight := func(i, j int) float64 {
		return in.Affinity(i, j) * math.Exp(float64(Noise*r.NormFloat64()))
	}
	edges := make([]graph.Edge, 0, in.N*EdgesPerItem+in.N/8)
	for i := 0; i < in.N; i++ {
		for k := 0; k < EdgesPerItem; k++ {
			j := -1
			for level := levels.Draw(r); level >= 0 && j < 0; level-- {
				m := cats.Members(i, level)
				if len(m) < 2 {
					continue // i is alone here: look one level up
				}
				pick := r.IntN(len(m) - 1)
				if m[pick] == int32(i) {
					pick = len(m) - 1 // skip i itself, keeping the draw uniform
				}
				j = int(m[pick])
			}
			if j >= 0 {
				edges = append(edges, graph.Edge{A: int32(i), B: int32(j), W: weight(i, j)})
			}
		}
	}
	edges = append(edges, in.bridges(edges, weight)...)
	g, err := graph.FromEdges(in.N, edges)
	if err != nil {
		panic("planted: " + err.Error()) // unreachable: ids and weights are valid by construction
	}
	in.Graph = g
}

// bridges returns one edge between the smallest items of consecutive
// components, in order of smallest item, so the graph is connected.
func (in *Instance) bridges(edges []graph.Edge, weight func(i, j int) float64) []graph.Edge {
	sets := disjoint.New(in.N) // a set's root is its smallest item
	for _, e := range edges {
		sets.Union(e.A, e.B)
	}
	var out []graph.Edge
	prev := int32(-1)
	for i := int32(0); int(i) < in.N; i++ {
		if sets.Find(i) != i {
			continue
		}
		if prev >= 0 {
			out = append(out, graph.Edge{A: prev, B: i, W: weight(int(prev), int(i))})
		}
		prev = i
	}
	return out
}

// buildVectors places the items as described in the package comment.
func (in *Instance) buildVectors() {
	r := rand.New(rand.NewPCG(in.Seed, streamVectors))
	// offsets[ℓ][c] for ℓ = 1..D, drawn level by level in category order.
	offsets := make([][][]float64, in.Depth+1)
	for l := 1; l <= in.Depth; l++ {
		scale := math.Pow(Spread, float64(l-1))
		offsets[l] = make([][]float64, pow(in.Branching, l))
		for c := range offsets[l] {
			v := make([]float64, Dim)
			for k := range v {
				v[k] = float64(scale * r.NormFloat64())
			}
			offsets[l][c] = v
		}
	}
	jitter := Jitter * math.Pow(Spread, float64(max(in.Depth-1, 0)))
	in.Vectors = make([][]float64, in.N)
	for i := range in.Vectors {
		v := make([]float64, Dim)
		for l := 1; l <= in.Depth; l++ {
			off := offsets[l][in.Ancestor(i, l)]
			for k := range v {
				v[k] += off[k]
			}
		}
		for k := range v {
			v[k] += float64(jitter * r.NormFloat64())
		}
		in.Vectors[i] = v
	}
}
