package format

import (
	"bytes"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
)

func TestPacketGoldenRoundTrip(t *testing.T) {
	files, _ := filepath.Glob("testdata/packet/*.outline")
	if len(files) == 0 {
		t.Fatal("no golden packets")
	}
	for _, f := range files {
		data, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		p, err := ParsePacket(f, data)
		if err != nil {
			t.Fatalf("%s: %v", f, err)
		}
		if got := FormatPacket(p); !bytes.Equal(got, data) {
			t.Errorf("%s: print(parse(x)) != x (-want +got):\n%s", f, cmp.Diff(string(data), string(got)))
		}
	}
}

func TestParsePacketFields(t *testing.T) {
	data, err := os.ReadFile("testdata/packet/uncertain.outline")
	if err != nil {
		t.Fatal(err)
	}
	p, err := ParsePacket("u.outline", data)
	if err != nil {
		t.Fatal(err)
	}
	want := &Packet{Reason: "uncertain", From: "6f1c09d2a4b3", Drawn: "2026-12-02", Size: 8, Score: 0.421, Verdict: "pending", TreeLine: 16}
	if diff := cmp.Diff(want, p, cmpopts.IgnoreFields(Packet{}, "Tree")); diff != "" {
		t.Errorf("(-want +got):\n%s", diff)
	}
	fastening := p.Tree.Children[0]
	if fastening.Name != "Fastening" || fastening.Line != 16 || fastening.Children[0].ItemLines[1] != 19 {
		t.Errorf("tree lines are not file lines: %+v", fastening)
	}
}

// A reviewer's hand edits: upper-case verdict, reordered lines, no blank
// line before the tree, comments in the tree.
func TestParsePacketHandEdits(t *testing.T) {
	in := "# ramify packet format 1\n# reason: audit\n# from: 0a1b2c3d4e5f\n# drawn: 2027-01-15\n# size: 3\n" +
		"note:   moved the hammer  \nVerdict: FIXED\nreviewer: editor-b\n" +
		"claw-hammer\n# measuring tools together\nMeasuring/\n  tape-measure-8m\n  laser-level\n"
	p, err := ParsePacket("p.outline", []byte(in))
	if err != nil {
		t.Fatal(err)
	}
	if p.Verdict != "fixed" || p.Reviewer != "editor-b" || p.Note != "moved the hammer" || p.TreeLine != 9 {
		t.Errorf("fields: %+v", p)
	}
	want, _ := ParsePacket("a.outline", mustRead(t, "testdata/packet/audit-answered.outline"))
	if diff := treeDiff(want.Tree, p.Tree); diff != "" {
		t.Errorf("tree (-want +got):\n%s", diff)
	}
}

func mustRead(t *testing.T, f string) []byte {
	t.Helper()
	data, err := os.ReadFile(f)
	if err != nil {
		t.Fatal(err)
	}
	return data
}

const packetHead = "# ramify packet format 1\n# reason: audit\n# from: 6f1c09d2a4b3\n# drawn: 2026-12-02\n# size: 3\n"

