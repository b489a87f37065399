package format

import (
	"strconv"
	"strings"
	"unicode/utf8"
)

// Small helpers that keep messages short and readable.

// clip shortens s for an error message, cutting on a character boundary.
func clip(s string) string {
	if len(s) <= 60 {
		return s
	}
	cut := 57
	for cut > 0 && !utf8.RuneStart(s[cut]) {
		cut--
	}
	return s[:cut] + "..."
}

// quoteClip quotes a shortened s.
func quoteClip(s string) string { return strconv.Quote(clip(s)) }

// plural writes a count with its noun: "1 level", "3 levels".
func plural(n int, noun string) string {
	if n == 1 {
		return "1 " + noun
	}
	return strconv.Itoa(n) + " " + noun + "s"
}

// grouped writes n with thousands separators, for limits in messages.
func grouped(n int) string {
	s := strconv.Itoa(n)
	var b strings.Builder
	for i, c := range s {
		if i > 0 && (len(s)-i)%3 == 0 {
			b.WriteByte(',')
		}
		b.WriteRune(c)
	}
	return b.String()
}

// joinOr lists choices for a message: "a", "a or b", "a, b or c".
func joinOr(choices []string) string {
	if len(choices) <= 1 {
		return strings.Join(choices, "")
	}
	return strings.Join(choices[:len(choices)-1], ", ") + " or " + choices[len(choices)-1]
}
