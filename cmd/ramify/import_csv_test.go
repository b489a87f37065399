package main

import (
	"strings"
	"testing"

	"github.com/ramify-tax/ramify/format"
)

// TestContentPos maps bytes of a cell's content to places in the file,
// through quotes, doubled quotes, line breaks inside quotes and
// multi-byte characters.
func TestContentPos(t *testing.T) {
	text := []byte("id,path\n\"a\"\"b\",\"x\ny\"\n\u00e9\u00e9,z\n")
	src := newImportText("f.csv", text)
	for _, tc := range []struct {
		off, k    int
		line, col int
	}{
		{0, 0, 1, 1},  // "id"
		{3, 2, 1, 6},  // "path", byte 2
		{8, 0, 2, 2},  // "a""b": the a, after the opening quote
		{8, 1, 2, 3},  // the quote, written doubled
		{8, 2, 2, 5},  // b, after the doubled quote
		{15, 2, 3, 1}, // "x\ny": the y is on the next line
		{21, 2, 4, 2}, // éé: byte 2 is the second é, column 2
		{26, 0, 4, 4}, // z
	} {
		got := src.contentPos(tc.off, tc.k)
		if got.Line != tc.line || got.Col != tc.col {
			t.Errorf("contentPos(%d, %d) = %d:%d, want %d:%d", tc.off, tc.k, got.Line, got.Col, tc.line, tc.col)
		}
	}
}

func TestParseImportCSV(t *testing.T) {
	for _, tc := range []struct {
		name, in, want string
	}{
		{"nested", "id,path\nb,A > B\na,A\nc,\n", "A/\n  B/\n    b\n  a\nc\n"},
		{"slash, spaces trimmed", "id,path\nb, A / B \na,A\n", "A/\n  B/\n    b\n  a\n"},
		{"slash kept in names when > is used", "id,path\nb,AC/DC > B\na,AC/DC\n", "AC/DC/\n  B/\n    b\n  a\n"},
		{"provisional", "id,path\na,~ Odd > Inner\n", "~ Odd/\n  Inner/\n    a\n"},
		{"quoted path", "id,path\na,\"Say \"\"hi\"\", then > go\"\n", "Say \"hi\", then/\n  go/\n    a\n"},
		{"CRLF", "id,path\r\na,X\r\n", "X/\n  a\n"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			root, items, ds := parseImportCSV("t.csv", []byte(tc.in))
			if len(ds) > 0 {
				t.Fatal(ds)
			}
			if got := string(format.FormatTree(root)); got != tc.want {
				t.Errorf("tree\n%s\nwant\n%s", got, tc.want)
			}
			if len(items) != root.Size() {
				t.Errorf("%d items for %d placed", len(items), root.Size())
			}
		})
	}
}

func TestParseImportCSVColumns(t *testing.T) {
	root, items, ds := parseImportCSV("t.csv", []byte("text,tags,path,label,id\n\"Line one\nline two\",\"b; a\",X,The A,a1\n"))
	if len(ds) > 0 {
		t.Fatal(ds)
	}
	want := format.Item{ID: "a1", Label: "The A", Tags: []string{"b", "a"}, Text: "Line one\nline two"}
	got := items[0]
	got.Pos = format.Pos{}
	if got.ID != want.ID || got.Label != want.Label || strings.Join(got.Tags, "|") != "b|a" || got.Text != want.Text {
		t.Errorf("item %+v, want %+v", got, want)
	}
	if items[0].Pos.Line != 3 {
		t.Errorf("item at line %d, want 3 (where its id is, after the two-line text)", items[0].Pos.Line)
	}
	if root.Children[0].Name != "X" {
		t.Errorf("tree %s", format.FormatTree(root))
	}
}
