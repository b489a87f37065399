package format

import (
	"bytes"
	"slices"
	"strings"
)

// OutlineHeader is the first line of every outline ramify writes.
const OutlineHeader = "# ramify outline 1"

// Outline is a parsed .outline file: the tree (the file itself is the root)
// and the structure hash recorded in its header, if any.
type Outline struct {
	Root *Category
	// Structure is the hash from the "# structure" line as read, or ""
	// when the file has none (made by hand or imported).
	Structure string
	// Records are the decisions the tree was last solved under, from the
	// "# record" lines at the end of the file (see OutlineRecord).
	Records []OutlineRecord
}

// OutlineRecord is one "# record KEY ID…" line: the fingerprint of a
// constraint record (kind and content, provenance excluded) that held when
// ramify wrote the outline, and the items it names. When the record later
// disappears from constraints/, its items are what the decision held in
// place, and the next solve lets them go.
type OutlineRecord struct {
	Key   string
	Items []string
}

// Edited reports whether the tree's shape no longer matches the structure
// hash ramify wrote: someone moved lines by hand. Outlines without a
// structure line are never "edited"; they are previous versions.
func (o *Outline) Edited() bool {
	return o.Structure != "" && o.Structure != StructureHash(o.Root)
}

// ParseOutline reads an outline. file names it in error messages. Every
// problem is reported; the returned error is a Diags.
func ParseOutline(file string, data []byte) (*Outline, error) {
	data, ds := CleanText(file, data)
	if len(ds) > 0 {
		return nil, ds
	}
	out := &Outline{}
	lines := strings.Split(string(data), "\n")
	meta := &outlineMeta{}
	root, _, ds := parseTreeLines(file, lines, func(i int) lineCol { return lineCol{1 + i, 1} }, true, nil, meta)
	out.Root, out.Structure, out.Records = root, meta.structure, meta.records
	if len(ds) == 0 {
		ds = parseConcepts(file, data, root)
	}
	return out, ds.Err()
}

// parseTree parses outline lines. firstLine is the file line number of
// data's first line (packets embed a tree after their header). When
// header is true, leading comment lines may carry the format line and the
// structure hash.
func parseTree(file string, data []byte, firstLine int, header bool) (*Category, string, Diags) {
	lines := strings.Split(string(data), "\n")
	return parseTreeLines(file, lines, func(i int) lineCol { return lineCol{firstLine + i, 1} }, header, nil, nil)
}

// outlineMeta collects what an outline file's comment lines say about it.
type outlineMeta struct {
	structure string
	records   []OutlineRecord
}

// parseRecordLine reads the rest of a "# record " line: a 12-hex-digit key
// and the item ids the record names.
func parseRecordLine(rest string, at func(int) Pos, off int, ds *Diags) (OutlineRecord, bool) {
	fields := strings.Fields(rest)
	if len(fields) == 0 || !isHex(fields[0]) || len(fields[0]) != 12 {
		key := ""
		if len(fields) > 0 {
			key = fields[0]
		}
		ds.Add(at(off), "record key %q is not 12 hex digits", clip(key))
		return OutlineRecord{}, false
	}
	rec := OutlineRecord{Key: fields[0]}
	for _, id := range fields[1:] {
		if !ValidItemID(id) {
			ds.Add(at(off), "%q in a record line is not a valid item id: %s", clip(id), ItemIDRule)
			return OutlineRecord{}, false
		}
		rec.Items = append(rec.Items, id)
	}
	return rec, true
}

