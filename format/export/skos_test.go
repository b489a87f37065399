package export

import (
	"bytes"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
)

const testBase = "https://example.org/tools/"

func awkwardSKOS(t *testing.T) (*format.Category, []format.Item, SKOSOptions) {
	root, items := fixture(t, "awkward.outline", "awkward.items.toml")
	return root, items, SKOSOptions{BaseIRI: testBase, Title: `Tool library "test" \ één`}
}

func TestSKOSGolden(t *testing.T) {
	root, items, opt := awkwardSKOS(t)
	var b bytes.Buffer
	if err := SKOS(&b, root, items, opt); err != nil {
		t.Fatal(err)
	}
	golden(t, "awkward.ttl", b.Bytes())
}

// TestSKOSDeterministic: the order items and categories arrive in does not
// change a byte, and the caller's tree is left as it was.
func TestSKOSDeterministic(t *testing.T) {
	root, items, opt := awkwardSKOS(t)
	var a, b bytes.Buffer
	if err := SKOS(&a, root, items, opt); err != nil {
		t.Fatal(err)
	}
	shuffled := root.Clone()
	reverseTree(shuffled)
	before := string(format.FormatTree(shuffled.Clone()))
	rev := append([]format.Item(nil), items...)
	for i, j := 0, len(rev)-1; i < j; i, j = i+1, j-1 {
		rev[i], rev[j] = rev[j], rev[i]
	}
	if err := SKOS(&b, shuffled, rev, opt); err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(a.Bytes(), b.Bytes()) {
		t.Error("the export depends on the order of the input")
	}
	if got := string(format.FormatTree(shuffled.Clone())); got != before {
		t.Error("SKOS changed the caller's tree")
	}
}

func reverseTree(c *format.Category) {
	for i, j := 0, len(c.Children)-1; i < j; i, j = i+1, j-1 {
		c.Children[i], c.Children[j] = c.Children[j], c.Children[i]
	}
	for i, j := 0, len(c.Items)-1; i < j; i, j = i+1, j-1 {
		c.Items[i], c.Items[j] = c.Items[j], c.Items[i]
	}
	c.ItemLines = nil
	for _, ch := range c.Children {
		reverseTree(ch)
	}
}

func TestSKOSVersion(t *testing.T) {
	root, items, opt := awkwardSKOS(t)
	for _, tc := range []struct{ version, want string }{
		{"", `owl:versionInfo "` + format.StructureHash(root) + `" ;`},
		{"2026.1 \"beta\"", `owl:versionInfo "2026.1 \"beta\"" ;`},
	} {
		opt.Version = tc.version
		var b bytes.Buffer
		if err := SKOS(&b, root, items, opt); err != nil {
			t.Fatal(err)
		}
		if !strings.Contains(b.String(), tc.want) {
			t.Errorf("version %q: no line %q", tc.version, tc.want)
		}
	}
}

func TestSKOSRefusesBadOptions(t *testing.T) {
	root, items, _ := awkwardSKOS(t)
	for _, tc := range []struct {
		name string
		opt  SKOSOptions
		want string
	}{
		{"no base", SKOSOptions{}, "base IRI is empty"},
		{"base without slash", SKOSOptions{BaseIRI: "https://example.org/t"}, `must end in "/" or "#"`},
		{"relative base", SKOSOptions{BaseIRI: "tools/"}, "not absolute"},
		{"space in base", SKOSOptions{BaseIRI: "https://example.org/my tools/"}, "which an IRI cannot"},
		{"angle in base", SKOSOptions{BaseIRI: "https://example.org/<t>/"}, "which an IRI cannot"},
		{"bad language", SKOSOptions{BaseIRI: testBase, Language: "en_GB"}, "language tag"},
		{"digit language", SKOSOptions{BaseIRI: testBase, Language: "1en"}, "language tag"},
		{"long language part", SKOSOptions{BaseIRI: testBase, Language: "en-abcdefghi"}, "1 to 8"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var b bytes.Buffer
			err := SKOS(&b, root, items, tc.opt)
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Fatalf("error %v, want one saying %q", err, tc.want)
			}
			if b.Len() != 0 {
				t.Error("wrote output despite the error")
			}
		})
	}
}

