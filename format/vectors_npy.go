package format

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/sbinet/npyio"
)

// ReadNPYVectors reads vectors from a NumPy .npy file (a two-dimensional
// float32 or float64 matrix in C order, one row per item, as numpy.save
// writes an embedding matrix) of size bytes, and the ids of its rows from
// a text file with one item id per line, in row order. Features are named
// f1, f2, …; float32 values stay float32 (Values32). The header's shape is
// checked against the file's size and the budgets before anything is
// allocated, so a file cannot ask for more memory than its own size, and
// the matrix is decoded as it is read, never held twice.
func ReadNPYVectors(file string, r io.ReaderAt, size int64, idsFile string, ids []byte) (v *Vectors, err error) {
	var ds Diags
	at := Pos{File: file, Line: 1, Col: 1}
	prefix := make([]byte, min(size, maxNPYHeader+12))
	if _, err := r.ReadAt(prefix, 0); err != nil && err != io.EOF {
		return nil, err
	}
	if msg := checkNPYPrefix(prefix); msg != "" {
		ds.Add(at, "not a NumPy .npy file: %s", msg)
		return nil, ds
	}
	// The reader trusts its input in places; a malformed file must still
	// be an error, never a crash.
	defer func() {
		if p := recover(); p != nil {
			var pds Diags
			pds.Add(at, "not a NumPy .npy file: the header cannot be read")
			v, err = nil, pds
		}
	}()
	nr, err := npyio.NewReader(bufio.NewReaderSize(io.NewSectionReader(r, 0, size), 1<<20))
	if err != nil {
		ds.Add(at, "not a NumPy .npy file: %s", clip(err.Error()))
		return nil, ds
	}
	rows, cols, width, msg := checkNPYShape(nr.Header, size)
	if msg != "" {
		ds.Add(at, "%s", msg)
		return nil, ds
	}
	v = &Vectors{Features: numberedFeatures(cols)}
	if msg := readNPYMatrix(nr, v, rows, cols, width); msg != "" {
		ds.Add(at, "%s", msg)
		return nil, ds
	}
	v.IDs, v.RowPos = parseRowIDs(idsFile, ids, rows, &ds)
	if len(ds) > 0 {
		return nil, ds
	}
	return v, nil
}

// checkNPYShape reads the matrix's rows, columns and value width (4 or 8
// bytes) off the header, or says why it cannot be vectors: not a matrix,
// not floats, past the budgets, larger than the file, or in column order.
func checkNPYShape(hd npyio.Header, size int64) (rows, cols, width int, msg string) {
	h := hd.Descr
	if len(h.Shape) != 2 {
		return 0, 0, 0, fmt.Sprintf("the array has %d dimensions; vectors need a matrix of rows by features", len(h.Shape))
	}
	rows, cols = h.Shape[0], h.Shape[1]
	switch h.Type {
	case "<f4", "|f4", ">f4":
		width = 4
	case "<f8", "|f8", ">f8":
		width = 8
	default:
		return 0, 0, 0, fmt.Sprintf("the array holds %q; vectors must be float32 or float64", clip(h.Type))
	}
	if msg := checkVectorBudget(int64(rows), int64(cols), int64(width)); msg != "" {
		return 0, 0, 0, msg
	}
	switch {
	case int64(rows)*int64(cols)*int64(width) > size:
		return 0, 0, 0, fmt.Sprintf("the header says %d by %d values but the file is only %d bytes long", rows, cols, size)
	case h.Fortran:
		return 0, 0, 0, "the matrix is in column order (Fortran); save it in row order (numpy.ascontiguousarray)"
	}
	return rows, cols, width, ""
}

