package export

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/ramify-tax/ramify/format"
)

// Address prefixes below the base IRI (see the package documentation).
const (
	itemPrefix     = "item/"
	categoryPrefix = "category/"
	conceptPrefix  = "concept/"
)

// ConceptPrefix is what follows the base IRI in the address of a
// category with a concept identifier: BASE + ConceptPrefix + ID.
const ConceptPrefix = conceptPrefix

// escapeSegment percent-encodes one category name for its place in an
// address: ASCII letters, digits, "-", "." and "_" stay, every other byte
// becomes %XX. "~" is encoded although RFC 3986 leaves it unreserved,
// because the suffix that tells equal paths apart starts with it.
func escapeSegment(name string) string {
	const hex = "0123456789ABCDEF"
	var b strings.Builder
	for i := 0; i < len(name); i++ {
		c := name[i]
		if c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9' || c == '-' || c == '.' || c == '_' {
			b.WriteByte(c)
			continue
		}
		b.WriteByte('%')
		b.WriteByte(hex[c>>4])
		b.WriteByte(hex[c&15])
	}
	return b.String()
}

// categorySlugs gives every category below root (root excluded) its path
// slug: the escaped names from the top down joined by "/". root must be
// in canonical order; a path met a second time gets "~2", a third "~3",
// so that every slug is unique and the same tree always gives the same
// slugs.
func categorySlugs(root *format.Category) map[*format.Category]string {
	out := map[*format.Category]string{}
	seen := map[string]int{}
	var rec func(c *format.Category, prefix string)
	rec = func(c *format.Category, prefix string) {
		for _, ch := range c.Children {
			slug := prefix + escapeSegment(ch.Name)
			seen[slug]++
			// A suffixed slug cannot equal any other: escaped names
			// hold no "~".
			if n := seen[slug]; n > 1 {
				slug += "~" + strconv.Itoa(n)
			}
			out[ch] = slug
			rec(ch, slug+"/")
		}
	}
	rec(root, "")
	return out
}

// checkBaseIRI refuses a base the Turtle output could not write between
// angle brackets, and one that concept names cannot follow.
func checkBaseIRI(base string) error {
	if base == "" {
		return fmt.Errorf("the base IRI is empty")
	}
	if !strings.HasSuffix(base, "/") && !strings.HasSuffix(base, "#") {
		return fmt.Errorf("base IRI %q must end in \"/\" or \"#\"", base)
	}
	if !strings.Contains(base, ":") {
		return fmt.Errorf("base IRI %q is not absolute (it has no scheme)", base)
	}
	for _, r := range base {
		// Turtle's IRIREF excludes these, and spaces and control
		// characters (SPARQL/Turtle grammar, production IRIREF).
		if r <= 0x20 || r == 0x7f || strings.ContainsRune("<>\"{}|^`\\", r) {
			return fmt.Errorf("base IRI %q holds %q, which an IRI cannot", base, r)
		}
	}
	return nil
}
