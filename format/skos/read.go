// Package skos turns a SKOS concept scheme, read as RDF triples by
// package rdf, into a ramify taxonomy: a tree of categories over items,
// with labels, texts and concept identifiers. It is what `ramify init
// --from FILE.ttl|.nt|.jsonld` runs.
package skos

import (
	"fmt"
	"slices"
	"strconv"
	"strings"
	"unicode"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/rdf"
)

// The SKOS vocabulary (W3C Recommendation "SKOS Simple Knowledge
// Organization System Reference", 18 August 2009).
const (
	NS              = "http://www.w3.org/2004/02/skos/core#"
	Concept         = NS + "Concept"
	ConceptScheme   = NS + "ConceptScheme"
	prefLabel       = NS + "prefLabel"
	altLabel        = NS + "altLabel"
	definition      = NS + "definition"
	notation        = NS + "notation"
	broader         = NS + "broader"
	narrower        = NS + "narrower"
	topConceptOf    = NS + "topConceptOf"
	hasTopConcept   = NS + "hasTopConcept"
	inScheme        = NS + "inScheme"
	editorialNote   = NS + "editorialNote"
	conceptIRIInfix = "/concept/"
)

// ProvisionalNote is the skos:editorialNote by which ramify's own export
// marks a provisional name; reading it back keeps the name provisional.
// (It must equal export.ProvisionalNote; a test checks that.)
const ProvisionalNote = "provisional name: made up by ramify from the members' tags or words, not yet confirmed by an editor"

// Items-are rules.
const (
	ItemsAreLeaves   = "leaves"
	ItemsAreNotation = "notation"
)

// Options say how the scheme becomes a taxonomy.
type Options struct {
	// Lang chooses the language of prefLabel, altLabel and definition;
	// "" takes the language most prefLabels have (ties: the smaller tag).
	// Tags compare without case.
	Lang string
	// ItemsAre says which concepts are items: ItemsAreLeaves (also "")
	// for concepts with no narrower concept, ItemsAreNotation for those
	// with a skos:notation, or an IRI: those with that rdf:type. The
	// others are categories.
	ItemsAre string
	// FirstBroader keeps the first broader concept of a concept that has
	// several (polyhierarchy), in file order, and reports the others
	// instead of failing.
	FirstBroader bool
	// Scheme, if not "", imports only the concepts of that concept
	// scheme (skos:inScheme, skos:topConceptOf, skos:hasTopConcept); it
	// is needed when the file holds several schemes.
	Scheme string
}

// Result is the imported taxonomy.
type Result struct {
	Root  *format.Category
	Items []format.Item
	// Lang is the language the labels were taken in ("" for untagged).
	Lang string
	// Notices say what the import decided for the reader: dropped
	// broader links, renamed duplicates, made-up ids.
	Notices []string
}

// node is everything the triples say about one concept.
type node struct {
	term       rdf.Term
	order      int // first appearance
	isConcept  bool
	types      []string
	pref       []rdf.Term
	alt        []rdf.Term
	def        []rdf.Term
	notations  []string
	provisonal bool
	parents    []link // in file order, one per distinct parent
	children   []*node
	schemes    map[string]bool
}

// link is a broader relation and the triple that stated it.
type link struct {
	to     *node
	triple rdf.Triple
}

type graph struct {
	nodes map[rdf.Term]*node
	list  []*node
}

func (g *graph) get(t rdf.Term) *node {
	key := rdf.Term{Kind: t.Kind, Value: t.Value}
	n, ok := g.nodes[key]
	if !ok {
		n = &node{term: key, order: len(g.list), schemes: map[string]bool{}}
		g.nodes[key] = n
		g.list = append(g.list, n)
	}
	return n
}

func resource(t rdf.Term) bool { return t.Kind == rdf.IRI || t.Kind == rdf.Blank }

