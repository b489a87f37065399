package format

import (
	"bytes"
	"encoding/csv"
	"errors"
	"io"
	"sort"
	"strings"
)

func parseItemsTable(file string, data []byte, sep byte, b Budget) ([]Item, error) {
	text, ds := CleanText(file, data)
	if len(ds) > 0 {
		return nil, ds
	}
	// A row a line, less the header.
	t := &itemTable{set: newItemSet(file, b, bytes.Count(text, []byte{'\n'}))}
	if sep == '\t' {
		readTSV(file, string(text), 0, &t.set.ds, func(row *tsvRow) bool {
			return t.row(row.Cells, func(i int) Pos { return row.pos(file, i) })
		})
	} else {
		readCSV(file, text, rune(sep), &t.set.ds, t.row)
	}
	if t.header == nil && len(t.set.ds) == 0 {
		t.set.ds.Add(Pos{file, 1, 1}, "the file is empty; it needs a header row naming the columns (id, label, tags, text)")
	}
	return t.set.result()
}

// itemTable turns rows into items once the header has said which column
// is which.
type itemTable struct {
	set    *itemSet
	header []string
	col    map[string]int
	broken bool // the header is unusable; rows are not read
}

// row takes one row; pos says where its i-th cell begins. It returns
// false to stop reading.
func (t *itemTable) row(cells []string, pos func(i int) Pos) bool {
	if t.header == nil {
		t.readHeader(cells, pos)
		return !t.broken
	}
	if len(cells) != len(t.header) {
		if len(cells) > len(t.header) {
			t.set.ds.Add(pos(len(t.header)), "row has %d cells but the header has %d", len(cells), len(t.header))
		} else {
			t.set.ds.Add(pos(0), "row has %d cells but the header has %d", len(cells), len(t.header))
		}
		return true
	}
	cell := func(name string) (string, Pos) {
		if i, ok := t.col[name]; ok {
			return cells[i], pos(i)
		}
		return "", pos(0)
	}
	id, idPos := cell("id")
	label, labelPos := cell("label")
	tags, tagsPos := cell("tags")
	desc, textPos := cell("text")
	it := Item{ID: strings.TrimSpace(id), Label: label, Text: desc, Pos: Pos{idPos.File, idPos.Line, 1}}
	if strings.TrimSpace(tags) != "" {
		it.Tags = make([]string, 0, strings.Count(tags, TagSeparator)+1)
		for tag := range strings.SplitSeq(tags, TagSeparator) {
			it.Tags = append(it.Tags, strings.TrimSpace(tag))
		}
	}
	at := itemPlaces{id: idPos, label: labelPos, tags: tagsPos, text: textPos}
	at.tag = func(int) Pos { return tagsPos }
	return t.set.add(it, at)
}

var itemColumns = []string{"id", "label", "tags", "text"}

func (t *itemTable) readHeader(cells []string, pos func(i int) Pos) {
	t.header = cells
	t.col = map[string]int{}
	for i, c := range cells {
		name := strings.TrimSpace(c)
		switch {
		case !contains(itemColumns, name):
			t.set.ds.Add(pos(i), "unknown column %q; the columns are id, label, tags and text%s", clip(name), didYouMean(name, itemColumns))
			t.broken = true
		case t.has(name):
			t.set.ds.Add(pos(i), "column %q appears twice in the header", name)
			t.broken = true
		default:
			t.col[name] = i
		}
	}
	if !t.has("id") && !t.broken {
		t.set.ds.Add(pos(0), "the header has no id column; the first row must name the columns (id, label, tags, text)")
		t.broken = true
	}
}

func (t *itemTable) has(name string) bool {
	_, ok := t.col[name]
	return ok
}

// readCSV calls row for every record of a CSV text, reporting quoting
// errors and going on after them.
// lineOfOffset is the 1-based line holding byte offset off, given the
// offsets where lines start.
func lineOfOffset(starts []int, off int) int {
	return sort.Search(len(starts), func(i int) bool { return starts[i] > off })
}

func readCSV(file string, text []byte, sep rune, ds *Diags, row func(cells []string, pos func(i int) Pos) bool) {
	lines := lineStarts(text)
	lineText := func(line int) string {
		if line < 1 || line > len(lines) {
			return ""
		}
		end := len(text)
		if line < len(lines) {
			end = lines[line] - 1
		}
		return string(text[lines[line-1]:end])
	}
	at := func(line, byteCol int) Pos {
		return Pos{file, line, RuneCol(lineText(line), byteCol-1)}
	}
	r := csv.NewReader(bytes.NewReader(text))
	r.Comma = sep
	r.FieldsPerRecord = -1
	for {
		if ds.Full() {
			ds.StopAt(Pos{file, lineOfOffset(lines, int(r.InputOffset())), 1})
			return
		}
		rec, err := r.Read()
		if errors.Is(err, io.EOF) {
			return
		}
		if err != nil {
			var pe *csv.ParseError
			if errors.As(err, &pe) {
				ds.Add(at(pe.Line, pe.Column), "%s", pe.Err.Error())
				continue
			}
			ds.Add(Pos{file, 1, 1}, "%s", err.Error())
			return
		}
		if !row(rec, func(i int) Pos {
			if i >= len(rec) {
				i = len(rec) - 1
			}
			line, col := r.FieldPos(i)
			return at(line, col)
		}) {
			return
		}
	}
}

// lineStarts lists the byte offset where each line of text begins.
func lineStarts(text []byte) []int {
	starts := []int{0}
	for i, c := range text {
		if c == '\n' && i+1 < len(text) {
			starts = append(starts, i+1)
		}
	}
	return starts
}
