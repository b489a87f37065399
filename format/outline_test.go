package format

import (
	"bytes"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
)

func TestOutlineGoldenRoundTrip(t *testing.T) {
	files, err := filepath.Glob("testdata/outline/*.outline")
	if err != nil || len(files) == 0 {
		t.Fatalf("no golden outlines: %v", err)
	}
	for _, f := range files {
		t.Run(filepath.Base(f), func(t *testing.T) {
			data, err := os.ReadFile(f)
			if err != nil {
				t.Fatal(err)
			}
			o, err := ParseOutline(f, data)
			if err != nil {
				t.Fatalf("parse: %v", err)
			}
			if o.Edited() {
				t.Errorf("golden outline counts as edited: structure %s, tree hashes to %s", o.Structure, StructureHash(o.Root))
			}
			if got := FormatOutline(o.Root); !bytes.Equal(got, data) {
				t.Errorf("print(parse(x)) != x (-want +got):\n%s", cmp.Diff(string(data), string(got)))
			}
		})
	}
}

func TestOutlineNoncanonicalInput(t *testing.T) {
	ins, _ := filepath.Glob("testdata/outline/noncanonical/*.in")
	if len(ins) == 0 {
		t.Fatal("no noncanonical inputs")
	}
	for _, in := range ins {
		data, err := os.ReadFile(in)
		if err != nil {
			t.Fatal(err)
		}
		want, err := os.ReadFile(strings.TrimSuffix(in, ".in") + ".want")
		if err != nil {
			t.Fatal(err)
		}
		o, err := ParseOutline(in, data)
		if err != nil {
			t.Fatalf("%s: %v", in, err)
		}
		if o.Structure != "" || o.Edited() {
			t.Errorf("%s: a file without a structure line is never edited", in)
		}
		if got := FormatOutline(o.Root); !bytes.Equal(got, want) {
			t.Errorf("%s: canonical form (-want +got):\n%s", in, cmp.Diff(string(want), string(got)))
		}
	}
}

func TestOutlineEditedByHand(t *testing.T) {
	data, err := os.ReadFile("testdata/outline/tools.outline")
	if err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name   string
		edit   func(string) string
		edited bool
	}{
		{"unchanged", func(s string) string { return s }, false},
		{"renamed", func(s string) string { return strings.Replace(s, "Hammers/", "Striking tools/", 1) }, false},
		{"lines reordered", func(s string) string {
			return strings.Replace(s, "    claw-hammer\n    mallet-rubber\n", "    mallet-rubber\n    claw-hammer\n", 1)
		}, false},
		{"item moved", func(s string) string {
			s = strings.Replace(s, "  drill-driver-18v\n", "", 1)
			return s + "drill-driver-18v\n"
		}, true},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			o, err := ParseOutline("t.outline", []byte(tt.edit(string(data))))
			if err != nil {
				t.Fatal(err)
			}
			if o.Edited() != tt.edited {
				t.Errorf("Edited() = %v, want %v", o.Edited(), tt.edited)
			}
		})
	}
}