// Read builds the taxonomy from the triples of one file. Problems come
// back as format.Diags, each placed at the triple behind it (JSON-LD
// triples, which have no lines, are quoted in the message instead).
func Read(file string, triples []rdf.Triple, opt Options) (*Result, error) {
	g, schemes, ds := readGraph(triples)
	if len(ds) > 0 {
		return nil, ds
	}
	concepts := conceptsOf(g, opt.Scheme)
	if err := checkConcepts(file, concepts, schemes, opt.Scheme); err != nil {
		return nil, err
	}
	notices := oneBroaderEach(concepts, opt.FirstBroader, &ds)
	if len(ds) > 0 {
		ds.Sort()
		return nil, ds
	}
	for _, n := range concepts {
		if len(n.parents) == 1 {
			p := n.parents[0].to
			p.children = append(p.children, n)
		}
	}
	if d, ok := findCycle(concepts); ok {
		return nil, format.Diags{d}
	}

	lang, err := chooseLang(file, concepts, opt.Lang)
	if err != nil {
		return nil, err
	}
	isItem, err := itemRule(file, opt.ItemsAre)
	if err != nil {
		return nil, err
	}
	b := &builder{lang: lang, ids: map[string]bool{}, conceptIDs: map[string]bool{}}
	root := &format.Category{}
	var tops []*node
	for _, n := range concepts {
		if len(n.parents) == 0 {
			tops = append(tops, n)
		}
	}
	for _, n := range tops {
		b.place(root, n, isItem, &ds)
	}
	if len(ds) > 0 {
		ds.Sort()
		return nil, ds
	}
	if len(b.items) == 0 {
		return nil, format.Diags{{Pos: format.Pos{File: file, Line: 1, Col: 1}, Msg: "no concept of the file is an item under the --items-are rule; there is nothing to import"}}
	}
	b.notices = append(notices, b.notices...)
	return &Result{Root: root, Items: b.items, Lang: lang, Notices: b.notices}, nil
}

// readGraph collects what the triples say of each resource: its types,
// labels, notes, broader links and schemes. It returns the graph, the
// concept schemes named anywhere, and the problems (a concept broader than
// itself).
func readGraph(triples []rdf.Triple) (*graph, map[string]bool, format.Diags) {
	g := &graph{nodes: map[rdf.Term]*node{}}
	var ds format.Diags
	schemes := map[string]bool{}
	for _, t := range triples {
		if !resource(t.S) {
			continue
		}
		switch t.P.Value {
		case rdf.RDFType:
			s := g.get(t.S)
			s.types = append(s.types, t.O.Value)
			switch t.O.Value {
			case Concept:
				s.isConcept = true
			case ConceptScheme:
				schemes[t.S.Value] = true
			}
		case prefLabel, altLabel, definition, notation, editorialNote:
			if t.O.Kind != rdf.Literal {
				continue
			}
			s := g.get(t.S)
			switch t.P.Value {
			case prefLabel:
				s.pref = append(s.pref, t.O)
			case altLabel:
				s.alt = append(s.alt, t.O)
			case definition:
				s.def = append(s.def, t.O)
			case notation:
				s.notations = append(s.notations, t.O.Value)
			case editorialNote:
				if t.O.Value == ProvisionalNote {
					s.provisonal = true
				}
			}
		case broader, narrower:
			if !resource(t.O) {
				continue
			}
			s, o := g.get(t.S), g.get(t.O)
			s.isConcept, o.isConcept = true, true
			if t.P.Value == broader {
				addParent(s, o, t, &ds)
			} else {
				addParent(o, s, t, &ds)
			}
		case topConceptOf, inScheme:
			if resource(t.O) {
				s := g.get(t.S)
				s.isConcept = s.isConcept || t.P.Value == topConceptOf
				s.schemes[t.O.Value] = true
				schemes[t.O.Value] = true
			}
		case hasTopConcept:
			if resource(t.O) {
				o := g.get(t.O)
				o.isConcept = true
				o.schemes[t.S.Value] = true
				schemes[t.S.Value] = true
			}
		}
	}
	return g, schemes, ds
}

// addParent records that triple t makes parent broader than child, once.
func addParent(child, parent *node, t rdf.Triple, ds *format.Diags) {
	if child == parent {
		ds.Add(t.Pos, "%sconcept %s is broader than itself", quoteIfNoLine(t), show(child.term))
		return
	}
	for _, l := range child.parents {
		if l.to == parent {
			return
		}
	}
	child.parents = append(child.parents, link{to: parent, triple: t})
}