func TestParsePacketErrors(t *testing.T) {
	tests := []struct {
		name string
		in   string
		want []string
	}{
		{"not a packet", "# ramify packet 2\n", []string{
			`p.outline:1:1: not a ramify packet: the first line must be "# ramify packet format 1", not "# ramify packet 2"`,
		}},
		{"a later format", "# ramify packet format 2\n# reason: audit\n", []string{
			`p.outline:1:1: unsupported packet format "2"; this ramify reads format 1`,
		}},
		{"an outline is not a packet", "# ramify outline 1\nx\n", []string{
			`p.outline:1:1: not a ramify packet: the first line must be "# ramify packet format 1", not "# ramify outline 1"`,
		}},
		{"malformed header and fields",
			"# ramify packet 1\n# reason: uncertin\n# from: xyz\n# drawn: 2026-13-01\n# size: many\n# score: -1\n# sise: 3\n# reason: audit\n" +
				"verdict: okay\nreviewer: me\nreviewr: x\nverdict: ok\n\nA/\n  x\n", []string{
				`p.outline:2:1: reason "uncertin" is not one of uncertain, audit; did you mean "uncertain"?`,
				`p.outline:3:1: from "xyz" is not a structure hash (12 hex digits)`,
				`p.outline:4:1: drawn "2026-13-01" is not a date written YYYY-MM-DD`,
				`p.outline:5:1: size "many" is not a number of items`,
				`p.outline:6:1: score "-1" is not a number between 0 and 1,000,000`,
				`p.outline:7:1: unknown header field "sise"; did you mean "size"?`,
				`p.outline:8:1: header field "reason" appears twice (first at line 2)`,
				`p.outline:9:9: verdict "okay" is not ok, fixed or pending; did you mean "ok"?`,
				`p.outline:11:1: unknown field "reviewr"; did you mean "reviewer"?`,
				`p.outline:12:1: field "verdict" appears twice (first at line 9)`,
			}},
		{"size does not match the tree", packetHead + "verdict: ok\n\nA/\n  x\n  y\n", []string{
			"p.outline:5:1: the header says size 3 but the tree has 2 items; every item of the packet must stay in it exactly once",
		}},
		{"score on an audit packet", packetHead + "# score: 0.5000\nverdict: ok\n\nA/\n  x\n  y\nz\n", []string{
			"p.outline:6:1: score is only for uncertain packets; an audit packet is drawn at random",
		}},
		{"missing verdict", packetHead + "reviewer: me\nA/\n  x\n  y\nz\n", []string{
			`p.outline:7:1: the packet has no verdict line; write "verdict: ok", "verdict: fixed" or "verdict: pending" above the tree`,
		}},
		{"misspelled verdict key", packetHead + "verdit: ok\n\nA/\n  x\n  y\nz\n", []string{
			`p.outline:6:1: unknown field "verdit"; did you mean "verdict"?`,
			`p.outline:8:1: the packet has no verdict line; write "verdict: ok", "verdict: fixed" or "verdict: pending" above the tree`,
		}},
		{"empty verdict", packetHead + "verdict:\n\nA/\n  x\n  y\nz\n", []string{
			"p.outline:6:9: verdict is empty; write ok, fixed or pending",
		}},
		{"tree errors carry file lines", packetHead + "verdict: fixed\n\nA/\n  x\n  x\n\ty\nB/\n", []string{
			`p.outline:10:3: item "x" appears twice (first at line 9); every item appears exactly once`,
			"p.outline:11:1: tab in the indentation; indent with two spaces per level",
			`p.outline:12:1: category "B" is empty; a category needs at least one item or subcategory`,
		}},
		{"header only", "# ramify packet format 1\n", []string{
			`p.outline:1:1: the header has no "# reason: " line`,
			`p.outline:1:1: the header has no "# from: " line`,
			`p.outline:1:1: the header has no "# drawn: " line`,
			`p.outline:1:1: the header has no "# size: " line`,
			`p.outline:1:1: the packet has no verdict line; write "verdict: ok", "verdict: fixed" or "verdict: pending" above the tree`,
		}},
		{"invalid UTF-8", packetHead + "reviewer: \xe9\n", []string{
			"p.outline:6:11: invalid UTF-8 (byte 0xe9); files must be UTF-8",
		}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := ParsePacket("p.outline", []byte(tt.in))
			checkErrors(t, err, tt.want)
		})
	}
}

func TestParsePacketAcceptsCRLFAndBOM(t *testing.T) {
	data := mustRead(t, "testdata/packet/uncertain.outline")
	want, err := ParsePacket("p.outline", data)
	if err != nil {
		t.Fatal(err)
	}
	got, err := ParsePacket("p.outline", append([]byte("\xef\xbb\xbf"), bytes.ReplaceAll(data, []byte("\n"), []byte("\r\n"))...))
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(FormatPacket(want), FormatPacket(got)) {
		t.Errorf("CRLF and BOM change the packet")
	}
}

