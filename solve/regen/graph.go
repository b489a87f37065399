package regen

import (
	"fmt"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/solve/graph"
)

// Graph builds the similarity graph of the settings: one kNN graph per
// configured source, each normalised and summed with its weight
// (graph.Combine). Item i of the graph is p.Items[i].
func Graph(p *repo.Repo, seed uint64) (*graph.CSR, error) {
	parts, err := sourceGraphs(p, seed)
	if err != nil {
		return nil, err
	}
	return combine(p, parts)
}

// sourceGraphs builds the kNN graph of each configured source, in the
// order of the settings.
func sourceGraphs(p *repo.Repo, seed uint64) ([]*graph.CSR, error) {
	b := graph.Builder{K: p.Settings.Similarity.Neighbors, Seed: seed}
	var parts []*graph.CSR
	for _, src := range p.Settings.Similarity.Sources {
		g, err := sourceGraph(p, b, src)
		if err != nil {
			return nil, fmt.Errorf("similarity source %q: %w", src.Kind, err)
		}
		parts = append(parts, g)
	}
	return parts, nil
}

// combine sums the source graphs with the weights of the settings.
func combine(p *repo.Repo, parts []*graph.CSR) (*graph.CSR, error) {
	if len(parts) == 0 {
		return graph.FromEdges(len(p.Items), nil)
	}
	weights := make([]float64, len(parts))
	for i, src := range p.Settings.Similarity.Sources {
		weights[i] = src.Weight
	}
	return graph.Combine(parts, weights)
}

func sourceGraph(p *repo.Repo, b graph.Builder, src format.Source) (*graph.CSR, error) {
	n := len(p.Items)
	switch src.Kind {
	case format.SourceTags:
		tags := make([][]string, n)
		for i, it := range p.Items {
			tags[i] = it.Tags
		}
		return b.Tags(tags)
	case format.SourceText:
		labels, texts := labelsAndTexts(p.Items)
		ts := p.Settings.Similarity.Text
		return b.LabelText(labels, texts, graph.TextMix{Heads: ts.LabelHeads, Grams: ts.LabelGrams, Words: ts.Description})
	case format.SourceVector:
		if p.Vectors == nil {
			return nil, fmt.Errorf("no vectors file is configured (items.vectors)")
		}
		dim := len(p.Vectors.Features)
		row := make(map[string]int32, len(p.Vectors.IDs))
		for i, id := range p.Vectors.IDs {
			row[id] = int32(i)
		}
		// The matrix stays in file order and precision; the builder reads
		// item i from its row, so a million embeddings are never copied.
		rows := make([]int32, n)
		for i, it := range p.Items {
			r, ok := row[it.ID]
			if !ok {
				return nil, fmt.Errorf("item %q has no vector", it.ID)
			}
			rows[i] = r
		}
		// Cosine on z-scored features is ramify's chosen vector
		// similarity; the Gaussian kernel with local scaling stays
		// available in solve/graph. Random far partners beside the
		// neighbours keep the coarse geometry of the points (see
		// graph.DefaultFarPartners).
		b.FarPartners = graph.DefaultFarPartners
		if p.Vectors.Values32 != nil {
			return graph.VectorRows(b, p.Vectors.Values32, rows, n, dim, graph.Cosine)
		}
		return graph.VectorRows(b, p.Vectors.Values, rows, n, dim, graph.Cosine)
	case format.SourceLinks:
		t := p.Links[src.File]
		if t == nil {
			return graph.Links(n, nil)
		}
		return graph.LinkColumns(n, p.LinkItems(t), t.A, t.B, t.Weight)
	}
	return nil, fmt.Errorf("unknown kind")
}

// labelsAndTexts lists the items' labels and descriptions, in item order,
// as the text graphs read them.
func labelsAndTexts(items []format.Item) (labels, texts []string) {
	labels = make([]string, len(items))
	texts = make([]string, len(items))
	for i, it := range items {
		labels[i], texts[i] = it.Label, it.Text
	}
	return labels, texts
}