// checkConcepts says why the concepts of the file (of scheme, when it is
// given) cannot be imported: no such scheme, several schemes and none
// chosen, no concepts, or too many.
func checkConcepts(file string, concepts []*node, schemes map[string]bool, scheme string) error {
	at := format.Pos{File: file, Line: 1, Col: 1}
	if scheme != "" && !schemes[scheme] {
		return format.Diags{{Pos: at, Msg: fmt.Sprintf("--scheme %s: the file has no such concept scheme%s", scheme, schemeList(schemes))}}
	}
	if scheme == "" && len(schemes) > 1 {
		return format.Diags{{Pos: at, Msg: fmt.Sprintf("the file holds %d concept schemes%s; choose one with --scheme IRI", len(schemes), schemeList(schemes))}}
	}
	if len(concepts) == 0 {
		return format.Diags{{Pos: at, Msg: "no SKOS concepts (skos:Concept, or skos:broader/narrower links) in the file; there is nothing to import"}}
	}
	if len(concepts) > format.MaxItems {
		return format.Diags{{Pos: at, Msg: fmt.Sprintf("%d concepts; the limit is %d", len(concepts), format.MaxItems)}}
	}
	return nil
}

// oneBroaderEach leaves each concept at most one broader concept among
// concepts, so that they form a tree: a second one is a problem, or with
// firstBroader it is dropped (the first stated is kept) with a notice,
// which it returns.
func oneBroaderEach(concepts []*node, firstBroader bool, ds *format.Diags) []string {
	in := map[*node]bool{}
	for _, n := range concepts {
		in[n] = true
	}
	var notices []string
	for _, n := range concepts {
		var ps []link
		for _, l := range n.parents {
			if in[l.to] {
				ps = append(ps, l)
			}
		}
		slices.SortStableFunc(ps, func(a, b link) int { return tripleOrder(a.triple, b.triple) })
		if len(ps) > 1 {
			if !firstBroader {
				for _, extra := range ps[1:] {
					ds.Add(extra.triple.Pos, "%sconcept %s has a second broader concept, %s; the first, %s, is stated at %s. A taxonomy is a tree: remove one of the two statements, or pass --first-broader to keep the first and drop the rest",
						quoteIfNoLine(extra.triple), show(n.term), show(extra.to.term), show(ps[0].to.term), ps[0].triple.Where())
				}
				continue
			}
			for _, extra := range ps[1:] {
				notices = append(notices, fmt.Sprintf("%s: dropped the broader concept %s of %s (kept %s, stated first at %s)",
					extra.triple.Where(), show(extra.to.term), show(n.term), show(ps[0].to.term), ps[0].triple.Where()))
			}
			ps = ps[:1]
		}
		n.parents = ps
	}
	return notices
}

// conceptsOf lists the concepts in order of first appearance, those of
// scheme only when it is given.
func conceptsOf(g *graph, scheme string) []*node {
	var out []*node
	for _, n := range g.list {
		if n.isConcept && (scheme == "" || n.schemes[scheme]) {
			out = append(out, n)
		}
	}
	return out
}

func schemeList(schemes map[string]bool) string {
	if len(schemes) == 0 {
		return ""
	}
	var s []string
	for k := range schemes {
		s = append(s, "<"+k+">")
	}
	slices.Sort(s)
	return " (" + strings.Join(s, ", ") + ")"
}

// tripleOrder puts triples in file order; triples without a line (JSON-LD)
// keep the order they came in.
func tripleOrder(a, b rdf.Triple) int {
	if a.Pos.Line != b.Pos.Line {
		return a.Pos.Line - b.Pos.Line
	}
	return a.Pos.Col - b.Pos.Col
}

func quoteIfNoLine(t rdf.Triple) string {
	if t.Pos.Line > 0 {
		return ""
	}
	return "statement " + t.String() + ": "
}

func show(t rdf.Term) string { return t.String() }

// findCycle reports a concept that is its own ancestor.
func findCycle(concepts []*node) (format.Diag, bool) {
	state := map[*node]int{} // 1 on the current path, 2 done
	for _, start := range concepts {
		var path []*node
		n := start
		for n != nil && state[n] == 0 {
			state[n] = 1
			path = append(path, n)
			if len(n.parents) == 0 {
				n = nil
				break
			}
			n = n.parents[0].to
		}
		if n != nil && state[n] == 1 {
			var names []string
			i := slices.Index(path, n)
			for _, m := range path[i:] {
				names = append(names, show(m.term))
			}
			t := n.parents[0].triple
			return format.Diag{Pos: t.Pos, Msg: fmt.Sprintf("%sthe broader links go round in a circle: %s, back to %s", quoteIfNoLine(t), strings.Join(names, " → "), show(n.term))}, true
		}
		for _, m := range path {
			state[m] = 2
		}
	}
	return format.Diag{}, false
}

