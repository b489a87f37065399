package format

import (
	"fmt"
	"strings"
)

// maxSuggestLen bounds the words Suggest compares: edit distance is
// quadratic, and a key thousands of characters long is garbage, not a typo.
const maxSuggestLen = 64

// Suggest returns the choice closest to word, for "did you mean" hints, or
// "" when no choice is close enough to be a plausible typo. A choice is
// close when it differs only in case, when one is a prefix of the other
// holding at least half of it ("ok" for "okay"), or when the edit distance (with
// transpositions) is at most 1 for short words and 2 for longer ones. Ties
// go to the earlier choice, so callers pass choices in a fixed order.
func Suggest(word string, choices []string) string {
	if word == "" || len(word) > maxSuggestLen {
		return ""
	}
	lower := strings.ToLower(word)
	limit := 1
	if len(word) > 4 {
		limit = 2
	}
	best, bestDist := "", limit+1
	for _, c := range choices {
		if c == word || len(c) > maxSuggestLen {
			continue
		}
		lc := strings.ToLower(c)
		var d int
		switch {
		case lc == lower:
			d = 0
		case isAbbreviation(lower, lc) || isAbbreviation(lc, lower):
			d = 1
		case abs(len(lc)-len(lower)) > limit:
			continue // the distance is at least the difference in length
		default:
			d = editDistance(lower, lc)
		}
		if d < bestDist {
			best, bestDist = c, d
		}
	}
	return best
}

// isAbbreviation reports whether short is a prefix of long that holds at
// least two characters and at least half of long.
func isAbbreviation(short, long string) bool {
	return len(short) >= 2 && 2*len(short) >= len(long) && strings.HasPrefix(long, short)
}

// didYouMean formats Suggest's answer as a message tail: `; did you mean
// "x"?`, or "" when there is nothing to suggest.
func didYouMean(word string, choices []string) string {
	if s := Suggest(word, choices); s != "" {
		return fmt.Sprintf("; did you mean %q?", s)
	}
	return ""
}

// editDistance is the optimal-string-alignment distance between a and b
// over bytes: insertions, deletions, substitutions and swaps of adjacent
// characters each cost 1. Keys are ASCII, so bytes are characters here.
func editDistance(a, b string) int {
	prev2 := make([]int, len(b)+1)
	prev := make([]int, len(b)+1)
	cur := make([]int, len(b)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(a); i++ {
		cur[0] = i
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			v := min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
			if i > 1 && j > 1 && a[i-1] == b[j-2] && a[i-2] == b[j-1] {
				v = min(v, prev2[j-2]+1)
			}
			cur[j] = v
		}
		prev2, prev, cur = prev, cur, prev2
	}
	return prev[len(b)]
}

func abs(n int) int {
	if n < 0 {
		return -n
	}
	return n
}
