package rdf

import (
	"sort"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/export"
)

// MaxNesting bounds how deeply blank-node property lists and collections
// may nest in a Turtle file, so that a hostile file cannot exhaust the
// stack.
const MaxNesting = 64

// ParseTurtle reads a Turtle document (W3C Recommendation "RDF 1.1
// Turtle", 25 February 2014; the grammar of its section 6.5) into
// triples, in document order. base resolves relative IRIs (RFC 3986
// section 5.2) until an @base or BASE directive changes it; with an empty
// base a relative IRI is an error. Blank nodes get fresh labels "b1",
// "b2", ... in order of first appearance. The first syntax error stops
// the read and is returned as format.Diags with its file:line:col.
func ParseTurtle(file string, src []byte, base string) ([]Triple, error) {
	text, ds := format.CleanText(file, src)
	if len(ds) > 0 {
		return nil, ds
	}
	p := &turtleParser{file: file, src: text, base: base, prefixes: map[string]string{}, labels: map[string]string{}}
	p.lines = []int{0}
	for i, c := range text {
		if c == '\n' {
			p.lines = append(p.lines, i+1)
		}
	}
	if err := p.parse(); err != nil {
		return nil, err
	}
	return p.out, nil
}

type turtleParser struct {
	file     string
	src      []byte
	off      int
	lines    []int // byte offset of each line's start
	base     string
	prefixes map[string]string
	labels   map[string]string // blank node label in the file -> fresh label
	blanks   int
	depth    int
	out      []Triple
	cursor   struct{ line, off, col, next int }
}

// turtleBail carries the first error out of the recursive descent.
type turtleBail struct{ diag format.Diag }

func (p *turtleParser) parse() (err error) {
	defer func() {
		if r := recover(); r != nil {
			b, ok := r.(turtleBail)
			if !ok {
				panic(r)
			}
			err = format.Diags{b.diag}
		}
	}()
	for {
		p.skipSpace()
		if p.off >= len(p.src) {
			return nil
		}
		p.statement()
	}
}

// posAt is the place of byte off, the column counted in characters.
// Places are asked for mostly in increasing order, so the last answer is
// kept and counting goes on from it: a long line costs linear time, not
// quadratic.
func (p *turtleParser) posAt(off int) format.Pos {
	c := &p.cursor
	if c.line == 0 || off < c.off || off >= c.next {
		line := sort.Search(len(p.lines), func(i int) bool { return p.lines[i] > off })
		c.line, c.off, c.col = line, p.lines[line-1], 1
		c.next = len(p.src) + 1
		if line < len(p.lines) {
			c.next = p.lines[line]
		}
	}
	c.col += utf8.RuneCount(p.src[c.off:off])
	c.off = off
	return format.Pos{File: p.file, Line: c.line, Col: c.col}
}

func (p *turtleParser) failAt(off int, msg string, args ...any) {
	var ds format.Diags
	ds.Add(p.posAt(off), msg, args...)
	panic(turtleBail{ds[0]})
}

func (p *turtleParser) fail(msg string, args ...any) { p.failAt(p.off, msg, args...) }

func (p *turtleParser) peek() byte {
	if p.off < len(p.src) {
		return p.src[p.off]
	}
	return 0
}

func (p *turtleParser) peekAt(k int) byte {
	if p.off+k < len(p.src) {
		return p.src[p.off+k]
	}
	return 0
}

// skipSpace skips white space and comments.
func (p *turtleParser) skipSpace() {
	for p.off < len(p.src) {
		switch p.src[p.off] {
		case ' ', '\t', '\n', '\r':
			p.off++
		case '#':
			for p.off < len(p.src) && p.src[p.off] != '\n' {
				p.off++
			}
		default:
			return
		}
	}
}

// expect skips space and consumes c, or fails naming what was wanted.
func (p *turtleParser) expect(c byte, what string) {
	p.skipSpace()
	if p.peek() != c {
		p.fail("expected %s, found %s", what, p.found())
	}
	p.off++
}

