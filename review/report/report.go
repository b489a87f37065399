// Package report builds the taxonomy report: one self-contained HTML page
// (inline style and script, no network) that shows the tree collapsed to
// its top level and builds rows only when a category is opened, from the
// data embedded in the page as JSON. Build gathers the facts into a Page;
// WriteHTML renders it, byte for byte the same for the same inputs.
package report

import (
	"sort"

	"github.com/ramify-tax/ramify/diff"
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/binding"
	"github.com/ramify-tax/ramify/review"
)

// Input is everything the report shows.
type Input struct {
	Title string
	// Root is the taxonomy; Structure its structure hash.
	Root      *format.Category
	Structure string
	Items     []format.Item
	Index     map[string]int
	Records   *binding.Index
	// Changes is the semantic diff from Base to Root; nil when there is no
	// base to compare with (BaseNote then says why).
	Changes  *diff.Report
	Base     string
	BaseNote string
	// Support holds the committee support of each category; nil when it
	// was not computed. Trees is the committee's size.
	Support map[*format.Category]float64
	Trees   int
	Open    []OpenPacket
	// Audits is the audit estimate for this version; nil when unknown.
	Audits *review.AuditSummary
	Gate   Gate
}

// OpenPacket is one packet of reviews/open.
type OpenPacket struct {
	File, Reason, Drawn, Verdict string
	Current                      bool // drawn from this version of the tree
	Items                        []string
}

// Gate is the release gate the audit tally is measured against.
type Gate struct {
	MinAudits     int
	MaxRejectRate float64
}

// Page is the report's data, as it is embedded in the page.
type Page struct {
	Title string
	// Cats[0] is the root; every other category follows its parent, in
	// walk order (subcategories before items, canonical order).
	Cats  []Cat
	Items []Item
	Tags  []string
	Recs  []Rec
	// Weakest lists category indices, least supported first.
	Weakest []int
	Changes *Changes
	Review  Review
	Support SupportInfo
	Base    string
	Note    string
	// Structure is the tree's structure hash.
	Structure string
}

// Cat is one category.
type Cat struct {
	Name        string
	Provisional bool
	Parent      int
	Size        int // items below it
	Children    []int
	Items       []int
	Support     float64 // -1 when not computed
	Records     []int
	// Marks are the change marks: "created", "renamed", "split", "merged".
	Marks []string
	// Was is the old name of a renamed category, or the old categories of
	// a split or merge, as text.
	Was string
}

// Item is one item.
type Item struct {
	ID, Label, Text string
	Tags            []int
	Cat             int
	Records         []int
	// Mark is "moved" or "added" (or ""); From is where a moved item was.
	Mark, From string
}

// Rec is one record, as the page lists it.
type Rec struct {
	Kind, Where, By, Date, Note, Summary string
}

// Changes lists what the page cannot mark in the tree: what left it.
type Changes struct {
	Moved         int        `json:"moved"`
	Added         int        `json:"added"`
	Removed       int        `json:"removed"`
	Renamed       int        `json:"renamed"`
	Created       int        `json:"created"`
	Dissolved     int        `json:"dissolved"`
	Split         int        `json:"split"`
	Merged        int        `json:"merged"`
	RemovedItems  []PathItem `json:"removed_items"`
	DissolvedCats []string   `json:"dissolved_categories"`
}

// PathItem is an item with a path, for items no longer in the tree.
type PathItem struct {
	ID   string `json:"id"`
	Path string `json:"path"`
}

// Review is the review state.
type Review struct {
	Open   []OpenPacket
	Audits *review.AuditSummary
	Gate   Gate
	// GatePassed says whether the audits meet the gate now.
	GatePassed bool
}

// SupportInfo says whether support was computed, and by how many trees.
type SupportInfo struct {
	Computed bool `json:"computed"`
	Trees    int  `json:"trees"`
}

// weakestShown is how many of the least supported categories the side
// panel lists.
const weakestShown = 20

// Build gathers the report's data. The input is not changed.
func Build(in Input) *Page {
	pg := &Page{Title: in.Title, Base: in.Base, Note: in.BaseNote, Structure: in.Structure}
	pg.Support = SupportInfo{Computed: in.Support != nil, Trees: in.Trees}
	catRecs := map[*format.Category][]int{}
	if in.Records != nil {
		catRecs = in.Records.ForCategories(in.Root)
		for _, r := range in.Records.Records {
			pg.Recs = append(pg.Recs, Rec{r.Kind, binding.Where(&r), r.By, r.Date, r.Note, r.Summary()})
		}
	}
	itemOf, catOf := pg.addCategories(in, catRecs)
	pg.sumSizes()
	if in.Support != nil {
		pg.listWeakest()
	}
	if in.Changes != nil {
		pg.Changes = markChanges(pg, in.Changes, itemOf, in.Root, catOf)
	}
	pg.Review = Review{Open: in.Open, Audits: in.Audits, Gate: in.Gate}
	if a := in.Audits; a != nil {
		pg.Review.GatePassed = a.Audits >= in.Gate.MinAudits && a.Hi <= in.Gate.MaxRejectRate
	}
	return pg
}

