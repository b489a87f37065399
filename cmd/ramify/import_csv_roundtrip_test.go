package main

import (
	"bytes"
	"os"
	"path/filepath"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/ramify-tax/ramify/concept"
	"github.com/ramify-tax/ramify/export"
	"github.com/ramify-tax/ramify/format"
)

// TestCSVRoundTripLossless exports the export package's awkward fixture
// (quotes, commas, line breaks and tabs in texts, non-ASCII names, a
// provisional name, an item without a label, one at the top level) as
// CSV, with concept identifiers, and reads it back as `init --from`
// does: the tree, names, identifiers, labels, tags and texts must all be
// the same.
func TestCSVRoundTripLossless(t *testing.T) {
	read := func(name string) []byte {
		data, err := os.ReadFile(filepath.Join("..", "..", "export", "testdata", name))
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
	var b bytes.Buffer
	if err := export.CSV(&b, o.Root, items); err != nil {
		t.Fatal(err)
	}
	root, back, ds := parseImportCSV("export.csv", b.Bytes())
	if len(ds) > 0 {
		t.Fatalf("reading the export back: %v\n%s", ds, b.String())
	}
	root.Sort()
	if got, want := string(format.FormatOutline(root)), string(format.FormatOutline(o.Root.Clone())); got != want {
		t.Errorf("tree read back (-want +got):\n%s", cmp.Diff(want, got))
	}
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
