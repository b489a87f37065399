package format

import (
	"bytes"
	"fmt"
	"math/rand/v2"
	"os"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
)

// designExample is the project's reference example of the record syntax,
// one record of each kind, comments and all.
const designExample = `[[triplet]]                     # a and b belong together before either joins c
pair = ["claw-hammer", "mallet-rubber"]
out = "drill-driver-18v"
by = "editor-a"
date = 2026-11-30
note = "hand tools stay apart from powered ones"

[[group]]                       # exactly these items form one category
items = ["laser-level", "spirit-level-60"]
name = "Levels"                 # optional; a named group fixes the category's name

[[shape]]                       # an approved packet: the tree restricted to these items
outline = """
Hammers/
  claw-hammer
  mallet-rubber
drill-driver-18v
"""
`

func TestParseConstraintsDesignExample(t *testing.T) {
	cf, err := ParseConstraints("c.toml", []byte(designExample))
	if err != nil {
		t.Fatal(err)
	}
	at := func(line, col int) Pos { return Pos{"c.toml", line, col} }
	want := &ConstraintFile{
		File: "c.toml",
		Triplets: []Triplet{{
			Pair: [2]string{"claw-hammer", "mallet-rubber"}, Out: "drill-driver-18v",
			Refs:       []Ref{{"claw-hammer", at(2, 9)}, {"mallet-rubber", at(2, 24)}, {"drill-driver-18v", at(3, 7)}},
			Pos:        at(1, 1),
			Provenance: Provenance{By: "editor-a", Date: "2026-11-30", Note: "hand tools stay apart from powered ones"},
		}},
		Groups: []Group{{
			Items: []string{"laser-level", "spirit-level-60"}, Name: "Levels",
			Refs: []Ref{{"laser-level", at(9, 10)}, {"spirit-level-60", at(9, 25)}},
			Pos:  at(8, 1),
		}},
		Shapes: []Shape{{
			Tree: &Category{
				Children: []*Category{{Name: "Hammers", Items: []string{"claw-hammer", "mallet-rubber"}, Line: 14, ItemLines: []int{15, 16}}},
				Items:    []string{"drill-driver-18v"}, ItemLines: []int{17},
			},
			Refs: []Ref{{"claw-hammer", at(15, 3)}, {"mallet-rubber", at(16, 3)}, {"drill-driver-18v", at(17, 1)}},
			Pos:  at(12, 1),
		}},
	}
	if diff := cmp.Diff(want, cf); diff != "" {
		t.Errorf("(-want +got):\n%s", diff)
	}
}

func TestConstraintsCanonicalRoundTrip(t *testing.T) {
	data, err := os.ReadFile("testdata/constraints/canonical.toml")
	if err != nil {
		t.Fatal(err)
	}
	cf, err := ParseConstraints("canonical.toml", data)
	if err != nil {
		t.Fatal(err)
	}
	if got := FormatConstraints(cf); !bytes.Equal(got, data) {
		t.Errorf("print(parse(x)) != x (-want +got):\n%s", cmp.Diff(string(data), string(got)))
	}
	if n := len(cf.Triplets) + len(cf.Groups) + len(cf.Shapes); n != 6 {
		t.Errorf("%d records, want 6", n)
	}
	if got := cf.Groups[1].Note; got != "line one\nline \"two\" with a \\ and a tab:\t." {
		t.Errorf("note decoded as %q", got)
	}
	if got := cf.Shapes[1].Tree.Children[0].Name; got != `A \ "quoted" name` {
		t.Errorf("shape category name decoded as %q", got)
	}
}

// constraintsCmp compares records by content: positions and mentions
// depend on the text, and trees are compared by treeDiff.
var constraintsCmp = cmp.Options{
	cmpopts.IgnoreFields(Triplet{}, "Refs", "Pos"),
	cmpopts.IgnoreFields(Group{}, "Refs", "Pos"),
	cmpopts.IgnoreFields(Shape{}, "Refs", "Pos", "Tree"),
	cmpopts.EquateEmpty(),
}

