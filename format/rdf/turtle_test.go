package rdf

import (
	"strings"
	"testing"
)

func TestParseTurtleErrors(t *testing.T) {
	for _, tc := range []struct {
		name, src, want string
	}{
		{"unknown prefix", "@prefix a: <http://x/> .\nb:s a:p a:o .\n", `t.ttl:2:1: prefix "b:" is not declared`},
		{"missing dot", "<http://x/s> <http://x/p> <http://x/o>\n<http://x/s> <http://x/p> <http://x/o> .\n", `t.ttl:2:1: expected "." at the end of the statement, found '<'`},
		{"relative without base", "<s> <http://x/p> <http://x/o> .\n", "t.ttl:1:1: relative IRI <s> with no base IRI"},
		{"open string", "<http://x/s> <http://x/p> \"abc\n", "t.ttl:1:27: string not closed before the end of the line"},
		{"bad escape", "<http://x/s> <http://x/p> \"a\\qb\" .\n", `t.ttl:1:29: unknown escape "\\q" in a string`},
		{"literal subject", "\"x\" <http://x/p> <http://x/o> .\n", "t.ttl:1:1: a literal cannot be a subject"},
		{"unclosed bracket", "<http://x/s> <http://x/p> [ <http://x/q> 1 .\n", `t.ttl:1:44: expected "]" closing the "[" at t.ttl:1:27`},
		{"space in IRI", "<http://x/a b> <http://x/p> 1 .\n", "t.ttl:1:12: IRI holds the character ' '"},
		{"bad directive", "@prefx a: <http://x/> .\n", "t.ttl:1:1: unknown directive"},
		{"column counts characters", "<http://x/é> <http://x/p> \"a\\z\" .\n", `t.ttl:1:29: unknown escape`},
		{"too deep", "<http://x/s> <http://x/p> " + strings.Repeat("(", MaxNesting+1) + strings.Repeat(")", MaxNesting+1) + " .\n", "nested more than 64 levels deep"},
		{"NUL", "<http://x/s> <http://x/p> \"\x00\" .\n", "NUL byte"},
	} {
		_, err := ParseTurtle("t.ttl", []byte(tc.src), "")
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: ParseTurtle(%q) = %v, want an error containing %q", tc.name, tc.src, err, tc.want)
		}
	}
}

func TestParseTurtlePlaces(t *testing.T) {
	src := "@prefix : <http://x/> .\n:s :p :o1 ,\n     :o2 ;\n  :q \"é\" , :o3 .\n"
	ts, err := ParseTurtle("t.ttl", []byte(src), "")
	if err != nil {
		t.Fatal(err)
	}
	want := []string{"t.ttl:2:7", "t.ttl:3:6", "t.ttl:4:6", "t.ttl:4:12"}
	if len(ts) != len(want) {
		t.Fatalf("got %d triples, want %d", len(ts), len(want))
	}
	for i, w := range want {
		if g := ts[i].Pos.String(); g != w {
			t.Errorf("triple %d (%s) at %s, want %s", i, ts[i], g, w)
		}
	}
}

func TestResolveIRI(t *testing.T) {
	// The normal and abnormal examples of RFC 3986 section 5.4.
	base := "http://a/b/c/d;p?q"
	for ref, want := range map[string]string{
		"g:h": "g:h", "g": "http://a/b/c/g", "./g": "http://a/b/c/g", "g/": "http://a/b/c/g/",
		"/g": "http://a/g", "//g": "http://g", "?y": "http://a/b/c/d;p?y", "g?y": "http://a/b/c/g?y",
		"#s": "http://a/b/c/d;p?q#s", "g#s": "http://a/b/c/g#s", "g?y#s": "http://a/b/c/g?y#s",
		";x": "http://a/b/c/;x", "g;x": "http://a/b/c/g;x", "g;x?y#s": "http://a/b/c/g;x?y#s",
		"": "http://a/b/c/d;p?q", ".": "http://a/b/c/", "./": "http://a/b/c/", "..": "http://a/b/",
		"../": "http://a/b/", "../g": "http://a/b/g", "../..": "http://a/", "../../": "http://a/",
		"../../g": "http://a/g", "../../../g": "http://a/g", "../../../../g": "http://a/g",
		"/./g": "http://a/g", "/../g": "http://a/g", "g.": "http://a/b/c/g.", ".g": "http://a/b/c/.g",
		"g..": "http://a/b/c/g..", "..g": "http://a/b/c/..g", "./../g": "http://a/b/g",
		"./g/.": "http://a/b/c/g/", "g/./h": "http://a/b/c/g/h", "g/../h": "http://a/b/c/h",
		"g;x=1/./y": "http://a/b/c/g;x=1/y", "g;x=1/../y": "http://a/b/c/y",
		"g?y/./x": "http://a/b/c/g?y/./x", "g?y/../x": "http://a/b/c/g?y/../x",
		"g#s/./x": "http://a/b/c/g#s/./x", "g#s/../x": "http://a/b/c/g#s/../x", "http:g": "http:g",
	} {
		if got := resolveIRI(base, ref); got != want {
			t.Errorf("resolveIRI(%q, %q) = %q, want %q", base, ref, got, want)
		}
	}
}

func TestParseNTriplesErrors(t *testing.T) {
	src := "<http://x/s> <http://x/p> <http://x/o> .\n  <http://x/s> <http://x/p> .\n<s> <http://x/p> \"a\" .\n"
	_, err := ParseNTriples("t.nt", []byte(src))
	if err == nil || !strings.Contains(err.Error(), "t.nt:2:3: not an N-Triples statement") || !strings.Contains(err.Error(), "t.nt:3:1: relative IRI <s>") {
		t.Errorf("ParseNTriples = %v, want errors at 2:3 and 3:1", err)
	}
}

func TestParseJSONLD(t *testing.T) {
	src := `{"@context": {"skos": "http://www.w3.org/2004/02/skos/core#"},
 "@graph": [
  {"@id": "http://x/a", "@type": "skos:Concept", "skos:prefLabel": {"@value": "Saws", "@language": "en"}},
  {"@id": "http://x/b", "skos:broader": {"@id": "http://x/a"}}
 ]}`
	ts, err := ParseJSONLD("t.jsonld", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	got := FormatNTriples(ts)
	want := "<http://x/a> <http://www.w3.org/1999/02/22-rdf-syntax-ns#type> <http://www.w3.org/2004/02/skos/core#Concept> .\n" +
		"<http://x/a> <http://www.w3.org/2004/02/skos/core#prefLabel> \"Saws\"@en .\n" +
		"<http://x/b> <http://www.w3.org/2004/02/skos/core#broader> <http://x/a> .\n"
	if got != want {
		t.Errorf("ParseJSONLD =\n%s\nwant\n%s", got, want)
	}
	for _, bad := range []struct{ src, want string }{
		{`{"@context": "https://lending.example/context.jsonld", "@id": "http://x/a"}`, "ramify reads no URL"},
		{"{\n  \"a\": [1,\n  }", "t.jsonld:3:3: JSON"},
		{strings.Repeat("[", 100) + strings.Repeat("]", 100), "nested more than 64 levels"},
	} {
		if _, err := ParseJSONLD("t.jsonld", []byte(bad.src)); err == nil || !strings.Contains(err.Error(), bad.want) {
			t.Errorf("ParseJSONLD(%q) = %v, want %q", bad.src, err, bad.want)
		}
	}
}