// parseTreeLines parses outline lines whose places in the file are given
// by start: the line and column of the first character of lines[i]. A
// shape's outline sits inside a TOML string, so its lines need not start
// at column 1 or follow one another in the file. onItem, if not nil, hears
// of every item accepted, with its place, in file order.
func parseTreeLines(file string, lines []string, start func(i int) lineCol, header bool, onItem func(id string, at Pos), meta *outlineMeta) (*Category, string, Diags) {
	root := &Category{}
	p := &outlineParser{
		file: file, onItem: onItem, meta: meta, inHeader: header,
		root: root, stack: []*Category{root},
		seenItem: map[string]int{}, siblingNames: map[*Category]map[string]int{},
		catPos: map[*Category]Pos{}, damaged: map[*Category]bool{},
		skipDeeper: -1,
	}
	if len(lines) > 0 && lines[len(lines)-1] == "" {
		lines = lines[:len(lines)-1]
	}
	for i, line := range lines {
		first := start(i)
		if p.ds.Full() {
			p.ds.StopAt(Pos{file, first.Line, 1})
			break
		}
		p.line(line, first)
	}
	p.reportEmpty()
	p.ds.Sort()
	if meta != nil {
		meta.structure = p.structure
	}
	return root, p.structure, p.ds
}

// outlineParser is the state of parseTreeLines between lines.
type outlineParser struct {
	file   string
	onItem func(id string, at Pos)
	meta   *outlineMeta
	ds     Diags
	root   *Category
	// stack[d] is the open category at depth d; stack[0] is the root.
	stack    []*Category
	seenItem map[string]int
	// siblingNames[cat] maps child names to their line, to catch duplicates.
	siblingNames map[*Category]map[string]int
	// catPos is where each category line starts, for the empty check.
	catPos map[*Category]Pos
	// damaged marks categories under which a line was dropped for an
	// error; they are not also reported as empty.
	damaged map[*Category]bool
	// After an indentation error, lines indented deeper than skipDeeper
	// levels are dropped silently: they belong to the bad line, and
	// reporting each of them would bury the one mistake.
	skipDeeper int
	structure  string
	inHeader   bool
}

// line reads one line that starts at first.
func (p *outlineParser) line(line string, first lineCol) {
	lineNo := first.Line
	at := func(byteCol int) Pos { return Pos{p.file, lineNo, first.Col - 1 + RuneCol(line, byteCol)} }
	if t := strings.IndexByte(line, '\t'); t >= 0 {
		if strings.TrimLeft(line[:t], " ") == "" {
			p.ds.Add(at(t), "tab in the indentation; indent with two spaces per level")
		} else {
			p.ds.Add(at(t), "tab character; category names and item ids cannot hold tabs")
		}
		p.damaged[p.stack[len(p.stack)-1]] = true
		return
	}
	trimmed := strings.TrimRight(line, " ")
	if trimmed == "" {
		return
	}
	body := strings.TrimLeft(trimmed, " ")
	indent := len(trimmed) - len(body)
	if strings.HasPrefix(body, "#") {
		p.comment(body, indent, at)
		return
	}
	p.inHeader = false
	depth, ok := p.depth(indent, at)
	if !ok {
		return
	}
	p.stack = p.stack[:depth+1]
	parent := p.stack[depth]
	if name, ok := strings.CutSuffix(body, "/"); ok {
		p.category(name, body, indent, parent, lineNo, at)
		return
	}
	p.item(body, indent, parent, lineNo, at)
}

// comment reads a comment line: a record line, or in the header the
// format line and the structure hash; any other comment says nothing.
func (p *outlineParser) comment(body string, indent int, at func(int) Pos) {
	if rest, ok := strings.CutPrefix(body, "# record "); ok && p.meta != nil && indent == 0 {
		if rec, ok := parseRecordLine(rest, at, len("# record "), &p.ds); ok {
			p.meta.records = append(p.meta.records, rec)
		}
		return
	}
	if !p.inHeader || indent != 0 {
		return
	}
	if v, ok := strings.CutPrefix(body, "# ramify outline "); ok {
		if v != "1" {
			p.ds.Add(at(0), "unsupported outline version %q; this ramify reads version 1", clip(v))
		}
	} else if v, ok := strings.CutPrefix(body, "# structure "); ok {
		v = strings.TrimSpace(v)
		if !isHex(v) || len(v) != 12 {
			p.ds.Add(at(len("# structure ")), "structure hash %q is not 12 hex digits", clip(v))
		} else {
			p.structure = v
		}
	}
}