// found describes what stands at the current place, for messages.
func (p *turtleParser) found() string {
	if p.off >= len(p.src) {
		return "the end of the file"
	}
	r, _ := utf8.DecodeRune(p.src[p.off:])
	return strconv.QuoteRune(r)
}

// keyword reports whether the word kw (compared without case when fold)
// stands here followed by white space or one of the bytes in next, and
// consumes it if so.
func (p *turtleParser) keyword(kw string, fold bool, next string) bool {
	end := p.off + len(kw)
	if end > len(p.src) {
		return false
	}
	w := string(p.src[p.off:end])
	if w != kw && !(fold && strings.EqualFold(w, kw)) {
		return false
	}
	if end < len(p.src) {
		c := p.src[end]
		if !(c == ' ' || c == '\t' || c == '\n' || c == '\r' || c == '#' || strings.IndexByte(next, c) >= 0) {
			return false
		}
	}
	p.off = end
	return true
}

func (p *turtleParser) statement() {
	start := p.off
	switch {
	case p.peek() == '@':
		p.off++
		switch {
		case p.keyword("prefix", false, ""):
			p.prefixDirective()
			p.expect('.', `"." after the @prefix directive`)
		case p.keyword("base", false, "<"):
			p.baseDirective()
			p.expect('.', `"." after the @base directive`)
		default:
			p.failAt(start, "unknown directive; Turtle has @prefix and @base")
		}
	case p.keyword("PREFIX", true, ""):
		p.prefixDirective()
	case p.keyword("BASE", true, "<"):
		p.baseDirective()
	default:
		p.triples()
		p.expect('.', `"." at the end of the statement`)
	}
}

func (p *turtleParser) prefixDirective() {
	p.skipSpace()
	at := p.off
	name := p.prefixName()
	if p.peek() != ':' {
		p.failAt(at, "expected a prefix name ending in \":\", found %s", p.found())
	}
	p.off++
	p.skipSpace()
	if p.peek() != '<' {
		p.fail("expected the prefix's IRI in <...>, found %s", p.found())
	}
	p.prefixes[name] = p.iriRef()
}

func (p *turtleParser) baseDirective() {
	p.skipSpace()
	if p.peek() != '<' {
		p.fail("expected the base IRI in <...>, found %s", p.found())
	}
	p.base = p.iriRef()
}

func (p *turtleParser) triples() {
	p.skipSpace()
	if p.peek() == '[' {
		at := p.off
		subj, anon := p.blankNodePropertyList()
		p.skipSpace()
		if anon || p.peek() != '.' {
			if anon && p.peek() == '.' {
				p.failAt(at, "an empty [] as subject needs predicates after it")
			}
			p.predicateObjectList(subj)
		}
		return
	}
	subj := p.subject()
	p.predicateObjectList(subj)
}

func (p *turtleParser) subject() Term {
	p.skipSpace()
	if t, ok := p.node(); ok {
		return t
	}
	if c := p.peek(); c == '"' || c == '\'' || c == '+' || c == '-' || c >= '0' && c <= '9' {
		p.fail("a literal cannot be a subject")
	}
	return NewIRI(p.prefixedName())
}

// node reads the terms that open alike as a subject or an object: an IRI
// in angle brackets, a blank node label or a collection; ok is false, and
// nothing is read, before anything else. A prefixed name, which both
// also take, is left to the caller to try last.
func (p *turtleParser) node() (t Term, ok bool) {
	switch c := p.peek(); {
	case c == '<':
		return NewIRI(p.iriRef()), true
	case c == '_' && p.peekAt(1) == ':':
		return p.blankLabel(), true
	case c == '(':
		return p.collection(), true
	}
	return Term{}, false
}

