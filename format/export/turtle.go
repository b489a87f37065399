package export

import (
	"fmt"
	"strings"
)

// turtleString writes s as a Turtle short string ("..."). The grammar
// (STRING_LITERAL_QUOTE) forbids a bare quote, backslash, line feed and
// carriage return inside; those take their ECHAR escapes, as do tab,
// backspace and form feed for readability, and any other control
// character takes a \uXXXX escape (UCHAR). Everything else, non-ASCII
// included, is written as its UTF-8 bytes.
func turtleString(s string) string { return QuotedString(s) }

// QuotedString writes s between double quotes with the escapes that
// Turtle's STRING_LITERAL_QUOTE and TOML's basic strings share (quote,
// backslash, \n \r \t \b \f, \uXXXX for other control characters), so
// the result is a valid literal in both.
func QuotedString(s string) string {
	var b strings.Builder
	b.Grow(len(s) + 2)
	b.WriteByte('"')
	for _, r := range s {
		switch r {
		case '"':
			b.WriteString(`\"`)
		case '\\':
			b.WriteString(`\\`)
		case '\n':
			b.WriteString(`\n`)
		case '\r':
			b.WriteString(`\r`)
		case '\t':
			b.WriteString(`\t`)
		case '\b':
			b.WriteString(`\b`)
		case '\f':
			b.WriteString(`\f`)
		default:
			if r < 0x20 || r == 0x7f {
				fmt.Fprintf(&b, `\u%04X`, r)
			} else {
				b.WriteRune(r)
			}
		}
	}
	b.WriteByte('"')
	return b.String()
}

// EscapedByte is the character the escape \c stands for in a Turtle or
// N-Triples string (ECHAR: \t \b \n \r \f \" \' \\, the ones QuotedString
// writes and \'); ok is false for any other c, \u and \U (UCHAR)
// included. The readers of such strings share it.
func EscapedByte(c byte) (b byte, ok bool) {
	switch c {
	case 't':
		return '\t', true
	case 'b':
		return '\b', true
	case 'n':
		return '\n', true
	case 'r':
		return '\r', true
	case 'f':
		return '\f', true
	case '"', '\'', '\\':
		return c, true
	}
	return 0, false
}

// langString is a string with a language tag.
func langString(s, lang string) string { return turtleString(s) + "@" + lang }

// checkLanguage accepts a language tag of the shape BCP 47 gives it:
// letters, then groups of letters and digits after "-", each 1 to 8
// characters. That is also within what Turtle's LANGTAG production takes.
func checkLanguage(tag string) error {
	parts := strings.Split(tag, "-")
	for i, p := range parts {
		if len(p) < 1 || len(p) > 8 {
			return fmt.Errorf("language tag %q: each part must be 1 to 8 characters", tag)
		}
		for j := 0; j < len(p); j++ {
			c := p[j]
			letter := c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z'
			digit := c >= '0' && c <= '9'
			if !letter && !(digit && i > 0) {
				return fmt.Errorf("language tag %q: the first part takes letters only, later parts letters and digits", tag)
			}
		}
	}
	return nil
}

// iriRef writes an absolute IRI between angle brackets. Callers build
// IRIs from a checked base and escaped names, so nothing needs escaping.
func iriRef(iri string) string { return "<" + iri + ">" }
