package export

import "testing"

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
