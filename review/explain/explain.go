// Package explain says why an item or a category sits where it does in
// the taxonomy: the records that bind it and which of them decide its
// place, its strongest neighbours inside and outside its category with
// the similarity source each comes from, the committee support of its
// ancestors, and where it would go with no records at all. The command
// prints what these functions return.
package explain

import (
	"fmt"
	"math"
	"slices"
	"sort"
	"strings"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/binding"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/solve/graph"
	"github.com/ramify-tax/ramify/solve/regen"
)

// Input is what an explanation is computed from.
type Input struct {
	Project *repo.Repo
	// Graph is the combined similarity graph; Sources the graph of each
	// source, which it sums.
	Graph   *graph.CSR
	Sources []regen.SourceGraph
	Records *binding.Index
	// Support holds each category's committee support; nil when not
	// computed.
	Support map[*format.Category]float64
	// Free is the taxonomy solved with no records at all; nil when not
	// computed.
	Free *format.Category
	// Without, when set, solves the taxonomy without one record (an index
	// into Records.Records) and returns it; explain uses it to find which
	// records decide an item's place. nil skips that question.
	Without func(record int) (*format.Category, error)
}

// Neighbours lists at most this many neighbours on each side.
const Neighbours = 5

// Item is why one item sits where it does.
type Item struct {
	ID      string   `json:"item"`
	Label   string   `json:"label"`
	Path    []string `json:"path"`
	Records []Record `json:"records"`
	// Inside are the strongest neighbours in its own category, Outside
	// the strongest elsewhere, strongest first.
	Inside  []Neighbour `json:"inside"`
	Outside []Neighbour `json:"outside"`
	// Support is each ancestor's committee support, top level first; nil
	// when not computed.
	Support []Ancestor `json:"support"`
	// WithoutRecords is its path in the taxonomy solved with no records;
	// nil when not computed.
	WithoutRecords []string `json:"without_records"`
}

// Record is one record that names the item.
type Record struct {
	Kind  string `json:"kind"`
	Where string `json:"where"`
	By    string `json:"by"`
	Date  string `json:"date"`
	Note  string `json:"note"`
	Role  string `json:"role"`
	// Decides is true when solving without this record alone puts the
	// item elsewhere; nil when that was not computed.
	Decides *bool `json:"decides"`
}

// Neighbour is a similar item with the similarity it has in the combined
// graph and in each source's graph.
type Neighbour struct {
	ID         string             `json:"item"`
	Label      string             `json:"label"`
	Path       []string           `json:"path"`
	Similarity float64            `json:"similarity"`
	Sources    map[string]float64 `json:"sources"`
}

// Ancestor is one category above an item, with its support.
type Ancestor struct {
	Path    []string `json:"path"`
	Support float64  `json:"support"`
}

// ExplainItem explains the item with the given id.
func ExplainItem(in Input, id string) (*Item, error) {
	p := in.Project
	idx, ok := p.Index[id]
	if !ok {
		return nil, fmt.Errorf("no item %q%s", id, p.SuggestItem(id))
	}
	root := p.Outline.Root
	paths := format.Paths(root)
	chain := binding.Chains(root)[id]
	out := &Item{ID: id, Label: p.Items[idx].Label, Path: nonNil(paths[id]), Records: []Record{}}
	for _, r := range in.Records.ForItem(id) {
		rec := &in.Records.Records[r]
		x := Record{Kind: rec.Kind, Where: binding.Where(rec), By: rec.By, Date: rec.Date, Note: rec.Note, Role: rec.Role(id)}
		if in.Without != nil {
			alt, err := in.Without(r)
			if err != nil {
				return nil, err
			}
			moved := !slices.Equal(format.Paths(alt)[id], paths[id])
			x.Decides = &moved
		}
		out.Records = append(out.Records, x)
	}
	// Its category is the one that holds it, subcategories included; an
	// item at the top level has none, and every neighbour is outside.
	own := map[string]bool{}
	if len(chain) > 1 {
		for _, it := range chain[len(chain)-1].AllItems() {
			own[it] = true
		}
	}
	out.Inside, out.Outside = []Neighbour{}, []Neighbour{}
	for _, nb := range neighbours(in, idx) {
		nb.Path = nonNil(paths[nb.ID])
		if own[nb.ID] {
			if len(out.Inside) < Neighbours {
				out.Inside = append(out.Inside, nb)
			}
		} else if len(out.Outside) < Neighbours {
			out.Outside = append(out.Outside, nb)
		}
	}
	if in.Support != nil {
		out.Support = []Ancestor{}
		for d := 1; d < len(chain); d++ {
			if s, ok := in.Support[chain[d]]; ok {
				out.Support = append(out.Support, Ancestor{Path: out.Path[:d], Support: s})
			}
		}
	}
	if in.Free != nil {
		out.WithoutRecords = nonNil(format.Paths(in.Free)[id])
	}
	return out, nil
}

// neighbours lists the item's neighbours in the combined graph, strongest
// first (ties by id).
func neighbours(in Input, idx int) []Neighbour {
	p := in.Project
	ts, ws := in.Graph.Neighbors(idx)
	out := make([]Neighbour, 0, len(ts))
	for k, t := range ts {
		if int(t) == idx {
			continue
		}
		nb := Neighbour{ID: p.Items[t].ID, Label: p.Items[t].Label, Similarity: round4(ws[k]), Sources: map[string]float64{}}
		for _, s := range in.Sources {
			if w := s.Graph.Weight(idx, int(t)); w > 0 {
				nb.Sources[sourceName(s.Source)] = round4(w)
			}
		}
		out = append(out, nb)
	}
	sort.SliceStable(out, func(i, j int) bool {
		if out[i].Similarity != out[j].Similarity {
			return out[i].Similarity > out[j].Similarity
		}
		return out[i].ID < out[j].ID
	})
	return out
}

// sourceName names a source as reports show it: its kind, and its file
// for a links source.
func sourceName(s format.Source) string {
	if s.File != "" {
		return s.Kind + " (" + s.File + ")"
	}
	return s.Kind
}

func nonNil(s []string) []string {
	if s == nil {
		return []string{}
	}
	return s
}

func round4(x float64) float64 { return math.Round(x*1e4) / 1e4 }

// PathText joins a path as the text report shows it.
func PathText(path []string) string { return binding.PathText(path) }

// words lists what an item says about itself, for distinctive words: its
// tags and the words of its label and description.
func words(it format.Item) []string {
	w := append([]string(nil), it.Tags...)
	for _, tok := range graph.Tokens(it.Label + " " + it.Text) {
		if len(tok) > 2 && !strings.ContainsAny(tok, "0123456789") {
			w = append(w, tok)
		}
	}
	return w
}
