package review

import (
	"strings"
	"testing"

	"github.com/ramify-tax/ramify/format"
)

// drawnPacket is a packet over four items of fullOutline as draw writes it.
func drawnPacket(t *testing.T) (*Answer, *format.Category) {
	t.Helper()
	full := outline(t, fullOutline)
	items := []format.Item{
		{ID: "claw-hammer", Label: "Claw hammer, 16 oz"},
		{ID: "mallet-rubber", Label: "Rubber mallet\nfor tiles"},
		{ID: "driver-set"},
		{ID: "tape-measure", Label: "Tape measure"},
	}
	p, id := NewPacket(Draft{Reason: format.ReasonUncertain, Items: []int32{0, 1, 2, 3}, Score: 0.123456},
		full, items, "0123456789ab", "2026-12-01")
	if p.Score != 0.1235 {
		t.Errorf("score %v, want 0.1235 (four decimals)", p.Score)
	}
	// Each item with its label, one line each; driver-set has none.
	text := string(format.FormatPacket(p))
	for _, line := range []string{"\n    claw-hammer  # Claw hammer, 16 oz\n", "\n    mallet-rubber  # Rubber mallet for tiles\n",
		"\n  driver-set\n", "\ntape-measure  # Tape measure\n"} {
		if !strings.Contains(text, line) {
			t.Errorf("packet lacks %q:\n%s", line, text)
		}
	}
	return &Answer{File: "reviews/open/" + id + ".outline", ID: id, Data: format.FormatPacket(p), Packet: p}, full
}

// answer edits a packet's text and reads it back.
func answer(t *testing.T, a *Answer, edit func(string) string) *Answer {
	t.Helper()
	data := []byte(edit(string(a.Data)))
	p, err := format.ParsePacket(a.File, data)
	if err != nil {
		t.Fatalf("answered packet does not parse: %v\n%s", err, data)
	}
	return &Answer{File: a.File, ID: a.ID, Data: data, Packet: p}
}

func TestCheckAnswer(t *testing.T) {
	drawn, full := drawnPacket(t)
	shown := Restrict(full, drawn.Items())
	known := func(id string) bool { return id != "ghost" }
	moveDriver := func(s string) string {
		// driver-set leaves Fastening for the top level.
		s = strings.Replace(s, "  driver-set\n", "", 1)
		return s + "driver-set\n"
	}
	tests := []struct {
		name string
		edit func(string) string
		want string // "" = no problem
	}{
		{"ok as drawn", func(s string) string { return strings.Replace(s, "verdict: pending", "verdict: ok", 1) }, ""},
		{"fixed with a move", func(s string) string {
			return moveDriver(strings.Replace(s, "verdict: pending", "verdict: fixed", 1))
		}, ""},
		{"ok but changed", func(s string) string {
			return moveDriver(strings.Replace(s, "verdict: pending", "verdict: ok", 1))
		}, ":13:1: the verdict is ok but the tree below was changed"},
		{"fixed but unchanged", func(s string) string { return strings.Replace(s, "verdict: pending", "verdict: fixed", 1) },
			":13:1: the verdict is fixed but the tree groups the items as drawn"},
		{"fixed by moving a line with its label", func(s string) string {
			s = strings.Replace(s, "verdict: pending", "verdict: fixed", 1)
			s = strings.Replace(s, "    claw-hammer  # Claw hammer, 16 oz\n", "", 1)
			return s + "claw-hammer  # Claw hammer, 16 oz\n"
		}, ""},
		{"ok with a label retyped and a comment added", func(s string) string {
			s = strings.Replace(s, "verdict: pending", "verdict: ok", 1)
			s = strings.Replace(s, "# Claw hammer, 16 oz", "# a hammer, not a mallet", 1)
			return strings.Replace(s, "  driver-set\n", "  driver-set  # belongs here\n", 1)
		}, ""},
		{"fixed with only a label changed", func(s string) string {
			s = strings.Replace(s, "verdict: pending", "verdict: fixed", 1)
			return strings.Replace(s, "# Tape measure", "# Tape measure, 8 m", 1)
		}, ":13:1: the verdict is fixed but the tree groups the items as drawn"},
		{"an item retyped", func(s string) string {
			return strings.Replace(strings.Replace(s, "verdict: pending", "verdict: fixed", 1), "tape-measure", "tape-measure-5m", 1)
		}, ":5:1: the packet's items are not the 4 it was drawn with"},
		{"an unknown item", func(s string) string {
			return strings.Replace(strings.Replace(s, "verdict: pending", "verdict: fixed", 1), "tape-measure", "ghost", 1)
		}, `item "ghost" is not in the items files`},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			a := answer(t, drawn, tc.edit)
			ds := CheckAnswer(a, known, shown)
			switch {
			case tc.want == "" && len(ds) > 0:
				t.Errorf("unexpected problems: %v", ds)
			case tc.want != "" && (len(ds) != 1 || !strings.Contains(ds[0].String(), tc.want)):
				t.Errorf("problems %v, want one containing %q", ds, tc.want)
			}
		})
	}
	// Without the tree as drawn (an earlier version), only items are checked.
	a := answer(t, drawn, func(s string) string { return strings.Replace(s, "verdict: pending", "verdict: fixed", 1) })
	if ds := CheckAnswer(a, known, nil); len(ds) > 0 {
		t.Errorf("without the drawn tree: %v", ds)
	}
}

