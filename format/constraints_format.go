package format

import (
	"bytes"
	"fmt"
	"strings"
)

// FormatConstraints prints cf as canonical TOML that ParseConstraints reads
// back to the same records: triplets, then groups, then shapes, each in
// slice order, one blank line between records, provenance last and only
// when given. Shape outlines are printed in canonical order; cf itself is
// not changed.
func FormatConstraints(cf *ConstraintFile) []byte {
	var b bytes.Buffer
	sep := func() {
		if b.Len() > 0 {
			b.WriteByte('\n')
		}
	}
	for _, t := range cf.Triplets {
		sep()
		b.WriteString("[[triplet]]\n")
		fmt.Fprintf(&b, "pair = [%s, %s]\n", tomlQuote(t.Pair[0]), tomlQuote(t.Pair[1]))
		fmt.Fprintf(&b, "out = %s\n", tomlQuote(t.Out))
		writeProvenance(&b, t.Provenance)
	}
	for _, g := range cf.Groups {
		sep()
		b.WriteString("[[group]]\n")
		quoted := make([]string, len(g.Items))
		for i, id := range g.Items {
			quoted[i] = tomlQuote(id)
		}
		fmt.Fprintf(&b, "items = [%s]\n", strings.Join(quoted, ", "))
		if g.Name != "" {
			fmt.Fprintf(&b, "name = %s\n", tomlQuote(g.Name))
		}
		writeProvenance(&b, g.Provenance)
	}
	for _, s := range cf.Shapes {
		sep()
		b.WriteString("[[shape]]\n")
		var tree []byte
		if s.Tree != nil {
			tree = FormatTree(s.Tree.Clone())
		}
		fmt.Fprintf(&b, "outline = \"\"\"\n%s\"\"\"\n", tomlEscape(string(tree), true))
		if s.Packet != "" {
			fmt.Fprintf(&b, "packet = %s\n", tomlQuote(s.Packet))
		}
		if s.Structure != "" {
			fmt.Fprintf(&b, "structure = %s\n", tomlQuote(s.Structure))
		}
		if s.SideBySide {
			b.WriteString("side_by_side = true\n")
		}
		writeProvenance(&b, s.Provenance)
	}
	return b.Bytes()
}

func writeProvenance(b *bytes.Buffer, p Provenance) {
	if p.By != "" {
		fmt.Fprintf(b, "by = %s\n", tomlQuote(p.By))
	}
	if p.Date != "" {
		if validDate(p.Date) {
			fmt.Fprintf(b, "date = %s\n", p.Date) // a TOML local date
		} else {
			fmt.Fprintf(b, "date = %s\n", tomlQuote(p.Date))
		}
	}
	if p.Note != "" {
		fmt.Fprintf(b, "note = %s\n", tomlQuote(p.Note))
	}
}

// tomlQuote writes s as a TOML basic string.
func tomlQuote(s string) string { return `"` + tomlEscape(s, false) + `"` }

// tomlEscape escapes s for the inside of a TOML basic string; multiline
// keeps line breaks as they are (for """ strings). Everything TOML forbids
// raw — quote, backslash, control characters — is escaped; all other
// characters are written as themselves.
func tomlEscape(s string, multiline bool) string {
	var b strings.Builder
	for _, r := range s {
		switch {
		case r == '"':
			b.WriteString(`\"`)
		case r == '\\':
			b.WriteString(`\\`)
		case r == '\n' && multiline:
			b.WriteByte('\n')
		case r == '\n':
			b.WriteString(`\n`)
		case r == '\t':
			b.WriteString(`\t`)
		case r < 0x20 || r == 0x7f:
			fmt.Fprintf(&b, `\u%04X`, r)
		default:
			b.WriteRune(r)
		}
	}
	return b.String()
}