func TestParseOutlineErrors(t *testing.T) {
	tests := []struct {
		name string
		in   string
		want []string
	}{
		{"tab in indentation", "A/\n\tx\n", []string{
			"t.outline:2:1: tab in the indentation; indent with two spaces per level",
		}},
		{"tab inside a name", "A\tB/\n  x\n", []string{
			"t.outline:1:2: tab character; category names and item ids cannot hold tabs",
			"t.outline:2:1: indented 1 level, but here a line can be indented at most 0 levels (one level deeper than the category above it)",
		}},
		{"odd indentation", "A/\n   x\n  y\n", []string{
			"t.outline:2:1: indentation of 3 spaces; use exactly two spaces per level",
		}},
		{"over-indentation reported once for its block", "A/\n      B/\n        x\n  y\n", []string{
			"t.outline:2:1: indented 3 levels, but here a line can be indented at most 1 level (one level deeper than the category above it)",
		}},
		{"first line indented", "  x\n", []string{
			"t.outline:1:1: indented 1 level, but here a line can be indented at most 0 levels (one level deeper than the category above it)",
		}},
		{"empty category", "A/\n  x\nB/\nC/\n  D/\n", []string{
			`t.outline:3:1: category "B" is empty; a category needs at least one item or subcategory`,
			`t.outline:5:3: category "D" is empty; a category needs at least one item or subcategory`,
		}},
		{"duplicate item", "A/\n  x\nB/\n  x\n", []string{
			`t.outline:4:3: item "x" appears twice (first at line 2); every item appears exactly once`,
		}},
		{"duplicate sibling category", "A/\n  x\nA/\n  y\n", []string{
			`t.outline:3:1: category "A" appears twice in the same parent (first at line 1)`,
		}},
		{"same name under different parents is fine", "A/\n  C/\n    x\nB/\n  C/\n    y\n", nil},
		{"invalid ids", "A/\n  bad id\n  bad$id\n  -dash\n", []string{
			`t.outline:2:3: "bad id" is not an item id (ids have no spaces); a category line ends with "/"`,
			`t.outline:3:3: "bad$id" is not a valid item id: ` + ItemIDRule,
			`t.outline:4:3: "-dash" is not a valid item id: ` + ItemIDRule,
		}},
		{"id too long", "A/\n  " + strings.Repeat("a", 300) + "\n", []string{
			"t.outline:2:3: item id is 300 bytes long; the limit is 256",
		}},
		{"bad category names", "~ /\n  x\n# comment/\n~ ~ y/\n  y\n /\n", []string{
			"t.outline:1:1: category name is empty",
			`t.outline:4:1: category name cannot start with "~ " (that marks a provisional name)`,
			"t.outline:6:1: indentation of 1 space; use exactly two spaces per level",
		}},
		{"control character in a name", "A\x01/\n  x\n", []string{
			"t.outline:1:1: category name contains a control character",
		}},
		{"header version and hash", "# ramify outline 2\n# structure xyz\nx\n", []string{
			`t.outline:1:1: unsupported outline version "2"; this ramify reads version 1`,
			`t.outline:2:13: structure hash "xyz" is not 12 hex digits`,
		}},
		{"invalid UTF-8", "A/\n  x\xff\n", []string{
			"t.outline:2:4: invalid UTF-8 (byte 0xff); files must be UTF-8",
		}},
		{"NUL byte", "A/\n  x\x00y\n", []string{
			"t.outline:2:4: NUL byte: this is not a text file",
		}},
		{"column counts characters", "Ä/\n  ü x\n", []string{
			`t.outline:2:3: "ü x" is not an item id (ids have no spaces); a category line ends with "/"`,
		}},
		{"many problems at once", "A/\n\tx\n   y\nA/\n  z\n  z\n", []string{
			"t.outline:2:1: tab in the indentation; indent with two spaces per level",
			"t.outline:3:1: indentation of 3 spaces; use exactly two spaces per level",
			`t.outline:4:1: category "A" appears twice in the same parent (first at line 1)`,
			`t.outline:6:3: item "z" appears twice (first at line 5); every item appears exactly once`,
		}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := ParseOutline("t.outline", []byte(tt.in))
			checkErrors(t, err, tt.want)
		})
	}
}

func TestParseOutlineAcceptsCRLFAndBOM(t *testing.T) {
	want, err := ParseOutline("t.outline", []byte("A/\n  x\n  y\nz\n"))
	if err != nil {
		t.Fatal(err)
	}
	for _, in := range []string{
		"A/\r\n  x\r\n  y\r\nz\r\n",
		"\xef\xbb\xbfA/\n  x\n  y\nz\n",
		"\xef\xbb\xbfA/\r\n  x\r\n  y\r\nz",
	} {
		got, err := ParseOutline("t.outline", []byte(in))
		if err != nil {
			t.Errorf("%q: %v", in, err)
			continue
		}
		if diff := cmp.Diff(want.Root, got.Root, ignoreLines); diff != "" {
			t.Errorf("%q (-want +got):\n%s", in, diff)
		}
	}
}

func TestParseOutlineLongLine(t *testing.T) {
	in := "A/\n  " + strings.Repeat("x", 10<<20) + "\n"
	_, err := ParseOutline("t.outline", []byte(in))
	checkErrors(t, err, []string{"t.outline:2:1: line is 10485762 bytes long; the limit is 1048576"})
}

