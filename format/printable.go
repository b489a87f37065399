package format

import (
	"fmt"
	"strings"
	"unicode"
	"unicode/utf8"
)

// Printable is s as ramify prints it to a terminal or a text report:
// control characters (C0, DEL, C1: the escape that starts a terminal
// sequence among them), the invisible and bidirectional formatting
// characters of IsInvisible, and bytes that are not UTF-8 are written as
// escapes (\x1b, \u202e, \xff), so that nothing a file or a pull request
// holds can move the cursor, set the window title, recolour the screen or
// reorder what the reader sees. Every other character, backslashes too,
// is kept. Line breaks are escaped as well: callers that print several
// lines escape each (PrintableLines).
func Printable(s string) string {
	if !needsEscape(s) {
		return s
	}
	var b strings.Builder
	for i := 0; i < len(s); {
		r, size := utf8.DecodeRuneInString(s[i:])
		switch {
		case r == utf8.RuneError && size == 1:
			fmt.Fprintf(&b, `\x%02x`, s[i])
		case r < 0x80 && isControl(r):
			fmt.Fprintf(&b, `\x%02x`, r)
		case isControl(r) || IsInvisible(r):
			fmt.Fprintf(&b, `\u%04x`, r)
		default:
			b.WriteString(s[i : i+size])
		}
		i += size
	}
	return b.String()
}

// PrintableLines escapes each line of s with Printable, keeping its line
// breaks.
func PrintableLines(s string) string {
	if !needsEscape(strings.ReplaceAll(s, "\n", "")) {
		return s
	}
	lines := strings.Split(s, "\n")
	for i, l := range lines {
		lines[i] = Printable(l)
	}
	return strings.Join(lines, "\n")
}

func needsEscape(s string) bool {
	for i := 0; i < len(s); i++ {
		if c := s[i]; c < 0x20 || c == 0x7f || c >= 0x80 {
			goto slow
		}
	}
	return false
slow:
	for _, r := range s {
		if r == utf8.RuneError || isControl(r) || IsInvisible(r) {
			return true
		}
	}
	return false
}

// isControl is C0, DEL or C1.
func isControl(r rune) bool { return r < 0x20 || r == 0x7f || (r >= 0x80 && r < 0xa0) }

// invisible are the characters IsInvisible reports, from the Unicode
// Character Database as Go's unicode package holds it (unicode.Version):
// the format characters (general category Cf: zero-width space and
// joiners, the byte order mark, the soft hyphen, the bidirectional
// embeddings, overrides and isolates, tag characters), the bidirectional
// marks and controls, and the other default-ignorable characters (Hangul
// fillers, the combining grapheme joiner and the like).
var invisible = []*unicode.RangeTable{unicode.Cf, unicode.Bidi_Control, unicode.Join_Control, unicode.Other_Default_Ignorable_Code_Point}

// IsInvisible reports whether r changes how the text around it is shown
// without showing itself (see invisible), so that two names that look the
// same may differ in it, or a line may be shown in another order than it
// is written.
func IsInvisible(r rune) bool {
	return r >= 0x80 && unicode.IsOneOf(invisible, r)
}
