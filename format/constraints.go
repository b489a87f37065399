package format

import (
	"fmt"
	"strings"
)

// Provenance says who made a decision, when and why. Date is as written,
// YYYY-MM-DD, or "" when the record gives none.
type Provenance struct {
	By, Date, Note string
}

// Ref is one mention of an item id in a record, so that a later check
// ("no such item") can point at the mention itself.
type Ref struct {
	ID  string
	Pos Pos
}

// Triplet is the decision ab|c: Pair[0] and Pair[1] join each other before
// either joins Out.
type Triplet struct {
	Pair [2]string
	Out  string
	Refs []Ref
	Pos  Pos // the [[triplet]] header
	Provenance
}

// Group is the decision that exactly these items form one category; a
// named group also fixes that category's name.
type Group struct {
	Items []string
	Name  string
	Refs  []Ref
	Pos   Pos // the [[group]] header
	Provenance
}

// Shape is an approved packet: the tree restricted to its items must
// resolve every triplet among them the way Tree does.
type Shape struct {
	Tree *Category // canonical order; lines are file lines
	// Packet is the id of the review packet it came from, if any;
	// Structure the structure hash of the taxonomy that packet was drawn
	// from.
	Packet, Structure string
	// SideBySide says that the outline's categories keep their entries
	// side by side as well: a category with three or more (items and
	// subcategories) means that none of them is grouped with another
	// apart from the rest (side_by_side = true). Without it a shape keeps
	// only the groupings it makes. absorb sets it for an answer that lays
	// grouped items side by side.
	SideBySide bool
	Refs       []Ref
	Pos        Pos // the [[shape]] header
	Provenance
}

// ConstraintFile is one constraints/*.toml file.
type ConstraintFile struct {
	File     string
	Triplets []Triplet
	Groups   []Group
	Shapes   []Shape
}

// Limits on a constraints file.
const (
	MaxRecordsPerFile = 100_000
	MaxArrayLen       = 100_000
	// MinShapeItems is the smallest shape that says anything: a triplet
	// needs three items.
	MinShapeItems = 3
)

var (
	recordKinds      = []string{"group", "shape", "triplet"}
	provenanceKeys   = []string{"by", "date", "note"}
	tripletKeys      = append([]string{"pair", "out"}, provenanceKeys...)
	groupKeys        = append([]string{"items", "name"}, provenanceKeys...)
	shapeKeys        = append([]string{"outline", "packet", "structure", "side_by_side"}, provenanceKeys...)
	constraintLimits = tomlLimits{
		MaxNesting:     8,
		MaxArray:       MaxArrayLen,
		MaxKeyParts:    8,
		MaxHeaders:     MaxRecordsPerFile,
		TooManyHeaders: fmt.Sprintf("more than %s records in one file; split them across several files", grouped(MaxRecordsPerFile)),
		MaxKeys:        20 * MaxRecordsPerFile,
		WantStrings:    true,
	}
)

// ParseConstraints reads a constraints file: [[triplet]], [[group]] and
// [[shape]] records in any mix (the records of README "A tour of the
// workflow"). Every problem is reported with its place.
func ParseConstraints(file string, data []byte) (*ConstraintFile, error) {
	doc, ds := decodeTOML(file, data, constraintLimits)
	if len(ds) > 0 {
		return nil, ds
	}
	cf := &ConstraintFile{File: file}
	ds = append(ds, unknownKeys(doc.root, recordKinds, "a constraints file (records are [[triplet]], [[group]] and [[shape]])", doc.rootKeyPos)...)
	for _, kind := range recordKinds {
		records, rds := doc.records(kind)
		ds = append(ds, rds...)
		for i := range records {
			r := &records[i]
			switch kind {
			case "triplet":
				t, tds := parseTriplet(r)
				ds = append(ds, tds...)
				cf.Triplets = append(cf.Triplets, t)
			case "group":
				g, gds := parseGroup(r)
				ds = append(ds, gds...)
				cf.Groups = append(cf.Groups, g)
			case "shape":
				s, sds := parseShape(r)
				ds = append(ds, sds...)
				cf.Shapes = append(cf.Shapes, s)
			}
		}
	}
	return orProblems(cf, ds)
}