// A tree nested far deeper than MaxDepth gives one clear error, not one
// per line, and does not recurse.
func TestParseOutlineDeepNesting(t *testing.T) {
	const levels = 3000
	var b strings.Builder
	for d := range levels {
		b.WriteString(strings.Repeat("  ", d))
		b.WriteString("c/\n")
	}
	b.WriteString(strings.Repeat("  ", levels) + "x\n")
	_, err := ParseOutline("t.outline", []byte(b.String()))
	checkErrors(t, err, []string{"t.outline:257:1: nesting deeper than 256 levels"})
}

// parse(print(t)) == t on random trees, up to 10,000 items and 12 levels.
func TestOutlineRandomRoundTrip(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for trial := range 40 {
		n := rng.IntN(10_001)
		if trial < 4 {
			n = []int{0, 1, 2, 10_000}[trial]
		}
		tree := randomTree(rng, n, 1+rng.IntN(12))
		text := FormatOutline(tree) // sorts tree
		o, err := ParseOutline("t.outline", text)
		if err != nil {
			t.Fatalf("trial %d (%d items): %v\n%s", trial, n, err, text)
		}
		if diff := treeDiff(tree, o.Root); diff != "" {
			t.Fatalf("trial %d: parse(print(t)) != t (-want +got):\n%s", trial, diff)
		}
		if o.Edited() || o.Structure != StructureHash(tree) {
			t.Fatalf("trial %d: structure line %q does not match the tree", trial, o.Structure)
		}
		if again := FormatOutline(o.Root); !bytes.Equal(again, text) {
			t.Fatalf("trial %d: printing is not stable", trial)
		}
		if got := o.Root.Size(); got != n {
			t.Fatalf("trial %d: %d items, want %d", trial, got, n)
		}
	}
}

// Parsed trees remember the file line of every category and item.
func TestOutlineRecordsLines(t *testing.T) {
	o, err := ParseOutline("t.outline", []byte("# ramify outline 1\nA/\n\n  x\n  B/\n    y\nz\n"))
	if err != nil {
		t.Fatal(err)
	}
	a := o.Root.Children[0]
	if a.Line != 2 || a.ItemLines[0] != 4 || a.Children[0].Line != 5 || a.Children[0].ItemLines[0] != 6 || o.Root.ItemLines[0] != 7 {
		t.Errorf("lines: A=%d x=%v B=%d y=%v z=%v", a.Line, a.ItemLines, a.Children[0].Line, a.Children[0].ItemLines, o.Root.ItemLines)
	}
}

// The "# record" lines at the end of an outline: read back as written,
// sorted by key with items sorted, and malformed ones reported with their
// place.
func TestOutlineRecordLines(t *testing.T) {
	src := "# ramify outline 1\nA/\n  x\n  y\nz\n# record ffffffffffff z\n# record 0123456789ab y x\n"
	o, err := ParseOutline("t.outline", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	want := []OutlineRecord{{Key: "ffffffffffff", Items: []string{"z"}}, {Key: "0123456789ab", Items: []string{"y", "x"}}}
	if diff := cmp.Diff(want, o.Records); diff != "" {
		t.Fatalf("ParseOutline records (-want +got):\n%s", diff)
	}
	got := string(FormatOutlineRecords(o.Root, o.Records))
	if !strings.HasSuffix(got, "z\n# record 0123456789ab x y\n# record ffffffffffff z\n") {
		t.Errorf("FormatOutlineRecords ends\n%s", got)
	}
	for _, tc := range []struct{ src, msg string }{
		{"x\n# record 12345 x\n", "t.outline:2:10: record key \"12345\" is not 12 hex digits"},
		{"x\n# record 0123456789ab x$\n", "t.outline:2:10: \"x$\" in a record line is not a valid item id"},
	} {
		_, err := ParseOutline("t.outline", []byte(tc.src))
		if err == nil || !strings.HasPrefix(err.Error(), tc.msg) {
			t.Errorf("ParseOutline(%q) = %v, want %s…", tc.src, err, tc.msg)
		}
	}
}