// readNPYMatrix decodes the rows × cols matrix into v at its width and
// says what is wrong when it cannot be read or holds a value that is not
// finite.
func readNPYMatrix(nr *npyio.Reader, v *Vectors, rows, cols, width int) string {
	var err error
	bad := -1
	if width == 4 {
		v.Values32 = make([]float32, 0, rows*cols)
		err = nr.Read(&v.Values32)
		bad = firstNonFinite(v.Values32)
	} else {
		v.Values = make([]float64, 0, rows*cols)
		err = nr.Read(&v.Values)
		bad = firstNonFinite(v.Values)
	}
	if err != nil {
		return fmt.Sprintf("cannot read the matrix: %s", clip(err.Error()))
	}
	if bad >= 0 {
		return fmt.Sprintf("row %d, feature %d is %v; every value must be a finite number", bad/cols+1, bad%cols+1, v.value(bad))
	}
	return ""
}

// firstNonFinite is the index of the first NaN or infinite value, or -1.
func firstNonFinite[T float32 | float64](xs []T) int {
	for i, x := range xs {
		if f := float64(x); math.IsNaN(f) || math.IsInf(f, 0) {
			return i
		}
	}
	return -1
}

// value is the p-th stored value, whichever precision holds it.
func (v *Vectors) value(p int) float64 {
	if v.Values32 != nil {
		return float64(v.Values32[p])
	}
	return v.Values[p]
}

// maxNPYHeader bounds the header of a .npy file; numpy writes a few
// hundred bytes.
const maxNPYHeader = 1 << 16

// checkNPYPrefix checks the magic string, the version and the header
// length of a .npy file (NumPy's format: "\x93NUMPY", major and minor
// version bytes, a little-endian header length of 2 bytes in version 1 and
// 4 in versions 2 and 3, then the header ending in a newline) before the
// reader allocates anything by them.
func checkNPYPrefix(data []byte) string {
	if len(data) < 10 || string(data[:6]) != "\x93NUMPY" {
		return "it does not start with the .npy magic string"
	}
	var hdrLen, start int
	switch data[6] {
	case 1:
		hdrLen, start = int(data[8])|int(data[9])<<8, 10
	case 2, 3:
		if len(data) < 12 {
			return "the file ends inside its header"
		}
		hdrLen, start = int(data[8])|int(data[9])<<8|int(data[10])<<16|int(data[11])<<24, 12
	default:
		return "unknown format version " + strconv.Itoa(int(data[6]))
	}
	switch {
	case hdrLen > maxNPYHeader:
		return "the header is over " + strconv.Itoa(maxNPYHeader) + " bytes long"
	case start+hdrLen > len(data):
		return "the file ends inside its header"
	case hdrLen == 0 || data[start+hdrLen-1] != '\n':
		return "the header does not end in a newline"
	}
	return ""
}

// parseRowIDs reads one item id per line (blank lines and lines starting
// with "#" skipped) and checks there are exactly rows of them, each valid
// and given once.
func parseRowIDs(file string, data []byte, rows int, ds *Diags) ([]string, []Pos) {
	text, cds := CleanText(file, data)
	if len(cds) > 0 {
		*ds = append(*ds, cds...)
		return nil, nil
	}
	ids := make([]string, 0, rows)
	pos := make([]Pos, 0, rows)
	first := map[string]int{}
	for n, line := range strings.Split(string(text), "\n") {
		id := strings.TrimSpace(line)
		if id == "" || strings.HasPrefix(id, "#") {
			continue
		}
		p := Pos{File: file, Line: n + 1, Col: 1}
		switch {
		case len(ids) == rows:
			ds.Add(p, "more ids than the %d rows of the matrix", rows)
			return nil, nil
		case !ValidItemID(id):
			ds.Add(p, "%q is not a valid item id: %s", clip(id), ItemIDRule)
		case first[id] != 0:
			ds.Add(p, "item %q has a second row (first at line %d)", id, first[id])
		default:
			first[id] = n + 1
		}
		ids = append(ids, id)
		pos = append(pos, p)
	}
	if len(ids) < rows && len(*ds) == 0 {
		ds.Add(Pos{File: file, Line: 1, Col: 1}, "%d ids for the %d rows of the matrix; give one id per row, in row order", len(ids), rows)
	}
	return ids, pos
}