// predicateObjectList reads "verb objects (; verb objects)*", a trailing
// ";" allowed.
func (p *turtleParser) predicateObjectList(subj Term) {
	p.verbObjects(subj)
	for {
		p.skipSpace()
		if p.peek() != ';' {
			return
		}
		for p.peek() == ';' {
			p.off++
			p.skipSpace()
		}
		if c := p.peek(); c == '.' || c == ']' || c == 0 {
			return
		}
		p.verbObjects(subj)
	}
}

func (p *turtleParser) verbObjects(subj Term) {
	p.skipSpace()
	var pred Term
	if p.peek() == 'a' && !isNameByte(p.peekAt(1)) {
		p.off++
		pred = NewIRI(RDFType)
	} else if p.peek() == '<' {
		pred = NewIRI(p.iriRef())
	} else {
		if c := p.peek(); c == '[' || c == '"' || c == '\'' || c == '(' || c == '_' && p.peekAt(1) == ':' {
			p.fail("a predicate must be an IRI, found %s", p.found())
		}
		pred = NewIRI(p.prefixedName())
	}
	for {
		p.skipSpace()
		at := p.off
		obj := p.object()
		p.emit(subj, pred, obj, at)
		p.skipSpace()
		if p.peek() != ',' {
			return
		}
		p.off++
	}
}

func (p *turtleParser) emit(s, pr, o Term, at int) {
	p.out = append(p.out, Triple{S: s, P: pr, O: o, Pos: p.posAt(at)})
}

func (p *turtleParser) object() Term {
	p.skipSpace()
	if t, ok := p.node(); ok {
		return t
	}
	switch c := p.peek(); {
	case c == '[':
		t, _ := p.blankNodePropertyList()
		return t
	case c == '"' || c == '\'':
		return p.rdfLiteral()
	case c == '+' || c == '-' || c >= '0' && c <= '9' || c == '.' && isDigit(p.peekAt(1)):
		return p.number()
	case p.keyword("true", false, ".,;])"):
		return NewLiteral("true", "", XSDBoolean)
	case p.keyword("false", false, ".,;])"):
		return NewLiteral("false", "", XSDBoolean)
	case c == 0 || c == '.' || c == ',' || c == ';' || c == ']' || c == ')':
		p.fail("expected an object, found %s", p.found())
	}
	return NewIRI(p.prefixedName())
}

func (p *turtleParser) newBlank() Term {
	p.blanks++
	return NewBlank("b" + strconv.Itoa(p.blanks))
}

func (p *turtleParser) nest(at int) {
	if p.depth++; p.depth > MaxNesting {
		p.failAt(at, "nested more than %d levels deep", MaxNesting)
	}
}

// blankNodePropertyList reads "[ ... ]"; anon reports the empty "[]".
func (p *turtleParser) blankNodePropertyList() (t Term, anon bool) {
	at := p.off
	p.off++ // '['
	t = p.newBlank()
	p.skipSpace()
	if p.peek() == ']' {
		p.off++
		return t, true
	}
	p.nest(at)
	p.predicateObjectList(t)
	p.expect(']', `"]" closing the "[" at `+p.posAt(at).String())
	p.depth--
	return t, false
}

// collection reads "( objects )" as an RDF list.
func (p *turtleParser) collection() Term {
	at := p.off
	p.off++ // '('
	p.nest(at)
	head := NewIRI(RDFNil)
	var prev Term
	for {
		p.skipSpace()
		if p.peek() == ')' {
			p.off++
			break
		}
		if p.peek() == 0 {
			p.fail(`expected ")" closing the "(" at %s, found the end of the file`, p.posAt(at))
		}
		node := p.newBlank()
		if prev.Kind == 0 {
			head = node
		} else {
			p.emit(prev, NewIRI(RDFRest), node, p.off)
		}
		objAt := p.off
		obj := p.object()
		p.emit(node, NewIRI(RDFFirst), obj, objAt)
		prev = node
	}
	if prev.Kind != 0 {
		p.emit(prev, NewIRI(RDFRest), NewIRI(RDFNil), p.off-1)
	}
	p.depth--
	return head
}

