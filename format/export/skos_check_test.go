package export

import (
	"sort"
	"strings"
	"testing"

	"github.com/ramify-tax/ramify/format"
)

// Checks on the triples an independent parser read from a SKOS export:
// the integrity conditions of the W3C SKOS Reference (Recommendation of
// 18 August 2009) that a tree export can break, and that the triples
// describe exactly the tree that was exported.

const (
	rdfType     = "http://www.w3.org/1999/02/22-rdf-syntax-ns#type"
	skosConcept = nsSKOS + "Concept"
	skosScheme  = nsSKOS + "ConceptScheme"
)

// rdfGraph indexes triples by subject and predicate.
type rdfGraph struct {
	triples []rdfTriple
	out     map[string]map[string][]rdfTerm
}

func newGraph(ts []rdfTriple) *rdfGraph {
	g := &rdfGraph{triples: ts, out: map[string]map[string][]rdfTerm{}}
	for _, tr := range ts {
		s := tr.s.value
		if g.out[s] == nil {
			g.out[s] = map[string][]rdfTerm{}
		}
		g.out[s][tr.p.value] = append(g.out[s][tr.p.value], tr.o)
	}
	return g
}

func (g *rdfGraph) objects(s, p string) []rdfTerm { return g.out[s][p] }

func (g *rdfGraph) has(s, p, o string) bool {
	for _, x := range g.out[s][p] {
		if x.value == o {
			return true
		}
	}
	return false
}

// ofType lists the subjects stated to have type class, sorted.
func (g *rdfGraph) ofType(class string) []string {
	var out []string
	for s := range g.out {
		if g.has(s, rdfType, class) {
			out = append(out, s)
		}
	}
	sort.Strings(out)
	return out
}

// pairs lists (subject, object) of every triple with predicate p.
func (g *rdfGraph) pairs(p string) [][2]string {
	var out [][2]string
	for _, tr := range g.triples {
		if tr.p.value == p {
			out = append(out, [2]string{tr.s.value, tr.o.value})
		}
	}
	return out
}

func checkIntegrity(t *testing.T, g *rdfGraph, opt SKOSOptions) {
	t.Helper()
	lang := opt.Language
	if lang == "" {
		lang = DefaultLanguage
	}
	concepts := g.ofType(skosConcept)
	schemes := g.ofType(skosScheme)
	isConcept := map[string]bool{}
	for _, c := range concepts {
		isConcept[c] = true
	}
	if len(schemes) != 1 || schemes[0] != opt.BaseIRI {
		t.Fatalf("concept schemes %v, want exactly the base IRI %s", schemes, opt.BaseIRI)
	}
	// S9: skos:ConceptScheme is disjoint with skos:Concept.
	if isConcept[opt.BaseIRI] {
		t.Errorf("S9: %s is both a concept and a concept scheme", opt.BaseIRI)
	}
	for s := range g.out {
		// S14: a resource has no more than one value of skos:prefLabel
		// per language tag.
		perLang := map[string]int{}
		for _, l := range g.objects(s, nsSKOS+"prefLabel") {
			perLang[l.lang]++
			if perLang[l.lang] == 2 {
				t.Errorf("S14: %s has more than one prefLabel@%s", s, l.lang)
			}
		}
		// S13: skos:prefLabel, skos:altLabel and skos:hiddenLabel are
		// pairwise disjoint properties.
		seen := map[rdfTerm]string{}
		for _, p := range []string{"prefLabel", "altLabel", "hiddenLabel"} {
			for _, l := range g.objects(s, nsSKOS+p) {
				if prev, dup := seen[l]; dup && prev != p {
					t.Errorf("S13: %s has %v as both %s and %s", s, l, prev, p)
				}
				seen[l] = p
			}
		}
	}
	// Every concept (and the scheme) is labelled once in the export's
	// language: stronger than S14, which allows none.
	for _, c := range append(concepts, opt.BaseIRI) {
		ls := g.objects(c, nsSKOS+"prefLabel")
		if len(ls) != 1 || ls[0].lang != lang {
			t.Errorf("%s has prefLabels %v, want one @%s", c, ls, lang)
		}
	}
	// S7: skos:topConceptOf is a sub-property of skos:inScheme; the
	// export states both.
	for _, pr := range g.pairs(nsSKOS + "topConceptOf") {
		if !g.has(pr[0], nsSKOS+"inScheme", pr[1]) {
			t.Errorf("S7: %s is a top concept of %s but not stated in it", pr[0], pr[1])
		}
	}
	// S8: skos:topConceptOf is owl:inverseOf skos:hasTopConcept; the
	// export states both directions.
	inverse(t, g, "S8", nsSKOS+"topConceptOf", nsSKOS+"hasTopConcept")
	// S25: skos:narrower is owl:inverseOf skos:broader.
	inverse(t, g, "S25", nsSKOS+"broader", nsSKOS+"narrower")
	// S19, S20: the domain and range of skos:semanticRelation (and so of
	// skos:broader and skos:narrower, S21, S22) is skos:Concept; the
	// export types every end explicitly.
	for _, p := range []string{"broader", "narrower", "related"} {
		for _, pr := range g.pairs(nsSKOS + p) {
			if !isConcept[pr[0]] || !isConcept[pr[1]] {
				t.Errorf("S19/S20: skos:%s links %s and %s, not both concepts", p, pr[0], pr[1])
			}
		}
	}
	// Every concept is in the scheme and has exactly one place: one
	// broader concept, or top concept of the scheme.
	for _, c := range concepts {
		if !g.has(c, nsSKOS+"inScheme", opt.BaseIRI) {
			t.Errorf("%s is not in the scheme", c)
		}
		if n := len(g.objects(c, nsSKOS+"broader")) + len(g.objects(c, nsSKOS+"topConceptOf")); n != 1 {
			t.Errorf("%s has %d broader or topConceptOf links, want 1", c, n)
		}
	}
	// skos:broaderTransitive is the transitive closure of skos:broader
	// (S22, S24). No concept may be broader and narrower than another
	// at once, which is no cycle: broaderTransitive is irreflexive here.
	up := map[string][]string{}
	for _, pr := range g.pairs(nsSKOS + "broader") {
		up[pr[0]] = append(up[pr[0]], pr[1])
	}
	broaderT := map[[2]string]bool{}
	for _, c := range concepts {
		stack := append([]string(nil), up[c]...)
		for len(stack) > 0 {
			a := stack[len(stack)-1]
			stack = stack[:len(stack)-1]
			if broaderT[[2]string{c, a}] {
				continue
			}
			broaderT[[2]string{c, a}] = true
			stack = append(stack, up[a]...)
		}
		if broaderT[[2]string{c, c}] {
			t.Errorf("%s is broader and narrower than itself: the hierarchy has a cycle", c)
		}
	}
	// S27: skos:related is disjoint with skos:broaderTransitive. The
	// export writes no skos:related; checked here all the same, so a
	// change that starts writing it is held to the condition.
	for _, pr := range g.pairs(nsSKOS + "related") {
		if broaderT[pr] {
			t.Errorf("S27: %s is both related to and narrower than %s", pr[0], pr[1])
		}
	}
}

