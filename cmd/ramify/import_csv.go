package main

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"slices"
	"sort"
	"strings"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/export"
)

// An import CSV names its columns in a header row: id and path are
// required; label, tags (separated by ";") and text are optional and mean
// what they mean in an items file. path is the item's place: category
// names from the top down, joined by " > " (what `ramify export --format
// csv` writes). A file none of whose paths holds " > " may join them with
// "/" instead; a file with " > " anywhere uses " > " throughout, so that
// a name there may hold a "/". Spaces around each name are dropped, a
// name starting with "~ " is provisional, and an empty path puts the item
// at the top level. concepts, also optional, gives the concept
// identifier of each category on the path, joined by " > " (what the
// export writes), so identifiers survive the round trip.
var importColumns = []string{"id", "path", "label", "tags", "text", "concepts"}

// importSlash is the separator of files that never use export.PathSeparator.
const importSlash = "/"

// importText locates bytes of a cleaned CSV text by line and column.
type importText struct {
	file  string
	text  []byte
	lines []int // byte offset where each line starts
	// guarded holds the cells (by the offset of their first byte) whose
	// guard quote was taken away: content byte k lies one further on.
	guarded map[int]bool
}

func newImportText(file string, text []byte) *importText {
	s := &importText{file: file, text: text, lines: []int{0}, guarded: map[int]bool{}}
	for i, c := range text {
		if c == '\n' && i+1 < len(text) {
			s.lines = append(s.lines, i+1)
		}
	}
	return s
}

// posAt is the place of byte off, its column counted in characters.
func (s *importText) posAt(off int) format.Pos {
	line := sort.Search(len(s.lines), func(i int) bool { return s.lines[i] > off })
	start := s.lines[line-1]
	end := bytes.IndexByte(s.text[start:], '\n')
	if end < 0 {
		end = len(s.text) - start
	}
	return format.Pos{File: s.file, Line: line, Col: format.RuneCol(string(s.text[start:start+end]), off-start)}
}

// contentPos is the place of byte k of a cell's content, the cell's
// first byte (its opening quote, if quoted) being at off. Inside quotes a
// doubled quote stands for one.
func (s *importText) contentPos(off, k int) format.Pos {
	if s.guarded[off] {
		k++
	}
	if off < len(s.text) && s.text[off] == '"' {
		off++
		for ; k > 0 && off < len(s.text); k-- {
			if s.text[off] == '"' {
				off++
			}
			off++
		}
		return s.posAt(off)
	}
	return s.posAt(off + k)
}

// importRow is one record and where each of its cells starts.
type importRow struct {
	cells []string
	offs  []int
	line  int
}

func (r importRow) linePos(s *importText) format.Pos {
	if len(r.offs) > 0 {
		return s.posAt(r.offs[0])
	}
	return format.Pos{File: s.file, Line: r.line, Col: 1}
}

// readImportRows reads every record, reporting quoting errors and going on.
func readImportRows(s *importText, ds *format.Diags) []importRow {
	r := csv.NewReader(bytes.NewReader(s.text))
	r.FieldsPerRecord = -1
	var rows []importRow
	for {
		rec, err := r.Read()
		if errors.Is(err, io.EOF) {
			return rows
		}
		var pe *csv.ParseError
		if errors.As(err, &pe) {
			off := s.lines[min(pe.Line, len(s.lines))-1] + max(pe.Column-1, 0)
			ds.Add(s.posAt(min(off, len(s.text))), "%s", pe.Err.Error())
			continue
		}
		if err != nil {
			ds.Add(format.Pos{File: s.file, Line: 1, Col: 1}, "%s", err.Error())
			return rows
		}
		row := importRow{cells: rec, offs: make([]int, len(rec))}
		for i := range rec {
			line, col := r.FieldPos(i)
			row.offs[i] = s.lines[line-1] + col - 1
			var cut int
			if row.cells[i], cut = export.UnguardCell(rec[i]); cut > 0 {
				s.guarded[row.offs[i]] = true
			}
			if i == 0 {
				row.line = line
			}
		}
		rows = append(rows, row)
	}
}

// parseImportCSV reads an import CSV into a tree and its items. Every
// problem is reported with its place; nothing is returned with problems.
func parseImportCSV(file string, data []byte) (*format.Category, []format.Item, format.Diags) {
	text, ds := format.CleanText(file, data)
	if len(ds) > 0 {
		return nil, nil, ds
	}
	src := newImportText(file, text)
	rows := readImportRows(src, &ds)
	if len(rows) == 0 {
		if len(ds) == 0 {
			ds.Add(format.Pos{File: file, Line: 1, Col: 1}, "the file is empty; it needs a header row naming the columns (id and path, and optionally label, tags, text)")
		}
		return nil, nil, ds
	}
	col, ok := importHeader(src, rows[0], &ds)
	if !ok {
		return nil, nil, ds
	}
	if len(rows) == 1 && len(ds) == 0 {
		ds.Add(format.Pos{File: file, Line: rows[0].line + 1, Col: 1}, "no rows below the header; there is nothing to import")
	}
	sep := importSlash
	for _, row := range rows[1:] {
		if len(row.cells) == len(rows[0].cells) && strings.Contains(row.cells[col["path"]], export.PathSeparator) {
			sep = export.PathSeparator
			break
		}
	}
	b := newImportTree(src, sep)
	for _, row := range rows[1:] {
		b.row(row, col, len(rows[0].cells), &ds)
	}
	if len(ds) > 0 {
		ds.Sort()
		return nil, nil, ds
	}
	return b.root, b.items, nil
}

// importHeader maps column names to their index.
func importHeader(src *importText, header importRow, ds *format.Diags) (map[string]int, bool) {
	col := map[string]int{}
	ok := true
	for i, c := range header.cells {
		name := strings.TrimSpace(c)
		at := src.contentPos(header.offs[i], 0)
		switch _, dup := col[name]; {
		case !slices.Contains(importColumns, name):
			hint := ""
			if s := format.Suggest(name, importColumns); s != "" {
				hint = fmt.Sprintf("; did you mean %q?", s)
			}
			ds.Add(at, "unknown column %q; an import reads the columns id, path, label, tags, text and concepts%s", name, hint)
			ok = false
		case dup:
			ds.Add(at, "column %q appears twice in the header", name)
			ok = false
		default:
			col[name] = i
		}
	}
	broken := !ok
	for _, need := range []string{"id", "path"} {
		if _, has := col[need]; !has && !broken {
			ds.Add(header.linePos(src), "the header has no %s column; the first row must name the columns: id and path, and optionally label, tags and text", need)
			ok = false
		}
	}
	return col, ok
}
