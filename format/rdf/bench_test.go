package rdf

import (
	"fmt"
	"strings"
	"testing"
)

// skosScheme writes a SKOS scheme of n concepts under 10 top concepts,
// in Turtle with prefixes, as a large imported thesaurus would look.
func skosScheme(n int) []byte {
	var b strings.Builder
	b.WriteString("@prefix skos: <http://www.w3.org/2004/02/skos/core#> .\n@prefix : <https://lending.example/t/> .\n")
	for i := 0; i < n; i++ {
		fmt.Fprintf(&b, ":c%d a skos:Concept ;\n    skos:prefLabel \"Concept %d\"@en, \"Concept %d\"@fr ;\n    skos:definition \"\"\"A tool, number %d.\"\"\"@en", i, i, i, i)
		if i >= 10 {
			fmt.Fprintf(&b, " ;\n    skos:broader :c%d", i/10)
		}
		b.WriteString(" .\n")
	}
	return []byte(b.String())
}

func BenchmarkParseTurtle(b *testing.B) {
	for _, n := range []int{1_000, 100_000} {
		src := skosScheme(n)
		b.Run(fmt.Sprint(n), func(b *testing.B) {
			b.SetBytes(int64(len(src)))
			for b.Loop() {
				if _, err := ParseTurtle("b.ttl", src, ""); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func BenchmarkParseNTriples(b *testing.B) {
	ts, err := ParseTurtle("b.ttl", skosScheme(100_000), "")
	if err != nil {
		b.Fatal(err)
	}
	src := []byte(FormatNTriples(ts))
	b.SetBytes(int64(len(src)))
	for b.Loop() {
		if _, err := ParseNTriples("b.nt", src); err != nil {
			b.Fatal(err)
		}
	}
}
