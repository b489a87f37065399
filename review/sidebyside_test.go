package review

import (
	"testing"

	"github.com/google/go-cmp/cmp"

	"github.com/ramify-tax/ramify/format"
)

// TestSideBySide works small packets by hand: flattening (a b) c d loses
// ab|c and ab|d; moving b next to c parts it from a by a recorded move,
// which is not listed; an answer as drawn loses nothing.
func TestSideBySide(t *testing.T) {
	parse := func(body string) *format.Category {
		t.Helper()
		o, err := format.ParseOutline("t", []byte("# ramify outline 1\n"+body))
		if err != nil {
			t.Fatal(err)
		}
		return o.Root
	}
	shown := parse("G/\n  a\n  b\nc\nd\n")
	for _, c := range []struct {
		name, answer string
		want         [][3]string
	}{
		{"flattened", "a\nb\nc\nd\n", [][3]string{{"a", "b", "c"}, {"a", "b", "d"}}},
		{"regrouped", "G/\n  b\n  c\na\nd\n", nil},
		{"partly flattened", "G/\n  a\n  b\n  c\nd\n", [][3]string{{"a", "b", "c"}}},
		{"as drawn", "G/\n  a\n  b\nc\nd\n", nil},
	} {
		if diff := cmp.Diff(c.want, SideBySide(shown, parse(c.answer))); diff != "" {
			t.Errorf("%s: SideBySide (-want +got):\n%s", c.name, diff)
		}
	}
}
