package format

import (
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
)

var testLimits = tomlLimits{MaxNesting: 4, MaxArray: 5, MaxKeyParts: 3, MaxHeaders: 10, MaxKeys: 50, WantStrings: true}

// The scanner must follow every valid construct without getting confused,
// or positions would silently go missing.
func TestScanTOMLFollowsValidText(t *testing.T) {
	in := `# [[not a header]] "not a string"
title = "a [ b { c"   # brackets in strings and comments do not nest
"quoted key" = 'lit [ '
'lit key'.bare."q.uoted" = 1
dt = 1979-05-27 07:32:00Z
d = 2026-11-30
inline = { a = "x", b = [1, 2, { c = "y" }], }
arr = [
  "one", # comment ]
  'two',
  """three""",
]

[[table]]
empty = []
nums = [ 1.5, -2, 0x1f, inf, nan ]
ml = """
first \
   still first
second\nthird "quoted" \""" 
"""
ml2 = '''no escapes \n here
line two'''
[ sub . "table" ]
x = """""five quotes"""""
`
	scan, lerr := scanTOML([]byte(in), testLimits)
	if lerr != nil {
		t.Fatal(lerr.Msg)
	}
	if scan.Confused {
		t.Fatal("scanner confused by valid TOML")
	}
	var headers []string
	for _, h := range scan.Headers {
		headers = append(headers, strings.Join(h.Path, "|"))
	}
	if diff := cmp.Diff([]string{"table", "sub|table"}, headers); diff != "" {
		t.Errorf("headers (-want +got):\n%s", diff)
	}
	var keys []string
	for _, k := range scan.Keys {
		keys = append(keys, strings.Join(k.Path, "|"))
	}
	wantKeys := []string{"title", "quoted key", "lit key|bare|q.uoted", "dt", "d", "inline", "arr", "empty", "nums", "ml", "ml2", "x"}
	if diff := cmp.Diff(wantKeys, keys); diff != "" {
		t.Errorf("keys (-want +got):\n%s", diff)
	}
	byName := map[string]tomlKey{}
	for _, k := range scan.Keys {
		byName[k.Path[len(k.Path)-1]] = k
	}
	// Where each line of the multi-line strings starts.
	ml := byName["ml"].Strings[0]
	wantStarts := []lineCol{{18, 1}, {20, 1}, {20, 9}, {21, 1}}
	if diff := cmp.Diff(wantStarts, ml.Starts); diff != "" {
		t.Errorf("ml line starts (-want +got):\n%s", diff)
	}
	doc, ds := decodeTOML("t.toml", []byte(in), testLimits)
	if len(ds) > 0 {
		t.Fatal(ds)
	}
	decoded := doc.root["table"].([]map[string]any)[0]["ml"].(string)
	if n := len(strings.Split(decoded, "\n")); n != len(ml.Starts) {
		t.Errorf("decoded ml has %d lines, scanner found %d: %q", n, len(ml.Starts), decoded)
	}
	if got := len(byName["inline"].Strings); got != 2 {
		t.Errorf("inline table strings: %d, want 2", got)
	}
	if got := byName["arr"].Strings; len(got) != 3 || got[2].At != (lineCol{11, 3}) {
		t.Errorf("arr strings: %+v", got)
	}
}

func TestScanTOMLLimits(t *testing.T) {
	tests := []struct {
		name string
		in   string
		want string
	}{
		{"nesting", "a = [[[[[1]]]]]", "1:9: arrays or tables nested more than 4 deep"},
		{"nesting through inline tables", "a = [{b = [{c = 1}]}]\nb = {x = {y = {z = {w = {}}}}}", "2:25: arrays or tables nested more than 4 deep"},
		{"array length", "a = [1,2,3,4,5,6]", "1:5: array has more than 5 elements"},
		{"array length with trailing comma is fine", "a = [1,2,3,4,5,]", ""},
		{"key parts", "a.b.c.d = 1", "1:7: key has more than 3 dotted parts"},
		{"headers", strings.Repeat("[[t]]\n", 11), "11:1: more than 10 tables in one file"},
		{"keys", strings.Repeat("k = 1\n", 51), "51:1: more than 50 keys in one file"},
		// After text it cannot follow, the scanner still counts brackets.
		{"nesting after confusion", "a = ?\nb = [[[[[[1]]]]]]", "2:9: arrays or tables nested more than 4 deep"},
		{"brackets in strings do not count", "a = [\"[[[[[[\", '{{{{{{', \"\"\"[[[[[\n[[[[\"\"\"]", ""},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, lerr := scanTOML([]byte(tt.in), testLimits)
			got := ""
			if lerr != nil {
				got = Pos{"", lerr.At.Line, lerr.At.Col}.String()[1:] + ": " + lerr.Msg
			}
			if got != tt.want {
				t.Errorf("got %q, want %q", got, tt.want)
			}
		})
	}
}

// CleanText leaves a CRLF behind in "\r\r\n"; the decoder reads it as a
// line end, and so must the scanner.
func TestScanTOMLCRLF(t *testing.T) {
	for _, in := range []string{"\r\n", "a = 1\r\n[t]\r\nb = [1,\r\n2]\r\n", "a = \"\"\"x\r\ny\"\"\"\r\n"} {
		scan, lerr := scanTOML([]byte(in), testLimits)
		if lerr != nil || scan.Confused {
			t.Errorf("%q: scanner confused (%v)", in, lerr)
		}
	}
}
