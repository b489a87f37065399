package main

import (
	"strings"
	"unicode"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/export"
)

// importTree builds the tree and the items of an import CSV row by row,
// checking every cell as an items file and an outline would.
type importTree struct {
	src   *importText
	sep   string
	root  *format.Category
	items []format.Item
	// firstID is the line each id was first seen on.
	firstID map[string]int
	// children finds a category's subcategory by name; seenAt is the line
	// that made each category, for messages.
	children map[*format.Category]map[string]*format.Category
	seenAt   map[*format.Category]int
	rows     int
	// idAt finds the category of each concept identifier.
	idAt map[string]*format.Category
}

func newImportTree(src *importText, sep string) *importTree {
	return &importTree{
		src: src, sep: sep, root: &format.Category{},
		firstID:  map[string]int{},
		children: map[*format.Category]map[string]*format.Category{},
		seenAt:   map[*format.Category]int{},
	}
}

// row takes one record; width is the header's number of cells.
func (b *importTree) row(r importRow, col map[string]int, width int, ds *format.Diags) {
	if len(r.cells) != width {
		at := r.linePos(b.src)
		if len(r.cells) > width {
			at = b.src.contentPos(r.offs[width], 0)
		}
		ds.Add(at, "row has %d cells but the header has %d", len(r.cells), width)
		return
	}
	if b.rows++; b.rows > format.MaxItems {
		if b.rows == format.MaxItems+1 {
			ds.Add(r.linePos(b.src), "more than %d items; that is the limit", format.MaxItems)
		}
		return
	}
	cell := func(name string) (string, int, bool) {
		i, ok := col[name]
		if !ok {
			return "", 0, false
		}
		return r.cells[i], r.offs[i], true
	}
	idCell, idOff, _ := cell("id")
	id := strings.TrimSpace(idCell)
	idAt := b.src.contentPos(idOff, len(idCell)-len(strings.TrimLeft(idCell, " ")))
	it := format.Item{ID: id, Pos: format.Pos{File: b.src.file, Line: idAt.Line, Col: 1}}
	good := b.checkID(id, idAt, ds)
	if label, off, ok := cell("label"); ok {
		if importHasControl(label, "") {
			ds.Add(b.src.contentPos(off, 0), "label contains a control character (such as a tab or line break)")
			good = false
		}
		it.Label = label
	}
	if tags, off, ok := cell("tags"); ok && strings.TrimSpace(tags) != "" {
		it.Tags = b.tags(tags, off, ds, &good)
	}
	if text, off, ok := cell("text"); ok {
		if importHasControl(text, "\n\t") {
			ds.Add(b.src.contentPos(off, 0), "text contains a control character other than tab and line break")
			good = false
		}
		it.Text = text
	}
	pathCell, pathOff, _ := cell("path")
	conceptsCell, conceptsOff, _ := cell("concepts")
	ids, ok := b.conceptIDs(conceptsCell, conceptsOff, ds)
	if !ok {
		return
	}
	parent, ok := b.place(pathCell, pathOff, r.line, ids, ds)
	if !ok || !good {
		return
	}
	parent.Items = append(parent.Items, id)
	b.items = append(b.items, it)
}

func (b *importTree) checkID(id string, at format.Pos, ds *format.Diags) bool {
	switch {
	case id == "":
		ds.Add(at, "item has no id")
	case len(id) > format.MaxIDLen:
		ds.Add(at, "item id is %d bytes long; the limit is %d", len(id), format.MaxIDLen)
	case !format.ValidItemID(id):
		ds.Add(at, "%q is not a valid item id: %s", id, format.ItemIDRule)
	default:
		if prev, dup := b.firstID[id]; dup {
			ds.Add(at, "item %q appears twice (first at line %d)", id, prev)
			return false
		}
		b.firstID[id] = at.Line
		return true
	}
	return false
}

// tags splits a tags cell on ";" and checks each tag as items files do.
func (b *importTree) tags(cell string, off int, ds *format.Diags, good *bool) []string {
	var out []string
	seen := map[string]bool{}
	start := 0
	for _, raw := range strings.Split(cell, format.TagSeparator) {
		tag := strings.TrimSpace(raw)
		at := b.src.contentPos(off, start+len(raw)-len(strings.TrimLeft(raw, " ")))
		start += len(raw) + len(format.TagSeparator)
		switch {
		case tag == "":
			ds.Add(at, "empty tag (two %q with nothing between them, or one at an end)", format.TagSeparator)
		case importHasControl(tag, ""):
			ds.Add(at, "tag %q contains a control character", tag)
		case seen[tag]:
			ds.Add(at, "tag %q appears twice in this item", tag)
		default:
			seen[tag] = true
			out = append(out, tag)
			continue
		}
		*good = false
	}
	if len(out) > format.MaxTagsPerItem {
		ds.Add(b.src.contentPos(off, 0), "item has %d tags; the limit is %d", len(out), format.MaxTagsPerItem)
		*good = false
	}
	return out
}

