package format

import (
	"bytes"
	"math"
	"strconv"
	"strings"
	"testing"

	"github.com/parquet-go/parquet-go"
)

// parquetBytes writes rows with parquet-go (github.com/parquet-go/parquet-go
// v0.32.0, parquet.Write), whose struct tags give the schema: a ",list"
// field is the three-level LIST layout pyarrow writes, a plain slice a bare
// repeated field.
func parquetBytes[T any](t testing.TB, rows []T) []byte {
	t.Helper()
	var b bytes.Buffer
	if err := parquet.Write(&b, rows); err != nil {
		t.Fatal(err)
	}
	return b.Bytes()
}

type listRow32 struct {
	ID        string    `parquet:"id"`
	Embedding []float32 `parquet:"embedding,list"`
}

type listRow64 struct {
	ID        string    `parquet:"id"`
	Embedding []float64 `parquet:"embedding,list"`
}

type repeatedRow32 struct {
	ID  string    `parquet:"id"`
	Vec []float32 `parquet:"vec"`
	Tag string    `parquet:"tag"`
}

type twoListsRow struct {
	ID    string    `parquet:"id"`
	Text  []float32 `parquet:"text_embedding,list"`
	Image []float32 `parquet:"image_embedding,list"`
}

type optionalIDRow struct {
	ID        *string   `parquet:"id,optional"`
	Embedding []float32 `parquet:"embedding,list"`
}

type noIDRow struct {
	Name      string    `parquet:"name"`
	Embedding []float32 `parquet:"embedding,list"`
}

type intListRow struct {
	ID        string  `parquet:"id"`
	Embedding []int32 `parquet:"embedding,list"`
}

func TestParseParquetVectors(t *testing.T) {
	want := [][]float64{{1, 2.5, -3}, {0, 4, 1e-3}, {-0.5, 7, 1e10}}
	ids := []string{"b", "a", "c"}
	rows32 := make([]listRow32, 3)
	rows64 := make([]listRow64, 3)
	rep := make([]repeatedRow32, 3)
	for i := range 3 {
		rows64[i] = listRow64{ID: ids[i], Embedding: want[i]}
		rows32[i] = listRow32{ID: ids[i]}
		for _, x := range want[i] {
			rows32[i].Embedding = append(rows32[i].Embedding, float32(x))
		}
		rep[i] = repeatedRow32{ID: ids[i], Vec: rows32[i].Embedding, Tag: "x"}
	}
	for _, c := range []struct {
		name    string
		data    []byte
		column  string
		float32 bool
	}{
		{"list of float", parquetBytes(t, rows32), "", true},
		{"list of double", parquetBytes(t, rows64), "", false},
		{"repeated float", parquetBytes(t, rep), "", true},
		{"named column", parquetBytes(t, rep), "vec", true},
	} {
		v, err := ParseParquetVectors("e.parquet", c.data, c.column)
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		if strings.Join(v.IDs, ",") != "b,a,c" || strings.Join(v.Features, ",") != "f1,f2,f3" {
			t.Errorf("%s: ids %q features %q", c.name, v.IDs, v.Features)
		}
		if c.float32 != (v.Values32 != nil) || (v.Values32 != nil) == (v.Values != nil) {
			t.Errorf("%s: %d float64 and %d float32 values", c.name, len(v.Values), len(v.Values32))
		}
		for i := range 3 {
			for j, x := range v.Row(i) {
				w := want[i][j]
				if c.float32 {
					w = float64(float32(w))
				}
				if x != w {
					t.Errorf("%s: row %d feature %d = %v, want %v", c.name, i, j, x, w)
				}
			}
		}
		if len(v.RowPos) != 3 || v.RowPos[2] != (Pos{"e.parquet", 1, 1}) {
			t.Errorf("%s: row positions %v", c.name, v.RowPos)
		}
	}
}