// depth turns a line's indentation into its depth, or reports why the
// line is dropped (false): odd indentation, a jump of more than one
// level, nesting past MaxDepth, or a line under an earlier bad one.
func (p *outlineParser) depth(indent int, at func(int) Pos) (int, bool) {
	open := p.stack[len(p.stack)-1]
	if indent%2 != 0 {
		p.ds.Add(at(0), "indentation of %s; use exactly two spaces per level", plural(indent, "space"))
		p.damaged[open] = true
		if p.skipDeeper < 0 {
			p.skipDeeper = len(p.stack) - 1
		}
		return 0, false
	}
	depth := indent / 2
	if p.skipDeeper >= 0 {
		if depth > p.skipDeeper {
			return 0, false
		}
		p.skipDeeper = -1
	}
	if depth >= len(p.stack) {
		p.ds.Add(at(0), "indented %s, but here a line can be indented at most %s (one level deeper than the category above it)", plural(depth, "level"), plural(len(p.stack)-1, "level"))
		p.damaged[open] = true
		p.skipDeeper = len(p.stack) - 1
		return 0, false
	}
	if depth >= MaxDepth {
		p.ds.Add(at(0), "nesting deeper than %d levels", MaxDepth)
		p.damaged[open] = true
		p.skipDeeper = MaxDepth - 1
		return 0, false
	}
	return depth, true
}

// category opens the category line body ("name/", name without the
// slash) under parent.
func (p *outlineParser) category(name, body string, indent int, parent *Category, lineNo int, at func(int) Pos) {
	cat := &Category{Line: lineNo}
	p.catPos[cat] = at(indent)
	name = strings.TrimSpace(name)
	if rest, ok := strings.CutPrefix(name, "~ "); ok {
		cat.Provisional = true
		name = strings.TrimSpace(rest)
	} else if name == "~" { // "~ /": a provisional marker with no name
		cat.Provisional = true
		name = ""
	}
	cat.Name = name
	if msg := CheckCategoryName(name); msg != "" {
		where := indent
		if k, _ := FirstInvisible(body); k >= 0 && strings.Contains(msg, "invisible") {
			where += k
		}
		p.ds.Add(at(where), "%s", msg)
	}
	names := p.siblingNames[parent]
	if names == nil {
		names = map[string]int{}
		p.siblingNames[parent] = names
	}
	if prev, dup := names[name]; dup && name != "" {
		p.ds.Add(at(indent), "category %q appears twice in the same parent (first at line %d)", clip(name), prev)
	} else {
		names[name] = lineNo
	}
	parent.Children = append(parent.Children, cat)
	p.stack = append(p.stack, cat)
}

// item places the item line body under parent, unless it is not a valid
// id or the item came before.
func (p *outlineParser) item(body string, indent int, parent *Category, lineNo int, at func(int) Pos) {
	if !ValidItemID(body) {
		switch {
		case strings.Contains(body, " "):
			p.ds.Add(at(indent), "%q is not an item id (ids have no spaces); a category line ends with \"/\"", clip(body))
		case len(body) > MaxIDLen:
			p.ds.Add(at(indent), "item id is %d bytes long; the limit is %d", len(body), MaxIDLen)
		default:
			p.ds.Add(at(indent), "%q is not a valid item id: %s", clip(body), ItemIDRule)
		}
		p.damaged[parent] = true
		return
	}
	if prev, dup := p.seenItem[body]; dup {
		p.ds.Add(at(indent), "item %q appears twice (first at line %d); every item appears exactly once", body, prev)
		p.damaged[parent] = true
		return
	}
	p.seenItem[body] = lineNo
	if p.onItem != nil {
		p.onItem(body, at(indent))
	}
	parent.Items = append(parent.Items, body)
	parent.ItemLines = append(parent.ItemLines, lineNo)
}

// reportEmpty reports the categories left with no item and no
// subcategory, unless a dropped line may have been theirs.
func (p *outlineParser) reportEmpty() {
	p.root.Walk(func(c *Category, depth int) bool {
		if depth > 0 && len(c.Children) == 0 && len(c.Items) == 0 && !p.damaged[c] {
			p.ds.Add(p.catPos[c], "category %q is empty; a category needs at least one item or subcategory", clip(c.Name))
		}
		return true
	})
}

