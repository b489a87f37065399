// Package format holds ramify's document model (taxonomy trees, items,
// constraint records, project settings) and the codecs for every file a
// taxonomy repository keeps. Parsers never stop at the first problem: they
// collect every one as a Diag that names file, line and column.
package format

import (
	"fmt"
	"sort"
	"strings"
)

// Pos is a place in an input file. Line and Col are 1-based; Col counts
// characters (runes), not bytes, so it matches what an editor shows.
type Pos struct {
	File string
	Line int
	Col  int
}

func (p Pos) String() string {
	line, col := p.Line, p.Col
	if line < 1 {
		line = 1
	}
	if col < 1 {
		col = 1
	}
	return fmt.Sprintf("%s:%d:%d", p.File, line, col)
}

// Diag is one problem found in an input file.
type Diag struct {
	Pos
	Msg string
}

func (d Diag) String() string { return d.Pos.String() + ": " + d.Msg }

// Diags is a list of problems; a non-empty Diags is an error.
type Diags []Diag

func (ds Diags) Error() string {
	lines := make([]string, len(ds))
	for i, d := range ds {
		lines[i] = d.String()
	}
	return strings.Join(lines, "\n")
}

// Add appends a problem at pos.
func (ds *Diags) Add(pos Pos, format string, args ...any) {
	*ds = append(*ds, Diag{Pos: pos, Msg: fmt.Sprintf(format, args...)})
}

// Err returns ds as an error, or nil when there is no problem, so callers
// never return a typed nil.
func (ds Diags) Err() error {
	if len(ds) == 0 {
		return nil
	}
	return ds
}

// Sort orders problems by file, line and column so reports are stable.
func (ds Diags) Sort() {
	sort.SliceStable(ds, func(i, j int) bool {
		a, b := ds[i], ds[j]
		if a.File != b.File {
			return a.File < b.File
		}
		if a.Line != b.Line {
			return a.Line < b.Line
		}
		return a.Col < b.Col
	})
}

// AsDiags extracts the problem list from an error returned by a parser.
// Any other error becomes a single problem without a position.
func AsDiags(err error, file string) Diags {
	if err == nil {
		return nil
	}
	if ds, ok := err.(Diags); ok {
		return ds
	}
	return Diags{{Pos: Pos{File: file}, Msg: err.Error()}}
}
