package export

import (
	"testing"

	"github.com/ramify-tax/ramify/format"
)

// Percent-encoding as RFC 3986 section 2.1 has it (upper-case hex of each
// UTF-8 byte), keeping the unreserved characters of section 2.3 but "~".
func TestEscapeSegment(t *testing.T) {
	for _, tc := range []struct{ in, want string }{
		{"Hammers", "Hammers"},
		{"a-b.c_d", "a-b.c_d"},
		{"Hand tools", "Hand%20tools"},
		{"AC/DC", "AC%2FDC"},
		{"100%", "100%25"},
		{"~ tilde~", "%7E%20tilde%7E"},
		{"été", "%C3%A9t%C3%A9"},
		{"道", "%E9%81%93"},
		{`"q" & <a>`, "%22q%22%20%26%20%3Ca%3E"},
		{"a#b?c", "a%23b%3Fc"},
	} {
		if got := escapeSegment(tc.in); got != tc.want {
			t.Errorf("escapeSegment(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
}

func TestCategorySlugsUnique(t *testing.T) {
	// Two siblings with one name (possible in a tree built in memory),
	// each with a child of one name: every slug differs, and which one
	// gets the suffix follows canonical order (the smaller first item).
	a := &format.Category{Name: "Saws", Children: []*format.Category{{Name: "Hand", Items: []string{"b1"}}}}
	b := &format.Category{Name: "Saws", Children: []*format.Category{{Name: "Hand", Items: []string{"a1"}}}}
	c := &format.Category{Name: "Saws", Provisional: true, Items: []string{"c1"}}
	root := &format.Category{Children: []*format.Category{a, c, b}}
	tree := sortedCopy(root)
	slugs := categorySlugs(tree)
	want := []string{"Saws", "Saws/Hand", "Saws~2", "Saws~2/Hand", "Saws~3"}
	var got []string
	tree.Walk(func(n *format.Category, depth int) bool {
		if depth > 0 {
			got = append(got, slugs[n])
		}
		return true
	})
	if len(got) != len(want) {
		t.Fatalf("slugs %v, want %v", got, want)
	}
	for i := range want {
		if got[i] != want[i] {
			t.Errorf("slug %d = %q, want %q (all: %v)", i, got[i], want[i], got)
		}
	}
	if tree.Children[0].Items != nil || tree.Children[0].Children[0].Items[0] != "a1" {
		t.Errorf("canonical order should put the Saws holding a1 first")
	}
}
