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
		{"cafe\u0301 au lait", []string{"cafe\u0301", "au", "lait"}},
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