// iriRef reads "<...>" and resolves it against the base.
func (p *turtleParser) iriRef() string {
	at := p.off
	p.off++ // '<'
	var b strings.Builder
	for {
		c := p.inside(at, "IRI not closed with \">\"")
		switch {
		case c == '>':
			p.off++
			return p.resolve(b.String(), at)
		case c == '\\':
			if n := p.peekAt(1); n != 'u' && n != 'U' {
				p.fail(`only \u and \U escapes are allowed in an IRI`)
			}
			r := p.uchar()
			if r <= 0x20 || strings.ContainsRune("<>\"{}|^`\\", r) {
				p.failAt(at, "IRI holds the character %q, which an IRI cannot", r)
			}
			b.WriteRune(r)
		case c <= 0x20 || strings.IndexByte("<\"{}|^`", c) >= 0:
			p.fail("IRI holds the character %q, which an IRI cannot", rune(c))
		default:
			p.copyRune(&b)
		}
	}
}

func (p *turtleParser) resolve(ref string, at int) string {
	if isAbsoluteIRI(ref) {
		return resolveIRI(ref, ref)
	}
	if p.base == "" {
		p.failAt(at, "relative IRI <%s> with no base IRI to resolve it against (add an @base directive)", ref)
	}
	return resolveIRI(p.base, ref)
}

// uchar reads \uXXXX or \UXXXXXXXX at the current place.
func (p *turtleParser) uchar() rune {
	at := p.off
	n := 4
	if p.peekAt(1) == 'U' {
		n = 8
	}
	if p.off+2+n > len(p.src) {
		p.failAt(at, "escape \\%c needs %d hex digits", p.peekAt(1), n)
	}
	v, err := strconv.ParseUint(string(p.src[p.off+2:p.off+2+n]), 16, 32)
	if err != nil {
		p.failAt(at, "escape \\%c needs %d hex digits", p.peekAt(1), n)
	}
	r := rune(v)
	if !utf8.ValidRune(r) {
		p.failAt(at, "escape \\%c%s is not a Unicode character", p.peekAt(1), p.src[p.off+2:p.off+2+n])
	}
	p.off += 2 + n
	return r
}

// prefixName reads a PN_PREFIX (possibly empty) up to its ":".
func (p *turtleParser) prefixName() string {
	start := p.off
	if r, size := p.rune(); isPNCharsBase(r) {
		p.off += size
		p.nameRest()
	}
	return string(p.src[start:p.off])
}

// inside is the byte at the current place in a token (an IRI, a string)
// that opened at at; the input ending first fails there with msg.
func (p *turtleParser) inside(at int, msg string) byte {
	if p.off >= len(p.src) {
		p.failAt(at, "%s", msg)
	}
	return p.src[p.off]
}

// copyRune copies the character at the current place to b and moves past
// it.
func (p *turtleParser) copyRune(b *strings.Builder) {
	r, size := p.rune()
	b.WriteRune(r)
	p.off += size
}

func (p *turtleParser) rune() (rune, int) {
	if p.off >= len(p.src) {
		return -1, 0
	}
	return utf8.DecodeRune(p.src[p.off:])
}

// prefixedName reads PNAME_NS or PNAME_LN and expands it.
func (p *turtleParser) prefixedName() string {
	at := p.off
	prefix := p.prefixName()
	if p.peek() != ':' {
		p.failAt(at, "expected an IRI, a prefixed name, a blank node or a literal, found %s", p.found())
	}
	p.off++
	ns, ok := p.prefixes[prefix]
	if !ok {
		p.failAt(at, "prefix %q is not declared (add @prefix %s: <...> .)", prefix+":", prefix)
	}
	return ns + p.localName()
}

