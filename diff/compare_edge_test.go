package diff

import (
	"bytes"
	"testing"
)

// Degenerate outlines: nothing at all, one item, items without categories.
// Compare must not fail, and the report must still be well-formed JSON
// with empty lists rather than nulls.
func TestCompareDegenerateOutlines(t *testing.T) {
	tests := []struct {
		name, old, new string
		tripletExact   bool
		cophenetic     bool
	}{
		{"both empty", "", "", true, false},
		{"one item each", "x\n", "x\n", true, false},
		{"from nothing", "", "A/\n  x\n  y\n", true, false},
		{"flat lists", "x\ny\nz\n", "x\ny\nz\n", true, false},
		// A flat list is a star: its lca sizes are constant, so the
		// correlation is undefined (see TestMetricsSmallTrees).
		{"flat to nested", "w\nx\ny\nz\n", "A/\n  w\n  x\ny\nz\n", true, false},
		{"nested both", "A/\n  w\n  x\ny\nz\n", "A/\n  w\n  y\nx\nz\n", true, true},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			r := Compare(parseOutline(t, "old", []byte(tc.old)), parseOutline(t, "new", []byte(tc.new)))
			if r.Metrics.TripletExact != tc.tripletExact || (r.Metrics.Cophenetic != nil) != tc.cophenetic {
				t.Errorf("metrics = %+v", r.Metrics)
			}
			var b bytes.Buffer
			if err := r.WriteJSON(&b); err != nil {
				t.Fatal(err)
			}
			for _, field := range []string{`"added": [`, `"removed": [`, `"moved": [`, `"renamed": [`, `"split": [`, `"merged": [`, `"created": [`, `"dissolved": [`} {
				if !bytes.Contains(b.Bytes(), []byte(field)) {
					t.Errorf("JSON lacks %s:\n%s", field, b.String())
				}
			}
			var txt, md bytes.Buffer
			r.Text(&txt, true)
			r.Markdown(&md)
			if txt.Len() == 0 || md.Len() == 0 {
				t.Errorf("empty rendering")
			}
		})
	}
}