func randomProvenance(rng *rand.Rand) Provenance {
	texts := []string{"", "editor-a", "Zoë O'Brien", `back\slash "quotes"`, "tab\there", "line\nbreak", "bell\x07 and del\x7f", "漢字", "'''", `"""`}
	p := Provenance{By: texts[rng.IntN(7)], Note: texts[rng.IntN(len(texts))]}
	if strings.ContainsAny(p.By, "\t\n\x07") {
		p.By = "editor-b"
	}
	if rng.IntN(2) == 0 {
		p.Date = fmt.Sprintf("%04d-%02d-%02d", 1990+rng.IntN(60), 1+rng.IntN(12), 1+rng.IntN(28))
	}
	return p
}

func randomConstraints(rng *rand.Rand) *ConstraintFile {
	cf := &ConstraintFile{File: "r.toml"}
	id := func() string { return randomID(rng, rng.IntN(1000)) }
	for range rng.IntN(5) {
		a, b, c := id()+"a", id()+"b", id()+"c"
		cf.Triplets = append(cf.Triplets, Triplet{Pair: [2]string{a, b}, Out: c, Provenance: randomProvenance(rng)})
	}
	for range rng.IntN(5) {
		n := 2 + rng.IntN(6)
		g := Group{Provenance: randomProvenance(rng)}
		for i := range n {
			g.Items = append(g.Items, fmt.Sprintf("%s-%d", id(), i))
		}
		if rng.IntN(2) == 0 {
			g.Name = randomName(rng)
		}
		cf.Groups = append(cf.Groups, g)
	}
	for range rng.IntN(4) {
		s := Shape{Tree: randomTree(rng, 3+rng.IntN(30), 1+rng.IntN(4)), SideBySide: rng.IntN(2) == 0, Provenance: randomProvenance(rng)}
		if rng.IntN(2) == 0 {
			s.Packet = "2026-12-02-" + fmt.Sprintf("%012x", rng.Int64N(1<<48))
			s.Structure = fmt.Sprintf("%012x", rng.Int64N(1<<48))
		}
		cf.Shapes = append(cf.Shapes, s)
	}
	return cf
}

// parse(print(cf)) == cf on random records, and every mention points at
// the id it names.
func TestConstraintsRandomRoundTrip(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	for trial := range 300 {
		cf := randomConstraints(rng)
		text := FormatConstraints(cf)
		got, err := ParseConstraints("r.toml", text)
		if err != nil {
			t.Fatalf("trial %d: %v\n%s", trial, err, text)
		}
		if diff := cmp.Diff(cf, got, constraintsCmp); diff != "" {
			t.Fatalf("trial %d (-want +got):\n%s\n%s", trial, diff, text)
		}
		for i := range cf.Shapes {
			cf.Shapes[i].Tree.Sort()
			if diff := treeDiff(cf.Shapes[i].Tree, got.Shapes[i].Tree); diff != "" {
				t.Fatalf("trial %d shape %d (-want +got):\n%s", trial, i, diff)
			}
		}
		if again := FormatConstraints(got); !bytes.Equal(again, text) {
			t.Fatalf("trial %d: printing is not stable", trial)
		}
		checkRefsPointAtIDs(t, text, got)
	}
}

func checkRefsPointAtIDs(t *testing.T, text []byte, cf *ConstraintFile) {
	t.Helper()
	lines := strings.Split(string(text), "\n")
	check := func(r Ref) {
		line := lines[r.Pos.Line-1]
		rest := string([]rune(line)[r.Pos.Col-1:])
		if !strings.HasPrefix(rest, r.ID) && !strings.HasPrefix(rest, `"`+r.ID+`"`) {
			t.Errorf("mention of %q at %v points at %q", r.ID, r.Pos, rest)
		}
	}
	for _, tr := range cf.Triplets {
		for _, r := range tr.Refs {
			check(r)
		}
	}
	for _, g := range cf.Groups {
		for _, r := range g.Refs {
			check(r)
		}
	}
	for _, s := range cf.Shapes {
		for _, r := range s.Refs {
			check(r)
		}
	}
}

