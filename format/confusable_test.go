package format

import (
	"strings"
	"testing"
)

// Look-alike pairs: Cyrillic and Greek letters drawn as Latin ones (a
// subset of Unicode TR39's confusables, see lookAlike), compatibility
// forms (NFKC: ligatures, full-width letters), and names that merely
// resemble each other, which must stay apart.
func TestSkeleton(t *testing.T) {
	for _, tc := range []struct {
		a, b string
		same bool
	}{
		{"Cleaning", "\u0421leaning", true},            // Cyrillic capital ES
		{"Power tools", "P\u043ewer t\u03bfols", true}, // Cyrillic o, Greek omicron
		{"Profiles", "Pro\ufb01les", true},             // the "fi" ligature
		{"Saws", "\uff33aws", true},                    // full-width S
		{"Drills 10", "Drills lO", true},               // digits TR39 folds with letters
		{"Hammers", "Harnrners", true},                 // "rn" for m
		{"Saws", "Saw", false},
		{"Cleaning", "Clearing", false},
		{"Garden", "garden", false}, // case is told apart by every reader
		{"Säge", "Sage", false},     // a diacritic is a different letter
	} {
		if got := Skeleton(tc.a) == Skeleton(tc.b); got != tc.same {
			t.Errorf("Skeleton(%q) == Skeleton(%q) is %v, want %v (%q, %q)", tc.a, tc.b, got, tc.same, Skeleton(tc.a), Skeleton(tc.b))
		}
	}
}

func TestConfusableSiblings(t *testing.T) {
	o, err := ParseOutline("t.outline", []byte("# ramify outline 1\nCleaning/\n  mop\n\u0421leaning/\n  broom\nShelf/\n  Cleaning/\n    sponge\n"))
	if err != nil {
		t.Fatal(err)
	}
	ds := ConfusableSiblings("t.outline", o.Root)
	if len(ds) != 1 || ds[0].Pos.Line != 4 || !strings.Contains(ds[0].Msg, `looks like its sibling "Cleaning" (line 2)`) || !strings.Contains(ds[0].Msg, "U+0421") {
		t.Fatalf("ConfusableSiblings = %v; want one warning at line 4 naming U+0421", ds)
	}
}

// Invisible and bidirectional formatting characters are refused in
// category names and item ids, at the character's place.
func TestInvisibleRefused(t *testing.T) {
	for _, tc := range []struct {
		outline string
		col     int
		code    string
	}{
		{"Clean\u200bing/\n  mop\n", 6, "U+200B"},    // zero-width space
		{"Tools \u202eslaoc/\n  mop\n", 7, "U+202E"}, // right-to-left override
		{"A\ufeffB/\n  mop\n", 2, "U+FEFF"},          // byte order mark inside
		{"Shelf/\n  Wax\u2066/\n    mop\n", 6, "U+2066"},
	} {
		_, err := ParseOutline("t.outline", []byte("# ramify outline 1\n"+tc.outline))
		ds, _ := err.(Diags)
		if len(ds) != 1 || ds[0].Pos.Col != tc.col || !strings.Contains(ds[0].Msg, tc.code) {
			t.Errorf("%q: %v; want one problem at column %d naming %s", tc.outline, err, tc.col, tc.code)
		}
	}
	for _, id := range []string{"mop\u200b", "m\u202eop", "\u2060mop"} {
		_, err := ParseItems("items.toml", []byte("[[item]]\nid = \""+id+"\"\n"))
		if err == nil || !strings.Contains(err.Error(), "invisible or bidirectional") {
			t.Errorf("item id %q: %v; want it refused as invisible", id, err)
		}
	}
	if msg := CheckCategoryName("Cl\u00e9aning \u0645\u0643\u0646\u0633\u0629"); msg != "" {
		t.Errorf("accented and Arabic letters: %s", msg)
	}
}
