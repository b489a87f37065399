package format

import (
	"path"
	"strings"
)

// Item is one thing the taxonomy places: an id, and what is known about it
// to tell how similar it is to others.
type Item struct {
	ID    string
	Label string
	Tags  []string
	Text  string
	// Pos is where the item is introduced: its [[item]] header or its row.
	Pos Pos
}

// Limits on item files.
const (
	MaxItems       = 1_000_000
	MaxTagsPerItem = 1_000
	// TagSeparator separates tags in one .tsv or .csv cell.
	TagSeparator = ";"
)

// Budget bounds how many things (items, links) a parser keeps: Left
// more may be read; the next one is reported, with the message Over, and
// reading stops there, before anything more is allocated.
type Budget struct {
	Left int
	Over string
}

// fileItems is the budget of one items file read on its own.
var fileItems = Budget{Left: MaxItems, Over: "more than " + grouped(MaxItems) + " items in one file"}

// ParseItems reads an items file, choosing the format by its extension:
// .toml, .tsv or .csv.
func ParseItems(file string, data []byte) ([]Item, error) {
	return ParseItemsWithin(file, data, fileItems)
}

// ParseItemsWithin is ParseItems keeping at most b.Left items.
func ParseItemsWithin(file string, data []byte, b Budget) ([]Item, error) {
	switch strings.ToLower(path.Ext(file)) {
	case ".toml":
		return parseItemsTOML(file, data, b)
	case ".tsv":
		return parseItemsTable(file, data, '\t', b)
	case ".csv":
		return parseItemsTable(file, data, ',', b)
	}
	return nil, Diags{{Pos: Pos{File: file}, Msg: "items files must end in .toml, .tsv or .csv"}}
}

// itemSet collects items, checking each as it arrives.
type itemSet struct {
	file   string
	budget Budget
	items  []Item
	first  map[string]int // id -> line of its first appearance
	ds     Diags
}

// newItemSet makes room for about room items (at most the budget's), so
// a million rows do not regrow the list and the id map twenty times.
func newItemSet(file string, b Budget, room int) *itemSet {
	room = max(min(room, b.Left), 0)
	return &itemSet{file: file, budget: b, items: make([]Item, 0, room), first: make(map[string]int, room)}
}

// itemPlaces says where each part of an item is written, for messages.
type itemPlaces struct {
	id, label, tags, text Pos
	tag                   func(i int) Pos // where the i-th tag is
}

// add checks it and keeps it if its id is usable. It reports false once
// the file holds more items than its budget; the caller stops reading.
func (s *itemSet) add(it Item, at itemPlaces) bool {
	if len(s.items) >= s.budget.Left {
		s.ds.Add(it.Pos, "%s", s.budget.Over)
		return false
	}
	if len(it.Tags) == 0 {
		it.Tags = nil // no tags reads the same from every format
	}
	ok := true
	switch {
	case it.ID == "":
		s.ds.Add(at.id, "item has no id")
		ok = false
	case len(it.ID) > MaxIDLen:
		s.ds.Add(at.id, "item id is %d bytes long; the limit is %d", len(it.ID), MaxIDLen)
		ok = false
	case invisibleIn(it.ID):
		_, r := FirstInvisible(it.ID)
		s.ds.Add(at.id, "%s", InvisibleMessage("item id", r))
		ok = false
	case !ValidItemID(it.ID):
		s.ds.Add(at.id, "%q is not a valid item id: %s", clip(it.ID), ItemIDRule)
		ok = false
	default:
		if prev, dup := s.first[it.ID]; dup {
			s.ds.Add(at.id, "item %q appears twice (first at line %d)", it.ID, prev)
			ok = false
		} else {
			s.first[it.ID] = it.Pos.Line
		}
	}
	if hasControl(it.Label, "") {
		s.ds.Add(at.label, "label contains a control character (such as a tab or line break)")
	}
	if hasControl(it.Text, "\n\t") {
		s.ds.Add(at.text, "text contains a control character other than tab and line break")
	}
	s.checkTags(it, at)
	if ok {
		s.items = append(s.items, it)
	}
	return true
}

func (s *itemSet) checkTags(it Item, at itemPlaces) {
	if len(it.Tags) > MaxTagsPerItem {
		s.ds.Add(at.tags, "item has %d tags; the limit is %s", len(it.Tags), grouped(MaxTagsPerItem))
		return
	}
	seen := make(map[string]bool, len(it.Tags))
	for i, tag := range it.Tags {
		switch {
		case tag == "":
			s.ds.Add(at.tag(i), "empty tag")
		case strings.TrimSpace(tag) != tag:
			s.ds.Add(at.tag(i), "tag %q has leading or trailing spaces", clip(tag))
		case strings.Contains(tag, TagSeparator):
			s.ds.Add(at.tag(i), "tag %q contains %q, which separates tags in .tsv and .csv files", clip(tag), TagSeparator)
		case hasControl(tag, ""):
			s.ds.Add(at.tag(i), "tag %q contains a control character", clip(tag))
		case seen[tag]:
			s.ds.Add(at.tag(i), "tag %q appears twice in this item", clip(tag))
		}
		seen[tag] = true
	}
}

func (s *itemSet) result() ([]Item, error) {
	return orProblems(s.items, s.ds)
}

func invisibleIn(s string) bool { _, r := FirstInvisible(s); return r >= 0 }
