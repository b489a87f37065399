package export

import (
	"fmt"
	"strconv"
	"strings"
	"unicode/utf8"
)

// This file reads N-Triples, the line-based RDF form that Debian's
// rapper prints, so tests can look at the triples an independent Turtle
// parser found in an export.

// rdfTerm is an IRI, a blank node or a literal.
type rdfTerm struct {
	kind     byte // 'i' IRI, 'b' blank node, 'l' literal
	value    string
	lang     string
	datatype string
}

func (t rdfTerm) String() string {
	switch t.kind {
	case 'i':
		return "<" + t.value + ">"
	case 'b':
		return "_:" + t.value
	}
	s := strconv.Quote(t.value)
	if t.lang != "" {
		s += "@" + t.lang
	}
	if t.datatype != "" {
		s += "^^<" + t.datatype + ">"
	}
	return s
}

type rdfTriple struct{ s, p, o rdfTerm }

// parseNTriples reads every triple line; blank lines and comments are
// skipped.
func parseNTriples(text string) ([]rdfTriple, error) {
	var out []rdfTriple
	for n, line := range strings.Split(text, "\n") {
		line = strings.TrimSpace(line)
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		r := &ntReader{s: line}
		var tr rdfTriple
		var err error
		if tr.s, err = r.term(); err == nil {
			if tr.p, err = r.term(); err == nil {
				tr.o, err = r.term()
			}
		}
		if err == nil {
			r.space()
			if r.s[r.i:] != "." {
				err = fmt.Errorf("expected \".\" at the end, found %q", r.s[r.i:])
			}
		}
		if err != nil {
			return nil, fmt.Errorf("line %d: %v: %s", n+1, err, line)
		}
		out = append(out, tr)
	}
	return out, nil
}

type ntReader struct {
	s string
	i int
}

func (r *ntReader) space() {
	for r.i < len(r.s) && (r.s[r.i] == ' ' || r.s[r.i] == '\t') {
		r.i++
	}
}

func (r *ntReader) term() (rdfTerm, error) {
	r.space()
	if r.i >= len(r.s) {
		return rdfTerm{}, fmt.Errorf("line ends early")
	}
	switch {
	case r.s[r.i] == '<':
		v, err := r.iri()
		return rdfTerm{kind: 'i', value: v}, err
	case strings.HasPrefix(r.s[r.i:], "_:"):
		start := r.i + 2
		r.i = start
		for r.i < len(r.s) && r.s[r.i] != ' ' && r.s[r.i] != '\t' {
			r.i++
		}
		return rdfTerm{kind: 'b', value: r.s[start:r.i]}, nil
	case r.s[r.i] == '"':
		return r.literal()
	}
	return rdfTerm{}, fmt.Errorf("unexpected %q", r.s[r.i])
}

func (r *ntReader) iri() (string, error) {
	end := strings.IndexByte(r.s[r.i:], '>')
	if end < 0 {
		return "", fmt.Errorf("IRI without \">\"")
	}
	raw := r.s[r.i+1 : r.i+end]
	r.i += end + 1
	return unescapeNT(raw)
}

func (r *ntReader) literal() (rdfTerm, error) {
	r.i++ // opening quote
	start := r.i
	for r.i < len(r.s) && r.s[r.i] != '"' {
		if r.s[r.i] == '\\' {
			r.i++
		}
		r.i++
	}
	if r.i >= len(r.s) {
		return rdfTerm{}, fmt.Errorf("literal without closing quote")
	}
	v, err := unescapeNT(r.s[start:r.i])
	if err != nil {
		return rdfTerm{}, err
	}
	r.i++ // closing quote
	t := rdfTerm{kind: 'l', value: v}
	switch {
	case strings.HasPrefix(r.s[r.i:], "@"):
		start := r.i + 1
		r.i = start
		for r.i < len(r.s) && r.s[r.i] != ' ' && r.s[r.i] != '\t' {
			r.i++
		}
		t.lang = r.s[start:r.i]
	case strings.HasPrefix(r.s[r.i:], "^^"):
		r.i += 2
		if r.i >= len(r.s) || r.s[r.i] != '<' {
			return rdfTerm{}, fmt.Errorf("datatype is not an IRI")
		}
		t.datatype, err = r.iri()
	}
	return t, err
}

// unescapeNT undoes the escapes N-Triples allows: ECHAR and \u, \U.
func unescapeNT(s string) (string, error) {
	if !strings.Contains(s, `\`) {
		if !utf8.ValidString(s) {
			return "", fmt.Errorf("invalid UTF-8")
		}
		return s, nil
	}
	var b strings.Builder
	for i := 0; i < len(s); i++ {
		c := s[i]
		if c != '\\' {
			b.WriteByte(c)
			continue
		}
		i++
		if i >= len(s) {
			return "", fmt.Errorf("escape at the end")
		}
		if x, ok := EscapedByte(s[i]); ok {
			b.WriteByte(x)
			continue
		}
		switch s[i] {
		case 'u', 'U':
			n := 4
			if s[i] == 'U' {
				n = 8
			}
			if i+n >= len(s) {
				return "", fmt.Errorf("short \\%c escape", s[i])
			}
			v, err := strconv.ParseUint(s[i+1:i+1+n], 16, 32)
			if err != nil {
				return "", fmt.Errorf("bad \\%c escape: %v", s[i], err)
			}
			b.WriteRune(rune(v))
			i += n
		default:
			return "", fmt.Errorf("unknown escape \\%c", s[i])
		}
	}
	return b.String(), nil
}
