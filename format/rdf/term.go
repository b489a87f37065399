// Package rdf reads RDF graphs for `ramify init --from`: Turtle with its
// own reader, N-Triples and JSON-LD through github.com/piprate/json-gold.
// Every reader returns the same plain triples, each with the place in the
// file it came from where the syntax has places (JSON-LD has none), so a
// problem found later, such as a concept with two broader concepts, can
// name the statements behind it.
package rdf

import (
	"fmt"
	"strings"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/export"
)

// Kind says what a term is.
type Kind uint8

const (
	IRI Kind = iota + 1
	Blank
	Literal
)

// Vocabulary IRIs the readers need.
const (
	NSRDF         = "http://www.w3.org/1999/02/22-rdf-syntax-ns#"
	NSXSD         = "http://www.w3.org/2001/XMLSchema#"
	RDFType       = NSRDF + "type"
	RDFFirst      = NSRDF + "first"
	RDFRest       = NSRDF + "rest"
	RDFNil        = NSRDF + "nil"
	RDFLangString = NSRDF + "langString"
	XSDString     = NSXSD + "string"
	XSDInteger    = NSXSD + "integer"
	XSDDecimal    = NSXSD + "decimal"
	XSDDouble     = NSXSD + "double"
	XSDBoolean    = NSXSD + "boolean"
)

// Term is an IRI, a blank node (Value is its label, unique within one
// read) or a literal (Value is its lexical form; Datatype is always set,
// rdf:langString when Lang is, xsd:string for a plain string, as RDF 1.1
// has it).
type Term struct {
	Kind     Kind
	Value    string
	Lang     string
	Datatype string
}

// NewIRI, NewBlank and NewString build terms.
func NewIRI(v string) Term   { return Term{Kind: IRI, Value: v} }
func NewBlank(v string) Term { return Term{Kind: Blank, Value: v} }

// NewLiteral is a literal with a language tag (lang not empty, kept as
// written: tags compare without case) or a datatype (xsd:string when
// empty).
func NewLiteral(v, lang, datatype string) Term {
	if lang != "" {
		return Term{Kind: Literal, Value: v, Lang: lang, Datatype: RDFLangString}
	}
	if datatype == "" {
		datatype = XSDString
	}
	return Term{Kind: Literal, Value: v, Datatype: datatype}
}

// String writes the term as N-Triples does.
func (t Term) String() string {
	switch t.Kind {
	case IRI:
		return "<" + escapeIRI(t.Value) + ">"
	case Blank:
		return "_:" + t.Value
	case Literal:
		s := quoteLiteral(t.Value)
		switch {
		case t.Lang != "":
			return s + "@" + t.Lang
		case t.Datatype != "" && t.Datatype != XSDString:
			return s + "^^<" + escapeIRI(t.Datatype) + ">"
		}
		return s
	}
	return "?"
}

// Triple is one statement and where it was read.
type Triple struct {
	S, P, O Term
	// Pos is where the statement's object starts; File only (no line)
	// for syntaxes without places.
	Pos format.Pos
}

// String writes the triple as one N-Triples line without the newline.
func (t Triple) String() string {
	return t.S.String() + " " + t.P.String() + " " + t.O.String() + " ."
}

// Where says where the triple was read, for messages: its position, or
// the file and the triple itself when the syntax has no positions.
func (t Triple) Where() string {
	if t.Pos.Line > 0 {
		return t.Pos.String()
	}
	return fmt.Sprintf("%s: %s", t.Pos.File, t)
}

// quoteLiteral writes s as an N-Triples STRING_LITERAL_QUOTE, with the
// escapes Turtle, N-Triples and TOML share (export.QuotedString).
func quoteLiteral(s string) string { return export.QuotedString(s) }

// escapeIRI writes the characters an N-Triples IRIREF cannot hold as
// \uXXXX escapes.
func escapeIRI(s string) string {
	if !strings.ContainsFunc(s, badIRIRune) {
		return s
	}
	var b strings.Builder
	for _, r := range s {
		if badIRIRune(r) {
			fmt.Fprintf(&b, `\u%04X`, r)
		} else {
			b.WriteRune(r)
		}
	}
	return b.String()
}

func badIRIRune(r rune) bool {
	return r <= 0x20 || strings.ContainsRune("<>\"{}|^`\\", r)
}

// FormatNTriples writes triples as an N-Triples document.
func FormatNTriples(ts []Triple) string {
	var b strings.Builder
	for _, t := range ts {
		b.WriteString(t.String())
		b.WriteByte('\n')
	}
	return b.String()
}