func parseProvenance(r *tomlRecord, ds *Diags) Provenance {
	var p Provenance
	if v, ok := r.Values["by"]; ok {
		s, isString := v.(string)
		switch {
		case !isString:
			ds.Add(r.keyPos("by"), "by must be a string naming who decided, not %s", tomlType(v))
		case hasControl(s, ""):
			ds.Add(r.keyPos("by"), "by contains a control character")
		default:
			p.By = s
		}
	}
	if v, ok := r.Values["date"]; ok {
		d, msg := asDate(v)
		if msg != "" {
			ds.Add(r.keyPos("date"), "%s", msg)
		}
		p.Date = d
	}
	if v, ok := r.Values["note"]; ok {
		s, isString := v.(string)
		if !isString {
			ds.Add(r.keyPos("note"), "note must be a string saying why, not %s", tomlType(v))
		}
		p.Note = s
	}
	return p
}

// itemRef checks one item id written in the i-th string of key and returns
// its mention.
func itemRef(r *tomlRecord, key string, i int, id string, ds *Diags) (Ref, bool) {
	at := r.stringPos(key, i)
	switch {
	case len(id) > MaxIDLen:
		ds.Add(at, "item id is %d bytes long; the limit is %d", len(id), MaxIDLen)
	case !ValidItemID(id):
		ds.Add(at, "%q is not a valid item id: %s", clip(id), ItemIDRule)
	default:
		return Ref{ID: id, Pos: at}, true
	}
	return Ref{}, false
}

func parseTriplet(r *tomlRecord) (Triplet, Diags) {
	var ds Diags
	ds = append(ds, unknownKeys(r.Values, tripletKeys, "[[triplet]]", r.keyPos)...)
	t := Triplet{Pos: r.At, Provenance: parseProvenance(r, &ds)}
	pairOK := false
	if v, ok := r.Values["pair"]; !ok {
		ds.Add(r.At, "[[triplet]] has no pair; write pair = [\"a\", \"b\"] for the two items that belong together")
	} else if ids, msg := asStrings(v); msg != "" {
		ds.Add(r.keyPos("pair"), "pair %s", msg)
	} else if len(ids) != 2 {
		ds.Add(r.keyPos("pair"), "pair must name exactly two items; it names %d", len(ids))
	} else {
		refA, okA := itemRef(r, "pair", 0, ids[0], &ds)
		refB, okB := itemRef(r, "pair", 1, ids[1], &ds)
		if okA && okB {
			if ids[0] == ids[1] {
				ds.Add(r.stringPos("pair", 1), "pair names %q twice; a triplet pairs two different items", ids[0])
			} else {
				t.Pair = [2]string{ids[0], ids[1]}
				t.Refs = append(t.Refs, refA, refB)
				pairOK = true
			}
		}
	}
	if v, ok := r.Values["out"]; !ok {
		ds.Add(r.At, "[[triplet]] has no out; write out = \"c\" for the item that joins the pair later")
	} else if id, isString := v.(string); !isString {
		ds.Add(r.keyPos("out"), "out must be one item id as a string, not %s", tomlType(v))
	} else if ref, ok := itemRef(r, "out", 0, id, &ds); ok {
		if pairOK && (id == t.Pair[0] || id == t.Pair[1]) {
			ds.Add(ref.Pos, "out %q is also in the pair; a triplet needs three different items", id)
		} else {
			t.Out = id
			t.Refs = append(t.Refs, ref)
		}
	}
	return t, ds
}

