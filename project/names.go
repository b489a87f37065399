package project

import (
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/solve/graph"
	"github.com/ramify-tax/ramify/solve/naming"
)

// nameCategories names a freshly solved tree: named groups fix their
// category's name, categories that match one of the previous outline take
// its name, and the rest get a provisional name from their members' tags
// and words.
func (p *Project) nameCategories(root, prev *format.Category) naming.Counts {
	var fixed []naming.Fixed
	for _, f := range p.Constraints {
		for _, g := range f.Groups {
			if g.Name != "" {
				fixed = append(fixed, naming.Fixed{Items: g.Items, Name: g.Name})
			}
		}
	}
	cache := map[string][]string{}
	words := func(id string) []string {
		if w, ok := cache[id]; ok {
			return w
		}
		i, ok := p.Index[id]
		if !ok {
			return nil
		}
		it := p.Items[i]
		w := append([]string(nil), it.Tags...)
		w = append(w, graph.Tokens(it.Label+" "+it.Text)...)
		cache[id] = w
		return w
	}
	return naming.Assign(root, prev, fixed, words)
}
