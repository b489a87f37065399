package format

import (
	"strconv"
	"unicode/utf8"
)

// The TOML decoder turns text into values but does not say where a key or
// a string was written, and it recurses into nested arrays without a bound.
// scanTOML is a light lexical pass that runs first: it records where every
// table header, key and string literal is, so errors can point at them, and
// it refuses inputs that would make the decoder recurse deeply or allocate
// without bound. It does not report syntax errors; the decoder does that
// better. When it meets text it does not understand, it stops recording
// positions and only keeps counting brackets, so the nesting bound holds
// even then.

// tomlLimits bounds what one TOML file may hold.
type tomlLimits struct {
	MaxNesting  int // arrays and inline tables inside each other
	MaxArray    int // elements of one array
	MaxKeyParts int // parts of one dotted key
	MaxHeaders  int // table headers in the file
	// TooManyHeaders is the message when MaxHeaders is passed; files of
	// records say "records" or "items" rather than "tables".
	TooManyHeaders string
	MaxKeys        int // key/value lines in the file
	// WantStrings records every string literal of each value, for files
	// whose messages point inside values (item ids, shape outlines,
	// paths); a big items file goes without.
	WantStrings bool
}

// lineCol is a 1-based line and character column.
type lineCol struct{ Line, Col int }

// tomlHeader is a [table] or [[array-of-tables]] header.
type tomlHeader struct {
	Path  []string
	Array bool
	At    lineCol
}

// tomlKey is one key = value line (or a key inside an inline table, which
// is recorded as part of its outer key's value, not on its own).
type tomlKey struct {
	Header  int      // index into tomlScan.Headers; -1 before any header
	Path    []string // as written, relative to its table
	At      lineCol
	Array   bool // the value is an array
	Strings []tomlString
}

// tomlString is a string literal inside a value.
type tomlString struct {
	At lineCol // the opening quote
	// Starts holds where each line of the decoded value begins in the
	// file: one entry for a one-line string, one per line otherwise.
	Starts []lineCol
}

type tomlScan struct {
	Headers []tomlHeader
	Keys    []tomlKey
	// Confused is set when the scanner met text it could not follow; the
	// decoder then reports a syntax error, or positions may be missing.
	Confused bool
}

// tomlLimitError is a limit the input broke, with the place it broke it.
type tomlLimitError struct {
	At  lineCol
	Msg string
}

type tomlScanner struct {
	data      []byte
	i         int
	line      int
	lineStart int
	// colAt and colRunes cache the rune column of one offset on the
	// current line, so columns cost O(distance) rather than O(line).
	colAt, colRunes int
	lim             tomlLimits
	out             *tomlScan
	limit           *tomlLimitError
	confused        bool
	depth           int
}

// scanTOML scans data (already through CleanText). It returns the
// positions found, or the first limit the text breaks.
func scanTOML(data []byte, lim tomlLimits) (*tomlScan, *tomlLimitError) {
	s := &tomlScanner{data: data, line: 1, lim: lim, out: &tomlScan{}}
	s.run()
	if s.limit != nil {
		return nil, s.limit
	}
	s.out.Confused = s.confused
	return s.out, nil
}

func (s *tomlScanner) run() {
	for s.i < len(s.data) && s.limit == nil && !s.confused {
		s.skipSpace()
		if s.i >= len(s.data) {
			break
		}
		switch s.data[s.i] {
		case '\n':
			s.newline()
			continue
		case '#':
			s.skipComment()
			continue
		case '[':
			s.header()
		default:
			s.keyValue()
		}
		if s.limit == nil && !s.confused {
			s.endOfLine()
		}
	}
	if s.confused && s.limit == nil {
		s.crude()
	}
}

func (s *tomlScanner) peek(off int) byte {
	if s.i+off < len(s.data) {
		return s.data[s.i+off]
	}
	return 0
}

func (s *tomlScanner) newline() {
	s.i++
	s.line++
	s.lineStart = s.i
	s.colAt, s.colRunes = s.i, 0
}

// here is the position of offset i, which must be on the current line.
func (s *tomlScanner) here() lineCol {
	if s.colAt < s.lineStart || s.colAt > s.i {
		s.colAt, s.colRunes = s.lineStart, 0
	}
	s.colRunes += utf8.RuneCount(s.data[s.colAt:s.i])
	s.colAt = s.i
	return lineCol{s.line, s.colRunes + 1}
}

func (s *tomlScanner) fail(at lineCol, msg string) {
	if s.limit == nil {
		s.limit = &tomlLimitError{At: at, Msg: msg}
	}
}

