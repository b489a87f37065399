package format

import (
	"strconv"
	"unicode/utf8"
)

// The lexical pieces of the TOML scanner: key parts and string literals.

func (s *tomlScanner) keyPart() (string, bool) {
	switch s.peek(0) {
	case '"':
		return s.basicKey()
	case '\'':
		start := s.i + 1
		for j := start; j < len(s.data); j++ {
			switch s.data[j] {
			case '\'':
				s.i = j + 1
				return string(s.data[start:j]), true
			case '\n':
				return "", false
			}
		}
		return "", false
	}
	start := s.i
	for s.i < len(s.data) && isBareKeyByte(s.data[s.i]) {
		s.i++
	}
	return string(s.data[start:s.i]), s.i > start
}

func isBareKeyByte(c byte) bool {
	return c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9' || c == '_' || c == '-'
}

// basicKey decodes a "quoted" key with its escapes, so it can be matched
// against the decoder's keys.
func (s *tomlScanner) basicKey() (string, bool) {
	var out []byte
	for j := s.i + 1; j < len(s.data); j++ {
		c := s.data[j]
		switch c {
		case '"':
			s.i = j + 1
			return string(out), true
		case '\n':
			return "", false
		case '\\':
			if j+1 >= len(s.data) {
				return "", false
			}
			j++
			switch e := s.data[j]; e {
			case 'b':
				out = append(out, '\b')
			case 't':
				out = append(out, '\t')
			case 'n':
				out = append(out, '\n')
			case 'f':
				out = append(out, '\f')
			case 'r':
				out = append(out, '\r')
			case 'e':
				out = append(out, 0x1b)
			case 'u', 'U', 'x':
				n := map[byte]int{'u': 4, 'U': 8, 'x': 2}[e]
				if j+n >= len(s.data) {
					return "", false
				}
				v, err := strconv.ParseUint(string(s.data[j+1:j+1+n]), 16, 32)
				if err != nil {
					return "", false
				}
				out = utf8.AppendRune(out, rune(v))
				j += n
			default:
				out = append(out, e)
			}
		default:
			out = append(out, c)
		}
	}
	return "", false
}

// str scans a string literal of any of TOML's four kinds and records where
// each line of its decoded value begins.
func (s *tomlScanner) str() tomlString {
	q := s.data[s.i]
	out := tomlString{At: s.here()}
	multi := s.peek(1) == q && s.peek(2) == q
	if !multi {
		s.i++
		out.Starts = []lineCol{s.here()}
		for s.i < len(s.data) {
			c := s.data[s.i]
			switch {
			case c == '\n':
				s.confused = true
				return out
			case c == q:
				s.i++
				return out
			case c == '\\' && q == '"':
				escaped := s.peek(1)
				s.i = min(s.i+2, len(s.data))
				if escaped == 'n' { // an escaped line break starts a decoded line
					out.Starts = append(out.Starts, s.here())
				}
			default:
				s.i++
			}
		}
		s.confused = true
		return out
	}
	s.i += 3
	if s.peek(0) == '\n' {
		s.newline() // a newline right after the opening quotes is trimmed
	}
	out.Starts = []lineCol{s.here()}
	for s.i < len(s.data) {
		c := s.data[s.i]
		switch {
		case c == q && s.peek(1) == q && s.peek(2) == q:
			// Up to two quotes may precede the closing three.
			n := 3
			for n < 5 && s.peek(n) == q {
				n++
			}
			s.i += n
			return out
		case c == '\n':
			s.newline()
			out.Starts = append(out.Starts, s.here())
		case c == '\\' && q == '"':
			switch s.peek(1) {
			case ' ', '\t', '\n':
				// A backslash at the end of a line joins it to the next
				// non-blank text: no decoded newline.
				s.i++
				for s.i < len(s.data) && (s.data[s.i] == ' ' || s.data[s.i] == '\t' || s.data[s.i] == '\n') {
					if s.data[s.i] == '\n' {
						s.newline()
					} else {
						s.i++
					}
				}
			case 'n':
				s.i += 2
				out.Starts = append(out.Starts, s.here())
			default:
				s.i = min(s.i+2, len(s.data))
			}
		default:
			s.i++
		}
	}
	s.confused = true
	return out
}
