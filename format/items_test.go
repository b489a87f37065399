package format

import (
	"fmt"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
)

func TestParseItemsFormatsAgree(t *testing.T) {
	want := []Item{
		{ID: "claw-hammer", Label: "Claw hammer", Tags: []string{"hand", "wood"}, Text: "Pulls nails, too."},
		{ID: "tape-measure-8m", Label: "Tape measure, 8 m"},
		{ID: "isbn:978-3", Tags: []string{"book"}, Text: "Two\nlines"},
	}
	inputs := map[string]string{
		"items.toml": `# a comment
[[item]]
id = "claw-hammer"
label = "Claw hammer"
tags = ["hand", "wood"]
text = "Pulls nails, too."

[[item]]
id = "tape-measure-8m"
label = "Tape measure, 8 m"
tags = []

[[item]]
id = "isbn:978-3"
tags = ["book"]
text = """
Two
lines"""
`,
		"items.tsv": "id\tlabel\ttags\ttext\n" +
			"claw-hammer\tClaw hammer\thand; wood\tPulls nails, too.\n" +
			"tape-measure-8m\tTape measure, 8 m\t\t\n" +
			"\n" +
			"isbn:978-3\t\tbook\tTwo\\nlines\n",
		"items.csv": "text,id,tags,label\r\n" +
			"\"Pulls nails, too.\",claw-hammer,hand;wood,Claw hammer\r\n" +
			",tape-measure-8m,,\"Tape measure, 8 m\"\r\n" +
			"\"Two\nlines\",isbn:978-3,book,\r\n",
	}
	for file, in := range inputs {
		t.Run(file, func(t *testing.T) {
			got, err := ParseItems(file, []byte(in))
			if err != nil {
				t.Fatal(err)
			}
			w := want
			if file == "items.tsv" {
				// A tab-separated cell cannot hold a line break; the
				// backslash stays as written.
				w = append([]Item(nil), want...)
				w[2].Text = `Two\nlines`
			}
			if diff := cmp.Diff(w, got, cmp.FilterPath(func(p cmp.Path) bool { return p.Last().String() == ".Pos" }, cmp.Ignore())); diff != "" {
				t.Errorf("(-want +got):\n%s", diff)
			}
		})
	}
}

func TestParseItemsPositions(t *testing.T) {
	tests := []struct {
		file, in string
		want     []string
	}{
		{"i.toml", "# c\n[[item]]\nid = \"a\"\n\n  [[item]]\nid = \"b\"\n", []string{"i.toml:2:1", "i.toml:5:3"}},
		{"i.tsv", "id\n\na\nb\n", []string{"i.tsv:3:1", "i.tsv:4:1"}},
		{"i.csv", "id,text\na,\"x\ny\"\nb,\n", []string{"i.csv:2:1", "i.csv:4:1"}},
	}
	for _, tt := range tests {
		items, err := ParseItems(tt.file, []byte(tt.in))
		if err != nil {
			t.Fatalf("%s: %v", tt.file, err)
		}
		var got []string
		for _, it := range items {
			got = append(got, it.Pos.String())
		}
		if diff := cmp.Diff(tt.want, got); diff != "" {
			t.Errorf("%s positions (-want +got):\n%s", tt.file, diff)
		}
	}
}

func TestParseItemsTOMLErrors(t *testing.T) {
	tests := []struct {
		name string
		in   string
		want []string
	}{
		{"unknown key, duplicate id, bad id, bad tags, missing id, wrong types",
			"[[item]]\nid = \"a\"\nlabl = \"A\"\n[[item]]\nid = \"a\"\n[[item]]\nid = \"bad id\"\ntags = [\"\", \" x\", \"a;b\", \"q\", \"q\"]\n[[item]]\nlabel = \"x\"\n[[item]]\nid = 5\ntags = \"x\"\n",
			[]string{
				`i.toml:3:1: unknown key "labl" in [[item]]; did you mean "label"?`,
				`i.toml:5:1: item "a" appears twice (first at line 1)`,
				`i.toml:7:1: "bad id" is not a valid item id: ` + ItemIDRule,
				"i.toml:8:1: empty tag",
				`i.toml:8:1: tag " x" has leading or trailing spaces`,
				`i.toml:8:1: tag "a;b" contains ";", which separates tags in .tsv and .csv files`,
				`i.toml:8:1: tag "q" appears twice in this item`,
				"i.toml:9:1: [[item]] has no id",
				"i.toml:12:1: id must be a string, not an integer",
				"i.toml:13:1: tags must be an array of strings, not a string",
			}},
		{"unknown top-level key", "items = 1\n[[item]]\nid=\"a\"\n", []string{
			`i.toml:1:1: unknown key "items" in an items file; did you mean "item"?`,
		}},
		{"single table instead of a list", "[item]\nid=\"a\"\n", []string{
			`i.toml:1:1: "item" must be a list of [[item]] tables, each introduced by its own [[item]] line`,
		}},
		{"sub-table of an item", "[[item]]\nid = \"a\"\n[item.sub]\nx=1\n", []string{
			`i.toml:3:1: unknown key "sub" in [[item]]`,
		}},
		{"label with a line break", "[[item]]\nid = \"a\"\nlabel = \"x\\ny\"\n", []string{
			"i.toml:3:1: label contains a control character (such as a tab or line break)",
		}},
		{"syntax error", "[[item]]\nid = \"a\n", []string{
			"i.toml:2:8: TOML syntax: strings cannot contain newlines",
		}},
		{"nested array bomb", "[[item]]\nid = \"a\"\ntags = " + strings.Repeat("[", 100_000) + strings.Repeat("]", 100_000) + "\n", []string{
			"i.toml:3:16: arrays or tables nested more than 8 deep",
		}},
		{"too many tags", "[[item]]\nid = \"a\"\ntags = [" + strings.Repeat(`"t", `, 1001) + "]\n", []string{
			"i.toml:3:1: item has 1001 tags; the limit is 1,000",
		}},
		{"huge array", "[[item]]\nid = \"a\"\ntags = [" + strings.Repeat(`1,`, 100_001) + "]\n", []string{
			"i.toml:3:8: array has more than 100,000 elements",
		}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := ParseItemsTOML("i.toml", []byte(tt.in))
			checkErrors(t, err, tt.want)
		})
	}
}