// skipSpace skips spaces and tabs, and the CR of a CRLF line end: CleanText
// turns CRLF into LF, but "\r\r\n" still leaves one CRLF behind, and the
// decoder reads it as a line end.
func (s *tomlScanner) skipSpace() {
	for s.i < len(s.data) {
		switch c := s.data[s.i]; {
		case c == ' ' || c == '\t' || c == '\r' && s.peek(1) == '\n':
			s.i++
		default:
			return
		}
	}
}

func (s *tomlScanner) skipComment() {
	for s.i < len(s.data) && s.data[s.i] != '\n' {
		s.i++
	}
}

// skipBlank skips spaces, newlines and comments, as allowed between the
// elements of an array.
func (s *tomlScanner) skipBlank() {
	for s.i < len(s.data) {
		switch s.data[s.i] {
		case ' ', '\t':
			s.i++
		case '\r':
			if s.peek(1) != '\n' {
				return
			}
			s.i++
		case '\n':
			s.newline()
		case '#':
			s.skipComment()
		default:
			return
		}
	}
}

func (s *tomlScanner) endOfLine() {
	s.skipSpace()
	if s.i < len(s.data) && s.data[s.i] == '#' {
		s.skipComment()
	}
	if s.i < len(s.data) && s.data[s.i] != '\n' {
		s.confused = true
	}
}

func (s *tomlScanner) header() {
	at := s.here()
	array := s.peek(1) == '['
	if array {
		s.i += 2
	} else {
		s.i++
	}
	path, ok := s.key()
	if !ok {
		return
	}
	s.skipSpace()
	if s.peek(0) != ']' || (array && s.peek(1) != ']') {
		s.confused = true
		return
	}
	if array {
		s.i += 2
	} else {
		s.i++
	}
	if len(s.out.Headers) >= s.lim.MaxHeaders {
		msg := s.lim.TooManyHeaders
		if msg == "" {
			msg = "more than " + grouped(s.lim.MaxHeaders) + " tables in one file"
		}
		s.fail(at, msg)
		return
	}
	s.out.Headers = append(s.out.Headers, tomlHeader{Path: path, Array: array, At: at})
}

func (s *tomlScanner) keyValue() {
	at := s.here()
	path, ok := s.key()
	if !ok {
		return
	}
	s.skipSpace()
	if s.peek(0) != '=' {
		s.confused = true
		return
	}
	s.i++
	if len(s.out.Keys) >= s.lim.MaxKeys {
		s.fail(at, "more than "+grouped(s.lim.MaxKeys)+" keys in one file")
		return
	}
	s.skipSpace()
	s.out.Keys = append(s.out.Keys, tomlKey{Header: len(s.out.Headers) - 1, Path: path, At: at, Array: s.peek(0) == '['})
	s.value(len(s.out.Keys) - 1)
}

// key reads a dotted key: bare, "basic" or 'literal' parts joined by dots.
func (s *tomlScanner) key() ([]string, bool) {
	var parts []string
	for {
		s.skipSpace()
		at := s.here()
		part, ok := s.keyPart()
		if !ok {
			s.confused = true
			return nil, false
		}
		parts = append(parts, part)
		if len(parts) > s.lim.MaxKeyParts {
			s.fail(at, "key has more than "+strconv.Itoa(s.lim.MaxKeyParts)+" dotted parts")
			return nil, false
		}
		s.skipSpace()
		if s.peek(0) != '.' {
			return parts, true
		}
		s.i++
	}
}

type tomlFrame struct {
	table bool
	n     int
	at    lineCol
}

// value scans the value of key k, which may be an array or inline table
// nested to any depth; the nesting is followed with an explicit stack.
func (s *tomlScanner) value(k int) {
	v := &valueScan{needValue: true}
	defer func() {
		if s.confused {
			s.depth = len(v.stack) // crude goes on counting from here
		}
	}()
	for s.limit == nil && !s.confused {
		if !v.needValue && len(v.stack) == 0 {
			return
		}
		if len(v.stack) > 0 {
			s.skipBlank()
		} else {
			s.skipSpace()
		}
		if s.i >= len(s.data) {
			s.confused = true
			return
		}
		c := s.data[s.i]
		var more bool
		if v.needValue {
			more = s.element(v, c, k)
		} else {
			more = s.afterElement(v, c)
		}
		if !more {
			return
		}
	}
}

// valueScan is where value is inside a value: the open arrays and inline
// tables, and whether an element (or a table's key) comes next rather
// than a comma or a close.
type valueScan struct {
	stack     []tomlFrame
	needValue bool
}

