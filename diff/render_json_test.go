package diff

import (
	"bytes"
	"encoding/json"
	"testing"
)

// Category names often hold "&" ("Home & garden"); the JSON keeps them
// readable instead of escaping them for HTML, and still decodes to the
// same names.
func TestPathJSONKeepsPunctuation(t *testing.T) {
	for _, tc := range []struct {
		path Path
		want string
	}{
		{nil, `[]`},
		{Path{}, `[]`},
		{Path{"Home & garden", "<Tools>"}, `["Home & garden","<Tools>"]`},
		{Path{`say "hi"`}, `["say \"hi\""]`},
	} {
		got, err := tc.path.MarshalJSON()
		if err != nil || string(got) != tc.want {
			t.Errorf("Path(%q).MarshalJSON() = %s, %v; want %s", []string(tc.path), got, err, tc.want)
		}
		var back []string
		if err := json.Unmarshal(got, &back); err != nil || len(back) != len(tc.path) {
			t.Errorf("json.Unmarshal(%s) = %q, %v", got, back, err)
		}
	}
	var b bytes.Buffer
	r := &Report{Renamed: []Rename{{From: Path{"A & B"}, To: Path{"A and B"}}}}
	if err := r.WriteJSON(&b); err != nil {
		t.Fatal(err)
	}
	if !bytes.Contains(b.Bytes(), []byte(`"A & B"`)) {
		t.Errorf("WriteJSON escapes \"&\":\n%s", b.Bytes())
	}
}
