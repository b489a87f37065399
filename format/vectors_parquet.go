package format

import (
	"encoding/binary"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/parquet-go/parquet-go"
)

// ParquetIDColumn is the column of a Parquet vectors file that names each
// row's item, like the "id" header of vectors.tsv.
const ParquetIDColumn = "id"

// ReadParquetVectors reads vectors from a Parquet file of size bytes: a
// string column "id" naming each row's item and a list column of float or
// double values, the embedding, as a data frame with an id and a vector
// per row is saved. column names the list column; "" picks the file's
// only list of floats. Every row needs an id and a vector of the same
// length, no null among them. Features are named f1, f2, …; float values
// stay float32 (Values32), doubles float64.
//
// Parquet has no lines, so every problem is reported at line 1, column 1,
// with the row it is about. The footer's row count and the column chunks'
// sizes are checked against the budgets before any page is read, and
// decoding stops at the first row that breaks them, so a file cannot make
// ramify allocate much more than its vectors need.
func ReadParquetVectors(file string, r io.ReaderAt, size int64, column string) (v *Vectors, err error) {
	at := Pos{File: file, Line: 1, Col: 1}
	fail := func(format string, args ...any) (*Vectors, error) {
		var ds Diags
		ds.Add(at, format, args...)
		return nil, ds
	}
	// The reader trusts parts of its input; a malformed file must still be
	// an error, never a crash.
	defer func() {
		if p := recover(); p != nil {
			v, err = fail("not a readable Parquet file: %s", clip(fmt.Sprint(p)))
		}
	}()
	if msg := checkParquetFrame(r, size); msg != "" {
		return fail("not a Parquet file: %s", msg)
	}
	pf, err := parquet.OpenFile(r, size, parquet.SkipPageIndex(true), parquet.SkipBloomFilters(true))
	if err != nil {
		return fail("not a Parquet file: %s", clip(err.Error()))
	}
	idCol, vecCol, msg := parquetColumns(pf.Root(), column)
	if msg != "" {
		return fail("%s", msg)
	}
	rows := pf.NumRows()
	if rows < 1 {
		return fail("the file has no rows")
	}
	if rows > MaxItems {
		return fail("%d rows; at most %s are allowed", rows, grouped(MaxItems))
	}
	if msg := checkParquetChunks(pf, size); msg != "" {
		return fail("%s", msg)
	}
	ids, msg := readParquetIDs(idCol, rows)
	if msg != "" {
		return fail("%s", msg)
	}
	v = &Vectors{IDs: ids}
	dim, msg := readParquetMatrix(vecCol, rows, ids, v)
	if msg != "" {
		return fail("%s", msg)
	}
	v.Features = numberedFeatures(dim)
	if ds := checkParquetIDs(at, ids); len(ds) > 0 {
		return nil, ds
	}
	v.RowPos = make([]Pos, len(ids))
	for i := range v.RowPos {
		v.RowPos[i] = at
	}
	return v, nil
}

// checkParquetChunks bounds the column chunks before any page is read:
// decoded pages are as large as the chunks say they are uncompressed.
func checkParquetChunks(pf *parquet.File, size int64) string {
	var decoded int64
	for _, rg := range pf.Metadata().RowGroups {
		for _, cc := range rg.Columns {
			if cc.MetaData.TotalCompressedSize > size || cc.MetaData.TotalCompressedSize < 0 {
				return fmt.Sprintf("a column chunk says it is %d bytes long but the file is only %d", cc.MetaData.TotalCompressedSize, size)
			}
			decoded += max(cc.MetaData.TotalUncompressedSize, 0)
		}
	}
	if decoded > 2*MaxVectorBytes {
		return fmt.Sprintf("the columns take %d bytes uncompressed; the limit is %d", decoded, int64(2*MaxVectorBytes))
	}
	return ""
}

// readParquetMatrix reads the vector column into v, float values as
// float32 and doubles as float64, and returns the vectors' length.
func readParquetMatrix(vecCol *parquet.Column, rows int64, ids []string, v *Vectors) (int, string) {
	var dim int
	var msg string
	if vecCol.Type().Kind() == parquet.Float {
		v.Values32, dim, msg = readParquetLists(vecCol, rows, 4, ids, func(x parquet.Value) float32 { return x.Float() })
	} else {
		v.Values, dim, msg = readParquetLists(vecCol, rows, 8, ids, func(x parquet.Value) float64 { return x.Double() })
	}
	return dim, msg
}

