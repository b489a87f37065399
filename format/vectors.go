package format

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
)

// MaxFeatures bounds the columns of a vectors file.
const MaxFeatures = 4096

// Vectors holds numeric features, one row per item.
type Vectors struct {
	Features []string
	IDs      []string
	// Values is row-major: row i (item IDs[i]) is
	// Values[i*len(Features) : (i+1)*len(Features)]. It holds the rows of
	// a vectors.tsv and of float64 matrices; float32 matrices (.npy or
	// Parquet) are kept in Values32 instead, in the same layout, at half
	// the memory. Exactly one of the two is set.
	Values   []float64
	Values32 []float32
	// RowPos is where each row begins.
	RowPos []Pos
}

// MaxVectorBytes bounds the memory of the values of one vectors file:
// 4 GiB, a million 1024-dimensional float32 embeddings (or half as many
// float64 ones). A file is checked against it before its values are read.
const MaxVectorBytes = 4 << 30

// MaxVectorFileBytes bounds the size of a binary vectors file (.npy or
// Parquet), which is read as it is decoded rather than whole.
const MaxVectorFileBytes = 8 << 30

// checkVectorBudget says what is wrong when rows × cols values of size
// bytes each would pass the limits, or "".
func checkVectorBudget(rows, cols, size int64) string {
	switch {
	case rows < 1 || cols < 1:
		return fmt.Sprintf("the matrix is %d by %d; it needs at least one row and one feature", rows, cols)
	case cols > MaxFeatures:
		return fmt.Sprintf("%d features; at most %d are allowed", cols, MaxFeatures)
	case rows > MaxItems:
		return fmt.Sprintf("%d rows; at most %s are allowed", rows, grouped(MaxItems))
	case rows*cols*size > MaxVectorBytes:
		return fmt.Sprintf("%d by %d values take %d bytes; the limit is %d", rows, cols, rows*cols*size, int64(MaxVectorBytes))
	}
	return ""
}

// numberedFeatures names dim features f1, f2, …, for binary files that
// carry no feature names.
func numberedFeatures(dim int) []string {
	names := make([]string, dim)
	for j := range dim {
		names[j] = "f" + strconv.Itoa(j+1)
	}
	return names
}

// ParseVectors reads a vectors.tsv: a header "id" followed by feature
// names, then one row per item with a finite number in every cell.
func ParseVectors(file string, data []byte) (*Vectors, error) {
	text, ds := CleanText(file, data)
	if len(ds) > 0 {
		return nil, ds
	}
	v := &Vectors{}
	rowsGuess := min(bytes.Count(text, []byte{'\n'}), MaxItems)
	first := make(map[string]int, min(rowsGuess, 1<<16))
	header := false
	rows := 0
	readTSV(file, string(text), 0, &ds, func(row *tsvRow) bool {
		if !header {
			header = true
			ok := readVectorHeader(file, row, v, &ds)
			if ok {
				// A row needs at least two bytes per feature, which bounds
				// how many rows the text can hold.
				rowsGuess = min(rowsGuess, len(text)/(2*len(v.Features)))
				v.Values = make([]float64, 0, rowsGuess*len(v.Features))
				v.IDs = make([]string, 0, rowsGuess)
				v.RowPos = make([]Pos, 0, rowsGuess)
			}
			return ok
		}
		rows++
		if rows > MaxItems {
			ds.Add(row.pos(file, 0), "more than %s rows in one file", grouped(MaxItems))
			return false
		}
		width := len(v.Features) + 1
		if len(row.Cells) != width {
			at := row.pos(file, 0)
			if len(row.Cells) > width {
				at = row.pos(file, width)
			}
			ds.Add(at, "row has %d cells but the header has %d", len(row.Cells), width)
			return true
		}
		id := strings.TrimSpace(row.Cells[0])
		switch {
		case !ValidItemID(id):
			ds.Add(row.pos(file, 0), "%q is not a valid item id: %s", clip(id), ItemIDRule)
		case first[id] != 0:
			ds.Add(row.pos(file, 0), "item %q has a second row (first at line %d)", id, first[id])
		default:
			first[id] = row.Line
		}
		for j, cell := range row.Cells[1:] {
			x, msg := parseFinite(cell)
			if msg != "" {
				ds.Add(row.pos(file, j+1), "%s (feature %q)", msg, clip(v.Features[j]))
			}
			if len(ds) == 0 {
				v.Values = append(v.Values, x)
			}
		}
		if len(ds) == 0 {
			v.IDs = append(v.IDs, strings.Clone(id))
			v.RowPos = append(v.RowPos, Pos{file, row.Line, 1})
		}
		return true
	})
	if !header {
		ds.Add(Pos{file, 1, 1}, "the file is empty; it needs a header row: id, then the feature names")
	}
	return orProblems(v, ds)
}

func readVectorHeader(file string, row *tsvRow, v *Vectors, ds *Diags) bool {
	if strings.TrimSpace(row.Cells[0]) != "id" {
		ds.Add(row.pos(file, 0), "the first header cell must be \"id\", not %q", clip(row.Cells[0]))
		return false
	}
	if len(row.Cells)-1 > MaxFeatures {
		ds.Add(row.pos(file, MaxFeatures+1), "%d features; the limit is %d", len(row.Cells)-1, MaxFeatures)
		return false
	}
	if len(row.Cells) == 1 {
		ds.Add(row.pos(file, 1), "the header names no features; add a column per feature after id")
		return false
	}
	seen := map[string]int{}
	ok := true
	for j, c := range row.Cells[1:] {
		name := strings.TrimSpace(c)
		switch {
		case name == "":
			ds.Add(row.pos(file, j+1), "feature name is empty")
			ok = false
		case hasControl(name, ""):
			ds.Add(row.pos(file, j+1), "feature name %q contains a control character", clip(name))
			ok = false
		case seen[name] != 0:
			ds.Add(row.pos(file, j+1), "feature %q appears twice in the header (first in column %d)", clip(name), seen[name])
			ok = false
		default:
			seen[name] = j + 2
		}
		v.Features = append(v.Features, strings.Clone(name))
	}
	return ok
}

// parseFinite reads a finite number, saying what is wrong otherwise.
func parseFinite(cell string) (float64, string) {
	s := strings.TrimSpace(cell)
	if s == "" {
		return 0, "empty cell; every cell needs a number"
	}
	x, err := strconv.ParseFloat(s, 64)
	switch {
	case errors.Is(err, strconv.ErrRange):
		return 0, "number " + quoteClip(s) + " is out of range"
	case err != nil:
		return 0, quoteClip(s) + " is not a number"
	case math.IsNaN(x) || math.IsInf(x, 0):
		return 0, quoteClip(s) + " is not a finite number"
	}
	return x, ""
}