func randomPacket(rng *rand.Rand) *Packet {
	tree := randomTree(rng, 1+rng.IntN(12), 1+rng.IntN(3))
	p := &Packet{
		Reason:  []string{ReasonUncertain, ReasonAudit}[rng.IntN(2)],
		From:    fmt.Sprintf("%012x", rng.Int64N(1<<48)),
		Drawn:   fmt.Sprintf("%04d-%02d-%02d", 2000+rng.IntN(50), 1+rng.IntN(12), 1+rng.IntN(28)),
		Size:    tree.Size(),
		Verdict: packetVerdicts[rng.IntN(3)],
		Tree:    tree,
	}
	if p.Reason == ReasonUncertain && rng.IntN(4) > 0 {
		p.Score = float64(rng.IntN(100_000)) / 1e4
	}
	words := []string{"", "editor-a", "Zoë O'Brien", "a: b: c", "#hash", "verdict: ok", "漢字"}
	p.Reviewer = words[rng.IntN(len(words))]
	p.Note = words[rng.IntN(len(words))]
	labels := []string{"", "Claw hammer, 16 oz", "  two\nlines\t ", "ends in a slash/", "# hash", "\u202eevil", "Zoë's 漢字 saw", strings.Repeat("long ", 40)}
	for _, id := range tree.AllItems() {
		if l := labels[rng.IntN(len(labels))]; l != "" && rng.IntN(3) > 0 {
			if p.Labels == nil {
				p.Labels = map[string]string{}
			}
			p.Labels[id] = l
		}
	}
	return p
}

// shownLabels is what a packet's labels read back as: each through
// PacketComment, those left empty dropped.
func shownLabels(labels map[string]string) map[string]string {
	var out map[string]string
	for id, l := range labels {
		if c := PacketComment(l); c != "" {
			if out == nil {
				out = map[string]string{}
			}
			out[id] = c
		}
	}
	return out
}

// parse(print(p)) == p on random packets.
func TestPacketRandomRoundTrip(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	for trial := range 500 {
		p := randomPacket(rng)
		text := FormatPacket(p)
		got, err := ParsePacket("p.outline", text)
		if err != nil {
			t.Fatalf("trial %d: %v\n%s", trial, err, text)
		}
		p.Labels = shownLabels(p.Labels)
		if diff := cmp.Diff(p, got, cmpopts.IgnoreFields(Packet{}, "Tree", "TreeLine")); diff != "" {
			t.Fatalf("trial %d (-want +got):\n%s\n%s", trial, diff, text)
		}
		p.Tree.Sort()
		if diff := treeDiff(p.Tree, got.Tree); diff != "" {
			t.Fatalf("trial %d tree (-want +got):\n%s", trial, diff)
		}
		if again := FormatPacket(got); !bytes.Equal(again, text) {
			t.Fatalf("trial %d: printing is not stable", trial)
		}
		if !strings.Contains(string(text), fmt.Sprintf("# Check how these %d items are grouped.\n", p.Size)) {
			t.Fatalf("trial %d: instructions do not name the item count", trial)
		}
	}
}

// A packet written before the first line named the format reads as
// format 1, and prints with today's first line and nothing else changed.
func TestParsePacketLegacyHeader(t *testing.T) {
	old := mustRead(t, "testdata/packet-legacy/uncertain.outline")
	if !bytes.HasPrefix(old, []byte("# ramify packet 1\n")) || !IsPacketText(old) {
		t.Fatal("the legacy golden does not start with the old first line")
	}
	p, err := ParsePacket("old.outline", old)
	if err != nil {
		t.Fatal(err)
	}
	want := mustRead(t, "testdata/packet/uncertain.outline")
	if got := FormatPacket(p); !bytes.Equal(got, want) {
		t.Errorf("(-want +got):\n%s", cmp.Diff(string(want), string(got)))
	}
}

func TestIsPacketText(t *testing.T) {
	for in, want := range map[string]bool{
		"# ramify packet format 1\n":         true,
		"\ufeff# ramify packet format 1\n":   true,
		"# ramify packet 1\n":                true,
		"# ramify packet format 7\n":         true, // read, then refused by version
		"# ramify outline 1\n":               false,
		"":                                   false,
		"claw-hammer  # ramify packet 1\n":   false,
		"# ramify packets are small files\n": false,
	} {
		if got := IsPacketText([]byte(in)); got != want {
			t.Errorf("IsPacketText(%q) = %v, want %v", in, got, want)
		}
	}
}

