package review

import (
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/ramify-tax/ramify/solve"
	"github.com/ramify-tax/ramify/solve/graph"
	"github.com/ramify-tax/ramify/solve/planted"
)

var testOptions = solve.Options{MinSize: 3, MaxChildren: 12, MaxDepth: 6, Seed: 1}

// TestSupportOfPlantedClusters: a planted hierarchy (solve/planted, three
// top categories of about 100 items with three subcategories each) is
// well separated — most similarity stays inside a bottom category — so
// every planted category must be held by nearly every committee tree.
func TestSupportOfPlantedClusters(t *testing.T) {
	in := planted.Generate(3, 300, 3, 2)
	c, err := BuildCommittee(in.Graph, nil, testOptions, DefaultCommitteeSize, 9)
	if err != nil {
		t.Fatal(err)
	}
	checked := 0
	for v := in.Tree.N; v < in.Tree.NumNodes(); v++ {
		if int32(v) == in.Tree.Root {
			continue
		}
		leaves := in.Tree.Leaves(int32(v))
		if s := c.Support(leaves); s < 0.95 {
			t.Errorf("planted category of %d items has support %.2f, want >= 0.95", len(leaves), s)
		}
		checked++
	}
	if checked != 12 {
		t.Fatalf("checked %d planted categories, want 3 + 9", checked)
	}
}

// TestSupportOnStructurelessGraph: on a random graph (every item linked
// to ten uniformly random others, weights uniform in [0.5, 1.5]) nothing
// is planted, so the categories of the solved tree are accidents of the
// data and few committee trees repeat them.
func TestSupportOnStructurelessGraph(t *testing.T) {
	const n = 300
	r := rand.New(rand.NewPCG(1, 2))
	var edges []graph.Edge
	for i := range n {
		for range 10 {
			edges = append(edges, graph.Edge{A: int32(i), B: int32(r.IntN(n)), W: 0.5 + r.Float64()})
		}
	}
	g, err := graph.FromEdges(n, edges)
	if err != nil {
		t.Fatal(err)
	}
	res, err := solve.Solve(g, nil, testOptions)
	if err != nil {
		t.Fatal(err)
	}
	c, err := BuildCommittee(g, nil, testOptions, DefaultCommitteeSize, 9)
	if err != nil {
		t.Fatal(err)
	}
	a := c.Assess(res.Taxonomy)
	sum, count, most := 0.0, 0, 0.0
	for _, v := range internalNodes(res.Taxonomy) {
		if v == res.Taxonomy.Root {
			continue
		}
		sum += a.Support[v]
		most = max(most, a.Support[v])
		count++
	}
	if count < 10 {
		t.Fatalf("the solved tree has only %d categories", count)
	}
	if mean := sum / float64(count); mean > 0.1 || most > 0.5 {
		t.Errorf("support on a structureless graph: mean %.3f (want <= 0.1), largest %.2f (want <= 0.5)", mean, most)
	}
}

func TestSupportNearMatch(t *testing.T) {
	// One tree over 20 items holds {0..9} exactly and {10..19} as a cluster
	// of 10 whose nearest counterpart has one item fewer.
	tr := tree(t, 21, "((0,1,2,3,4,5,6,7,8,9),((10,11,12,13,14,15,16,17,18),19,20))")
	c, err := NewCommittee(21, []*solve.Tree{tr})
	if err != nil {
		t.Fatal(err)
	}
	seq := func(lo, hi int32) []int32 {
		var out []int32
		for i := lo; i < hi; i++ {
			out = append(out, i)
		}
		return out
	}
	tests := []struct {
		name  string
		items []int32
		want  float64
	}{
		{"exact cluster", seq(0, 10), 1},
		{"9 of a 10-item cluster: Jaccard 0.9", seq(0, 9), 1},
		{"8 of a 10-item cluster: Jaccard 0.8", seq(0, 8), 0},
		{"one item too many: Jaccard 9/10", seq(10, 20), 1},
		{"two items from elsewhere", append(seq(10, 19), 0, 1), 0},
		{"whole tree", seq(0, 21), 1},
	}
	for _, tc := range tests {
		items := slices.Clone(tc.items)
		if got := c.Support(items); got != tc.want {
			t.Errorf("%s: support %v, want %v", tc.name, got, tc.want)
		}
	}
}