// chooseLang picks the labels' language.
func chooseLang(file string, concepts []*node, want string) (string, error) {
	count := map[string]int{}
	for _, n := range concepts {
		seen := map[string]bool{}
		for _, l := range n.pref {
			tag := strings.ToLower(l.Lang)
			if !seen[tag] {
				seen[tag] = true
				count[tag]++
			}
		}
	}
	if want != "" {
		if count[strings.ToLower(want)] == 0 {
			return "", format.Diags{{Pos: format.Pos{File: file, Line: 1, Col: 1}, Msg: fmt.Sprintf("--lang %s: no skos:prefLabel in that language%s", want, langList(count))}}
		}
		return strings.ToLower(want), nil
	}
	best, bestN := "", -1
	for tag, n := range count {
		if n > bestN || n == bestN && tag < best {
			best, bestN = tag, n
		}
	}
	return best, nil
}

func langList(count map[string]int) string {
	if len(count) == 0 {
		return "; the file has no prefLabel at all"
	}
	var s []string
	for tag, n := range count {
		if tag == "" {
			tag = "(no language)"
		}
		s = append(s, fmt.Sprintf("%s: %d", tag, n))
	}
	slices.Sort(s)
	return "; the file has " + strings.Join(s, ", ")
}

// itemRule turns --items-are into a test.
func itemRule(file, rule string) (func(n *node) bool, error) {
	switch rule {
	case "", ItemsAreLeaves:
		return func(n *node) bool { return len(n.children) == 0 }, nil
	case ItemsAreNotation:
		return func(n *node) bool { return len(n.notations) > 0 }, nil
	}
	iri := strings.TrimSuffix(strings.TrimPrefix(rule, "<"), ">")
	if !strings.Contains(iri, ":") {
		return nil, format.Diags{{Pos: format.Pos{File: file}, Msg: fmt.Sprintf("--items-are %q: give leaves, notation, or the full IRI of a type", rule)}}
	}
	return func(n *node) bool { return slices.Contains(n.types, iri) }, nil
}

// builder makes categories and items.
type builder struct {
	lang       string
	items      []format.Item
	ids        map[string]bool // item ids given
	conceptIDs map[string]bool
	notices    []string
}

// pick is the literal of the chosen language, else one without a
// language, else the first of the smallest tag; "" when there is none.
func (b *builder) pick(ls []rdf.Term) string {
	var plain, other *rdf.Term
	for i := range ls {
		l := &ls[i]
		switch tag := strings.ToLower(l.Lang); {
		case tag == b.lang:
			return l.Value
		case tag == "" && plain == nil:
			plain = l
		case other == nil || tag < strings.ToLower(other.Lang):
			other = l
		}
	}
	if plain != nil {
		return plain.Value
	}
	if other != nil {
		return other.Value
	}
	return ""
}

// all are the literals of the chosen language (else of no language).
func (b *builder) all(ls []rdf.Term) []string {
	var in, plain []string
	for _, l := range ls {
		switch strings.ToLower(l.Lang) {
		case b.lang:
			in = append(in, l.Value)
		case "":
			plain = append(plain, l.Value)
		}
	}
	if len(in) > 0 {
		return in
	}
	return plain
}

func localName(t rdf.Term) string {
	if t.Kind != rdf.IRI {
		return ""
	}
	v := strings.TrimRight(t.Value, "/#")
	if i := strings.LastIndexAny(v, "/#:"); i >= 0 {
		return v[i+1:]
	}
	return v
}

// place puts concept n below parent.
func (b *builder) place(parent *format.Category, n *node, isItem func(*node) bool, ds *format.Diags) {
	at := format.Pos{}
	if len(n.parents) > 0 {
		at = n.parents[0].triple.Pos
	}
	if isItem(n) {
		if len(n.children) > 0 {
			ds.Add(at, "concept %s is an item under the --items-are rule but has narrower concepts (%s, ...); an item cannot hold others", show(n.term), show(n.children[0].term))
			return
		}
		b.item(parent, n)
		return
	}
	if len(n.children) == 0 {
		ds.Add(at, "concept %s is a category under the --items-are rule but has no narrower concept; a category needs members", show(n.term))
		return
	}
	c := &format.Category{Name: b.categoryName(n), Provisional: n.provisonal, ID: b.conceptID(n)}
	for _, sib := range parent.Children {
		if sib.Name == c.Name {
			base := c.Name
			for k := 2; ; k++ {
				cand := base + " " + strconv.Itoa(k)
				if !slices.ContainsFunc(parent.Children, func(x *format.Category) bool { return x.Name == cand }) {
					c.Name = cand
					break
				}
			}
			b.notices = append(b.notices, fmt.Sprintf("%s is called %q like a sibling; named %q", show(n.term), base, c.Name))
			break
		}
	}
	parent.Children = append(parent.Children, c)
	for _, ch := range n.children {
		b.place(c, ch, isItem, ds)
	}
}

