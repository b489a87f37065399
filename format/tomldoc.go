package format

import (
	"bytes"
	"errors"
	"fmt"
	"sort"
	"unicode/utf8"

	"github.com/BurntSushi/toml"
)

// tomlDoc is a decoded TOML file together with the positions scanTOML
// found, so that checks on the decoded values can point into the text.
type tomlDoc struct {
	file string
	root map[string]any
	scan *tomlScan
	// keysOf lists, per header index (+1, so the root is 0), the indices
	// of the keys written under it.
	keysOf [][]int
	// rootIndex maps a top-level name to where it is first written.
	rootIndex map[string]lineCol
}

// decodeTOML checks data as text, scans it for positions and limits, and
// decodes it. A syntax error is reported at the place the decoder names.
func decodeTOML(file string, data []byte, lim tomlLimits) (*tomlDoc, Diags) {
	text, ds := CleanText(file, data)
	if len(ds) > 0 {
		return nil, ds
	}
	scan, lerr := scanTOML(text, lim)
	if lerr != nil {
		return nil, Diags{{Pos: Pos{file, lerr.At.Line, lerr.At.Col}, Msg: lerr.Msg}}
	}
	root, err := safeDecode(text)
	if err != nil {
		var pe toml.ParseError
		if errors.As(err, &pe) {
			return nil, Diags{{Pos: errorPos(file, text, pe.Position), Msg: "TOML syntax: " + pe.Message}}
		}
		return nil, Diags{{Pos: Pos{file, 1, 1}, Msg: "TOML: " + err.Error()}}
	}
	d := &tomlDoc{file: file, root: root, scan: scan}
	d.keysOf = make([][]int, len(scan.Headers)+1)
	for i, k := range scan.Keys {
		d.keysOf[k.Header+1] = append(d.keysOf[k.Header+1], i)
	}
	return d, nil
}

// safeDecode runs the decoder, turning a panic inside it into an error: a
// bad file must give a message, never a crash.
func safeDecode(text []byte) (root map[string]any, err error) {
	defer func() {
		if r := recover(); r != nil {
			root, err = nil, fmt.Errorf("the TOML decoder failed on this file: %v", r)
		}
	}()
	root = map[string]any{}
	_, err = toml.Decode(string(text), &root)
	return root, err
}

// errorPos turns the decoder's error position into ours: the decoder's
// column counts bytes, ours counts characters.
func errorPos(file string, text []byte, p toml.Position) Pos {
	start := p.Start
	if start < 0 || start > len(text) {
		return Pos{file, max(p.Line, 1), 1}
	}
	line := 1 + bytes.Count(text[:start], []byte{'\n'})
	if p.Line > 0 && line != p.Line {
		return Pos{file, p.Line, 1}
	}
	lineStart := bytes.LastIndexByte(text[:start], '\n') + 1
	return Pos{file, line, utf8.RuneCount(text[lineStart:start]) + 1}
}

func (d *tomlDoc) pos(lc lineCol) Pos { return Pos{d.file, lc.Line, lc.Col} }

// keysUnder lists the keys written directly under header h (-1: the root).
func (d *tomlDoc) keysUnder(h int) []*tomlKey {
	if h+1 >= len(d.keysOf) {
		return nil
	}
	out := make([]*tomlKey, 0, len(d.keysOf[h+1]))
	for _, i := range d.keysOf[h+1] {
		out = append(out, &d.scan.Keys[i])
	}
	return out
}

// rootKeyPos is where top-level name is first written: as a key, as the
// first part of a dotted key, or as the first part of a table header.
// Positions are indexed on first use: a hostile file may hold a million
// unknown keys, and each is looked up.
func (d *tomlDoc) rootKeyPos(name string) Pos {
	if d.rootIndex == nil {
		d.rootIndex = map[string]lineCol{}
		for _, k := range d.keysUnder(-1) {
			if _, ok := d.rootIndex[k.Path[0]]; !ok {
				d.rootIndex[k.Path[0]] = k.At
			}
		}
		for _, h := range d.scan.Headers {
			if _, ok := d.rootIndex[h.Path[0]]; !ok {
				d.rootIndex[h.Path[0]] = h.At
			}
		}
	}
	if at, ok := d.rootIndex[name]; ok {
		return d.pos(at)
	}
	return Pos{d.file, 1, 1}
}

