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

// String is "file:line:col", or "file:line" when the column is not
// known, or the file alone when the line is not known (a problem with the
// whole file, such as its size): a made-up 1:1 would send the reader to a
// line that is not at fault.
func (p Pos) String() string {
	switch {
	case p.Line < 1:
		return p.File
	case p.Col < 1:
		return fmt.Sprintf("%s:%d", p.File, p.Line)
	}
	return fmt.Sprintf("%s:%d:%d", p.File, p.Line, p.Col)
}

// Problem reports are bounded, so that a hostile file of a million bad
// lines costs neither memory nor a screen of a million lines: at most
// MaxProblemsPerFile problems of one file are kept (the rest are counted,
// and parsers stop reading the file), and at most MaxProblems in all are
// printed.
const (
	MaxProblemsPerFile = 100
	MaxProblems        = 1000
)

// Diag is one problem found in an input file. A Diag with More > 0 is not
// a problem but a count: More problems of its file that are not kept (or,
// with an empty File, More problems not shown at all).
type Diag struct {
	Pos
	Msg  string
	More int
}

func (d Diag) String() string {
	switch {
	case d.More > 0 && d.File == "":
		return "and " + plural(d.More, "more problem")
	case d.More > 0 && d.Msg != "":
		return d.Pos.String() + ": and " + plural(d.More, "more problem") + " in this file; " + d.Msg
	case d.More > 0:
		return d.File + ": and " + plural(d.More, "more problem") + " in this file"
	}
	return d.Pos.String() + ": " + d.Msg
}

// Diags is a list of problems; a non-empty Diags is an error.
type Diags []Diag

// Error prints the problems one a line, at most MaxProblems of them.
func (ds Diags) Error() string {
	shown := ds.Capped()
	lines := make([]string, len(shown))
	for i, d := range shown {
		lines[i] = d.String()
	}
	return strings.Join(lines, "\n")
}

// Add appends a problem at pos, or only counts it once its file has
// MaxProblemsPerFile problems.
func (ds *Diags) Add(pos Pos, format string, args ...any) {
	if ds.countMore(pos.File) {
		return
	}
	*ds = append(*ds, Diag{Pos: pos, Msg: fmt.Sprintf(format, args...)})
}

// countMore counts one more problem of file in the trailing count entry
// when the file has its fill of problems (the problems of one file come
// together: each parser reads one file), and reports whether it did.
func (ds *Diags) countMore(file string) bool {
	n := len(*ds)
	if n > 0 && (*ds)[n-1].More > 0 && (*ds)[n-1].File == file {
		(*ds)[n-1].More++
		return true
	}
	same := 0
	for i := n - 1; i >= 0 && same < MaxProblemsPerFile && (*ds)[i].File == file && (*ds)[i].More == 0; i-- {
		same++
	}
	if same < MaxProblemsPerFile {
		return false
	}
	*ds = append(*ds, Diag{Pos: Pos{File: file}, More: 1})
	return true
}

// Full reports whether the last file's problems reached
// MaxProblemsPerFile: a parser then stops reading and calls StopAt.
func (ds Diags) Full() bool {
	return len(ds) > 0 && ds[len(ds)-1].More > 0
}

// StopAt notes that the parser stopped reading the full file at pos.
func (ds Diags) StopAt(pos Pos) {
	if ds.Full() {
		last := &ds[len(ds)-1]
		last.Pos = pos
		last.Msg = fmt.Sprintf("stopped reading at line %d", pos.Line)
	}
}

// Count is the number of problems, counted ones included.
func (ds Diags) Count() int {
	n := 0
	for _, d := range ds {
		if d.More > 0 {
			n += d.More
		} else {
			n++
		}
	}
	return n
}

// Stopped reports whether some file was not read to its end for having
// too many problems, so that Count is only a lower bound.
func (ds Diags) Stopped() bool {
	for _, d := range ds {
		if d.More > 0 && d.Msg != "" {
			return true
		}
	}
	return false
}

// Capped is the first MaxProblems entries of ds, then (when there are
// more) one entry counting the problems left out.
func (ds Diags) Capped() Diags {
	if len(ds) <= MaxProblems {
		return ds
	}
	shown := append(Diags(nil), ds[:MaxProblems]...)
	return append(shown, Diag{More: ds[MaxProblems:].Count()})
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
		if (a.More > 0) != (b.More > 0) {
			return b.More > 0 // a file's count comes after its problems
		}
		if a.Line != b.Line {
			return a.Line < b.Line
		}
		return a.Col < b.Col
	})
}

// orProblems is what a reader returns: v, or, when there are problems,
// no value and the problems in the order of Sort.
func orProblems[T any](v T, ds Diags) (T, error) {
	if len(ds) > 0 {
		ds.Sort()
		var none T
		return none, ds
	}
	return v, nil
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