// conceptID is one identifier of a concepts cell and where it starts.
type conceptID struct {
	id string
	at format.Pos
}

// conceptIDs splits a concepts cell into one identifier per level ("" for
// a level without one).
func (b *importTree) conceptIDs(cell string, off int, ds *format.Diags) ([]conceptID, bool) {
	if strings.TrimSpace(cell) == "" {
		return nil, true
	}
	var out []conceptID
	start := 0
	for _, raw := range strings.Split(cell, export.PathSeparator) {
		id := strings.TrimSpace(raw)
		at := b.src.contentPos(off, start+len(raw)-len(strings.TrimLeft(raw, " ")))
		start += len(raw) + len(export.PathSeparator)
		if id != "" && !format.ValidConceptID(id) {
			ds.Add(at, "%q is not a concept identifier (c and 10 hex digits, as ramify writes them)", id)
			return nil, false
		}
		out = append(out, conceptID{id, at})
	}
	return out, true
}

// place finds (making it where needed) the category a path names; ids,
// if not nil, gives each level's concept identifier.
func (b *importTree) place(cell string, off, line int, ids []conceptID, ds *format.Diags) (*format.Category, bool) {
	if strings.TrimSpace(cell) == "" {
		if len(ids) > 0 {
			ds.Add(ids[0].at, "concept identifiers for an item at the top level (its path is empty)")
			return nil, false
		}
		return b.root, true
	}
	c := b.root
	start := 0
	parts := strings.Split(cell, b.sep)
	if ids != nil && len(ids) != len(parts) {
		ds.Add(ids[0].at, "%d concept identifiers for a path of %d levels", len(ids), len(parts))
		return nil, false
	}
	for level, raw := range parts {
		segStart := start
		start += len(raw) + len(b.sep)
		seg := strings.TrimSpace(raw)
		if seg == "" {
			switch {
			case level == 0:
				ds.Add(b.src.contentPos(off, 0), "empty category name: the path starts with %q", b.sep)
			case level == len(parts)-1:
				ds.Add(b.src.contentPos(off, segStart-len(b.sep)), "empty category name: the path ends with %q", b.sep)
			default:
				ds.Add(b.src.contentPos(off, segStart), "empty category name: two %q with nothing between them", b.sep)
			}
			return nil, false
		}
		at := b.src.contentPos(off, segStart+len(raw)-len(strings.TrimLeft(raw, " ")))
		if level >= format.MaxDepth-1 {
			ds.Add(at, "path is deeper than %d levels", format.MaxDepth-1)
			return nil, false
		}
		name, provisional := seg, false
		if rest, ok := strings.CutPrefix(seg, "~ "); ok {
			name, provisional = strings.TrimSpace(rest), true
		} else if seg == "~" {
			name, provisional = "", true
		}
		if msg := format.CheckCategoryName(name); msg != "" {
			ds.Add(at, "%s", msg)
			return nil, false
		}
		next := b.children[c][name]
		if next == nil {
			next = &format.Category{Name: name, Provisional: provisional}
			if b.children[c] == nil {
				b.children[c] = map[string]*format.Category{}
			}
			b.children[c][name] = next
			b.seenAt[next] = line
			c.Children = append(c.Children, next)
		} else if next.Provisional != provisional {
			mark := func(p bool) string {
				if p {
					return "provisional (\"~ \")"
				}
				return "not provisional"
			}
			ds.Add(at, "category %q is %s here but %s at line %d", name, mark(provisional), mark(next.Provisional), b.seenAt[next])
			return nil, false
		}
		if ids != nil && !b.setID(next, ids[level], line, ds) {
			return nil, false
		}
		c = next
	}
	return c, true
}

// setID gives c its concept identifier, which every row through c must
// agree on and no other category may have.
func (b *importTree) setID(c *format.Category, id conceptID, line int, ds *format.Diags) bool {
	if id.id == "" {
		return true
	}
	if b.idAt == nil {
		b.idAt = map[string]*format.Category{}
	}
	switch other := b.idAt[id.id]; {
	case c.ID != "" && c.ID != id.id:
		ds.Add(id.at, "category %q has concept identifier %s here but %s at line %d", c.Name, id.id, c.ID, b.seenAt[c])
		return false
	case other != nil && other != c:
		ds.Add(id.at, "concept identifier %s names category %q here but %q at line %d", id.id, c.Name, other.Name, b.seenAt[other])
		return false
	}
	c.ID = id.id
	b.idAt[id.id] = c
	return true
}

// importHasControl reports a control character other than those allowed.
func importHasControl(s, allowed string) bool {
	for _, r := range s {
		if unicode.IsControl(r) && !strings.ContainsRune(allowed, r) {
			return true
		}
	}
	return false
}
