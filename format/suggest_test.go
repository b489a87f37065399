package format

import (
	"strings"
	"testing"
)

func TestSuggest(t *testing.T) {
	keys := []string{"files", "vectors", "neighbors", "max_depth", "max_children", "max_reject_rate"}
	tests := []struct {
		word, want string
	}{
		{"file", "files"},           // prefix
		{"neighbours", "neighbors"}, // one insertion
		{"max_dept", "max_depth"},   // prefix, more than half
		{"max_detph", "max_depth"},  // transposition
		{"MAX_DEPTH", "max_depth"},  // case only
		{"max_reject", "max_reject_rate"},
		{"vectros", "vectors"},
		{"x", ""},                      // too short to guess from
		{"colour", ""},                 // nothing close
		{"max", ""},                    // a prefix, but of too little
		{strings.Repeat("a", 100), ""}, // garbage is not a typo
		{"", ""},
	}
	for _, tt := range tests {
		if got := Suggest(tt.word, keys); got != tt.want {
			t.Errorf("Suggest(%q) = %q, want %q", tt.word, got, tt.want)
		}
	}
	// Verdicts: short words still get help.
	verdicts := []string{"ok", "fixed", "pending"}
	for word, want := range map[string]string{"okay": "ok", "fxied": "fixed", "pendng": "pending", "no": ""} {
		if got := Suggest(word, verdicts); got != want {
			t.Errorf("Suggest(%q, verdicts) = %q, want %q", word, got, want)
		}
	}
	// An exact match is not a suggestion.
	if got := Suggest("files", keys); got != "" {
		t.Errorf("Suggest of a known word = %q", got)
	}
}

func TestEditDistance(t *testing.T) {
	tests := []struct {
		a, b string
		want int
	}{
		{"", "", 0}, {"a", "", 1}, {"", "abc", 3}, {"kitten", "sitting", 3},
		{"ab", "ba", 1}, {"abc", "acb", 1}, {"flaw", "lawn", 2}, {"same", "same", 0},
	}
	for _, tt := range tests {
		if got := editDistance(tt.a, tt.b); got != tt.want {
			t.Errorf("editDistance(%q, %q) = %d, want %d", tt.a, tt.b, got, tt.want)
		}
		if got := editDistance(tt.b, tt.a); got != tt.want {
			t.Errorf("editDistance(%q, %q) = %d, want %d (symmetry)", tt.b, tt.a, got, tt.want)
		}
	}
}