func parseGroup(r *tomlRecord) (Group, Diags) {
	var ds Diags
	ds = append(ds, unknownKeys(r.Values, groupKeys, "[[group]]", r.keyPos)...)
	g := Group{Pos: r.At, Provenance: parseProvenance(r, &ds)}
	if v, ok := r.Values["items"]; !ok {
		ds.Add(r.At, "[[group]] has no items; write items = [\"a\", \"b\", ...] for the items that form one category")
	} else if ids, msg := asStrings(v); msg != "" {
		ds.Add(r.keyPos("items"), "items %s", msg)
	} else {
		if len(ids) < 2 {
			ds.Add(r.keyPos("items"), "a group needs at least 2 items; it has %d", len(ids))
		}
		first := map[string]int{}
		for i, id := range ids {
			ref, ok := itemRef(r, "items", i, id, &ds)
			if !ok {
				continue
			}
			if j, dup := first[id]; dup {
				ds.Add(ref.Pos, "item %q appears twice in the group (first as item %d)", id, j+1)
				continue
			}
			first[id] = i
			g.Items = append(g.Items, id)
			g.Refs = append(g.Refs, ref)
		}
	}
	if v, ok := r.Values["name"]; ok {
		name, isString := v.(string)
		if !isString {
			ds.Add(r.keyPos("name"), "name must be a string, not %s", tomlType(v))
		} else if msg := CheckCategoryName(name); msg != "" {
			ds.Add(r.stringPos("name", 0), "%s", msg)
		} else {
			g.Name = name
		}
	}
	return g, ds
}

func parseShape(r *tomlRecord) (Shape, Diags) {
	var ds Diags
	ds = append(ds, unknownKeys(r.Values, shapeKeys, "[[shape]]", r.keyPos)...)
	s := Shape{Pos: r.At, Provenance: parseProvenance(r, &ds)}
	optionalString := func(key string, check func(string) string) string {
		v, ok := r.Values[key]
		if !ok {
			return ""
		}
		str, isString := v.(string)
		if !isString {
			ds.Add(r.keyPos(key), "%s must be a string, not %s", key, tomlType(v))
			return ""
		}
		if msg := check(str); msg != "" {
			ds.Add(r.stringPos(key, 0), "%s", msg)
			return ""
		}
		return str
	}
	s.Packet = optionalString("packet", func(v string) string {
		if !ValidItemID(v) {
			return fmt.Sprintf("packet %q is not a packet id (the packet file's name without .outline)", clip(v))
		}
		return ""
	})
	s.Structure = optionalString("structure", func(v string) string {
		if len(v) != 12 || !isHex(v) {
			return fmt.Sprintf("structure %q is not 12 hex digits", clip(v))
		}
		return ""
	})
	if v, ok := r.Values["side_by_side"]; ok {
		b, isBool := v.(bool)
		if !isBool {
			ds.Add(r.keyPos("side_by_side"), "side_by_side must be true or false, not %s", tomlType(v))
		}
		s.SideBySide = b
	}
	v, ok := r.Values["outline"]
	if !ok {
		ds.Add(r.At, "[[shape]] has no outline; write the approved tree as outline = \"\"\"...\"\"\"")
		return s, ds
	}
	text, isString := v.(string)
	if !isString {
		ds.Add(r.keyPos("outline"), "outline must be a string holding outline lines, not %s", tomlType(v))
		return s, ds
	}
	tree, refs, tds := parseShapeOutline(r, text)
	ds = append(ds, tds...)
	if len(tds) == 0 && len(refs) < MinShapeItems {
		ds.Add(r.keyPos("outline"), "a shape needs at least %d items; its outline has %d", MinShapeItems, len(refs))
	}
	s.Tree, s.Refs = tree, refs
	return s, ds
}

// parseShapeOutline parses a shape's outline so that every problem points
// at the file line and column where the outline line is written.
func parseShapeOutline(r *tomlRecord, text string) (*Category, []Ref, Diags) {
	lines := strings.Split(text, "\n")
	var starts []lineCol
	fallback := lineCol{r.At.Line, r.At.Col}
	if k := r.key("outline"); k != nil {
		fallback = k.At
		if len(k.Strings) == 1 && len(k.Strings[0].Starts) == len(lines) {
			starts = k.Strings[0].Starts
		}
	}
	start := func(i int) lineCol {
		if starts != nil {
			return starts[i]
		}
		return fallback
	}
	var refs []Ref
	tree, _, ds := parseTreeLines(r.doc.file, lines, start, false, func(id string, at Pos) {
		refs = append(refs, Ref{ID: id, Pos: at})
	}, nil)
	tree.Sort()
	return tree, refs, ds
}