// checkParquetIDs reports the rows whose id is not a valid item id or
// repeats an earlier row's, up to maxParquetDiags of them.
func checkParquetIDs(at Pos, ids []string) Diags {
	var ds Diags
	first := make(map[string]int, len(ids))
	for i, id := range ids {
		switch {
		case !ValidItemID(id):
			ds.Add(at, "row %d: %q is not a valid item id: %s", i+1, clip(id), ItemIDRule)
		case first[id] != 0:
			ds.Add(at, "row %d: item %q has a second row (first in row %d)", i+1, id, first[id])
		default:
			first[id] = i + 1
		}
		if len(ds) >= maxParquetDiags {
			break
		}
	}
	return ds
}

// maxParquetFooter bounds the footer (the file's metadata), which the
// reader allocates at the size the file states; a file of a million rows
// in a few row groups needs a few kilobytes.
const maxParquetFooter = 16 << 20

// checkParquetFrame checks the magic bytes at both ends and the footer
// length before the reader allocates by it (Parquet's layout: "PAR1", the
// column chunks, the footer, its 4-byte little-endian length, "PAR1").
// Encrypted files ("PARE") are refused: ramify has no keys for them.
func checkParquetFrame(r io.ReaderAt, size int64) string {
	if size < 12 {
		return fmt.Sprintf("it is only %d bytes long", size)
	}
	var head, tail [8]byte
	if _, err := r.ReadAt(head[:4], 0); err != nil {
		return clip(err.Error())
	}
	if _, err := r.ReadAt(tail[:], size-8); err != nil && err != io.EOF {
		return clip(err.Error())
	}
	switch {
	case string(head[:4]) == "PARE" || string(tail[4:]) == "PARE":
		return "the file is encrypted; give ramify an unencrypted copy"
	case string(head[:4]) != "PAR1" || string(tail[4:]) != "PAR1":
		return "it does not start and end with the Parquet magic bytes"
	}
	footer := int64(binary.LittleEndian.Uint32(tail[:4]))
	switch {
	case footer > maxParquetFooter:
		return fmt.Sprintf("the footer says it is %d bytes long; the limit is %d", footer, maxParquetFooter)
	case footer+12 > size:
		return fmt.Sprintf("the footer says it is %d bytes long but the file is only %d", footer, size)
	}
	return ""
}

// maxParquetDiags bounds the problems reported for one file's ids.
const maxParquetDiags = 100

// parquetColumns finds the id column and the vector column among the
// top-level fields of a Parquet schema: the id a required or optional
// string, the vector a list of float or double (the three-level LIST
// layout pyarrow writes, or a bare repeated field), named column or the
// only one.
func parquetColumns(root *parquet.Column, column string) (id, vec *parquet.Column, msg string) {
	var lists []*parquet.Column
	var names []string
	for _, c := range root.Columns() {
		leaf := singleLeaf(c)
		switch {
		case c.Name() == ParquetIDColumn:
			if leaf == nil || leaf != c || leaf.MaxRepetitionLevel() != 0 || leaf.Type().Kind() != parquet.ByteArray {
				return nil, nil, fmt.Sprintf("column %q must hold one string per row", ParquetIDColumn)
			}
			id = c
		case leaf != nil && leaf.MaxRepetitionLevel() == 1 && (leaf.Type().Kind() == parquet.Float || leaf.Type().Kind() == parquet.Double):
			lists = append(lists, leaf)
			names = append(names, c.Name())
		}
	}
	if id == nil {
		return nil, nil, fmt.Sprintf("no column %q; the file needs an %q column with each row's item id", ParquetIDColumn, ParquetIDColumn)
	}
	if column != "" {
		for i, n := range names {
			if n == column {
				return id, lists[i], ""
			}
		}
		return nil, nil, fmt.Sprintf("no column %q holding a list of floats per row (items.vector_column)", clip(column))
	}
	switch len(lists) {
	case 0:
		return nil, nil, "no column holds a list of floats per row; store each vector as a list of float32 or float64"
	case 1:
		return id, lists[0], ""
	}
	return nil, nil, fmt.Sprintf("%d columns hold lists of floats (%s); name the one to use with items.vector_column", len(lists), clip(strings.Join(names, ", ")))
}

// singleLeaf is c itself when it is a leaf, the leaf of a chain of groups
// with one field each (LIST → list → element), or nil.
func singleLeaf(c *parquet.Column) *parquet.Column {
	for depth := 0; depth < 4; depth++ {
		if c.Leaf() {
			return c
		}
		kids := c.Columns()
		if len(kids) != 1 {
			return nil
		}
		c = kids[0]
	}
	return nil
}

// errStop ends a page walk early; its reason is in the walker's message.
var errStop = errors.New("stop")

