package format

import "testing"

func TestPrintable(t *testing.T) {
	for _, tc := range []struct{ in, want string }{
		{"Säge, 24 Zähne", "Säge, 24 Zähne"},
		{`back\slash`, `back\slash`},
		{"Eve\x1b]0;owned\x07", `Eve\x1b]0;owned\x07`}, // OSC: set the window title
		{"\x1b[2Jclear", `\x1b[2Jclear`},
		{"tab\tand\nbreak\r", `tab\x09and\x0abreak\x0d`},
		{"del\x7f", `del\x7f`},
		{"csi\u009b", `csi\u009b`},                     // C1 control introducer
		{"Heat \u202egun", `Heat \u202egun`},           // right-to-left override
		{"Clean\u200bing", `Clean\u200bing`},           // zero-width space
		{"\ufeffid", `\ufeffid`},                       // byte order mark
		{"iso\u2066late\u2069", `iso\u2066late\u2069`}, // isolates
		{"bad \xff byte", `bad \xff byte`},             // not UTF-8
		{"שלום עולם", "שלום עולם"},                     // right-to-left text itself is kept
		{"ㅤ", `\u3164`},                                // Hangul filler, a blank-looking letter
	} {
		if got := Printable(tc.in); got != tc.want {
			t.Errorf("Printable(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
	if got, want := PrintableLines("one\x1b\ntwo\n"), "one\\x1b\ntwo\n"; got != want {
		t.Errorf("PrintableLines = %q, want %q", got, want)
	}
}