func TestParseItemsTableErrors(t *testing.T) {
	tests := []struct {
		name string
		file string
		in   string
		want []string
	}{
		{"unknown and repeated columns", "i.tsv", "id\tlabl\tid\n", []string{
			`i.tsv:1:4: unknown column "labl"; the columns are id, label, tags and text; did you mean "label"?`,
			`i.tsv:1:9: column "id" appears twice in the header`,
		}},
		{"missing id column", "i.tsv", "label\ttext\n", []string{
			"i.tsv:1:1: the header has no id column; the first row must name the columns (id, label, tags, text)",
		}},
		{"empty tag, duplicate id, ragged rows", "i.tsv", "id\ttags\na\tx;;y\na\t\nb\n c \tq\tr\n", []string{
			"i.tsv:2:3: empty tag",
			`i.tsv:3:1: item "a" appears twice (first at line 2)`,
			"i.tsv:4:1: row has 1 cells but the header has 2",
			"i.tsv:5:7: row has 3 cells but the header has 2",
		}},
		{"trailing separator is an empty tag", "i.tsv", "id\ttags\na\tx;\n", []string{
			"i.tsv:2:3: empty tag",
		}},
		{"invalid id", "i.tsv", "id\nb@d\n", []string{
			`i.tsv:2:1: "b@d" is not a valid item id: ` + ItemIDRule,
		}},
		{"empty file", "i.tsv", "", []string{
			"i.tsv:1:1: the file is empty; it needs a header row naming the columns (id, label, tags, text)",
		}},
		{"csv quoting error and ragged row", "i.csv", "id,label,text\na,\"A, with comma\",\"multi\nline\"\nb,B,\"bad\"quote\"\nc,C\n", []string{
			`i.csv:4:9: extraneous or missing " in quoted-field`,
			"i.csv:5:1: row has 2 cells but the header has 3",
		}},
		{"csv columns count characters", "i.csv", "id,label\nä,ö\n", []string{
			`i.csv:2:1: "ä" is not a valid item id: ` + ItemIDRule,
		}},
		{"invalid UTF-8", "i.csv", "id\n\xc3\n", []string{
			"i.csv:2:1: invalid UTF-8 (byte 0xc3); files must be UTF-8",
		}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := ParseItems(tt.file, []byte(tt.in))
			checkErrors(t, err, tt.want)
		})
	}
}

func TestParseItemsLimits(t *testing.T) {
	var b strings.Builder
	b.WriteString("id\n")
	for i := range MaxItems + 1 {
		fmt.Fprintf(&b, "i%d\n", i)
	}
	_, err := ParseItems("i.tsv", []byte(b.String()))
	checkErrors(t, err, []string{fmt.Sprintf("i.tsv:%d:1: more than 1,000,000 items in one file", MaxItems+2)})

	_, err = ParseItems("i.tsv", []byte("id\ttags\na\t"+strings.Repeat("t;", 1000)+"t\n"))
	checkErrors(t, err, []string{"i.tsv:2:3: item has 1001 tags; the limit is 1,000"})

	_, err = ParseItems("items.json", []byte("{}"))
	checkErrors(t, err, []string{"items.json: items files must end in .toml, .tsv or .csv"})
}

// A budget stops an items file at the first item past it, in every
// format, with the budget's message at that item.
func TestParseItemsWithinBudget(t *testing.T) {
	b := Budget{Left: 2, Over: "over the budget"}
	for file, data := range map[string]string{
		"i.toml": "[[item]]\nid = \"a\"\n[[item]]\nid = \"b\"\n[[item]]\nid = \"c\"\n[[item]]\nid = \"d\"\n",
		"i.tsv":  "id\na\nb\nc\nd\n",
		"i.csv":  "id\na\nb\nc\nd\n",
	} {
		_, err := ParseItemsWithin(file, []byte(data), b)
		ds, _ := err.(Diags)
		want := map[string]int{"i.toml": 5, "i.tsv": 4, "i.csv": 4}[file]
		if len(ds) != 1 || ds[0].Msg != "over the budget" || ds[0].Line != want {
			t.Errorf("%s: %v; want one problem at line %d", file, err, want)
		}
		if items, err := ParseItemsWithin(file, []byte(data), Budget{Left: 4, Over: "x"}); err != nil || len(items) != 4 {
			t.Errorf("%s within its budget: %d items, %v", file, len(items), err)
		}
	}
}
