package format

import (
	"bytes"
	"strings"
	"testing"

	"github.com/sbinet/npyio"
	"gonum.org/v1/gonum/mat"
)

// npyBytes writes m with npyio (github.com/sbinet/npyio v0.6.0, Write), the
// writer that numpy.save's format is read and written with in Go.
func npyBytes(t testing.TB, m any) []byte {
	t.Helper()
	var b bytes.Buffer
	if err := npyio.Write(&b, m); err != nil {
		t.Fatal(err)
	}
	return b.Bytes()
}

func TestParseNPYVectors(t *testing.T) {
	for _, c := range []struct {
		name string
		data []byte
	}{
		{"float64", npyBytes(t, mat.NewDense(3, 2, []float64{1, 2.5, -3, 0, 4, 1e-3}))},
		{"float32", npyBytes(t, float32Matrix(t, 3, 2, []float32{1, 2.5, -3, 0, 4, 1e-3}))},
	} {
		v, err := ParseNPYVectors("e.npy", c.data, "ids.txt", []byte("a\n# a comment\nb\n\nc\n"))
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		if strings.Join(v.IDs, ",") != "a,b,c" || strings.Join(v.Features, ",") != "f1,f2" {
			t.Errorf("%s: ids %q features %q", c.name, v.IDs, v.Features)
		}
		want := []float64{1, 2.5, -3, 0, 4, 1e-3}
		for i := range 3 {
			for j, x := range v.Row(i) {
				if d := x - want[i*2+j]; d > 1e-7 || d < -1e-7 {
					t.Errorf("%s: value %d,%d = %v, want %v", c.name, i, j, x, want[i*2+j])
				}
			}
		}
		// float32 matrices stay float32, at half the memory.
		if (c.name == "float32") != (v.Values32 != nil) || (v.Values32 != nil) == (v.Values != nil) {
			t.Errorf("%s: %d float64 and %d float32 values", c.name, len(v.Values), len(v.Values32))
		}
		if v.RowPos[2].Line != 5 {
			t.Errorf("%s: row 3 is named on line %d, want 5", c.name, v.RowPos[2].Line)
		}
	}
}

// float32Matrix is a 2-D float32 array as npyio writes one: a fixed-size
// Go array of arrays.
func float32Matrix(t testing.TB, rows, cols int, vals []float32) any {
	t.Helper()
	if rows != 3 || cols != 2 {
		t.Fatal("float32Matrix supports 3 by 2")
	}
	var m [3][2]float32
	for i := range 3 {
		for j := range 2 {
			m[i][j] = vals[i*2+j]
		}
	}
	return m
}

func TestParseNPYVectorsErrors(t *testing.T) {
	good := npyBytes(t, mat.NewDense(2, 2, []float64{1, 2, 3, 4}))
	// The same header with a shape of 2000 rows over the 32 bytes of data
	// (three padding spaces fewer, so the header keeps its length).
	lying := bytes.Replace(good, []byte("(2, 2)"), []byte("(2000, 2)"), 1)
	nl := bytes.IndexByte(lying, '\n')
	lying = append(lying[:nl-3:nl-3], lying[nl:]...)
	for _, c := range []struct {
		name      string
		data, ids []byte
		want      string
	}{
		{"not npy", []byte("id\tf1\n"), []byte("a\n"), "e.npy:1:1: not a NumPy .npy file"},
		{"cut header", good[:40], []byte("a\n"), "e.npy:1:1: not a NumPy .npy file: the file ends inside its header"},
		{"vector", npyBytes(t, []float64{1, 2, 3}), []byte("a\n"), "e.npy:1:1: the array has 1 dimensions"},
		{"ints", npyBytes(t, [2][2]int64{{1, 2}, {3, 4}}), []byte("a\nb\n"), `e.npy:1:1: the array holds "<i8"`},
		{"shape past the data", lying, []byte("a\nb\n"), "e.npy:1:1: the header says 2000 by 2 values but the file is only"},
		{"too few ids", good, []byte("a\n"), "ids.txt:1:1: 1 ids for the 2 rows"},
		{"too many ids", good, []byte("a\nb\nc\n"), "ids.txt:3:1: more ids than the 2 rows"},
		{"twice", good, []byte("a\na\n"), `ids.txt:2:1: item "a" has a second row (first at line 1)`},
		{"bad id", good, []byte("a\nb c\n"), `ids.txt:2:1: "b c" is not a valid item id`},
	} {
		_, err := ParseNPYVectors("e.npy", c.data, "ids.txt", c.ids)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: ParseNPYVectors = %v, want an error containing %q", c.name, err, c.want)
		}
	}
}
