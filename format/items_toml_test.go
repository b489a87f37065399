package format

import (
	"reflect"
	"testing"
)

// TestFormatItemsTOMLReadsBack writes items with every kind of awkward
// value and reads the file back with the TOML items reader.
func TestFormatItemsTOMLReadsBack(t *testing.T) {
	items := []Item{
		{ID: "z9", Label: "Last by id"},
		{ID: "a1", Label: `Quote " and backslash \ and ñ 道`, Tags: []string{"wood", "hand tool"}, Text: "Two\nlines\tand a tab"},
		{ID: "m:5", Text: "C:\\path and \"quotes\" over\nlines"},
		{ID: "b.2"},
	}
	data := FormatItemsTOML("# header\n", items)
	back, err := ParseItemsTOML("items.toml", data)
	if err != nil {
		t.Fatalf("the written file does not parse: %v\n%s", err, data)
	}
	want := []Item{items[1], items[3], items[2], items[0]}
	if len(back) != len(want) {
		t.Fatalf("read back %d items, want %d", len(back), len(want))
	}
	for i := range want {
		got := back[i]
		got.Pos = Pos{}
		if !reflect.DeepEqual(got, want[i]) {
			t.Errorf("item %d read back as %+v, want %+v", i, got, want[i])
		}
	}
}

func TestTOMLQuote(t *testing.T) {
	// Escapes from TOML 1.0, "Basic strings".
	for _, tc := range []struct{ in, want string }{
		{"plain", `"plain"`},
		{`a "q"`, `"a \"q\""`},
		{`c:\dir`, `"c:\\dir"`},
		{"l1\nl2", `"l1\nl2"`},
		{"a\tb", `"a\tb"`},
		{"\x01", `"\u0001"`},
		{"\r\x7f", `"\u000D\u007F"`},
		{"ünï", `"ünï"`},
	} {
		if got := tomlQuote(tc.in); got != tc.want {
			t.Errorf("tomlQuote(%q) = %s, want %s", tc.in, got, tc.want)
		}
	}
}
