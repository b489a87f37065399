package rdf

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"regexp"
	"sort"
	"strings"

	"github.com/piprate/json-gold/ld"
	"github.com/ramify-tax/ramify/format"
)

// ParseNTriples reads an N-Triples document (W3C Recommendation "RDF 1.1
// N-Triples", 25 February 2014) with json-gold's N-Quads reader, one line
// at a time so that every triple keeps its line. A quad naming a graph
// is refused: N-Triples has none. Blank nodes are relabelled "b1", "b2",
// ... in order of first appearance.
func ParseNTriples(file string, src []byte) ([]Triple, error) {
	text, ds := format.CleanText(file, src)
	if len(ds) > 0 {
		return nil, ds
	}
	labels := map[string]string{}
	var out []Triple
	for i, line := range strings.Split(string(text), "\n") {
		body := strings.TrimLeft(line, " \t")
		if body == "" || strings.HasPrefix(body, "#") {
			continue
		}
		at := format.Pos{File: file, Line: i + 1, Col: len(line) - len(body) + 1}
		set, err := ld.ParseNQuads(line)
		if err != nil {
			ds.Add(at, "not an N-Triples statement: %s", gold(err))
			continue
		}
		for graph, quads := range set.Graphs {
			if graph != "@default" {
				ds.Add(at, "the statement names a graph (%s); N-Triples has none", graph)
				continue
			}
			for _, q := range quads {
				t, err := fromGold(q, labels)
				if err != nil {
					ds.Add(at, "%v", err)
					continue
				}
				t.Pos = at
				if rel := relativeIRI(t); rel != "" {
					// json-gold takes these; the N-Triples grammar does not.
					ds.Add(at, "relative IRI <%s>; N-Triples needs absolute IRIs", rel)
					continue
				}
				out = append(out, t)
			}
		}
	}
	if len(ds) > 0 {
		return nil, ds
	}
	return out, nil
}

// goldLine drops json-gold's "line: 1" (we read one line at a time and
// give the real one).
var goldLine = regexp.MustCompile(`(?i)\s*invalid quad\.\s*line: \d+\.\s*`)

// gold is json-gold's message without its error code wrapping.
func gold(err error) string {
	msg := err.Error()
	var je *ld.JsonLdError
	if errors.As(err, &je) && je.Details != nil {
		if d, ok := je.Details.(error); ok {
			msg = d.Error()
		} else {
			msg = fmt.Sprint(je.Details)
		}
	}
	return strings.TrimSpace(goldLine.ReplaceAllString(msg, " "))
}

// MaxJSONLDDepth bounds the nesting of a JSON-LD document before it is
// handed to json-gold, whose expansion recurses once per level.
const MaxJSONLDDepth = 64

// toRDF runs the processor, turning a panic inside it (it asserts value
// types some documents do not have, e.g. {"": 0}) into an error about the
// document, since the input is what makes it fail.
func toRDF(proc *ld.JsonLdProcessor, doc any, opts *ld.JsonLdOptions) (res any, err error) {
	defer func() {
		if p := recover(); p != nil {
			res, err = nil, fmt.Errorf("the document is not JSON-LD the processor can expand (%v)", p)
		}
	}()
	return proc.ToRDF(doc, opts)
}

// ParseJSONLD reads a JSON-LD 1.1 document with json-gold's toRdf
// algorithm. Remote contexts are never fetched: a document that names
// one by URL is refused with a message saying to inline the context, as
// a file from a pull request must not make ramify reach the network.
// JSON-LD has no line numbers that survive expansion, so every triple
// carries the file alone. Triples come sorted in N-Triples order, so the
// result does not depend on json-gold's map iteration.
func ParseJSONLD(file string, src []byte) ([]Triple, error) {
	text, ds := format.CleanText(file, src)
	if len(ds) > 0 {
		return nil, ds
	}
	var doc any
	dec := json.NewDecoder(bytes.NewReader(text))
	dec.UseNumber()
	if err := dec.Decode(&doc); err != nil {
		return nil, jsonDiag(file, text, err)
	}
	if dec.More() {
		return nil, format.Diags{{Pos: format.Pos{File: file, Line: 1, Col: 1}, Msg: "more than one JSON value in the file"}}
	}
	if depth(doc, 0) > MaxJSONLDDepth {
		return nil, format.Diags{{Pos: format.Pos{File: file, Line: 1, Col: 1}, Msg: fmt.Sprintf("JSON nested more than %d levels deep", MaxJSONLDDepth)}}
	}
	proc := ld.NewJsonLdProcessor()
	opts := ld.NewJsonLdOptions("")
	opts.DocumentLoader = refuseLoader{}
	res, err := toRDF(proc, doc, opts)
	if err != nil {
		return nil, format.Diags{{Pos: format.Pos{File: file, Line: 1, Col: 1}, Msg: "JSON-LD: " + gold(err)}}
	}
	set, ok := res.(*ld.RDFDataset)
	if !ok {
		return nil, fmt.Errorf("json-gold returned %T, not a dataset; please report this", res)
	}
	quads := set.Graphs["@default"]
	for g := range set.Graphs {
		if g != "@default" {
			return nil, format.Diags{{Pos: format.Pos{File: file, Line: 1, Col: 1}, Msg: fmt.Sprintf("the document holds a named graph (%s); import reads the default graph only", g)}}
		}
	}
	raw := map[string]string{} // json-gold's labels, kept as they are
	out := make([]Triple, 0, len(quads))
	for _, q := range quads {
		t, err := fromGold(q, raw)
		if err != nil {
			return nil, format.Diags{{Pos: format.Pos{File: file, Line: 1, Col: 1}, Msg: err.Error()}}
		}
		t.Pos = format.Pos{File: file}
		out = append(out, t)
	}
	// Sort by the text with blank nodes masked (then as labelled), and
	// relabel blank nodes in that order, so the result is one order.
	masked := func(t Triple) string {
		m := func(x Term) string {
			if x.Kind == Blank {
				return "_:"
			}
			return x.String()
		}
		return m(t.S) + " " + m(t.P) + " " + m(t.O)
	}
	sort.SliceStable(out, func(i, j int) bool {
		a, b := masked(out[i]), masked(out[j])
		if a != b {
			return a < b
		}
		return out[i].String() < out[j].String()
	})
	labels := map[string]string{}
	relabel := func(x Term) Term {
		if x.Kind == Blank {
			return blank(x.Value, labels)
		}
		return x
	}
	for i := range out {
		out[i].S, out[i].O = relabel(out[i].S), relabel(out[i].O)
	}
	return out, nil
}

