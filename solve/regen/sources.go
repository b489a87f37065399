package regen

import (
	"fmt"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/solve/graph"
)

// SourceGraph is the kNN graph of one configured similarity source, as it
// enters the sum that Graph builds.
type SourceGraph struct {
	Source format.Source
	Graph  *graph.CSR
}

// SourceGraphs builds each configured source's graph on its own, so that
// a similarity in the combined graph can be traced to where it comes
// from. It gives the same graphs Graph sums.
func SourceGraphs(p *repo.Repo, seed uint64) ([]SourceGraph, error) {
	b := graph.Builder{K: p.Settings.Similarity.Neighbors, Seed: seed}
	var out []SourceGraph
	for _, src := range p.Settings.Similarity.Sources {
		g, err := sourceGraph(p, b, src)
		if err != nil {
			return nil, fmt.Errorf("similarity source %q: %w", src.Kind, err)
		}
		out = append(out, SourceGraph{Source: src, Graph: g})
	}
	return out, nil
}
