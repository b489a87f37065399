package format

import (
	"regexp"
	"strings"
	"testing"
)

// ValidItemID must accept exactly the documented item-id rule,
// [A-Za-z0-9][A-Za-z0-9._:-]* (see ValidItemID).
func TestValidItemIDMatchesTheRule(t *testing.T) {
	rule := regexp.MustCompile(`^[A-Za-z0-9][A-Za-z0-9._:-]*$`)
	cases := []string{"", "a", "A9", "9", "claw-hammer", "isbn:978-3", "a.b_c", "-a", ".a", "_a", ":a",
		"a b", "a/b", "a#", "ä", "aä", "a\n", strings.Repeat("a", MaxIDLen), strings.Repeat("a", MaxIDLen+1)}
	for c := byte(0); c < 128; c++ {
		cases = append(cases, "x"+string(c), string(c))
	}
	for _, id := range cases {
		want := len(id) <= MaxIDLen && rule.MatchString(id)
		if got := ValidItemID(id); got != want {
			t.Errorf("ValidItemID(%q) = %v, want %v", id, got, want)
		}
	}
}
