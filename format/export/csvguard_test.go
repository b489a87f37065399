package export

import "testing"

// The guard writes a quote before cells a spreadsheet would run as a
// formula (common practice against CSV formula injection) and nothing
// else; UnguardCell takes exactly that quote away.
func TestGuardCell(t *testing.T) {
	for _, tc := range []struct{ in, want string }{
		{"", ""},
		{"plain", "plain"},
		{"=HYPERLINK(\"http://example.org\")", "'=HYPERLINK(\"http://example.org\")"},
		{"+1", "'+1"},
		{"-2", "'-2"},
		{"@SUM(A1)", "'@SUM(A1)"},
		{"\tx", "'\tx"},
		{"\rx", "'\rx"},
		{"'=x", "''=x"}, // a quote already there gets one more
		{"''-x", "'''-x"},
		{"'plain", "'plain"}, // no formula behind the quote: left alone
		{"'", "'"},
		{"a=b", "a=b"},
		{" =x", " =x"},
	} {
		got := GuardCell(tc.in)
		if got != tc.want {
			t.Errorf("GuardCell(%q) = %q, want %q", tc.in, got, tc.want)
		}
		if formulaLead(got) {
			t.Errorf("GuardCell(%q) = %q still starts a formula", tc.in, got)
		}
		if back, cut := UnguardCell(got); back != tc.in || cut != len(got)-len(tc.in) {
			t.Errorf("UnguardCell(%q) = %q, %d; want %q, %d", got, back, cut, tc.in, len(got)-len(tc.in))
		}
	}
}

// UnguardCell inverts GuardCell on every string (the export is lossless).
func FuzzGuardCell(f *testing.F) {
	for _, s := range []string{"", "=", "'=", "''", "'", "-x", "@", "\t", "x"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		g := GuardCell(s)
		if formulaLead(g) {
			t.Fatalf("GuardCell(%q) = %q starts a formula", s, g)
		}
		if back, _ := UnguardCell(g); back != s {
			t.Fatalf("UnguardCell(GuardCell(%q)) = %q", s, back)
		}
	})
}

// No cell of the export starts a formula, whatever the labels, texts,
// tags and names hold.
func TestCSVGuardsFormulaCells(t *testing.T) {
	root, items := fixture(t, "awkward.outline", "awkward.items.toml")
	items[0].Label = "=cmd|' /C calc'!A0"
	items[1].Text = "+1 spare blade"
	items[2].Tags = []string{"@home", "wood"}
	root.Children[0].Name = "-Sale"
	rows := csvRows(t, root, items)
	guarded := 0
	for _, row := range rows {
		for _, cell := range row {
			if formulaLead(cell) {
				t.Errorf("cell %q starts a formula", cell)
			}
			if len(cell) > 1 && cell[0] == '\'' {
				guarded++
			}
		}
	}
	if guarded < 4 {
		t.Errorf("%d guarded cells, want at least 4 (label, text, tags, path)\n%q", guarded, rows)
	}
}
