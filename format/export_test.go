package format

import "bytes"

// Functions that only the tests call, kept out of the built package.

// ParseItemsTable reads items from a table with a header row: sep is '\t'
// for .tsv (no quoting; a cell is what lies between tabs) and ',' for
// .csv (RFC 4180 quoting). The header names the columns: id (required)
// and any of label, tags (separated by ";") and text, in any order.
func ParseItemsTable(file string, data []byte, sep byte) ([]Item, error) {
	return parseItemsTable(file, data, sep, fileItems)
}

// Links lists the table as one Link per row.
func (t *LinkTable) Links() []Link {
	out := make([]Link, t.Len())
	for k := range out {
		out[k] = Link{A: t.IDs[t.A[k]], B: t.IDs[t.B[k]], Weight: float64(t.Weight[k]), Pos: t.Pos(k)}
	}
	return out
}

// ParseLinks reads a links.tsv (see ParseLinkTable) as one Link per row.
func ParseLinks(file string, data []byte) ([]Link, error) {
	t, err := ParseLinkTable(file, data)
	if err != nil {
		return nil, err
	}
	return t.Links(), nil
}

// ParseLinkTable reads a links.tsv: the header "a<TAB>b<TAB>weight", then
// one row per link with two different item ids and a finite weight above
// 0, kept in single precision (so between 1.4e-45 and 3.4e38). A pair may
// appear in both directions; the graph builder combines them.
func ParseLinkTable(file string, data []byte) (*LinkTable, error) {
	return ParseLinkTableWithin(file, data, fileLinks, 0)
}

// Row returns the features of the i-th item (a copy, in float64, when the
// rows are float32).
func (v *Vectors) Row(i int) []float64 {
	n := len(v.Features)
	if v.Values32 != nil {
		out := make([]float64, n)
		for j, x := range v.Values32[i*n : (i+1)*n] {
			out[j] = float64(x)
		}
		return out
	}
	return v.Values[i*n : (i+1)*n]
}

// ParseNPYVectors reads vectors from a NumPy .npy file held in memory; see
// ReadNPYVectors.
func ParseNPYVectors(file string, data []byte, idsFile string, ids []byte) (*Vectors, error) {
	return ReadNPYVectors(file, bytes.NewReader(data), int64(len(data)), idsFile, ids)
}

// ParseParquetVectors reads Parquet vectors held in memory; see
// ReadParquetVectors.
func ParseParquetVectors(file string, data []byte, column string) (*Vectors, error) {
	return ReadParquetVectors(file, bytes.NewReader(data), int64(len(data)), column)
}

var fileLinks = Budget{Left: MaxLinks, Over: "more than " + grouped(MaxLinks) + " links in one file"}

// MaxLinks bounds the rows of a links file read on its own.
const MaxLinks = 100_000_000
