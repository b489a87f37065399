package main

import (
	"reflect"
	"testing"

	"github.com/ramify-tax/ramify/format"
)

// TestImportedItemsReadBack writes items with every kind of awkward value
// and reads the file back with ramify's own TOML items reader.
func TestImportedItemsReadBack(t *testing.T) {
	items := []format.Item{
		{ID: "z9", Label: "Last by id"},
		{ID: "a1", Label: `Quote " and backslash \ and ñ 道`, Tags: []string{"wood", "hand tool"}, Text: "Two\nlines\tand a tab"},
		{ID: "m:5", Text: "C:\\path and \"quotes\" over\nlines"},
		{ID: "b.2"},
	}
	data := formatImportedItems("source.csv", items)
	back, err := format.ParseItemsTOML("items.toml", data)
	if err != nil {
		t.Fatalf("the written file does not parse: %v\n%s", err, data)
	}
	want := itemsByID(items)
	if len(back) != len(want) {
		t.Fatalf("read back %d items, want %d", len(back), len(want))
	}
	for i := range want {
		got := back[i]
		got.Pos = format.Pos{}
		if !reflect.DeepEqual(got, want[i]) {
			t.Errorf("item %d read back as %+v, want %+v", i, got, want[i])
		}
	}
}

func TestImportTOMLString(t *testing.T) {
	// Escapes from TOML 1.0, "Basic strings".
	for _, tc := range []struct{ in, want string }{
		{"plain", `"plain"`},
		{`a "q"`, `"a \"q\""`},
		{`c:\dir`, `"c:\\dir"`},
		{"l1\nl2", `"l1\nl2"`},
		{"\x01", `"\u0001"`},
		{"ünï", `"ünï"`},
	} {
		if got := importTOMLString(tc.in); got != tc.want {
			t.Errorf("importTOMLString(%q) = %s, want %s", tc.in, got, tc.want)
		}
	}
}
