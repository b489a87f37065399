package regen

import (
	"fmt"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/solve/graph"
)

// View is one way of seeing the items: a similarity graph built from a
// part of what is known about them.
type View struct {
	Name  string // "all", a source kind, or "label" / "description"
	Graph *graph.CSR
}

// Views lists the views of the items that the review committee solves
// trees from (co-testing: Muslea, Minton & Knoblock, "Active learning
// with multiple views", JAIR 2006 — trees solved from views that see
// different evidence disagree where one view's evidence misleads it,
// which reweighting one graph cannot show). First comes the graph that
// solve uses (all, built here by Graph), then each configured source
// alone when there are several, and for a text source the label channels
// (head words and character grams), the head words alone and the
// description apart, when items have both labels and descriptions. A view with no edges at all is
// left out. all is the graph Graph(p, seed) returns, passed in so it is built
// once; GraphViews builds both and each source's graph only once.
func Views(p *repo.Repo, seed uint64, all *graph.CSR) ([]View, error) {
	return listViews(p, seed, all, nil)
}

// GraphViews returns the views with the graph solve uses first, as Views
// does, building each source's graph once for both the combined graph and
// the source's own view.
func GraphViews(p *repo.Repo, seed uint64) ([]View, error) {
	parts, err := sourceGraphs(p, seed)
	if err != nil {
		return nil, err
	}
	all, err := combine(p, parts)
	if err != nil {
		return nil, err
	}
	return listViews(p, seed, all, parts)
}

// listViews lists the views; parts, when not nil, are the sources' graphs
// already built (sourceGraphs).
func listViews(p *repo.Repo, seed uint64, all *graph.CSR, parts []*graph.CSR) ([]View, error) {
	views := []View{{Name: "all", Graph: all}}
	b := graph.Builder{K: p.Settings.Similarity.Neighbors, Seed: seed}
	add := func(name string, g *graph.CSR, err error) error {
		if err != nil {
			return fmt.Errorf("similarity view %q: %w", name, err)
		}
		if g.NumEdges() > 0 {
			views = append(views, View{Name: name, Graph: g})
		}
		return nil
	}
	sources := p.Settings.Similarity.Sources
	for i, src := range sources {
		if len(sources) > 1 {
			var g *graph.CSR
			var err error
			if parts != nil {
				g = parts[i]
			} else {
				g, err = sourceGraph(p, b, src)
			}
			if err := add(src.Kind, g, err); err != nil {
				return nil, err
			}
		}
		if src.Kind != format.SourceText || !hasLabelsAndText(p) {
			continue
		}
		labels, texts := labelsAndTexts(p.Items)
		mix := p.Settings.Similarity.Text
		channels := []struct {
			name string
			mix  graph.TextMix
		}{
			{"label", graph.TextMix{Heads: mix.LabelHeads, Grams: mix.LabelGrams}},
			{"label heads", graph.TextMix{Heads: 1}},
			{"description", graph.TextMix{Words: 1}},
		}
		for _, ch := range channels {
			if ch.mix.Check() != nil {
				continue // the settings give this channel no weight
			}
			g, err := b.LabelText(labels, texts, ch.mix)
			if err := add(ch.name, g, err); err != nil {
				return nil, err
			}
		}
	}
	return views, nil
}

// hasLabelsAndText reports whether some item has a label and some item a
// description, so that each alone says something.
func hasLabelsAndText(p *repo.Repo) bool {
	label, text := false, false
	for _, it := range p.Items {
		label = label || it.Label != ""
		text = text || it.Text != ""
	}
	return label && text
}