func TestShapeFileAndDoneText(t *testing.T) {
	drawn, _ := drawnPacket(t)
	a := answer(t, drawn, func(s string) string {
		s = strings.Replace(s, "verdict: pending", "verdict: fixed", 1)
		s = strings.Replace(s, "note:", "note: drivers are not fasteners", 1)
		return strings.Replace(s, "  driver-set\n", "", 1) + "driver-set\n"
	})
	cf := ShapeFile(a, "Ana Lima", "2026-12-03")
	text := format.FormatConstraints(cf)
	parsed, err := format.ParseConstraints(ShapePath(a.ID), text)
	if err != nil {
		t.Fatalf("shape file does not parse: %v\n%s", err, text)
	}
	s := parsed.Shapes[0]
	if s.Packet != a.ID || s.Structure != "0123456789ab" || s.By != "Ana Lima" || s.Date != "2026-12-03" || s.Note != "drivers are not fasteners" {
		t.Errorf("shape record %+v", s)
	}
	if got, want := string(format.FormatTree(s.Tree)), string(format.FormatTree(a.Packet.Tree.Clone())); got != want {
		t.Errorf("shape outline\n%s\nwant the reviewer's tree\n%s", got, want)
	}
	done := DoneText(a, "Ana Lima", "2026-12-03")
	p, err := format.ParsePacket("done.outline", done)
	if err != nil {
		t.Fatalf("done packet does not parse: %v\n%s", err, done)
	}
	if p.Reviewer != "Ana Lima" || p.Verdict != format.VerdictFixed || !strings.Contains(string(done), "# absorbed on 2026-12-03\n") {
		t.Errorf("done packet:\n%s", done)
	}
	// The audit log keeps the labels the reviewer saw; the record does
	// not: a label is no part of the answer.
	if !strings.Contains(string(done), "    claw-hammer  # Claw hammer, 16 oz\n") {
		t.Errorf("done packet lost the labels:\n%s", done)
	}
	if strings.Contains(string(text), "Claw hammer") {
		t.Errorf("the shape record holds a label:\n%s", text)
	}
}

func TestPacketIDs(t *testing.T) {
	ids := []string{"b", "a", "c"}
	h := PacketHash("0123456789ab", ids)
	if len(h) != 12 || h != PacketHash("0123456789ab", []string{"c", "b", "a"}) {
		t.Errorf("hash %q depends on item order", h)
	}
	if h == PacketHash("0123456789ac", ids) || h == PacketHash("0123456789ab", []string{"a", "b", "d"}) {
		t.Error("hash ignores the structure or the items")
	}
	id := PacketID("2026-12-01", "0123456789ab", ids)
	date, hash, ok := SplitPacketID(id)
	if !ok || date != "2026-12-01" || hash != h {
		t.Errorf("SplitPacketID(%q) = %q, %q, %v", id, date, hash, ok)
	}
	if _, _, ok := SplitPacketID("my-packet"); ok {
		t.Error("a hand-made name split as a packet id")
	}
	if Seed("0123456789ab") == Seed("0123456789ac") {
		t.Error("Seed does not separate structures")
	}
	// Anything else seeds from the first 8 bytes of its SHA-256, big
	// endian: `printf x | sha256sum` (GNU coreutils) gives 2d711642b726b044….
	if got := Seed("x"); got != 0x2d711642b726b044 {
		t.Errorf("Seed(\"x\") = %#x, want 0x2d711642b726b044", got)
	}
}