// inverse checks that p and q are stated as exact inverses.
func inverse(t *testing.T, g *rdfGraph, cond, p, q string) {
	t.Helper()
	for _, pr := range g.pairs(p) {
		if !g.has(pr[1], q, pr[0]) {
			t.Errorf("%s: %s %s %s, but not the inverse", cond, pr[0], p, pr[1])
		}
	}
	for _, pr := range g.pairs(q) {
		if !g.has(pr[1], p, pr[0]) {
			t.Errorf("%s: %s %s %s, but not the inverse", cond, pr[0], q, pr[1])
		}
	}
}

// checkSameTree rebuilds the tree from the triples alone — items are the
// concepts with a skos:notation, placed under their skos:broader — and
// compares it, with every label and definition, to what was exported.
func checkSameTree(t *testing.T, g *rdfGraph, root *format.Category, items []format.Item, opt SKOSOptions) {
	t.Helper()
	rebuilt := map[string]*format.Category{opt.BaseIRI: {}}
	node := func(iri string) *format.Category {
		if rebuilt[iri] == nil {
			rebuilt[iri] = &format.Category{}
		}
		return rebuilt[iri]
	}
	for _, c := range g.ofType(skosConcept) {
		parent := opt.BaseIRI
		if b := g.objects(c, nsSKOS+"broader"); len(b) == 1 {
			parent = b[0].value
		}
		if n := g.objects(c, nsSKOS+"notation"); len(n) == 1 {
			if want := opt.BaseIRI + itemPrefix + n[0].value; c != want {
				t.Errorf("item %s has IRI %s, want %s", n[0].value, c, want)
			}
			node(parent).Items = append(node(parent).Items, n[0].value)
			continue
		}
		cat := node(c)
		if ls := g.objects(c, nsSKOS+"prefLabel"); len(ls) > 0 {
			cat.Name = ls[0].value
		}
		for _, n := range g.objects(c, nsSKOS+"editorialNote") {
			cat.Provisional = cat.Provisional || n.value == ProvisionalNote
		}
		node(parent).Children = append(node(parent).Children, cat)
	}
	got, want := string(format.FormatTree(rebuilt[opt.BaseIRI])), string(format.FormatTree(root.Clone()))
	if got != want {
		t.Errorf("the tree read back differs\n--- read back ---\n%s\n--- exported ---\n%s", got, want)
	}
	idx := itemIndex(items)
	for _, id := range root.AllItems() {
		iri := opt.BaseIRI + itemPrefix + id
		if ls := g.objects(iri, nsSKOS+"prefLabel"); len(ls) != 1 || ls[0].value != labelOf(idx, id) {
			t.Errorf("item %s: prefLabel %v, want %q", id, ls, labelOf(idx, id))
		}
		defs := g.objects(iri, nsSKOS+"definition")
		it := idx[id]
		switch {
		case it != nil && strings.TrimSpace(it.Text) != "":
			if len(defs) != 1 || defs[0].value != it.Text {
				t.Errorf("item %s: definition %v, want %q", id, defs, it.Text)
			}
		case len(defs) != 0:
			t.Errorf("item %s has no text but definitions %v", id, defs)
		}
	}
}

// categoryByPath maps "A > B" (names without the provisional marker) to
// the category's IRI, following skos:broader up from each category.
func (g *rdfGraph) categoryByPath(opt SKOSOptions) map[string]string {
	out := map[string]string{}
	for _, c := range g.ofType(skosConcept) {
		if len(g.objects(c, nsSKOS+"notation")) > 0 {
			continue
		}
		var names []string
		for x := c; x != ""; {
			ls := g.objects(x, nsSKOS+"prefLabel")
			if len(ls) == 0 {
				break
			}
			names = append([]string{ls[0].value}, names...)
			b := g.objects(x, nsSKOS+"broader")
			x = ""
			if len(b) == 1 {
				x = b[0].value
			}
		}
		out[strings.Join(names, " > ")] = c
	}
	return out
}
