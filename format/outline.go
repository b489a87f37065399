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
	var ds Diags
	root := &Category{}
	// stack[d] is the open category at depth d; stack[0] is the root.
	stack := []*Category{root}
	seenItem := map[string]int{}
	// siblingNames[cat] maps child names to their line, to catch duplicates.
	siblingNames := map[*Category]map[string]int{}
	// catPos is where each category line starts, for the empty check.
	catPos := map[*Category]Pos{}
	// damaged marks categories under which a line was dropped for an
	// error; they are not also reported as empty.
	damaged := map[*Category]bool{}
	// After an indentation error, lines indented deeper than skipDeeper
	// levels are dropped silently: they belong to the bad line, and
	// reporting each of them would bury the one mistake.
	skipDeeper := -1
	structure := ""
	inHeader := header
	if len(lines) > 0 && lines[len(lines)-1] == "" {
		lines = lines[:len(lines)-1]
	}
	for i, line := range lines {
		first := start(i)
		lineNo := first.Line
		if ds.Full() {
			ds.StopAt(Pos{file, lineNo, 1})
			break
		}
		at := func(byteCol int) Pos { return Pos{file, lineNo, first.Col - 1 + RuneCol(line, byteCol)} }
		if t := strings.IndexByte(line, '\t'); t >= 0 {
			if strings.TrimLeft(line[:t], " ") == "" {
				ds.Add(at(t), "tab in the indentation; indent with two spaces per level")
			} else {
				ds.Add(at(t), "tab character; category names and item ids cannot hold tabs")
			}
			damaged[stack[len(stack)-1]] = true
			continue
		}
		trimmed := strings.TrimRight(line, " ")
		if trimmed == "" {
			continue
		}
		body := strings.TrimLeft(trimmed, " ")
		indent := len(trimmed) - len(body)
		if strings.HasPrefix(body, "#") {
			if rest, ok := strings.CutPrefix(body, "# record "); ok && meta != nil && indent == 0 {
				if rec, ok := parseRecordLine(rest, at, len("# record "), &ds); ok {
					meta.records = append(meta.records, rec)
				}
				continue
			}
			if inHeader && indent == 0 {
				if v, ok := strings.CutPrefix(body, "# ramify outline "); ok {
					if v != "1" {
						ds.Add(at(0), "unsupported outline version %q; this ramify reads version 1", clip(v))
					}
				} else if v, ok := strings.CutPrefix(body, "# structure "); ok {
					v = strings.TrimSpace(v)
					if !isHex(v) || len(v) != 12 {
						ds.Add(at(len("# structure ")), "structure hash %q is not 12 hex digits", clip(v))
					} else {
						structure = v
					}
				}
			}
			continue
		}
		inHeader = false
		if indent%2 != 0 {
			ds.Add(at(0), "indentation of %s; use exactly two spaces per level", plural(indent, "space"))
			damaged[stack[len(stack)-1]] = true
			if skipDeeper < 0 {
				skipDeeper = len(stack) - 1
			}
			continue
		}
		depth := indent / 2
		if skipDeeper >= 0 {
			if depth > skipDeeper {
				continue
			}
			skipDeeper = -1
		}
		if depth >= len(stack) {
			ds.Add(at(0), "indented %s, but here a line can be indented at most %s (one level deeper than the category above it)", plural(depth, "level"), plural(len(stack)-1, "level"))
			damaged[stack[len(stack)-1]] = true
			skipDeeper = len(stack) - 1
			continue
		}
		if depth >= MaxDepth {
			ds.Add(at(0), "nesting deeper than %d levels", MaxDepth)
			damaged[stack[len(stack)-1]] = true
			skipDeeper = MaxDepth - 1
			continue
		}
		stack = stack[:depth+1]
		parent := stack[depth]
		if name, ok := strings.CutSuffix(body, "/"); ok {
			cat := &Category{Line: lineNo}
			catPos[cat] = at(indent)
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
				ds.Add(at(where), "%s", msg)
			}
			names := siblingNames[parent]
			if names == nil {
				names = map[string]int{}
				siblingNames[parent] = names
			}
			if prev, dup := names[name]; dup && name != "" {
				ds.Add(at(indent), "category %q appears twice in the same parent (first at line %d)", clip(name), prev)
			} else {
				names[name] = lineNo
			}
			parent.Children = append(parent.Children, cat)
			stack = append(stack, cat)
			continue
		}
		if !ValidItemID(body) {
			switch {
			case strings.Contains(body, " "):
				ds.Add(at(indent), "%q is not an item id (ids have no spaces); a category line ends with \"/\"", clip(body))
			case len(body) > MaxIDLen:
				ds.Add(at(indent), "item id is %d bytes long; the limit is %d", len(body), MaxIDLen)
			default:
				ds.Add(at(indent), "%q is not a valid item id: %s", clip(body), ItemIDRule)
			}
			damaged[parent] = true
			continue
		}
		if prev, dup := seenItem[body]; dup {
			ds.Add(at(indent), "item %q appears twice (first at line %d); every item appears exactly once", body, prev)
			damaged[parent] = true
			continue
		}
		seenItem[body] = lineNo
		if onItem != nil {
			onItem(body, at(indent))
		}
		parent.Items = append(parent.Items, body)
		parent.ItemLines = append(parent.ItemLines, lineNo)
	}
	root.Walk(func(c *Category, depth int) bool {
		if depth > 0 && len(c.Children) == 0 && len(c.Items) == 0 && !damaged[c] {
			ds.Add(catPos[c], "category %q is empty; a category needs at least one item or subcategory", clip(c.Name))
		}
		return true
	})
	ds.Sort()
	if meta != nil {
		meta.structure = structure
	}
	return root, structure, ds
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
	out := FormatOutline(root)
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
