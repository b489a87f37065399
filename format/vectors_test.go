package format

import (
	"fmt"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
)

func TestParseVectors(t *testing.T) {
	v, err := ParseVectors("v.tsv", []byte("\xef\xbb\xbfid\tf1\t f2 \r\na\t1\t2.5\r\n\r\nb\t-3e2\t 0x1p-2 \r\n"))
	if err != nil {
		t.Fatal(err)
	}
	want := &Vectors{
		Features: []string{"f1", "f2"},
		IDs:      []string{"a", "b"},
		Values:   []float64{1, 2.5, -300, 0.25},
		RowPos:   []Pos{{"v.tsv", 2, 1}, {"v.tsv", 4, 1}},
	}
	if diff := cmp.Diff(want, v); diff != "" {
		t.Errorf("(-want +got):\n%s", diff)
	}
	if diff := cmp.Diff([]float64{-300, 0.25}, v.Row(1)); diff != "" {
		t.Errorf("Row(1) (-want +got):\n%s", diff)
	}
}

func TestParseVectorsErrors(t *testing.T) {
	tests := []struct {
		name string
		in   string
		want []string
	}{
		{"NaN, Inf, empty, garbage, ragged, duplicate, out of range",
			"id\tf1\tf2\na\tNaN\tInf\nb\t\tgarbage\nc\t1\nd\t1\t2\t3\na\t1e400\t-Infinity\n", []string{
				`v.tsv:2:3: "NaN" is not a finite number (feature "f1")`,
				`v.tsv:2:7: "Inf" is not a finite number (feature "f2")`,
				`v.tsv:3:3: empty cell; every cell needs a number (feature "f1")`,
				`v.tsv:3:4: "garbage" is not a number (feature "f2")`,
				"v.tsv:4:1: row has 2 cells but the header has 3",
				"v.tsv:5:7: row has 4 cells but the header has 3",
				`v.tsv:6:1: item "a" has a second row (first at line 2)`,
				`v.tsv:6:3: number "1e400" is out of range (feature "f1")`,
				`v.tsv:6:9: "-Infinity" is not a finite number (feature "f2")`,
			}},
		{"repeated and empty feature names", "id\tf1\tf1\t\n", []string{
			`v.tsv:1:7: feature "f1" appears twice in the header (first in column 2)`,
			"v.tsv:1:10: feature name is empty",
		}},
		{"header must start with id", "x\tf\n", []string{`v.tsv:1:1: the first header cell must be "id", not "x"`}},
		{"header without features", "id\n", []string{"v.tsv:1:3: the header names no features; add a column per feature after id"}},
		{"invalid id", "id\tf\n-x\t1\n", []string{`v.tsv:2:1: "-x" is not a valid item id: ` + ItemIDRule}},
		{"columns count characters", "id\tfü\nä\t1\n", []string{`v.tsv:2:1: "ä" is not a valid item id: ` + ItemIDRule}},
		{"empty file", "", []string{"v.tsv:1:1: the file is empty; it needs a header row: id, then the feature names"}},
		{"NUL byte", "id\tf\na\t1\x00\n", []string{"v.tsv:2:4: NUL byte: this is not a text file"}},
		{"too many features", "id" + strings.Repeat("\tf", MaxFeatures+1) + "\n", []string{
			fmt.Sprintf("v.tsv:1:%d: 4097 features; the limit is 4096", 3+2*MaxFeatures+1),
		}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := ParseVectors("v.tsv", []byte(tt.in))
			checkErrors(t, err, tt.want)
		})
	}
}
