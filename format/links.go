package format

import (
	"bytes"
	"strings"
)

// Link is an explicit similarity between two items.
type Link struct {
	A, B   string
	Weight float64
	Pos    Pos
}

// MaxLinks bounds the rows of a links file.
const MaxLinks = 100_000_000

// LinksHeader is the header row every links file starts with.
const LinksHeader = "a\tb\tweight"

// ParseLinks reads a links.tsv: the header "a<TAB>b<TAB>weight", then one
// row per link with two different item ids and a finite weight above 0.
// A pair may appear in both directions; the graph builder combines them.
func ParseLinks(file string, data []byte) ([]Link, error) {
	text, ds := CleanText(file, data)
	if len(ds) > 0 {
		return nil, ds
	}
	// Room for one link per line, up to a bound: a hostile file of empty
	// rows must not make ramify reserve gigabytes up front.
	links := make([]Link, 0, min(bytes.Count(text, []byte{'\n'}), 1<<20))
	ids := interner{}
	header := false
	readTSV(string(text), func(row *tsvRow) bool {
		if !header {
			header = true
			if strings.TrimRight(row.text, " ") != LinksHeader {
				ds.Add(row.pos(file, 0), "the header must be a, b and weight separated by tabs (\"a\\tb\\tweight\"), not %q", clip(row.text))
				return false
			}
			return true
		}
		if len(links) >= MaxLinks {
			ds.Add(row.pos(file, 0), "more than %s links in one file", grouped(MaxLinks))
			return false
		}
		if len(row.Cells) != 3 {
			at := row.pos(file, 0)
			if len(row.Cells) > 3 {
				at = row.pos(file, 3)
			}
			ds.Add(at, "row has %d cells; a link row has 3: a, b and weight", len(row.Cells))
			return true
		}
		a, b := strings.TrimSpace(row.Cells[0]), strings.TrimSpace(row.Cells[1])
		bad := false
		for i, id := range []string{a, b} {
			if !ValidItemID(id) {
				ds.Add(row.pos(file, i), "%q is not a valid item id: %s", clip(id), ItemIDRule)
				bad = true
			}
		}
		if !bad && a == b {
			ds.Add(row.pos(file, 1), "item %q is linked to itself", a)
			bad = true
		}
		w, msg := parseFinite(row.Cells[2])
		switch {
		case msg != "":
			ds.Add(row.pos(file, 2), "weight: %s", msg)
			bad = true
		case w <= 0:
			ds.Add(row.pos(file, 2), "weight %s must be greater than 0", quoteClip(strings.TrimSpace(row.Cells[2])))
			bad = true
		}
		if !bad && len(ds) == 0 {
			links = append(links, Link{A: ids.get(a), B: ids.get(b), Weight: w, Pos: Pos{file, row.Line, 1}})
		}
		return true
	})
	if !header {
		ds.Add(Pos{file, 1, 1}, "the file is empty; it needs the header \"a\\tb\\tweight\"")
	}
	if len(ds) > 0 {
		ds.Sort()
		return nil, ds
	}
	return links, nil
}