// categoryName is the concept's label made fit for an outline.
func (b *builder) categoryName(n *node) string {
	name := cleanName(b.pick(n.pref))
	if name == "" {
		name = cleanName(localName(n.term))
	}
	if name == "" {
		name = "Unnamed"
	}
	if format.CheckCategoryName(name) != "" {
		// A leading "#" or "~ " would read as a comment or a marker.
		name = strings.TrimLeft(name, "#~ ")
		if format.CheckCategoryName(name) != "" {
			name = "Unnamed"
		}
	}
	return name
}

// cleanName turns control characters into spaces, squeezes runs of
// spaces and bounds the length.
func cleanName(s string) string {
	s = strings.Map(func(r rune) rune {
		if unicode.IsControl(r) {
			return ' '
		}
		return r
	}, s)
	s = strings.Join(strings.Fields(s), " ")
	for len(s) > 200 {
		_, size := lastRune(s)
		s = strings.TrimSpace(s[:len(s)-size])
	}
	return s
}

func lastRune(s string) (rune, int) {
	for i := len(s) - 1; i >= 0; i-- {
		if s[i] < 0x80 || s[i] >= 0xC0 {
			return []rune(s[i:])[0], len(s) - i
		}
	}
	return 0, 1
}

// conceptID keeps an identifier ramify's export put in the IRI, else
// makes one from the IRI (or, for a blank node, from its label path).
func (b *builder) conceptID(n *node) string {
	if n.term.Kind == rdf.IRI {
		if i := strings.LastIndex(n.term.Value, conceptIRIInfix); i >= 0 {
			if id := n.term.Value[i+len(conceptIRIInfix):]; format.ValidConceptID(id) && !b.conceptIDs[id] {
				b.conceptIDs[id] = true
				return id
			}
		}
	}
	for salt := 0; ; salt++ {
		id := format.DeriveConceptIDFrom(n.term.String(), salt)
		if !b.conceptIDs[id] {
			b.conceptIDs[id] = true
			return id
		}
	}
}

// item adds concept n as an item of parent.
func (b *builder) item(parent *format.Category, n *node) {
	id := ""
	for _, cand := range append(slices.Clone(n.notations), localName(n.term)) {
		if format.ValidItemID(cand) && !b.ids[cand] {
			id = cand
			break
		}
	}
	label := cleanLabel(b.pick(n.pref))
	if id == "" {
		base := slug(label)
		if base == "" {
			base = "item"
		}
		id = base
		for k := 2; b.ids[id]; k++ {
			id = base + "-" + strconv.Itoa(k)
		}
		b.notices = append(b.notices, fmt.Sprintf("%s has no notation or IRI ending that is an item id; its id is %s", show(n.term), id))
	}
	b.ids[id] = true
	if label == id {
		label = "" // the export labels an unlabelled item with its id
	}
	text := strings.Join(b.all(n.def), "\n")
	if alts := b.all(n.alt); len(alts) > 0 {
		if text != "" {
			text += "\n"
		}
		text += "Also called: " + strings.Join(alts, "; ") + "."
	}
	parent.Items = append(parent.Items, id)
	b.items = append(b.items, format.Item{ID: id, Label: label, Text: text})
}

func cleanLabel(s string) string {
	return strings.Map(func(r rune) rune {
		if unicode.IsControl(r) {
			return ' '
		}
		return r
	}, s)
}

// slug makes an item id from a label: ASCII letters and digits kept
// (lower case), everything else a "-", at most 64 bytes.
func slug(s string) string {
	var b strings.Builder
	dash := false
	for _, r := range strings.ToLower(s) {
		if r < 0x80 && (r >= 'a' && r <= 'z' || r >= '0' && r <= '9') {
			b.WriteRune(r)
			dash = false
		} else if !dash && b.Len() > 0 {
			b.WriteByte('-')
			dash = true
		}
		if b.Len() >= 64 {
			break
		}
	}
	return strings.Trim(b.String(), "-")
}