// addCategories adds the categories in walk order with explicit parents,
// and their items, and returns the index of each item and category.
func (pg *Page) addCategories(in Input, catRecs map[*format.Category][]int) (map[string]int, map[*format.Category]int) {
	tagIndex := map[string]int{}
	catOf := map[*format.Category]int{}
	itemOf := make(map[string]int, len(in.Items))
	type frame struct {
		c      *format.Category
		parent int
	}
	stack := []frame{{in.Root, -1}}
	for len(stack) > 0 {
		f := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		ci := len(pg.Cats)
		catOf[f.c] = ci
		cat := Cat{Name: f.c.Name, Provisional: f.c.Provisional, Parent: f.parent, Support: -1, Records: catRecs[f.c]}
		if in.Support != nil {
			if s, ok := in.Support[f.c]; ok {
				cat.Support = s
			}
		}
		for _, id := range f.c.Items {
			ii := pg.addItem(in, id, ci, tagIndex)
			itemOf[id] = ii
			cat.Items = append(cat.Items, ii)
		}
		if f.parent >= 0 {
			pg.Cats[f.parent].Children = append(pg.Cats[f.parent].Children, ci)
		}
		pg.Cats = append(pg.Cats, cat)
		for i := len(f.c.Children) - 1; i >= 0; i-- {
			stack = append(stack, frame{f.c.Children[i], ci})
		}
	}
	return itemOf, catOf
}

// addItem adds item id of category ci, with its label, text, tags (as
// indices into pg.Tags, which tagIndex numbers in order of first use) and
// records, and returns its index.
func (pg *Page) addItem(in Input, id string, ci int, tagIndex map[string]int) int {
	it := Item{ID: id, Cat: ci}
	if k, ok := in.Index[id]; ok {
		src := in.Items[k]
		it.Label, it.Text = src.Label, src.Text
		for _, t := range src.Tags {
			ti, ok := tagIndex[t]
			if !ok {
				ti = len(pg.Tags)
				tagIndex[t] = ti
				pg.Tags = append(pg.Tags, t)
			}
			it.Tags = append(it.Tags, ti)
		}
	}
	if in.Records != nil {
		it.Records = in.Records.ForItem(id)
	}
	pg.Items = append(pg.Items, it)
	return len(pg.Items) - 1
}

// sumSizes counts the items under each category, bottom-up: a category
// comes after its parent, so walking backwards adds every category to its
// parent once it is complete.
func (pg *Page) sumSizes() {
	for ci := len(pg.Cats) - 1; ci >= 0; ci-- {
		pg.Cats[ci].Size += len(pg.Cats[ci].Items)
		if p := pg.Cats[ci].Parent; p >= 0 {
			pg.Cats[p].Size += pg.Cats[ci].Size
		}
	}
}

// listWeakest lists the least supported categories (root excluded), at
// most weakestShown, weakest first.
func (pg *Page) listWeakest() {
	for ci := 1; ci < len(pg.Cats); ci++ {
		if pg.Cats[ci].Support >= 0 {
			pg.Weakest = append(pg.Weakest, ci)
		}
	}
	sort.SliceStable(pg.Weakest, func(i, j int) bool {
		return pg.Cats[pg.Weakest[i]].Support < pg.Cats[pg.Weakest[j]].Support
	})
	pg.Weakest = pg.Weakest[:min(weakestShown, len(pg.Weakest))]
}

// markChanges puts the diff's facts on the items and categories of the
// page, and keeps what left the tree for a list of its own.
func markChanges(pg *Page, r *diff.Report, itemOf map[string]int, root *format.Category, catOf map[*format.Category]int) *Changes {
	ch := &Changes{
		Moved: len(r.Moved), Added: len(r.Added), Removed: len(r.Removed), Renamed: len(r.Renamed),
		Created: len(r.Created), Dissolved: len(r.Dissolved), Split: len(r.Split), Merged: len(r.Merged),
		RemovedItems: []PathItem{}, DissolvedCats: []string{},
	}
	byPath := categoriesByPath(root, catOf)
	for _, m := range r.Moved {
		if i, ok := itemOf[m.Item]; ok {
			pg.Items[i].Mark, pg.Items[i].From = "moved", binding.PathText(m.From)
		}
	}
	for _, a := range r.Added {
		if i, ok := itemOf[a.Item]; ok {
			pg.Items[i].Mark = "added"
		}
	}
	for _, rm := range r.Removed {
		ch.RemovedItems = append(ch.RemovedItems, PathItem{rm.Item, binding.PathText(rm.From)})
	}
	mark := func(p diff.Path, kind, was string) {
		ci, ok := byPath[binding.PathText(p)]
		if !ok {
			return
		}
		c := &pg.Cats[ci]
		c.Marks = append(c.Marks, kind)
		if was != "" {
			if c.Was != "" {
				c.Was += "; "
			}
			c.Was += was
		}
	}
	for _, rn := range r.Renamed {
		mark(rn.To, "renamed", "was "+binding.PathText(rn.From))
	}
	for _, p := range r.Created {
		mark(p, "created", "")
	}
	for _, s := range r.Split {
		for _, into := range s.Into {
			mark(into, "split", "split from "+binding.PathText(s.From))
		}
	}
	for _, m := range r.Merged {
		from := make([]string, len(m.From))
		for i, p := range m.From {
			from[i] = binding.PathText(p)
		}
		mark(m.Into, "merged", "merged from "+joinAnd(from))
	}
	for _, p := range r.Dissolved {
		ch.DissolvedCats = append(ch.DissolvedCats, binding.PathText(p))
	}
	return ch
}

func joinAnd(s []string) string {
	out := ""
	for i, x := range s {
		switch {
		case i == 0:
		case i == len(s)-1:
			out += " and "
		default:
			out += ", "
		}
		out += x
	}
	return out
}

// categoriesByPath maps the display path of every category to its index.
func categoriesByPath(root *format.Category, catOf map[*format.Category]int) map[string]int {
	out := map[string]int{}
	var rec func(c *format.Category, path []string)
	rec = func(c *format.Category, path []string) {
		for _, ch := range c.Children {
			p := append(append([]string(nil), path...), ch.DisplayName())
			out[binding.PathText(p)] = catOf[ch]
			rec(ch, p)
		}
	}
	rec(root, nil)
	return out
}
