package export

import (
	"io"
	"strings"

	"github.com/ramify-tax/ramify/format"
)

// SKOSOptions say how the concept scheme is named.
type SKOSOptions struct {
	// BaseIRI is the scheme's IRI and the prefix of every concept's
	// (release.base_iri); it must end in "/" or "#".
	BaseIRI string
	// Title names the scheme (dct:title and skos:prefLabel); DefaultTitle
	// when empty.
	Title string
	// Version is the scheme's owl:versionInfo; the tree's structure hash
	// when empty, so that every export says which tree it holds.
	Version string
	// Language tags every label, definition and note; DefaultLanguage
	// when empty.
	Language string
}

// Defaults of SKOSOptions.
const (
	DefaultTitle    = "Taxonomy"
	DefaultLanguage = "en"
)

// ProvisionalNote is the skos:editorialNote on a category whose name
// ramify made up and no editor has confirmed yet.
const ProvisionalNote = "provisional name: made up by ramify from the members' tags or words, not yet confirmed by an editor"

// The vocabularies the export uses, with the prefixes it writes them with.
const (
	nsSKOS = "http://www.w3.org/2004/02/skos/core#"
	nsDCT  = "http://purl.org/dc/terms/"
	nsOWL  = "http://www.w3.org/2002/07/owl#"
)

// SKOS writes the taxonomy as one skos:ConceptScheme in Turtle: a
// skos:Concept for every category and every item, linked by skos:broader
// and skos:narrower both ways, the top level linked to the scheme by
// skos:topConceptOf and skos:hasTopConcept. Categories are labelled with
// their names, items with their labels (their ids when they have none);
// items also carry their id as skos:notation and their text, if any, as
// skos:definition. items supplies labels and texts; the tree decides
// which concepts there are.
func SKOS(w io.Writer, root *format.Category, items []format.Item, opt SKOSOptions) error {
	if err := checkBaseIRI(opt.BaseIRI); err != nil {
		return err
	}
	if opt.Language == "" {
		opt.Language = DefaultLanguage
	}
	if err := checkLanguage(opt.Language); err != nil {
		return err
	}
	if opt.Title == "" {
		opt.Title = DefaultTitle
	}
	tree := sortedCopy(root)
	if opt.Version == "" {
		opt.Version = format.StructureHash(tree)
	}
	g := &skosGraph{opt: opt, idx: itemIndex(items), slugs: categorySlugs(tree), scheme: iriRef(opt.BaseIRI)}
	var b strings.Builder
	b.WriteString("# A SKOS concept scheme written by ramify.\n")
	b.WriteString("@prefix dct: <" + nsDCT + "> .\n")
	b.WriteString("@prefix owl: <" + nsOWL + "> .\n")
	b.WriteString("@prefix skos: <" + nsSKOS + "> .\n")
	for _, s := range g.statements(tree) {
		b.WriteByte('\n')
		s.writeTo(&b)
	}
	_, err := io.WriteString(w, b.String())
	return err
}

// skosGraph builds the statements of one export.
type skosGraph struct {
	opt    SKOSOptions
	idx    map[string]*format.Item
	slugs  map[*format.Category]string
	scheme string
}

func (g *skosGraph) categoryIRI(c *format.Category) string {
	if c.ID != "" {
		return iriRef(g.opt.BaseIRI + conceptPrefix + c.ID)
	}
	return iriRef(g.opt.BaseIRI + categoryPrefix + g.slugs[c])
}

func (g *skosGraph) itemIRI(id string) string {
	return iriRef(g.opt.BaseIRI + itemPrefix + id)
}

// members are the concepts directly below c: subcategories, then items.
func (g *skosGraph) members(c *format.Category) []string {
	out := make([]string, 0, len(c.Children)+len(c.Items))
	for _, ch := range c.Children {
		out = append(out, g.categoryIRI(ch))
	}
	for _, id := range c.Items {
		out = append(out, g.itemIRI(id))
	}
	return out
}

// statements lists the scheme, then every concept in outline order: a
// category, everything below it, then the next.
func (g *skosGraph) statements(root *format.Category) []*statement {
	lang := g.opt.Language
	scheme := &statement{subject: g.scheme}
	scheme.add("a", "skos:ConceptScheme")
	scheme.add("dct:title", langString(g.opt.Title, lang))
	scheme.add("skos:prefLabel", langString(g.opt.Title, lang))
	scheme.add("owl:versionInfo", turtleString(g.opt.Version))
	scheme.add("skos:hasTopConcept", g.members(root)...)
	out := []*statement{scheme}
	var rec func(c *format.Category, parent string)
	rec = func(c *format.Category, parent string) {
		for _, ch := range c.Children {
			s := g.concept(g.categoryIRI(ch), parent)
			s.add("skos:prefLabel", langString(ch.Name, lang))
			if ch.Provisional {
				s.add("skos:editorialNote", langString(ProvisionalNote, lang))
			}
			s.add("skos:narrower", g.members(ch)...)
			out = append(out, s)
			rec(ch, g.categoryIRI(ch))
		}
		for _, id := range c.Items {
			s := g.concept(g.itemIRI(id), parent)
			s.add("skos:prefLabel", langString(labelOf(g.idx, id), lang))
			s.add("skos:notation", turtleString(id))
			if it, ok := g.idx[id]; ok && strings.TrimSpace(it.Text) != "" {
				s.add("skos:definition", langString(it.Text, lang))
			}
			out = append(out, s)
		}
	}
	rec(root, "")
	return out
}

// concept starts a concept's statement: its type, its scheme, and its
// place (top concept when parent is "", else broader than parent).
func (g *skosGraph) concept(iri, parent string) *statement {
	s := &statement{subject: iri}
	s.add("a", "skos:Concept")
	s.add("skos:inScheme", g.scheme)
	if parent == "" {
		s.add("skos:topConceptOf", g.scheme)
	} else {
		s.add("skos:broader", parent)
	}
	return s
}