// afterElement reads what may follow an element inside an array or
// inline table at c: a comma, or the bracket that closes it. It reports
// false when value must stop.
func (s *tomlScanner) afterElement(v *valueScan, c byte) bool {
	top := len(v.stack) - 1
	switch {
	case c == ',':
		s.i++
		v.needValue = true
		if v.stack[top].table {
			s.skipBlank()
			if s.peek(0) == '}' {
				v.needValue = false
				return true
			}
			if !s.inlineKey() {
				return false
			}
		}
	case c == ']' && !v.stack[top].table, c == '}' && v.stack[top].table:
		s.i++
		v.stack = v.stack[:top]
	default:
		s.confused = true
	}
	return true
}

// element reads one element at c: a string (recorded for key k when
// strings are wanted), a scalar, or the opening of a nested array or
// table; or the close of an empty array or table, or after a trailing
// comma. It reports false when value must stop.
func (s *tomlScanner) element(v *valueScan, c byte, k int) bool {
	top := len(v.stack) - 1
	if top >= 0 && !v.stack[top].table {
		if c == ']' { // empty array, or a trailing comma
			s.i++
			v.stack = v.stack[:top]
			v.needValue = false
			return true
		}
		v.stack[top].n++
		if v.stack[top].n > s.lim.MaxArray {
			s.fail(v.stack[top].at, "array has more than "+grouped(s.lim.MaxArray)+" elements")
			return false
		}
	}
	if top >= 0 && v.stack[top].table && c == '}' {
		s.i++
		v.stack = v.stack[:top]
		v.needValue = false
		return true
	}
	switch c {
	case '[', '{':
		return s.open(v, c)
	case '"', '\'':
		str := s.str()
		if s.lim.WantStrings && !s.confused {
			s.out.Keys[k].Strings = append(s.out.Keys[k].Strings, str)
		}
	default:
		s.scalar()
	}
	v.needValue = false
	return true
}

// open pushes the array or inline table that c opens; an element (or the
// table's first key) comes next. It reports false when value must stop.
func (s *tomlScanner) open(v *valueScan, c byte) bool {
	at := s.here()
	if len(v.stack) >= s.lim.MaxNesting {
		s.fail(at, "arrays or tables nested more than "+strconv.Itoa(s.lim.MaxNesting)+" deep")
		return false
	}
	v.stack = append(v.stack, tomlFrame{table: c == '{', at: at})
	s.i++
	if c == '{' {
		s.skipBlank()
		if s.peek(0) == '}' {
			return true // the loop sees the close as an empty table
		}
		if !s.inlineKey() {
			return false
		}
	}
	return true
}

// inlineKey reads `key =` inside an inline table.
func (s *tomlScanner) inlineKey() bool {
	if _, ok := s.key(); !ok {
		return false
	}
	s.skipSpace()
	if s.peek(0) != '=' {
		s.confused = true
		return false
	}
	s.i++
	return true
}

// scalar skips a number, boolean or date. A date and a time may be
// separated by one space.
func (s *tomlScanner) scalar() {
	start := s.i
	for s.i < len(s.data) {
		c := s.data[s.i]
		if c == ' ' && s.i-start == 10 && s.data[start+4] == '-' && s.peek(1) >= '0' && s.peek(1) <= '9' {
			s.i++
			continue
		}
		if c == ' ' || c == '\t' || c == '\n' || c == '\r' || c == ',' || c == ']' || c == '}' || c == '#' {
			break
		}
		s.i++
	}
	if s.i == start {
		s.confused = true
	}
}

// crude follows the rest of a text the scanner could not parse, counting
// only how deep brackets nest, so the decoder never sees deeper nesting
// than the limit even if this scanner misreads valid text.
func (s *tomlScanner) crude() {
	for s.i < len(s.data) && s.limit == nil {
		switch s.data[s.i] {
		case '\n':
			s.newline()
		case '#':
			s.skipComment()
		case '"', '\'':
			start := s.i
			s.str()
			if s.i == start {
				s.i++
			}
		case '[', '{':
			s.depth++
			if s.depth > s.lim.MaxNesting+1 { // +1: a [[header]] opens two
				s.fail(s.here(), "arrays or tables nested more than "+strconv.Itoa(s.lim.MaxNesting)+" deep")
			}
			s.i++
		case ']', '}':
			if s.depth > 0 {
				s.depth--
			}
			s.i++
		default:
			s.i++
		}
	}
}
