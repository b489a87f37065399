package format

import (
	"strings"
)

// tsvRow is one non-empty line of a tab-separated file. Tab-separated
// files have no quoting: a cell is everything between two tabs.
type tsvRow struct {
	Line  int
	Cells []string
	text  string
	offs  []int // byte offset of each cell in text
	// cacheOff and cacheCol remember the last column computed, so the
	// columns of many cells on one long line cost linear time in all.
	cacheOff, cacheCol int
}

// readTSV calls each for every non-empty line of text, in order, until it
// returns false, or until ds (the problems of file) is full: the rest of
// a file with MaxProblemsPerFile problems is not read. text starts on
// line lines+1 of file (0 for the whole file). The row and its Cells
// slice are reused for the next line, so each must not keep them; the
// cell strings themselves may be kept.
func readTSV(file, text string, lines int, ds *Diags, each func(row *tsvRow) bool) {
	row := &tsvRow{}
	line := lines
	for len(text) > 0 || line == lines {
		line++
		if ds.Full() {
			ds.StopAt(Pos{file, line, 1})
			return
		}
		var cur string
		if nl := strings.IndexByte(text, '\n'); nl >= 0 {
			cur, text = text[:nl], text[nl+1:]
		} else {
			cur, text = text, ""
		}
		if cur == "" {
			if len(text) == 0 {
				return
			}
			continue
		}
		*row = tsvRow{Line: line, text: cur, Cells: row.Cells[:0], offs: row.offs[:0], cacheCol: 1}
		off := 0
		for {
			tab := strings.IndexByte(cur[off:], '\t')
			row.offs = append(row.offs, off)
			if tab < 0 {
				row.Cells = append(row.Cells, cur[off:])
				break
			}
			row.Cells = append(row.Cells, cur[off:off+tab])
			off += tab + 1
		}
		if !each(row) {
			return
		}
	}
}

// pos is where cell i begins; i == len(Cells) means the end of the line.
func (r *tsvRow) pos(file string, i int) Pos {
	off := len(r.text)
	if i >= 0 && i < len(r.offs) {
		off = r.offs[i]
	}
	if r.cacheOff > off {
		r.cacheOff, r.cacheCol = 0, 1
	}
	r.cacheCol += runeCount(r.text[r.cacheOff:off])
	r.cacheOff = off
	return Pos{file, r.Line, r.cacheCol}
}

func runeCount(s string) int {
	n := 0
	for range s {
		n++
	}
	return n
}
