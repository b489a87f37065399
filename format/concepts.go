package format

import (
	"crypto/sha256"
	"encoding/hex"
	"slices"
	"strconv"
	"strings"
)

// Concept identifiers. Every category ramify writes carries a short,
// stable identifier (Category.ID): made from the category's members when
// it first appears, then carried to its successor at every regeneration.
// SKOS exports build concept IRIs from it, so links to a concept survive
// renames and moves.
//
// The identifiers live in a comment block at the end of the outline, one
// line per category in outline order, after a count:
//
//	# concepts 2
//	# concept c5d41a7e0b2 3f0c9a1e Fastening
//	# concept c19b2d4e5aa 77b1e0d4 Fastening > Hammers
//
// Each line gives the identifier, a hash of the category's members (all
// items below it) and its path (names without the provisional marker,
// joined by " > "). The tree lines stay as readable as before, and a hand
// edit of them cannot lose an identifier: reading the file binds each
// line to the category with those members — which a rename or a move of
// the whole category keeps — and, failing that, to the category at that
// path — which moving items in or out keeps. The count catches a line
// deleted by accident.

// ConceptIDLen is the length of an identifier: "c" and 10 hex digits
// (40 bits of a SHA-256).
const ConceptIDLen = 11

// ValidConceptID reports whether id has the form ramify writes.
func ValidConceptID(id string) bool {
	if len(id) != ConceptIDLen || id[0] != 'c' {
		return false
	}
	return isHex(id[1:])
}

// DeriveConceptID makes an identifier from a category's members (sorted
// here) and a salt: salt 0 for the first try, 1, 2, ... when an earlier
// try is taken. The same members always give the same identifier, so two
// branches that make the same new category agree on it.
func DeriveConceptID(members []string, salt int) string {
	s := slices.Clone(members)
	slices.Sort(s)
	return deriveID("ramify concept\n"+strings.Join(s, "\n"), salt)
}

// DeriveConceptIDFrom makes an identifier from another stable name of
// the concept, such as its IRI in an imported SKOS file.
func DeriveConceptIDFrom(name string, salt int) string {
	return deriveID("ramify concept from\n"+name, salt)
}

func deriveID(text string, salt int) string {
	if salt > 0 {
		text += "\n#" + strconv.Itoa(salt)
	}
	sum := sha256.Sum256([]byte(text))
	return "c" + hex.EncodeToString(sum[:])[:ConceptIDLen-1]
}

// memberHash is the 8-hex-digit hash of a sorted member list, the ids
// joined by line breaks; buf is room for the joined text, reused from one
// list to the next.
func memberHash(sorted []string, buf *[]byte) string {
	b := (*buf)[:0]
	for i, id := range sorted {
		if i > 0 {
			b = append(b, '\n')
		}
		b = append(b, id...)
	}
	*buf = b
	sum := sha256.Sum256(b)
	return hex.EncodeToString(sum[:4])
}

// ConceptPathSeparator joins names in the paths of the concept block.
const ConceptPathSeparator = " > "

// conceptRow is one category of a tree with what the block says of it.
type conceptRow struct {
	cat     *Category
	members string // memberHash
	path    string
}

// conceptRows lists the categories below root in walk order.
func conceptRows(root *Category) []conceptRow {
	var rows []conceptRow
	var rec func(c *Category, prefix string)
	rec = func(c *Category, prefix string) {
		for _, ch := range c.Children {
			path := ch.Name
			if prefix != "" {
				path = prefix + ConceptPathSeparator + ch.Name
			}
			rows = append(rows, conceptRow{cat: ch, path: path})
			rec(ch, path)
		}
	}
	rec(root, "")
	var buf []byte
	for i, members := range MemberLists(root) {
		rows[i].members = memberHash(members, &buf)
	}
	return rows
}

// formatConcepts writes the concept block of root, or nothing when no
// category has an identifier.
func formatConcepts(b *strings.Builder, root *Category) {
	rows := conceptRows(root)
	n := 0
	for _, r := range rows {
		if r.cat.ID != "" {
			n++
		}
	}
	if n == 0 {
		return
	}
	b.WriteString("# concepts " + strconv.Itoa(n) + "\n")
	for _, r := range rows {
		if r.cat.ID != "" {
			b.WriteString("# concept " + r.cat.ID + " " + r.members + " " + r.path + "\n")
		}
	}
}

// conceptLine is one parsed line of the block.
type conceptLine struct {
	id, members, path string
	pos               Pos
}

