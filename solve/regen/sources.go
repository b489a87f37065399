package regen

import (
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
// from: the graphs Graph sums, each with its source.
func SourceGraphs(p *repo.Repo, seed uint64) ([]SourceGraph, error) {
	parts, err := sourceGraphs(p, seed)
	if err != nil {
		return nil, err
	}
	var out []SourceGraph
	for i, g := range parts {
		out = append(out, SourceGraph{Source: p.Settings.Similarity.Sources[i], Graph: g})
	}
	return out, nil
}
