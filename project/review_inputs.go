package project

import "github.com/ramify-tax/ramify/solve"

// CommitteeOptions are the solver options of a regeneration without the
// pull toward the previous outline: what the review committee solves each
// of its trees with, so that support measures the data and the decisions
// alone.
func CommitteeOptions(p *Project) solve.Options {
	return solve.Options{
		MinSize:     p.Settings.Taxonomy.MinSize,
		MaxChildren: p.Settings.Taxonomy.MaxChildren,
		MaxDepth:    p.Settings.Taxonomy.MaxDepth,
		Seed:        Seed,
	}
}

// ItemIDs lists the item ids in index order (position i is item i of the
// graph and of every solver tree).
func (p *Project) ItemIDs() []string {
	ids := make([]string, len(p.Items))
	for i, it := range p.Items {
		ids[i] = it.ID
	}
	return ids
}
