package main

import (
	"fmt"
	"slices"
	"strings"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/solve/regen"
)

// checkGroupNames refuses an outline in which a category that a named
// group fixes carries another name: an editor renamed it by hand, and the
// next solve would silently put the group's name back. Each such category
// is named with its line, and the record with its file and line, so the
// editor can change the name where it is decided. solve and check run it
// before anything else.
func checkGroupNames(p *repo.Repo) error {
	// Only a category of a named group's size can be the one it names.
	sizes := map[int]bool{}
	for _, f := range p.Constraints {
		for _, g := range f.Groups {
			if g.Name != "" {
				sizes[len(g.Items)] = true
			}
		}
	}
	if p.Outline == nil || len(sizes) == 0 {
		return nil
	}
	byItems := map[string]*format.Category{}
	var cats []*format.Category
	p.Outline.Root.Walk(func(c *format.Category, _ int) bool {
		if c != p.Outline.Root {
			cats = append(cats, c)
		}
		return true
	})
	for i, ids := range format.MemberLists(p.Outline.Root) {
		if !sizes[len(ids)] {
			continue
		}
		key := strings.Join(ids, "\x00")
		// The outer of a category and its only subcategory is the one a
		// group names (see naming.Assign).
		if _, seen := byItems[key]; !seen {
			byItems[key] = cats[i]
		}
	}
	rel := p.Settings.Taxonomy.File
	var lines []string
	for _, f := range p.Constraints {
		for _, g := range f.Groups {
			if g.Name == "" {
				continue
			}
			ids := slices.Clone(g.Items)
			slices.Sort(ids)
			c, ok := byItems[strings.Join(ids, "\x00")]
			if !ok || c.DisplayName() == g.Name {
				continue
			}
			rec := regen.Record{Kind: "group", Pos: g.Pos, Provenance: g.Provenance}
			lines = append(lines,
				fmt.Sprintf("%s:%d: category %q is named %q by a group record:", rel, c.Line, c.DisplayName(), g.Name),
				"  "+describeRecord(rec),
				fmt.Sprintf("  to rename the category, change name = %q in %s:%d; otherwise rename it back to %q here", g.Name, g.Pos.File, g.Pos.Line, g.Name))
		}
	}
	if len(lines) == 0 {
		return nil
	}
	return &failure{lines: lines}
}
