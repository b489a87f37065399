package project

import (
	"slices"
	"testing"
)

// TestViewsOfTheDemo: the demo's items have tags, labels and
// descriptions, so the committee sees them whole, by each source alone,
// and by the label channels apart from the description.
func TestViewsOfTheDemo(t *testing.T) {
	p, ds := Load("../examples/tool-library")
	if len(ds) > 0 {
		t.Fatal(ds)
	}
	g, err := p.Graph(Seed)
	if err != nil {
		t.Fatal(err)
	}
	views, err := p.Views(Seed, g)
	if err != nil {
		t.Fatal(err)
	}
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
