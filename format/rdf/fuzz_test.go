package rdf

import (
	"os"
	"path/filepath"
	"testing"
)

// FuzzParseTurtle: the reader never panics, and what it reads, written
// as N-Triples, reads back as Turtle to the same triples.
func FuzzParseTurtle(f *testing.F) {
	seeds, _ := filepath.Glob("testdata/*.ttl")
	more, _ := filepath.Glob("testdata/w3c-ntriples/*.nt")
	for _, s := range append(seeds, more...) {
		if data, err := os.ReadFile(s); err == nil {
			f.Add(data)
		}
	}
	f.Add([]byte("@prefix : <http://x/> . :a :b ( [ :c \"\"\"d\"\"\"@en ] 1.5e3 ) ."))
	f.Fuzz(func(t *testing.T, src []byte) {
		ts, err := ParseTurtle("f.ttl", src, "http://x/base/")
		if err != nil {
			return
		}
		nt := FormatNTriples(relabel(ts))
		back, err := ParseTurtle("back.nt", []byte(nt), "")
		if err != nil {
			t.Fatalf("our N-Triples does not read back: %v\n%s", err, nt)
		}
		if got := FormatNTriples(relabel(back)); got != nt {
			t.Fatalf("round trip differs\n%s\nvs\n%s", got, nt)
		}
	})
}

// FuzzParseNTriples and FuzzParseJSONLD: never a panic.
func FuzzParseNTriples(f *testing.F) {
	f.Add([]byte("<http://x/s> <http://x/p> \"o\"@en .\n_:a <http://x/p> _:b .\n"))
	f.Fuzz(func(t *testing.T, src []byte) { _, _ = ParseNTriples("f.nt", src) })
}

func FuzzParseJSONLD(f *testing.F) {
	f.Add([]byte(`{"@context": {"skos": "http://www.w3.org/2004/02/skos/core#"}, "@id": "http://x/a", "skos:broader": {"@id": "http://x/b"}}`))
	f.Fuzz(func(t *testing.T, src []byte) { _, _ = ParseJSONLD("f.jsonld", src) })
}

// relabel renames blank nodes in order of first appearance in ts.
func relabel(ts []Triple) []Triple {
	names := map[string]string{}
	fix := func(x Term) Term {
		if x.Kind == Blank {
			x.Value = blank(x.Value, names).Value
		}
		return x
	}
	out := make([]Triple, len(ts))
	for i, t := range ts {
		out[i] = Triple{S: fix(t.S), P: t.P, O: fix(t.O)}
	}
	return out
}