func TestParseConstraintsErrors(t *testing.T) {
	tests := []struct {
		name string
		in   string
		want []string
	}{
		{"triplet problems",
			"[[triplet]]\npair = [\"a\", \"a\"]\nout = \"a\"\ndate = \"2026-02-30\"\n" +
				"[[triplet]]\npair = [\"a\", \"b\", \"c\"]\n" +
				"[[triplet]]\npair = [\"a\", \"b\"]\nout = \"b\"\noot = 1\n" +
				"[[triplet]]\npair = \"a\"\nout = [\"c\"]\nby = 3\ndate = 2026-11-30T10:00:00\n", []string{
				`c.toml:2:14: pair names "a" twice; a triplet pairs two different items`,
				`c.toml:4:1: date "2026-02-30" is not a calendar date written YYYY-MM-DD`,
				`c.toml:5:1: [[triplet]] has no out; write out = "c" for the item that joins the pair later`,
				"c.toml:6:1: pair must name exactly two items; it names 3",
				`c.toml:9:7: out "b" is also in the pair; a triplet needs three different items`,
				`c.toml:10:1: unknown key "oot" in [[triplet]]; did you mean "out"?`,
				"c.toml:12:1: pair must be an array of strings, not a string",
				"c.toml:13:1: out must be one item id as a string, not an array",
				"c.toml:14:1: by must be a string naming who decided, not an integer",
				"c.toml:15:1: date must be a day written YYYY-MM-DD, without a time",
			}},
		{"group problems",
			"[[group]]\nitems = [\"x\"]\nname = \"~ x\"\n" +
				"[[group]]\nitems = [\"x\", \"y\", \"x\", \"bad id\"]\n" +
				"[[group]]\nname = \"G\"\n", []string{
				"c.toml:2:1: a group needs at least 2 items; it has 1",
				`c.toml:3:8: category name cannot start with "~ " (that marks a provisional name)`,
				`c.toml:5:20: item "x" appears twice in the group (first as item 1)`,
				`c.toml:5:25: "bad id" is not a valid item id: ` + ItemIDRule,
				`c.toml:6:1: [[group]] has no items; write items = ["a", "b", ...] for the items that form one category`,
			}},
		{"shape outline errors point at file lines",
			"[[shape]]\noutline = \"\"\"\nA/\n  x\n  x\nB/\n\"\"\"\nstructure = \"zz\"\n" +
				"[[shape]]\n  outline = \"\"\"A/\n    x\n  y\"\"\"\n" +
				"[[shape]]\noutline = \"A/\\n  x\\n y\\n\"\n" +
				"[[shape]]\noutline = '''\nA/\n\tx\n'''\n", []string{
				`c.toml:5:3: item "x" appears twice (first at line 4); every item appears exactly once`,
				`c.toml:6:1: category "B" is empty; a category needs at least one item or subcategory`,
				`c.toml:8:13: structure "zz" is not 12 hex digits`,
				"c.toml:11:1: indented 2 levels, but here a line can be indented at most 1 level (one level deeper than the category above it)",
				"c.toml:14:21: indentation of 1 space; use exactly two spaces per level",
				"c.toml:18:1: tab in the indentation; indent with two spaces per level",
			}},
		{"shape too small, missing outline, bad packet id", "[[shape]]\noutline = \"\"\"\nA/\n  x\ny\n\"\"\"\n[[shape]]\npacket = \"no spaces allowed\"\n", []string{
			"c.toml:2:1: a shape needs at least 3 items; its outline has 2",
			`c.toml:7:1: [[shape]] has no outline; write the approved tree as outline = """..."""`,
			`c.toml:8:10: packet "no spaces allowed" is not a packet id (the packet file's name without .outline)`,
		}},
		{"side_by_side is a boolean", "[[shape]]\noutline = \"\"\"\na\nb\nc\n\"\"\"\nside_by_side = \"yes\"\n", []string{
			"c.toml:7:1: side_by_side must be true or false, not a string",
		}},
		{"unknown record kind", "[[tripplet]]\nx = 1\n[meta]\n", []string{
			`c.toml:1:1: unknown key "tripplet" in a constraints file (records are [[triplet]], [[group]] and [[shape]]); did you mean "triplet"?`,
			`c.toml:3:1: unknown key "meta" in a constraints file (records are [[triplet]], [[group]] and [[shape]])`,
		}},
		{"record as a plain table", "[triplet]\npair = [\"a\", \"b\"]\n", []string{
			`c.toml:1:1: "triplet" must be a list of [[triplet]] tables, each introduced by its own [[triplet]] line`,
		}},
		{"records as an inline array", "triplet = [{pair = [\"a\", \"b\"], out = \"c\"}]\n", []string{
			`c.toml:1:1: "triplet" must be a list of [[triplet]] tables, each introduced by its own [[triplet]] line`,
		}},
		{"syntax error", "[[group]]\nitems = [\"a\", \"b\",,]\n", []string{
			"c.toml:2:19: TOML syntax: unexpected comma",
		}},
		{"deeply nested arrays", "[[group]]\nitems = " + strings.Repeat("[", 100_000) + strings.Repeat("]", 100_000) + "\n", []string{
			"c.toml:2:17: arrays or tables nested more than 8 deep",
		}},
		{"deeply nested arrays across lines", "[[group]]\nitems = " + strings.Repeat("[\n", 100_000) + strings.Repeat("]\n", 100_000), []string{
			"c.toml:10:1: arrays or tables nested more than 8 deep",
		}},
		{"deeply nested inline tables", "[[group]]\nx = " + strings.Repeat("{a=", 50_000) + "1" + strings.Repeat("}", 50_000) + "\n", []string{
			"c.toml:2:29: arrays or tables nested more than 8 deep",
		}},
		{"huge array", "[[group]]\nitems = [" + strings.Repeat(`"a",`, MaxArrayLen+1) + "]\n", []string{
			"c.toml:2:9: array has more than 100,000 elements",
		}},
		{"too many records", strings.Repeat("[[group]]\n", MaxRecordsPerFile+1), []string{
			"c.toml:100001:1: more than 100,000 records in one file; split them across several files",
		}},
		{"long dotted key", "[[group]]\n" + strings.Repeat("a.", 100_000) + "a = 1\n", []string{
			"c.toml:2:17: key has more than 8 dotted parts",
		}},
		{"invalid UTF-8", "[[group]]\nitems = [\"\xff\"]\n", []string{
			"c.toml:2:11: invalid UTF-8 (byte 0xff); files must be UTF-8",
		}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := ParseConstraints("c.toml", []byte(tt.in))
			checkErrors(t, err, tt.want)
		})
	}
}

func TestParseConstraintsAcceptsCRLFAndBOM(t *testing.T) {
	in := "\xef\xbb\xbf" + strings.ReplaceAll(designExample, "\n", "\r\n")
	got, err := ParseConstraints("c.toml", []byte(in))
	if err != nil {
		t.Fatal(err)
	}
	want, _ := ParseConstraints("c.toml", []byte(designExample))
	if diff := cmp.Diff(want, got); diff != "" {
		t.Errorf("(-want +got):\n%s", diff)
	}
}

func TestParseConstraintsEmpty(t *testing.T) {
	for _, in := range []string{"", "# nothing decided yet\n"} {
		cf, err := ParseConstraints("c.toml", []byte(in))
		if err != nil || len(cf.Triplets)+len(cf.Groups)+len(cf.Shapes) != 0 {
			t.Errorf("%q: %+v, %v", in, cf, err)
		}
	}
	if got := FormatConstraints(&ConstraintFile{}); len(got) != 0 {
		t.Errorf("empty file prints as %q", got)
	}
}
