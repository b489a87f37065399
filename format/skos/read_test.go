package skos

import (
	"strings"
	"testing"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/export"
	"github.com/ramify-tax/ramify/format/rdf"
)

func TestProvisionalNoteMatchesTheExport(t *testing.T) {
	if ProvisionalNote != export.ProvisionalNote {
		t.Errorf("skos.ProvisionalNote = %q, export writes %q", ProvisionalNote, export.ProvisionalNote)
	}
}

func read(t *testing.T, src string, opt Options) (*Result, error) {
	t.Helper()
	ts, err := rdf.ParseTurtle("t.ttl", []byte(src), "")
	if err != nil {
		t.Fatal(err)
	}
	return Read("t.ttl", ts, opt)
}

const prefixes = "@prefix skos: <http://www.w3.org/2004/02/skos/core#> .\n@prefix : <https://lending.example/t/> .\n"

func TestReadTree(t *testing.T) {
	res, err := read(t, prefixes+`
:saws skos:prefLabel "Saws"@en, "Sägen"@de, "Scies"@fr ; skos:editorialNote "`+ProvisionalNote+`"@en .
:hand skos:prefLabel "Hand saws"@en ; skos:broader :saws .
:tenon skos:broader :hand ; skos:prefLabel "Tenon saw"@en ; skos:definition "Stiff back."@en, "Dos raide."@fr .
:coping skos:broader :hand ; skos:notation "coping-saw" .
:jig skos:broader :saws ; skos:prefLabel "Jigsaw"@en .
`, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if got, want := string(format.FormatTree(res.Root)), "~ Saws/\n  Hand saws/\n    coping-saw\n    tenon\n  jig\n"; got != want {
		t.Errorf("tree\n%s\nwant\n%s", got, want)
	}
	if res.Lang != "en" {
		t.Errorf("language %q, want en (the most common)", res.Lang)
	}
	byID := map[string]format.Item{}
	for _, it := range res.Items {
		byID[it.ID] = it
	}
	if it := byID["tenon"]; it.Label != "Tenon saw" || it.Text != "Stiff back." {
		t.Errorf("tenon = %+v", it)
	}
	if it := byID["coping-saw"]; it.Label != "" {
		t.Errorf("coping-saw has no prefLabel, got label %q", it.Label)
	}
}

func TestReadCycle(t *testing.T) {
	_, err := read(t, prefixes+":a skos:broader :b .\n:b skos:broader :a .\n:c skos:broader :a .\n", Options{})
	if err == nil || !strings.Contains(err.Error(), "go round in a circle") {
		t.Errorf("cycle: %v", err)
	}
}

func TestReadSchemes(t *testing.T) {
	src := prefixes + ":s1 a skos:ConceptScheme .\n:s2 a skos:ConceptScheme .\n:a skos:inScheme :s1 .\n:x skos:broader :a ; skos:inScheme :s1 .\n:b skos:inScheme :s2 .\n:y skos:broader :b ; skos:inScheme :s2 .\n"
	if _, err := read(t, src, Options{}); err == nil || !strings.Contains(err.Error(), "2 concept schemes") {
		t.Errorf("two schemes without --scheme: %v", err)
	}
	res, err := read(t, src, Options{Scheme: "https://lending.example/t/s2"})
	if err != nil {
		t.Fatal(err)
	}
	if got := string(format.FormatTree(res.Root)); got != "b/\n  y\n" {
		t.Errorf("scheme s2 gives\n%s", got)
	}
}

// FuzzReadSKOS: any Turtle the reader takes either imports or gives an
// error with a place, never a panic, and an import is a valid outline.
func FuzzReadSKOS(f *testing.F) {
	f.Add([]byte(prefixes + ":a skos:prefLabel \"A\"@en .\n:b skos:broader :a ; skos:notation \"b\" .\n"))
	f.Add([]byte(prefixes + ":a skos:broader :b , :c .\n:b skos:broader :a .\n"))
	f.Fuzz(func(t *testing.T, src []byte) {
		ts, err := rdf.ParseTurtle("f.ttl", src, "http://x/")
		if err != nil {
			return
		}
		for _, first := range []bool{false, true} {
			res, err := Read("f.ttl", ts, Options{FirstBroader: first})
			if err != nil {
				continue
			}
			text := append([]byte(format.OutlineHeader+"\n"), format.FormatTree(res.Root)...)
			if _, err := format.ParseOutline("back.outline", text); err != nil {
				t.Fatalf("import does not make a valid outline: %v\n%s", err, text)
			}
		}
	})
}
