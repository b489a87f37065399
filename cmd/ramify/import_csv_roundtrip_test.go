package main

import (
	"bytes"
	"os"
	"path/filepath"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/ramify-tax/ramify/diff/concept"
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/export"
)

// TestCSVRoundTripLossless exports the export package's awkward fixture
// (quotes, commas, line breaks and tabs in texts, non-ASCII names, a
// provisional name, an item without a label, one at the top level) as
// CSV, with concept identifiers, and reads it back as `init --from`
// does: the tree, names, identifiers, labels, tags and texts must all be
// the same.
func TestCSVRoundTripLossless(t *testing.T) {
	read := func(name string) []byte {
		data, err := os.ReadFile(filepath.Join("..", "..", "format", "export", "testdata", name))
		if err != nil {
			t.Fatal(err)
		}
		return data
	}
	o, err := format.ParseOutline("awkward.outline", read("awkward.outline"))
	if err != nil {
		t.Fatal(err)
	}
	items, err := format.ParseItems("awkward.items.toml", read("awkward.items.toml"))
	if err != nil {
		t.Fatal(err)
	}
	// Tags on some items, so that they travel too.
	items[0].Tags = []string{"hand", "wood"}
	items[2].Tags = []string{"über", "a b"}
	concept.Carry(o.Root)
	back := csvRoundTrip(t, o.Root, items)
	type plain struct {
		ID, Label, Text string
		Tags            []string
	}
	strip := func(its []format.Item) map[string]plain {
		out := map[string]plain{}
		for _, it := range its {
			out[it.ID] = plain{it.ID, it.Label, it.Text, it.Tags}
		}
		return out
	}
	if d := cmp.Diff(strip(items), strip(back)); d != "" {
		t.Errorf("items read back (-want +got):\n%s", d)
	}
}

// TestCSVRoundTripFormulaCells: cells the export guards against formula
// injection (a quote before "=", "+", "-", "@", a tab or a carriage
// return) read back as they were, including values that already begin
// with quotes; a problem in a guarded cell is reported at its place in
// the file.
func TestCSVRoundTripFormulaCells(t *testing.T) {
	o, err := format.ParseOutline("t.outline", []byte("# ramify outline 1\n-Sale/\n  =Blades/\n    saw-1\n  saw-2\n@Home/\n  saw-3\n  saw-4\n"))
	if err != nil {
		t.Fatal(err)
	}
	items := []format.Item{
		{ID: "saw-1", Label: "=1+1", Text: "'=already quoted", Tags: []string{"-x", "y"}},
		{ID: "saw-2", Label: "'plain quote", Text: "\tindented"},
		{ID: "saw-3", Label: "''@two quotes", Text: "-"},
		{ID: "saw-4", Label: "+", Text: "ordinary"},
	}
	back := csvRoundTrip(t, o.Root, items)
	for i, it := range back {
		w := items[i]
		if it.ID != w.ID || it.Label != w.Label || it.Text != w.Text || !cmp.Equal(it.Tags, w.Tags, cmpopts.EquateEmpty()) {
			t.Errorf("item read back %+v, want %+v", it, w)
		}
	}

	// A bad category name behind a guard quote: the column is that of
	// the name in the file, counting the quote.
	_, _, ds := parseImportCSV("bad.csv", []byte("id,path\nsaw-1,'-Sale > ~\n"))
	if len(ds) != 1 || ds[0].Pos.Line != 2 || ds[0].Pos.Col != 16 {
		t.Errorf("problems %v; want one at bad.csv:2:16, the \"~\"", ds)
	}
}

// csvRoundTrip exports root and items as CSV, reads the file back as
// `init --from` does, checks that the tree is the same and returns the
// items read.
func csvRoundTrip(t *testing.T, root *format.Category, items []format.Item) []format.Item {
	t.Helper()
	var b bytes.Buffer
	if err := export.CSV(&b, root, items); err != nil {
		t.Fatal(err)
	}
	back, backItems, ds := parseImportCSV("export.csv", b.Bytes())
	if len(ds) > 0 {
		t.Fatalf("reading the export back: %v\n%s", ds, b.String())
	}
	back.Sort()
	if got, want := string(format.FormatOutline(back)), string(format.FormatOutline(root.Clone())); got != want {
		t.Errorf("tree read back (-want +got):\n%s", cmp.Diff(want, got))
	}
	return backItems
}