// TestSKOSReadByRapper parses exports with an independent Turtle parser,
// Debian's rapper (package raptor2-utils, 2.0.15; call:
// `rapper -q -i turtle -o ntriples FILE`), and checks what it read.
func TestSKOSReadByRapper(t *testing.T) {
	rapper := needTool(t, "rapper", "raptor2-utils", "--version")
	cases := []struct {
		name  string
		load  func(t *testing.T) (*format.Category, []format.Item, SKOSOptions)
		hands map[string]string // category path -> IRI worked out by hand
	}{
		{"awkward", awkwardSKOS, map[string]string{
			"Outils d'été":               testBase + "category/Outils%20d%27%C3%A9t%C3%A9",
			"AC/DC adaptors":             testBase + "category/AC%2FDC%20adaptors",
			"Fastening > drill · driver": testBase + "category/Fastening/drill%20%C2%B7%20driver",
			"Measuring \"precise\" > Levels (laser), spirit; [etc]": testBase + "category/Measuring%20%22precise%22/Levels%20%28laser%29%2C%20spirit%3B%20%5Betc%5D",
			"2024": testBase + "category/2024",
		}},
		{"awkward in German", func(t *testing.T) (*format.Category, []format.Item, SKOSOptions) {
			root, items, opt := awkwardSKOS(t)
			opt.Language, opt.BaseIRI = "de-CH", "https://example.org/werkzeug#"
			return root, items, opt
		}, nil},
		{"demo", demoSKOS, nil},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			root, items, opt := tc.load(t)
			var b bytes.Buffer
			if err := SKOS(&b, root, items, opt); err != nil {
				t.Fatal(err)
			}
			file := filepath.Join(t.TempDir(), "export.ttl")
			if err := os.WriteFile(file, b.Bytes(), 0o644); err != nil {
				t.Fatal(err)
			}
			var stdout, stderr bytes.Buffer
			cmd := exec.Command(rapper, "-q", "-i", "turtle", "-o", "ntriples", file)
			cmd.Stdout, cmd.Stderr = &stdout, &stderr
			if err := cmd.Run(); err != nil || stderr.Len() > 0 {
				t.Fatalf("rapper refused the export: %v\n%s", err, stderr.String())
			}
			triples, err := parseNTriples(stdout.String())
			if err != nil {
				t.Fatal(err)
			}
			// Expected triple count, from the tree alone. With C
			// categories, I items, D items with a non-blank text and P
			// provisional names: the scheme has 4 (type, title,
			// prefLabel, versionInfo) plus one hasTopConcept per top
			// concept T; every concept has type, inScheme and prefLabel
			// (3) and one of topConceptOf or broader (1); every concept
			// but the T top ones is also its parent's narrower (1);
			// items add a notation (I) and a definition (D), provisional
			// categories an editorialNote (P):
			//   4 + T + 4(C+I) + (C+I-T) + I + D + P = 4 + 5(C+I) + I + D + P
			c, i, d, p := countTree(root, items)
			if want := 4 + 5*(c+i) + i + d + p; len(triples) != want {
				t.Errorf("rapper read %d triples; the formula says %d (C=%d I=%d D=%d P=%d)", len(triples), want, c, i, d, p)
			}
			g := newGraph(triples)
			checkIntegrity(t, g, opt)
			checkSameTree(t, g, root, items, opt)
			for path, iri := range tc.hands {
				if got := g.categoryByPath(opt)[path]; got != iri {
					t.Errorf("category %s has IRI %s, worked out by hand: %s", path, got, iri)
				}
			}
		})
	}
}

func demoSKOS(t *testing.T) (*format.Category, []format.Item, SKOSOptions) {
	p, ds := repo.Load(filepath.Join("..", "..", "examples", "tool-library"))
	if len(ds) > 0 {
		t.Fatalf("the demo does not load: %v", ds)
	}
	if p.Outline == nil {
		t.Fatal("the demo has no outline")
	}
	return p.Outline.Root, p.Items, SKOSOptions{BaseIRI: p.Settings.Release.BaseIRI, Title: "Tool library", Version: "demo"}
}

// countTree counts what the triple-count formula needs, from the tree.
func countTree(root *format.Category, items []format.Item) (cats, its, defs, prov int) {
	text := map[string]string{}
	for _, it := range items {
		text[it.ID] = it.Text
	}
	root.Walk(func(c *format.Category, depth int) bool {
		if depth > 0 {
			cats++
			if c.Provisional {
				prov++
			}
		}
		for _, id := range c.Items {
			its++
			if strings.TrimSpace(text[id]) != "" {
				defs++
			}
		}
		return true
	})
	return
}
