package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"testing"

	"github.com/piprate/json-gold/ld"
	"github.com/ramify-tax/ramify/format/rdf"
)

// TestSKOSRoundTrip exports the demo as SKOS, writes the same graph in
// each of the three syntaxes, imports each with `init --from`, and
// exports again: the second export must equal the first byte for byte,
// so the tree, the provisional marks, the labels, the definitions and
// the concept identifiers all came back. The N-Triples file is our
// Turtle reader's graph; the JSON-LD file is json-gold v0.9.1's
// FromRDF of that graph (a general-purpose library, not our writer).
func TestSKOSRoundTrip(t *testing.T) {
	dir := t.TempDir()
	demo := filepath.Join(dir, "demo")
	copyTree(t, demoDir, demo)
	ttl := filepath.Join(dir, "demo.ttl")
	if code, _, stderr := runIn("export", "--dir", demo, "--format", "skos", "--out", "demo.ttl"); code != 0 {
		t.Fatalf("export: exit %d\n%s", code, stderr)
	}
	first, err := os.ReadFile(filepath.Join(demo, "demo.ttl"))
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(ttl, first, 0o644); err != nil {
		t.Fatal(err)
	}
	triples, err := rdf.ParseTurtle(ttl, first, "")
	if err != nil {
		t.Fatal(err)
	}
	nt := rdf.FormatNTriples(triples)
	if err := os.WriteFile(filepath.Join(dir, "demo.nt"), []byte(nt), 0o644); err != nil {
		t.Fatal(err)
	}
	opts := ld.NewJsonLdOptions("")
	opts.Format = "application/n-quads"
	doc, err := ld.NewJsonLdProcessor().FromRDF(nt, opts)
	if err != nil {
		t.Fatal(err)
	}
	js, err := json.MarshalIndent(doc, "", " ")
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "demo.jsonld"), js, 0o644); err != nil {
		t.Fatal(err)
	}
	for _, file := range []string{"demo.ttl", "demo.nt", "demo.jsonld"} {
		t.Run(file, func(t *testing.T) {
			back := filepath.Join(dir, "back-"+file)
			wd, _ := os.Getwd()
			if err := os.Chdir(dir); err != nil {
				t.Fatal(err)
			}
			code, stdout, stderr := runIn("init", "--dir", back, "--from", file)
			os.Chdir(wd)
			if code != 0 {
				t.Fatalf("init --from %s: exit %d\n%s%s", file, code, stdout, stderr)
			}
			out := filepath.Join(back, "again.ttl")
			if code, _, stderr := runIn("export", "--dir", back, "--format", "skos", "--out", "again.ttl"); code != 0 {
				t.Fatalf("export of the import: exit %d\n%s", code, stderr)
			}
			second, err := os.ReadFile(out)
			if err != nil {
				t.Fatal(err)
			}
			if !bytes.Equal(first, second) {
				t.Errorf("export → init --from %s → export differs from the first export", file)
			}
		})
	}
}
