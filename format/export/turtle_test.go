package export

import (
	"strconv"
	"strings"
	"testing"
)

// Escapes from the Turtle grammar (W3C Turtle, 2014: productions
// STRING_LITERAL_QUOTE, ECHAR and UCHAR).
func TestTurtleString(t *testing.T) {
	for _, tc := range []struct{ in, want string }{
		{"", `""`},
		{"plain", `"plain"`},
		{`say "hi"`, `"say \"hi\""`},
		{`back\slash`, `"back\\slash"`},
		{"two\nlines", `"two\nlines"`},
		{"cr\r\nlf", `"cr\r\nlf"`},
		{"tab\there", `"tab\there"`},
		{"bell\a", `"bell\u0007"`},
		{"del\x7f", `"del\u007F"`},
		{"single 'quotes' stay", `"single 'quotes' stay"`},
		{"été 道具 →", `"été 道具 →"`},
	} {
		if got := turtleString(tc.in); got != tc.want {
			t.Errorf("turtleString(%q) = %s, want %s", tc.in, got, tc.want)
		}
	}
}

func TestCheckLanguage(t *testing.T) {
	for _, tc := range []struct {
		tag string
		ok  bool
	}{
		{"en", true},
		{"de-CH", true},
		{"zh-Hant-TW", true},
		{"es-419", true},
		{"", false},
		{"en-", false},
		{"en_GB", false},
		{"1en", false},
		{"languages-x", false},
		{"en GB", false},
	} {
		if err := checkLanguage(tc.tag); (err == nil) != tc.ok {
			t.Errorf("checkLanguage(%q) = %v, want ok=%v", tc.tag, err, tc.ok)
		}
	}
}

// EscapedByte knows exactly the eight ECHAR escapes, each standing for the
// character Go's own rune literal of the same escape is.
func TestEscapedByte(t *testing.T) {
	echar := "tbnrf\"'\\"
	for c := 0; c < 256; c++ {
		got, ok := EscapedByte(byte(c))
		if want := strings.IndexByte(echar, byte(c)) >= 0; ok != want {
			t.Errorf("EscapedByte(%q) ok = %v, want %v", rune(c), ok, want)
			continue
		}
		if !ok {
			continue
		}
		quote := byte('\'') // Go escapes a quote only inside its own kind of quotes
		if c == '"' {
			quote = '"'
		}
		r, _, _, err := strconv.UnquoteChar(`\`+string(rune(c)), quote)
		if err != nil || got != byte(r) {
			t.Errorf("EscapedByte(%q) = %q, want %q (%v)", rune(c), got, r, err)
		}
	}
}