// tomlRecord is one [[kind]] table of a file made of such records.
type tomlRecord struct {
	doc    *tomlDoc
	Kind   string
	Values map[string]any
	At     Pos // the [[kind]] header
	header int // index into scan.Headers; len(Headers) when unknown
	next   int // index of the next header after this record's, or len(Headers)
	// keyIndex maps a key name to its first key line and subIndex to its
	// first [kind.name] header; both are built on first use.
	keyIndex map[string]*tomlKey
	subIndex map[string]lineCol
}

// records returns the [[kind]] tables in file order. A top-level kind that
// is not an array of tables is reported.
func (d *tomlDoc) records(kind string) ([]tomlRecord, Diags) {
	v, ok := d.root[kind]
	if !ok {
		return nil, nil
	}
	tables, ok := v.([]map[string]any)
	if !ok {
		return nil, Diags{{Pos: d.rootKeyPos(kind), Msg: fmt.Sprintf("%q must be a list of [[%s]] tables, each introduced by its own [[%s]] line", kind, kind, kind)}}
	}
	var headers []int
	for i, h := range d.scan.Headers {
		if h.Array && len(h.Path) == 1 && h.Path[0] == kind {
			headers = append(headers, i)
		}
	}
	if len(headers) != len(tables) && d.scan.Confused {
		// The scanner lost its way in text the decoder accepted: read the
		// records without positions rather than refuse them.
		out := make([]tomlRecord, len(tables))
		for i, t := range tables {
			out[i] = tomlRecord{doc: d, Kind: kind, Values: t, At: Pos{d.file, 1, 1}, header: len(d.scan.Headers), next: len(d.scan.Headers)}
		}
		return out, nil
	}
	if len(headers) != len(tables) {
		// Written as an inline array (kind = [{...}]): the scanner has no
		// header per record, so ask for the form that can be pointed at.
		return nil, Diags{{Pos: d.rootKeyPos(kind), Msg: fmt.Sprintf("write each %s as its own [[%s]] table, not as an inline array", kind, kind)}}
	}
	out := make([]tomlRecord, len(tables))
	for i, t := range tables {
		h := headers[i]
		next := len(d.scan.Headers)
		if i+1 < len(headers) {
			next = headers[i+1]
		}
		out[i] = tomlRecord{doc: d, Kind: kind, Values: t, At: d.pos(d.scan.Headers[h].At), header: h, next: next}
	}
	return out, nil
}

// key finds where key name of the record is written.
func (r *tomlRecord) key(name string) *tomlKey {
	if r.keyIndex == nil {
		keys := r.doc.keysUnder(r.header)
		r.keyIndex = make(map[string]*tomlKey, len(keys))
		for _, k := range keys {
			if _, ok := r.keyIndex[k.Path[0]]; !ok {
				r.keyIndex[k.Path[0]] = k
			}
		}
	}
	return r.keyIndex[name]
}

// keyPos is where key name of the record is written: its key line, or a
// [kind.name] sub-table header, or failing both the record's header.
func (r *tomlRecord) keyPos(name string) Pos {
	if k := r.key(name); k != nil {
		return r.doc.pos(k.At)
	}
	if r.subIndex == nil {
		r.subIndex = map[string]lineCol{}
		for h := r.header + 1; h < r.next && h < len(r.doc.scan.Headers); h++ {
			p := r.doc.scan.Headers[h].Path
			if len(p) >= 2 && p[0] == r.Kind {
				if _, ok := r.subIndex[p[1]]; !ok {
					r.subIndex[p[1]] = r.doc.scan.Headers[h].At
				}
			}
		}
	}
	if at, ok := r.subIndex[name]; ok {
		return r.doc.pos(at)
	}
	return r.At
}

// stringPos is where the i-th string literal of key name begins, or the
// key itself when that cannot be told.
func (r *tomlRecord) stringPos(name string, i int) Pos {
	k := r.key(name)
	if k == nil {
		return r.keyPos(name)
	}
	if i >= 0 && i < len(k.Strings) {
		return r.doc.pos(k.Strings[i].At)
	}
	return r.doc.pos(k.At)
}

// unknownKeys reports every key of values not in known, with a
// suggestion, in file order.
func unknownKeys(values map[string]any, known []string, where string, pos func(string) Pos) Diags {
	var ds Diags
	for _, k := range sortedKeys(values) {
		if !contains(known, k) {
			ds.Add(pos(k), "unknown key %q in %s%s", k, where, didYouMean(k, known))
		}
	}
	ds.Sort()
	return ds
}

func sortedKeys[V any](m map[string]V) []string {
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	return keys
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}
