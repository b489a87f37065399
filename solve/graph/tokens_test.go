package graph

import (
	"slices"
	"testing"
)

func TestTokens(t *testing.T) {
	// Expected tokens follow the rules in Tokens' doc comment, worked by hand.
	tests := []struct {
		text string
		want []string
	}{
		{"Cordless Drill, 18V — with 2 batteries!", []string{"cordless", "drill", "18v", "batteries"}},
		{"a saw; the SAW's blade", []string{"saw", "saw", "blade"}},
		{"Säge für Holz", []string{"säge", "für", "holz"}},
		// NFC (UAX #15; the compositions are UnicodeData.txt's canonical
		// decompositions read backwards): e + U+0301 is é (U+00E9); the
		// ångström sign U+212B is Å (U+00C5); conjoining jamo U+1100
		// U+1161 are the syllable U+AC00. NFC is not NFKC: the ligature
		// U+FB01 stays as it is.
		{"cafe\u0301 au lait", []string{"caf\u00e9", "au", "lait"}},
		{"Caf\u00e9 CAFE\u0301 cafe\u0301", []string{"caf\u00e9", "caf\u00e9", "caf\u00e9"}},
		{"\u212Bngstr\u00f6m", []string{"\u00e5ngstr\u00f6m"}},
		{"\u1100\u1161\u1100\u1161 \uac00\uac00", []string{"\uac00\uac00", "\uac00\uac00"}},
		{"\ufb01le", []string{"\ufb01le"}},
		{"x-y z_w  q9", []string{"q9"}},
		{"ΣΟΦΙΑ ΣΟΦΙΑ", []string{"σοφια", "σοφια"}},
		{"", nil},
		{"... — !!", nil},
	}
	for _, tc := range tests {
		if got := Tokens(tc.text); !slices.Equal(got, tc.want) {
			t.Errorf("Tokens(%q) = %q, want %q", tc.text, got, tc.want)
		}
	}
}

func TestPluralStem(t *testing.T) {
	// Hand-written cases for the rules in PluralStem's doc comment.
	tests := map[string]string{
		"batteries": "battery",
		"ties":      "tie",
		"boxes":     "box",
		"benches":   "bench",
		"brushes":   "brush",
		"glasses":   "glass",
		"hammers":   "hammer",
		"axes":      "ax",
		"glass":     "glass",
		"cactus":    "cactus",
		"analysis":  "analysis",
		"saw":       "saw",
		"gas":       "gas",
		"drill":     "drill",
		"18v":       "18v",
	}
	for in, want := range tests {
		if got := PluralStem(in); got != want {
			t.Errorf("PluralStem(%q) = %q, want %q", in, got, want)
		}
	}
}

// Precomposed and decomposed "café" are one term everywhere text is
// compared: the same tokens, the same character grams, so labels that
// differ only in how the accent was typed are as similar as equal labels.
func TestTokensNFCOneTerm(t *testing.T) {
	pre, dec := "Caf\u00e9 grinder", "Cafe\u0301 grinder"
	if a, b := Tokens(pre), Tokens(dec); !slices.Equal(a, b) {
		t.Errorf("tokens %q and %q differ", a, b)
	}
	if a, b := CharGrams(pre, 3, 5), CharGrams(dec, 3, 5); !slices.Equal(a, b) {
		t.Errorf("grams %q and %q differ", a, b)
	}
}