// localName reads a PN_LOCAL, percent escapes kept, backslash escapes
// replaced by the character they escape.
func (p *turtleParser) localName() string {
	var b strings.Builder
	first := true
	// trailing counts the dots at the end of b, which belong to the
	// statement, not the name.
	trailing := 0
	for p.off < len(p.src) {
		r, size := p.rune()
		switch {
		case r == '%':
			if !isHex(p.peekAt(1)) || !isHex(p.peekAt(2)) {
				p.fail("%% in a local name must be followed by two hex digits")
			}
			b.Write(p.src[p.off : p.off+3])
			p.off += 3
			trailing = 0
		case r == '\\':
			c := p.peekAt(1)
			if c == 0 || strings.IndexByte("_~.-!$&'()*+,;=/?#@%", c) < 0 {
				p.fail("%q cannot be escaped in a local name", rune(c))
			}
			b.WriteByte(c)
			p.off += 2
			trailing = 0
		case r == '.' && !first:
			b.WriteByte('.')
			p.off++
			trailing++
		case first && (isPNCharsU(r) || r == ':' || r >= '0' && r <= '9'), !first && (isPNChars(r) || r == ':'):
			b.WriteRune(r)
			p.off += size
			trailing = 0
		default:
			goto done
		}
		first = false
	}
done:
	p.off -= trailing
	s := b.String()
	return s[:len(s)-trailing]
}

// nameRest reads what follows the first character of a prefix or a blank
// node label: PN_CHARS and dots, but not a dot at the end, which is left
// to end the statement. The first character, never a dot, stops the
// backing up.
func (p *turtleParser) nameRest() {
	for {
		r, size := p.rune()
		if !isPNChars(r) && r != '.' {
			break
		}
		p.off += size
	}
	for p.src[p.off-1] == '.' {
		p.off--
	}
}

func (p *turtleParser) blankLabel() Term {
	at := p.off
	p.off += 2 // "_:"
	start := p.off
	if r, size := p.rune(); isPNCharsU(r) || r >= '0' && r <= '9' {
		p.off += size
		p.nameRest()
	}
	if p.off == start {
		p.failAt(at, "blank node label \"_:\" has no name")
	}
	label := string(p.src[start:p.off])
	fresh, ok := p.labels[label]
	if !ok {
		fresh = p.newBlank().Value
		p.labels[label] = fresh
	}
	return NewBlank(fresh)
}

// rdfLiteral reads a string with its language tag or datatype.
func (p *turtleParser) rdfLiteral() Term {
	s := p.stringLiteral()
	switch {
	case p.peek() == '@':
		at := p.off
		p.off++
		start := p.off
		for isLetter(p.peek()) {
			p.off++
		}
		if p.off == start {
			p.failAt(at, "language tag is empty")
		}
		for p.peek() == '-' && (isLetter(p.peekAt(1)) || isDigit(p.peekAt(1))) {
			p.off++
			for isLetter(p.peek()) || isDigit(p.peek()) {
				p.off++
			}
		}
		return NewLiteral(s, string(p.src[start:p.off]), "")
	case p.peek() == '^' && p.peekAt(1) == '^':
		p.off += 2
		if p.peek() == '<' {
			return NewLiteral(s, "", p.iriRef())
		}
		return NewLiteral(s, "", p.prefixedName())
	}
	return NewLiteral(s, "", "")
}