// parseConcepts reads the concept block from the comment lines of an
// outline and binds its identifiers to the categories of root (see the
// comment at the top of this file). Lines of the block may sit anywhere
// among the comments; the count line must come first.
func parseConcepts(file string, data []byte, root *Category) Diags {
	var ds Diags
	var lines []conceptLine
	count, countPos := -1, Pos{}
	seen := map[string]Pos{}
	for i, line := range strings.Split(string(data), "\n") {
		at := Pos{File: file, Line: i + 1, Col: 1}
		if v, ok := strings.CutPrefix(line, "# concepts "); ok {
			n, err := strconv.Atoi(strings.TrimSpace(v))
			if err != nil || n < 0 {
				ds.Add(at, "concept count %q is not a number", clip(v))
				continue
			}
			if count >= 0 {
				ds.Add(at, "a second \"# concepts\" line (the first is at line %d)", countPos.Line)
				continue
			}
			count, countPos = n, at
			continue
		}
		v, ok := strings.CutPrefix(line, "# concept ")
		if !ok {
			continue
		}
		fields := strings.SplitN(v, " ", 3)
		if len(fields) < 3 || !ValidConceptID(fields[0]) || len(fields[1]) != 8 || !isHex(fields[1]) {
			ds.Add(at, "concept line must read \"# concept ID MEMBERS PATH\" (ID is c and 10 hex digits, MEMBERS 8 hex digits)")
			continue
		}
		if prev, dup := seen[fields[0]]; dup {
			ds.Add(at, "concept %s appears twice (first at line %d)", fields[0], prev.Line)
			continue
		}
		seen[fields[0]] = at
		lines = append(lines, conceptLine{id: fields[0], members: fields[1], path: fields[2], pos: at})
	}
	switch {
	case count < 0 && len(lines) > 0:
		ds.Add(lines[0].pos, "concept lines without the \"# concepts N\" line that counts them")
	case count >= 0 && count != len(lines) && len(ds) == 0:
		ds.Add(countPos, "the concept block counts %d identifiers but holds %d lines; an edit lost or added one — restore the block from git (`git diff` shows it)", count, len(lines))
	}
	if len(ds) > 0 {
		ds.Sort() // the missing count line is found last but told at the first line
		return ds
	}
	bindConcepts(root, lines)
	return nil
}

// bindConcepts gives each line's identifier to a category: first by
// members (lines and categories paired in walk order among equal member
// hashes, as a category and its only subcategory share members), then by
// path, then by its own name when exactly one line and one category left
// over have it (a category both moved and changed in one edit). An
// identifier whose category is gone is dropped: that concept has been
// retired by the edit.
func bindConcepts(root *Category, lines []conceptLine) {
	rows := conceptRows(root)
	byMembers := map[string][]int{}
	byPath := map[string][]int{}
	for i, r := range rows {
		byMembers[r.members] = append(byMembers[r.members], i)
		byPath[r.path] = append(byPath[r.path], i)
	}
	bound := make([]bool, len(rows))
	used := make([]bool, len(lines))
	take := func(cands []int, li int) bool {
		for _, i := range cands {
			if !bound[i] {
				bound[i], used[li] = true, true
				rows[i].cat.ID = lines[li].id
				return true
			}
		}
		return false
	}
	// Among categories with equal members (a category and its only
	// subcategory), the one at the line's path comes first.
	for li, l := range lines {
		var samePath []int
		for _, i := range byMembers[l.members] {
			if rows[i].path == l.path {
				samePath = append(samePath, i)
			}
		}
		if !take(samePath, li) {
			take(byMembers[l.members], li)
		}
	}
	for li, l := range lines {
		if !used[li] {
			take(byPath[l.path], li)
		}
	}
	lastName := func(path string) string {
		if i := strings.LastIndex(path, ConceptPathSeparator); i >= 0 {
			return path[i+len(ConceptPathSeparator):]
		}
		return path
	}
	leftLines, leftRows := map[string][]int{}, map[string][]int{}
	for li, l := range lines {
		if !used[li] {
			leftLines[lastName(l.path)] = append(leftLines[lastName(l.path)], li)
		}
	}
	for i, r := range rows {
		if !bound[i] {
			leftRows[r.cat.Name] = append(leftRows[r.cat.Name], i)
		}
	}
	for name, ls := range leftLines {
		if rs := leftRows[name]; len(ls) == 1 && len(rs) == 1 {
			take(rs, ls[0])
		}
	}
}

// ConceptBlock is the concept block FormatOutline ends with, for writers
// of outlines without a structure line (an import).
func ConceptBlock(root *Category) []byte {
	var b strings.Builder
	formatConcepts(&b, root)
	return []byte(b.String())
}