func depth(v any, d int) int {
	if d > MaxJSONLDDepth {
		return d
	}
	best := d
	switch x := v.(type) {
	case map[string]any:
		for _, e := range x {
			best = max(best, depth(e, d+1))
		}
	case []any:
		for _, e := range x {
			best = max(best, depth(e, d+1))
		}
	}
	return best
}

// jsonDiag places a JSON syntax error.
func jsonDiag(file string, text []byte, err error) format.Diags {
	off := int64(0)
	var se *json.SyntaxError
	var te *json.UnmarshalTypeError
	switch {
	case errors.As(err, &se):
		off = se.Offset
	case errors.As(err, &te):
		off = te.Offset
	default:
		off = int64(len(text))
	}
	off = min(max(off-1, 0), int64(len(text)))
	line := 1 + bytes.Count(text[:off], []byte("\n"))
	start := bytes.LastIndexByte(text[:off], '\n') + 1
	col := len([]rune(string(text[start:off]))) + 1
	return format.Diags{{Pos: format.Pos{File: file, Line: line, Col: col}, Msg: "JSON: " + err.Error()}}
}

// refuseLoader is the document loader of every JSON-LD read: none.
type refuseLoader struct{}

func (refuseLoader) LoadDocument(u string) (*ld.RemoteDocument, error) {
	return nil, ld.NewJsonLdError(ld.LoadingDocumentFailed,
		fmt.Sprintf("the document refers to the remote context %s; ramify reads no URL: put the context into the file (\"@context\": {...})", u))
}

// fromGold turns one json-gold quad into a triple, relabelling blank nodes.
func fromGold(q *ld.Quad, labels map[string]string) (Triple, error) {
	conv := func(n ld.Node) (Term, error) {
		switch v := n.(type) {
		case ld.IRI:
			return NewIRI(v.Value), nil
		case *ld.IRI:
			return NewIRI(v.Value), nil
		case ld.BlankNode:
			return blank(v.Attribute, labels), nil
		case *ld.BlankNode:
			return blank(v.Attribute, labels), nil
		case ld.Literal:
			return goldLiteral(v), nil
		case *ld.Literal:
			return goldLiteral(*v), nil
		}
		return Term{}, fmt.Errorf("unexpected RDF node %T", n)
	}
	s, err := conv(q.Subject)
	if err != nil {
		return Triple{}, err
	}
	p, err := conv(q.Predicate)
	if err != nil {
		return Triple{}, err
	}
	o, err := conv(q.Object)
	if err != nil {
		return Triple{}, err
	}
	return Triple{S: s, P: p, O: o}, nil
}

func goldLiteral(l ld.Literal) Term {
	if l.Datatype == RDFLangString || l.Language != "" {
		return NewLiteral(l.Value, l.Language, "")
	}
	return NewLiteral(l.Value, "", l.Datatype)
}

func blank(label string, labels map[string]string) Term {
	label = strings.TrimPrefix(label, "_:")
	fresh, ok := labels[label]
	if !ok {
		fresh = fmt.Sprintf("b%d", len(labels)+1)
		labels[label] = fresh
	}
	return NewBlank(fresh)
}

// relativeIRI is the first IRI of t without a scheme, or "".
func relativeIRI(t Triple) string {
	for _, x := range []Term{t.S, t.P, t.O} {
		if x.Kind == IRI && !isAbsoluteIRI(x.Value) {
			return x.Value
		}
		if x.Kind == Literal && !isAbsoluteIRI(x.Datatype) {
			return x.Datatype
		}
	}
	return ""
}