// stringLiteral reads any of Turtle's four string forms.
func (p *turtleParser) stringLiteral() string {
	at := p.off
	q := p.src[p.off]
	long := p.peekAt(1) == q && p.peekAt(2) == q
	if long {
		p.off += 3
	} else {
		p.off++
	}
	var b strings.Builder
	for {
		c := p.inside(at, "string not closed")
		switch {
		case c == q && !long:
			p.off++
			return b.String()
		case c == q:
			run := 0
			for p.peekAt(run) == q {
				run++
			}
			if run >= 3 {
				if run > 5 {
					p.fail("too many quotes in a row in a long string")
				}
				for i := 0; i < run-3; i++ {
					b.WriteByte(q)
				}
				p.off += run
				return b.String()
			}
			for i := 0; i < run; i++ {
				b.WriteByte(q)
			}
			p.off += run
		case c == '\\':
			e := p.peekAt(1)
			if e == 'u' || e == 'U' {
				b.WriteRune(p.uchar())
				continue
			}
			x, ok := export.EscapedByte(e)
			if !ok {
				p.fail("unknown escape %q in a string", "\\"+string(rune(e)))
			}
			b.WriteByte(x)
			p.off += 2
		case (c == '\n' || c == '\r') && !long:
			p.failAt(at, "string not closed before the end of the line (use \"\"\" for text over several lines)")
		default:
			p.copyRune(&b)
		}
	}
}

// number reads INTEGER, DECIMAL or DOUBLE, keeping the lexical form.
func (p *turtleParser) number() Term {
	start := p.off
	if c := p.peek(); c == '+' || c == '-' {
		p.off++
	}
	digits := func() int {
		n := 0
		for isDigit(p.peek()) {
			p.off++
			n++
		}
		return n
	}
	intDigits := digits()
	kind := XSDInteger
	if p.peek() == '.' && isDigit(p.peekAt(1)) {
		p.off++
		digits()
		kind = XSDDecimal
	}
	// The exponent's "e" is the next byte, or the one after a dot that
	// follows the integer digits ("1.e5" is a DOUBLE too); without digits
	// after it (and its sign) it is not read.
	e := 0
	if c := p.peek(); (c == 'e' || c == 'E') && (intDigits > 0 || kind == XSDDecimal) {
		e = 1
	} else if c == '.' && intDigits > 0 && (p.peekAt(1) == 'e' || p.peekAt(1) == 'E') {
		e = 2
	}
	if e > 0 {
		save := p.off
		p.off += e
		if c := p.peek(); c == '+' || c == '-' {
			p.off++
		}
		if digits() == 0 {
			p.off = save
		} else {
			kind = XSDDouble
		}
	}
	if intDigits == 0 && kind == XSDInteger {
		p.failAt(start, "expected a number after the sign")
	}
	return NewLiteral(string(p.src[start:p.off]), "", kind)
}

func isDigit(c byte) bool  { return c >= '0' && c <= '9' }
func isLetter(c byte) bool { return c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' }
func isHex(c byte) bool    { return isDigit(c) || c >= 'a' && c <= 'f' || c >= 'A' && c <= 'F' }

// isNameByte reports whether c may continue a name, so that "a" followed
// by it is not the keyword a.
func isNameByte(c byte) bool {
	return isLetter(c) || isDigit(c) || c == '_' || c == '-' || c == ':' || c == '%' || c == '\\' || c >= 0x80
}

// The character classes of the Turtle grammar (productions 163–166).
func isPNCharsBase(r rune) bool {
	switch {
	case r >= 'A' && r <= 'Z', r >= 'a' && r <= 'z',
		r >= 0xC0 && r <= 0xD6, r >= 0xD8 && r <= 0xF6, r >= 0xF8 && r <= 0x2FF,
		r >= 0x370 && r <= 0x37D, r >= 0x37F && r <= 0x1FFF, r >= 0x200C && r <= 0x200D,
		r >= 0x2070 && r <= 0x218F, r >= 0x2C00 && r <= 0x2FEF, r >= 0x3001 && r <= 0xD7FF,
		r >= 0xF900 && r <= 0xFDCF, r >= 0xFDF0 && r <= 0xFFFD, r >= 0x10000 && r <= 0xEFFFF:
		return true
	}
	return false
}

func isPNCharsU(r rune) bool { return isPNCharsBase(r) || r == '_' }

func isPNChars(r rune) bool {
	return isPNCharsU(r) || r == '-' || r >= '0' && r <= '9' || r == 0xB7 ||
		r >= 0x300 && r <= 0x36F || r >= 0x203F && r <= 0x2040
}