// walkValues hands every value of a leaf column to visit, page by page in
// row-group order, until visit returns false or the column ends.
func walkValues(col *parquet.Column, visit func(parquet.Value) bool) error {
	pages := col.Pages()
	defer pages.Close()
	buf := make([]parquet.Value, 4096)
	for {
		page, err := pages.ReadPage()
		if err == io.EOF {
			return nil
		}
		if err != nil {
			return err
		}
		vr := page.Values()
		for {
			n, err := vr.ReadValues(buf)
			for _, x := range buf[:n] {
				if !visit(x) {
					parquet.Release(page)
					return errStop
				}
			}
			if err == io.EOF {
				break
			}
			if err != nil {
				parquet.Release(page)
				return err
			}
		}
		parquet.Release(page)
	}
}

// readParquetIDs reads the id column: one non-null string per row.
func readParquetIDs(col *parquet.Column, rows int64) ([]string, string) {
	ids := make([]string, 0, rows)
	msg := ""
	err := walkValues(col, func(x parquet.Value) bool {
		switch {
		case int64(len(ids)) == rows:
			msg = fmt.Sprintf("column %q has more values than the file's %d rows", ParquetIDColumn, rows)
		case x.IsNull():
			msg = fmt.Sprintf("row %d: the id is missing (null)", len(ids)+1)
		case len(x.ByteArray()) > MaxLineBytes:
			msg = fmt.Sprintf("row %d: the id is %d bytes long", len(ids)+1, len(x.ByteArray()))
		default:
			ids = append(ids, string(x.ByteArray()))
			return true
		}
		return false
	})
	if msg != "" {
		return nil, msg
	}
	if err != nil {
		return nil, "cannot read column " + strconv.Quote(ParquetIDColumn) + ": " + clip(err.Error())
	}
	if int64(len(ids)) != rows {
		return nil, fmt.Sprintf("column %q has %d values for the file's %d rows", ParquetIDColumn, len(ids), rows)
	}
	return ids, ""
}

// readParquetLists reads a list column into one row-major matrix: every
// row a non-null list of finite numbers, all as long as the first. A
// value at repetition level 0 starts a row; one below the column's
// maximum definition level is a null or empty list, or a null element.
func readParquetLists[T float32 | float64](col *parquet.Column, rows, width int64, ids []string, get func(parquet.Value) T) ([]T, int, string) {
	var out []T
	maxDef := col.MaxDefinitionLevel()
	row, dim, inRow := int64(-1), 0, 0
	msg := ""
	name := func(r int64) string { return fmt.Sprintf("row %d (item %q)", r+1, clip(ids[r])) }
	endRow := func() bool {
		if row < 0 {
			return true
		}
		if row == 0 {
			dim = inRow
			if m := checkVectorBudget(rows, int64(dim), width); m != "" {
				msg = m
				return false
			}
			grown := make([]T, len(out), rows*int64(dim))
			copy(grown, out)
			out = grown
		} else if inRow != dim {
			msg = fmt.Sprintf("%s: the vector has %d values but the first row's has %d", name(row), inRow, dim)
			return false
		}
		return true
	}
	err := walkValues(col, func(x parquet.Value) bool {
		if x.RepetitionLevel() == 0 {
			if !endRow() {
				return false
			}
			row++
			inRow = 0
			if row >= rows {
				msg = fmt.Sprintf("the vector column has more rows than the file's %d", rows)
				return false
			}
		}
		if x.DefinitionLevel() < maxDef {
			msg = fmt.Sprintf("%s: the vector is missing, empty or holds a null", name(row))
			return false
		}
		inRow++
		if row == 0 && inRow > MaxFeatures {
			msg = fmt.Sprintf("%s: the vector has over %d values; at most %d features are allowed", name(row), MaxFeatures, MaxFeatures)
			return false
		}
		if row > 0 && inRow > dim {
			msg = fmt.Sprintf("%s: the vector has more values than the first row's %d", name(row), dim)
			return false
		}
		f := get(x)
		if g := float64(f); math.IsNaN(g) || math.IsInf(g, 0) {
			msg = fmt.Sprintf("%s, feature %d is %v; every value must be a finite number", name(row), inRow, g)
			return false
		}
		out = append(out, f)
		return true
	})
	if msg == "" && err == nil && !endRow() {
		err = errStop
	}
	if msg != "" {
		return nil, 0, msg
	}
	if err != nil {
		return nil, 0, "cannot read the vector column: " + clip(err.Error())
	}
	if row+1 != rows {
		return nil, 0, fmt.Sprintf("the vector column has %d rows for the file's %d", row+1, rows)
	}
	return out, dim, ""
}