func isHex(s string) bool {
	for _, r := range s {
		if !strings.ContainsRune("0123456789abcdef", r) {
			return false
		}
	}
	return s != ""
}

// FormatOutline prints root in canonical form with the header and a fresh
// structure hash. root is sorted in place first.
func FormatOutline(root *Category) []byte {
	root.Sort()
	return formatSortedOutline(root)
}

// formatSortedOutline is FormatOutline of a tree already in canonical
// order: it only reads root.
func formatSortedOutline(root *Category) []byte {
	var b bytes.Buffer
	b.WriteString(OutlineHeader + "\n")
	b.WriteString("# structure " + StructureHash(root) + "\n")
	writeTree(&b, root)
	var ids strings.Builder
	formatConcepts(&ids, root)
	b.WriteString(ids.String())
	return b.Bytes()
}

// FormatOutlineRecords is FormatOutline followed by one "# record" line
// per record, in key order, each with its items sorted: the decisions the
// tree was solved under.
func FormatOutlineRecords(root *Category, records []OutlineRecord) []byte {
	root.Sort()
	return FormatSortedOutlineRecords(root, records)
}

// FormatSortedOutlineRecords is FormatOutlineRecords of a tree already put
// in canonical order (Sort). It only reads root, so others may read the
// tree while it is printed.
func FormatSortedOutlineRecords(root *Category, records []OutlineRecord) []byte {
	out := formatSortedOutline(root)
	recs := slices.Clone(records)
	slices.SortFunc(recs, func(a, b OutlineRecord) int { return strings.Compare(a.Key, b.Key) })
	var b bytes.Buffer
	b.Write(out)
	for i, r := range recs {
		if i > 0 && r.Key == recs[i-1].Key {
			continue
		}
		b.WriteString("# record " + r.Key)
		items := slices.Clone(r.Items)
		slices.Sort(items)
		for _, id := range slices.Compact(items) {
			b.WriteString(" " + id)
		}
		b.WriteByte('\n')
	}
	return b.Bytes()
}

// FormatTree prints only the lines of the tree (no header), canonical order.
func FormatTree(root *Category) []byte {
	root.Sort()
	var b bytes.Buffer
	writeTree(&b, root)
	return b.Bytes()
}

func writeTree(b *bytes.Buffer, root *Category) { writeNode(b, root, 0, nil) }

// writeNode prints c's subcategories (each followed by its contents), then
// c's items, each followed by its label as a comment when labels has one
// (packets only). Recursion depth is bounded by the tree depth, which
// parsing limits to MaxDepth and solving to max_depth.
func writeNode(b *bytes.Buffer, c *Category, depth int, labels map[string]string) {
	pad := strings.Repeat("  ", depth)
	for _, ch := range c.Children {
		b.WriteString(pad)
		if ch.Provisional {
			b.WriteString("~ ")
		}
		b.WriteString(ch.Name)
		b.WriteString("/\n")
		writeNode(b, ch, depth+1, labels)
	}
	for _, it := range c.Items {
		b.WriteString(pad)
		b.WriteString(it)
		if labels != nil {
			if label := PacketComment(labels[it]); label != "" {
				b.WriteString("  # ")
				b.WriteString(label)
			}
		}
		b.WriteByte('\n')
	}
}

// DisplayName is how a category is shown in reports: its name with the
// provisional marker.
func (c *Category) DisplayName() string {
	if c.Provisional {
		return "~ " + c.Name
	}
	return c.Name
}

// Paths lists, for every item, the display names from the root (excluded) down to each item.
func Paths(root *Category) map[string][]string {
	out := map[string][]string{}
	var rec func(c *Category, path []string)
	rec = func(c *Category, path []string) {
		for _, it := range c.Items {
			out[it] = append([]string(nil), path...)
		}
		for _, ch := range c.Children {
			rec(ch, append(path, ch.DisplayName()))
		}
	}
	rec(root, nil)
	return out
}
