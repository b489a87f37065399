package report

import (
	"bytes"
	"encoding/json"
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/ramify-tax/ramify/diff"
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/binding"
	"github.com/ramify-tax/ramify/format/repo"
)

var update = flag.Bool("update", false, "rewrite the golden files under testdata/")

// demoInput is the report input of the bundled demo, with the changes
// from testdata/base.outline (the demo's outline with bike-chain-tool
// shelved with the car tools) and no support.
func demoInput(t *testing.T) Input {
	t.Helper()
	p, ds := repo.Load(filepath.Join("..", "..", "examples", "tool-library"))
	if len(ds) > 0 {
		t.Fatal(ds)
	}
	data, err := os.ReadFile(filepath.Join("testdata", "base.outline"))
	if err != nil {
		t.Fatal(err)
	}
	base, err := format.ParseOutline("base.outline", data)
	if err != nil {
		t.Fatal(err)
	}
	return Input{
		Title: "tool library", Root: p.Outline.Root, Structure: format.StructureHash(p.Outline.Root),
		Items: p.Items, Index: p.Index, Records: binding.New(p.Constraints),
		Changes: diff.Compare(base.Root, p.Outline.Root), Base: "base.outline",
		Gate: Gate{MinAudits: 20, MaxRejectRate: 0.1},
	}
}

// TestDemoGolden compares the data the demo's page embeds with
// testdata/tool-library.json (go test -update rewrites it).
func TestDemoGolden(t *testing.T) {
	got := Build(demoInput(t)).JSON()
	if !json.Valid(got) {
		t.Fatalf("JSON() is not valid JSON:\n%.400s", got)
	}
	golden := filepath.Join("testdata", "tool-library.json")
	if *update {
		if err := os.WriteFile(golden, got, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(golden)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(got, want) {
		t.Errorf("Build(demo).JSON() differs from %s; run go test ./report -update and check the diff", golden)
	}
}

// TestBuildFacts checks the numbers the page shows on the demo.
func TestBuildFacts(t *testing.T) {
	in := demoInput(t)
	pg := Build(in)
	if got, want := pg.Cats[0].Size, len(in.Items); got != want {
		t.Errorf("root size = %d, want %d items", got, want)
	}
	if got, want := len(pg.Cats)-1, in.Root.CountCategories(); got != want {
		t.Errorf("%d categories on the page, the outline has %d", got, want)
	}
	for ci, c := range pg.Cats {
		sum := len(c.Items)
		for _, k := range c.Children {
			sum += pg.Cats[k].Size
			if pg.Cats[k].Parent != ci {
				t.Errorf("category %d lists child %d whose parent is %d", ci, k, pg.Cats[k].Parent)
			}
		}
		if sum != c.Size {
			t.Errorf("category %q: size %d, but its items and subcategories hold %d", c.Name, c.Size, sum)
		}
	}
	moved := 0
	for _, it := range pg.Items {
		if it.Mark == "moved" {
			moved++
			if it.ID != "bike-chain-tool" || it.From != "Bike & car / Car" {
				t.Errorf("moved item %s from %q, want bike-chain-tool from \"Bike & car / Car\"", it.ID, it.From)
			}
		}
	}
	if moved != 1 {
		t.Errorf("%d items marked moved, want 1", moved)
	}
	// The group record of the safety gear binds the category Safety gear
	// (its items exactly) and each of its seven items.
	for ci, c := range pg.Cats {
		if c.Name != "Safety gear" {
			continue
		}
		found := false
		for _, r := range c.Records {
			if pg.Recs[r].Kind == "group" && strings.HasPrefix(pg.Recs[r].Where, "constraints/tomas-reyes.toml:") {
				found = true
			}
		}
		if !found {
			t.Errorf("Safety gear (category %d) does not carry the group record; records %v", ci, c.Records)
		}
		for _, ii := range c.Items {
			if len(pg.Items[ii].Records) == 0 {
				t.Errorf("item %s of Safety gear has no record", pg.Items[ii].ID)
			}
		}
	}
	if pg.Support.Computed || pg.Weakest != nil {
		t.Errorf("support computed without support input")
	}
}

// TestHTMLSafe: text from the repository cannot close the script element
// or inject markup, and the page names no address to fetch.
func TestHTMLSafe(t *testing.T) {
	in := demoInput(t)
	items := append([]format.Item(nil), in.Items...)
	items[0].Label = `</script><img src=x onerror=alert(1)> & "quoted"` + "\u2028"
	items[0].Text = "bad utf-8: \xff"
	in.Items = items
	in.Title = `<b>title</b>`
	var buf bytes.Buffer
	if err := Build(in).WriteHTML(&buf); err != nil {
		t.Fatal(err)
	}
	page := buf.String()
	for _, bad := range []string{"</script><img", "<b>title</b>", "\u2028", "\xff", "http://", "https://"} {
		if strings.Contains(page, bad) {
			t.Errorf("page contains %q", bad)
		}
	}
	if n := strings.Count(page, "</script>"); n != 3 {
		t.Errorf("%d </script> tags, want 3 (meta, script, items)", n)
	}
	// The escaped label reads back as it was.
	_, rest, _ := strings.Cut(page, `<script type="application/json" id="items">`)
	data, _, _ := strings.Cut(rest, "</script>")
	var rows [][]any
	if err := json.Unmarshal([]byte(data), &rows); err != nil {
		t.Fatal(err)
	}
	var row []any
	for _, r := range rows {
		if r[0] == items[0].ID {
			row = r
		}
	}
	if row == nil {
		t.Fatalf("no row for %s", items[0].ID)
	}
	if row[1] != items[0].Label {
		t.Errorf("label read back as %q, want %q", row[1], items[0].Label)
	}
	if row[2] != "bad utf-8: \ufffd" {
		t.Errorf("text read back as %q", row[2])
	}
}
