package diff

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"slices"
	"strconv"
	"strings"
)

// String joins a path for people: "Tools / Power / Drills"; the root is
// shown as "(top level)".
func (p Path) String() string {
	if len(p) == 0 {
		return "(top level)"
	}
	return strings.Join(p, " / ")
}

// MarshalJSON writes a path as an array of names, [] for the root (never
// null). Names keep "&", "<" and ">" as they are: they are common in
// category names, and the JSON is not meant for embedding in HTML.
func (p Path) MarshalJSON() ([]byte, error) {
	if p == nil {
		return []byte("[]"), nil
	}
	var b bytes.Buffer
	enc := json.NewEncoder(&b)
	enc.SetEscapeHTML(false)
	if err := enc.Encode([]string(p)); err != nil {
		return nil, err
	}
	return bytes.TrimSuffix(b.Bytes(), []byte("\n")), nil
}

// WriteJSON writes the report as indented JSON. The field order is fixed
// by the struct and every list is sorted, so equal reports print equal
// bytes.
func (r *Report) WriteJSON(w io.Writer) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	return enc.Encode(r)
}

// Empty reports whether nothing changed: no item or category differs
// (the metrics are then those of two identical trees).
func (r *Report) Empty() bool {
	return len(r.Added)+len(r.Removed)+len(r.Moved)+len(r.MovedCategories)+len(r.Renamed)+len(r.Split)+
		len(r.Merged)+len(r.Created)+len(r.Dissolved) == 0
}

// counted is "1 item" or "3 items".
func counted(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return strconv.Itoa(n) + " " + many
}

// summaryParts names the non-empty kinds of change, most significant
// first: structure, then items.
func (r *Report) summaryParts() []string {
	var parts []string
	add := func(n int, s string) {
		if n > 0 {
			parts = append(parts, s)
		}
	}
	add(len(r.Split), counted(len(r.Split), "split", "splits"))
	add(len(r.Merged), counted(len(r.Merged), "merge", "merges"))
	add(len(r.Renamed), counted(len(r.Renamed), "rename", "renames"))
	add(len(r.Created), strconv.Itoa(len(r.Created))+" created")
	add(len(r.Dissolved), strconv.Itoa(len(r.Dissolved))+" dissolved")
	add(len(r.MovedCategories), counted(len(r.MovedCategories), "category moved", "categories moved"))
	add(len(r.Moved), counted(len(r.Moved), "item moved", "items moved"))
	add(len(r.Added), strconv.Itoa(len(r.Added))+" added")
	add(len(r.Removed), strconv.Itoa(len(r.Removed))+" removed")
	return parts
}

// withItems is a category move's destination and how many items went
// with it: "Striking / Hammers (4 items)".
func (m CategoryMove) withItems() string {
	return m.To.String() + " (" + counted(len(m.Items), "item", "items") + ")"
}

// Number formats for the measures: four decimals, enough to see a 1%
// change and stable against noise.
func fixed4(v float64) string { return strconv.FormatFloat(v, 'f', 4, 64) }

// tripletText, rfText and copheneticText put the measures in words for
// both renderers.
func (m Metrics) tripletText() string {
	if m.TripletExact {
		return fixed4(m.TripletAgreement) + " (exact)"
	}
	lo, hi := 0.0, 1.0
	if len(m.TripletInterval) == 2 {
		lo, hi = m.TripletInterval[0], m.TripletInterval[1]
	}
	return fmt.Sprintf("%s (95%% interval %s–%s, %d sampled triples)", fixed4(m.TripletAgreement), fixed4(lo), fixed4(hi), m.TripletSamples)
}

// keptText gives triplet recall and precision: how much of the old
// tree's resolved structure the new one keeps, and the converse.
func (m Metrics) keptText() string {
	return "recall " + fixed4(m.TripletRecall) + " · precision " + fixed4(m.TripletPrecision)
}

func (m Metrics) rfText() string {
	return fmt.Sprintf("%d (normalised %s)", m.RF, fixed4(m.RFNormalized))
}

func (m Metrics) copheneticText() string {
	if m.Cophenetic == nil {
		return "undefined (a tree without levels)"
	}
	return fixed4(*m.Cophenetic)
}

// itemGroup is a run of item changes between the same two places.
type itemGroup struct {
	from, to Path
	items    []string
}

// groupMoves gathers moves by (from, to), ordered by from, then to; items
// keep id order.
func groupMoves(ms []Move) []itemGroup {
	idx := map[string]int{}
	var gs []itemGroup
	for _, m := range ms {
		key := strings.Join(m.From, "\x00") + "\x01" + strings.Join(m.To, "\x00")
		i, ok := idx[key]
		if !ok {
			i = len(gs)
			idx[key] = i
			gs = append(gs, itemGroup{from: m.From, to: m.To})
		}
		gs[i].items = append(gs[i].items, m.Item)
	}
	sortGroups(gs)
	return gs
}

func groupAdded(as []AddedItem) []itemGroup {
	ms := make([]Move, len(as))
	for i, a := range as {
		ms[i] = Move{Item: a.Item, To: a.To}
	}
	return groupMoves(ms)
}

func groupRemoved(rs []RemovedItem) []itemGroup {
	ms := make([]Move, len(rs))
	for i, r := range rs {
		ms[i] = Move{Item: r.Item, From: r.From}
	}
	return groupMoves(ms)
}

func sortGroups(gs []itemGroup) {
	slices.SortStableFunc(gs, func(a, b itemGroup) int {
		if c := comparePaths(a.from, b.from); c != 0 {
			return c
		}
		return comparePaths(a.to, b.to)
	})
}
