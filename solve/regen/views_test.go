package regen

import (
	"slices"
	"testing"

	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/solve/graph"
)

// TestViewsOfTheDemo: the demo's items have tags, labels and
// descriptions, so the committee sees them whole, by each source alone,
// and by the label channels apart from the description.
func TestViewsOfTheDemo(t *testing.T) {
	p, g, views := demoViews(t)
	var names []string
	for _, v := range views {
		names = append(names, v.Name)
		if v.Graph.N != len(p.Items) || v.Graph.NumEdges() == 0 {
			t.Errorf("view %s: %d items, %d edges", v.Name, v.Graph.N, v.Graph.NumEdges())
		}
	}
	if want := []string{"all", "tags", "text", "label", "label heads", "description"}; !slices.Equal(names, want) {
		t.Errorf("views %q, want %q", names, want)
	}
	if views[0].Graph != g {
		t.Error("the first view is not the solve graph")
	}
}

// TestGraphViewsSameAsApart: building each source's graph once for both
// the combined graph and the sources' own views gives the graphs that
// Graph and Views build apart, edge for edge.
func TestGraphViewsSameAsApart(t *testing.T) {
	p, _, apart := demoViews(t)
	together, err := GraphViews(p, Seed)
	if err != nil {
		t.Fatal(err)
	}
	if len(together) != len(apart) {
		t.Fatalf("%d views together, %d apart", len(together), len(apart))
	}
	for i, v := range together {
		w := apart[i].Graph
		if v.Name != apart[i].Name || v.Graph.N != w.N ||
			!slices.Equal(v.Graph.Offsets, w.Offsets) ||
			!slices.Equal(v.Graph.Targets, w.Targets) ||
			!slices.Equal(v.Graph.Weights, w.Weights) {
			t.Errorf("view %d (%s) differs from %s built apart", i, v.Name, apart[i].Name)
		}
	}
}

// demoViews loads the demo and builds its graph and views apart.
func demoViews(t *testing.T) (*repo.Repo, *graph.CSR, []View) {
	t.Helper()
	p, ds := repo.Load("../../examples/tool-library")
	if len(ds) > 0 {
		t.Fatal(ds)
	}
	g, err := Graph(p, Seed)
	if err != nil {
		t.Fatal(err)
	}
	views, err := Views(p, Seed, g)
	if err != nil {
		t.Fatal(err)
	}
	return p, g, views
}