func TestParsePacketLabels(t *testing.T) {
	p, err := ParsePacket("l.outline", mustRead(t, "testdata/packet/labels.outline"))
	if err != nil {
		t.Fatal(err)
	}
	want := map[string]string{
		"claw-hammer":      "Claw hammer, 16 oz",
		"mallet-rubber":    "Rubber mallet # 2",
		"drill-driver-18v": "Drill driver, 18 V",
		"laser-level":      "Laser level: cross-line / green",
		"ball-peen-hammer": "Ball-peen hammer",
	}
	if diff := cmp.Diff(want, p.Labels); diff != "" {
		t.Errorf("labels (-want +got):\n%s", diff)
	}
	// A category line that holds " # " is a category, not an item with a
	// comment.
	if got := p.Tree.Children[1].Name; got != "Measuring # marking" {
		t.Errorf("second category is %q", got)
	}
	// The comments are no part of the tree: the same packet without them
	// has the same tree, items and lines.
	bare := regexpComment.ReplaceAllString(string(mustRead(t, "testdata/packet/labels.outline")), "$1")
	q, err := ParsePacket("l.outline", []byte(bare))
	if err != nil {
		t.Fatal(err)
	}
	if diff := treeDiff(q.Tree, p.Tree); diff != "" {
		t.Errorf("comments change the tree (-bare +labelled):\n%s", diff)
	}
	if q.Labels != nil {
		t.Errorf("labels without comments: %v", q.Labels)
	}
}

// regexpComment matches an item line's trailing comment in the golden.
var regexpComment = regexp.MustCompile(`(?m)(^ *[a-z0-9-]+)  # .*$`)

func TestPacketComment(t *testing.T) {
	tests := []struct{ in, want string }{
		{"Claw hammer, 16 oz", "Claw hammer, 16 oz"},
		{"", ""},
		{"   ", ""},
		{"two\nlines", "two lines"},
		{"tab\there\r\n", "tab here"},
		{"  spaced   out  ", "spaced out"},
		{"bidi \u202eoverride\u202c end", "bidi override end"},
		{"line\u2028separator", "line separator"},
		{"zero\u200bwidth", "zero width"},
		{"wood/metal/", "wood/metal"},
		{"slash / ", "slash"},
		{"# hash first", "# hash first"},
		{"Zoë's 漢字", "Zoë's 漢字"},
		{"\x00nul\x7fdel", "nul del"},
		{strings.Repeat("a", 100), strings.Repeat("a", 100)},
		{strings.Repeat("a", 101), strings.Repeat("a", 99) + "…"},
		{strings.Repeat("ab ", 50), strings.TrimSpace(strings.Repeat("ab ", 33)) + "…"},
	}
	for _, tt := range tests {
		got := PacketComment(tt.in)
		if got != tt.want {
			t.Errorf("PacketComment(%q) = %q, want %q", tt.in, got, tt.want)
		}
		if again := PacketComment(got); again != got {
			t.Errorf("PacketComment is not idempotent on %q: %q then %q", tt.in, got, again)
		}
	}
}

// Labels that would break a line or pose as a category still print one
// item line each, and read back as the same tree.
func TestFormatPacketHostileLabels(t *testing.T) {
	p := &Packet{Reason: ReasonAudit, From: "0a1b2c3d4e5f", Drawn: "2027-01-15", Size: 3, Verdict: VerdictPending,
		Tree: &Category{Items: []string{"a", "b", "c"}, Children: nil},
		Labels: map[string]string{
			"a": "first\nFake/\n  b",
			"b": "Looks like a category/",
			"c": "verdict: ok",
		}}
	text := string(FormatPacket(p))
	tree := text[strings.Index(text, "\n\n")+2:]
	want := "a  # first Fake/ b\nb  # Looks like a category\nc  # verdict: ok\n"
	if tree != want {
		t.Errorf("tree lines:\n%s\nwant:\n%s", tree, want)
	}
	got, err := ParsePacket("p.outline", []byte(text))
	if err != nil {
		t.Fatal(err)
	}
	if diff := treeDiff(p.Tree, got.Tree); diff != "" || got.Verdict != VerdictPending {
		t.Errorf("tree (-want +got):\n%s verdict %q", diff, got.Verdict)
	}
}