// More rows than one page or row group holds still come back in order.
func TestParseParquetVectorsManyRows(t *testing.T) {
	const n, dim = 5000, 7
	rows := make([]listRow32, n)
	for i := range rows {
		rows[i].ID = "item-" + strconv.Itoa(i)
		for j := range dim {
			rows[i].Embedding = append(rows[i].Embedding, float32(i*dim+j))
		}
	}
	var b bytes.Buffer
	w := parquet.NewGenericWriter[listRow32](&b, parquet.PageBufferSize(1024), parquet.MaxRowsPerRowGroup(1500))
	if _, err := w.Write(rows); err != nil {
		t.Fatal(err)
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	v, err := ParseParquetVectors("e.parquet", b.Bytes(), "")
	if err != nil {
		t.Fatal(err)
	}
	if len(v.IDs) != n || len(v.Values32) != n*dim {
		t.Fatalf("%d ids and %d values, want %d and %d", len(v.IDs), len(v.Values32), n, n*dim)
	}
	for p, x := range v.Values32 {
		if x != float32(p) {
			t.Fatalf("value %d = %v", p, x)
		}
	}
	for i, id := range v.IDs {
		if id != rows[i].ID {
			t.Fatalf("id %d = %q, want %q", i, id, rows[i].ID)
		}
	}
}

func TestParseParquetVectorsErrors(t *testing.T) {
	s := func(x string) *string { return &x }
	good := parquetBytes(t, []listRow32{{"a", []float32{1, 2}}, {"b", []float32{3, 4}}})
	for _, c := range []struct {
		name   string
		data   []byte
		column string
		want   string
	}{
		{"not parquet", []byte("id\tf1\na\t1\n"), "", "e.parquet:1:1: not a Parquet file"},
		{"cut", good[:len(good)-20], "", "e.parquet:1:1: not a Parquet file"},
		{"no id", parquetBytes(t, []noIDRow{{"a", []float32{1}}}), "", `e.parquet:1:1: no column "id"`},
		{"ints", parquetBytes(t, []intListRow{{"a", []int32{1}}}), "", "e.parquet:1:1: no column holds a list of floats"},
		{"two lists", parquetBytes(t, []twoListsRow{{"a", []float32{1}, []float32{2}}}), "", "2 columns hold lists of floats (text_embedding, image_embedding); name the one to use with items.vector_column"},
		{"unknown column", good, "vectors", `e.parquet:1:1: no column "vectors" holding a list of floats`},
		{"ragged", parquetBytes(t, []listRow32{{"a", []float32{1, 2}}, {"b", []float32{3}}}), "", `e.parquet:1:1: row 2 (item "b"): the vector has 1 values but the first row's has 2`},
		{"longer", parquetBytes(t, []listRow32{{"a", []float32{1, 2}}, {"b", []float32{3, 4, 5}}}), "", `row 2 (item "b"): the vector has more values than the first row's 2`},
		{"empty vector", parquetBytes(t, []listRow32{{"a", []float32{1}}, {"b", nil}}), "", `row 2 (item "b"): the vector is missing, empty or holds a null`},
		{"nan", parquetBytes(t, []listRow32{{"a", []float32{1, float32(math.NaN())}}}), "", `row 1 (item "a"), feature 2 is NaN`},
		{"null id", parquetBytes(t, []optionalIDRow{{s("a"), []float32{1}}, {nil, []float32{2}}}), "", "e.parquet:1:1: row 2: the id is missing (null)"},
		{"twice", parquetBytes(t, []listRow32{{"a", []float32{1}}, {"a", []float32{2}}}), "", `e.parquet:1:1: row 2: item "a" has a second row (first in row 1)`},
		{"bad id", parquetBytes(t, []listRow32{{"a b", []float32{1}}}), "", `e.parquet:1:1: row 1: "a b" is not a valid item id`},
		{"too wide", parquetBytes(t, []listRow32{{"a", make([]float32, MaxFeatures+1)}}), "", "at most 4096 features are allowed"},
	} {
		_, err := ParseParquetVectors("e.parquet", c.data, c.column)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: ParseParquetVectors = %v, want an error containing %q", c.name, err, c.want)
		}
	}
}

func TestCheckVectorBudget(t *testing.T) {
	for _, c := range []struct {
		rows, cols, size int64
		want             string
	}{
		{1_000_000, 384, 4, ""},
		{1_000_000, 1024, 4, ""},
		{1_000_000, 1024, 8, "the limit is 4294967296"},
		{0, 3, 4, "at least one row"},
		{2, MaxFeatures + 1, 4, "at most 4096 are allowed"},
		{MaxItems + 1, 1, 4, "rows; at most"},
	} {
		got := checkVectorBudget(c.rows, c.cols, c.size)
		if (c.want == "") != (got == "") || !strings.Contains(got, c.want) {
			t.Errorf("checkVectorBudget(%d, %d, %d) = %q, want %q", c.rows, c.cols, c.size, got, c.want)
		}
	}
}
