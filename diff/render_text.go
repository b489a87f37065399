package diff

import (
	"bufio"
	"io"
	"strings"
)

// Legend of the one-character marks that start the lines of Text:
//
//	<  split       one old category now spread over several new ones
//	&  merged      several old categories now one
//	=  renamed     same members, another name
//	+  created / added
//	-  dissolved / removed
//	>  moved       a category that moved whole, or an item whose category
//	               path changed
const Legend = "< split  & merged  = renamed  + created/added  - dissolved/removed  > moved"

// Terminal colours: few and soft. Structure in blue, gains green, losses
// red, moves amber; counts bold, measures dim.
const (
	ansiReset     = "\x1b[0m"
	ansiBold      = "\x1b[1m"
	ansiDim       = "\x1b[2m"
	ansiStructure = "\x1b[34m"
	ansiGain      = "\x1b[32m"
	ansiLoss      = "\x1b[31m"
	ansiMove      = "\x1b[33m"
)

// textWidth is where item lists wrap.
const textWidth = 88

type textWriter struct {
	w     *bufio.Writer
	color bool
}

func (t *textWriter) paint(style, s string) string {
	if !t.color || style == "" {
		return s
	}
	return style + s + ansiReset
}

func (t *textWriter) line(parts ...string) {
	for _, p := range parts {
		t.w.WriteString(p)
	}
	t.w.WriteByte('\n')
}

// Text writes the report for a terminal: a summary line, the measures,
// then the structural changes (splits, merges, renames, created,
// dissolved), then the item changes grouped by where they went. ANSI
// colour is used only when color is true (the caller decides from the
// terminal and NO_COLOR).
func (r *Report) Text(w io.Writer, color bool) {
	t := &textWriter{w: bufio.NewWriter(w), color: color}
	defer t.w.Flush()
	if r.Empty() {
		t.line(t.paint(ansiBold, "no changes"), "  ", counted(r.Metrics.CommonItems, "item", "items"), " in the same places")
	} else {
		t.line(t.paint(ansiBold, strings.Join(r.summaryParts(), ", ")))
	}
	m := r.Metrics
	t.line(t.paint(ansiDim, "triplet agreement "+m.tripletText()+" · "+m.keptText()+" · RF "+m.rfText()+
		" · cophenetic "+m.copheneticText()+" · "+counted(m.CommonItems, "common item", "common items")))

	structural := len(r.Split)+len(r.Merged)+len(r.Renamed)+len(r.MovedCategories)+len(r.Created)+len(r.Dissolved) > 0
	if structural {
		t.line()
	}
	for _, s := range r.Split {
		t.line(t.paint(ansiStructure, "<"), " split     ", s.From.String())
		for _, p := range s.Into {
			t.line("              into ", p.String())
		}
	}
	for _, m := range r.Merged {
		for i, p := range m.From {
			if i == 0 {
				t.line(t.paint(ansiStructure, "&"), " merged    ", p.String())
			} else {
				t.line("              and  ", p.String())
			}
		}
		t.line("              into ", m.Into.String())
	}
	for _, n := range r.Renamed {
		t.line(t.paint(ansiStructure, "="), " renamed   ", n.From.String())
		t.line("              to   ", n.To.String())
	}
	for _, m := range r.MovedCategories {
		t.line(t.paint(ansiMove, ">"), " moved     ", m.From.String())
		t.line("              to   ", m.withItems())
	}
	for _, p := range r.Created {
		t.line(t.paint(ansiGain, "+"), " created   ", p.String())
	}
	for _, p := range r.Dissolved {
		t.line(t.paint(ansiLoss, "-"), " dissolved ", p.String())
	}

	t.itemSection(ansiMove, ">", "moved", len(r.Moved), groupMoves(r.Moved), func(g itemGroup) string {
		return g.from.String() + t.paint(ansiMove, "  ->  ") + g.to.String()
	})
	t.itemSection(ansiGain, "+", "added", len(r.Added), groupAdded(r.Added), func(g itemGroup) string { return "in " + g.to.String() })
	t.itemSection(ansiLoss, "-", "removed", len(r.Removed), groupRemoved(r.Removed), func(g itemGroup) string { return "from " + g.from.String() })
}

// itemSection writes one kind of item change (nothing when there are n = 0
// of them): a heading, marked with sign in style, that counts them as
// what, then every group's place and its items.
func (t *textWriter) itemSection(style, sign, what string, n int, groups []itemGroup, place func(itemGroup) string) {
	if n == 0 {
		return
	}
	t.line()
	t.line(t.paint(style, sign), " ", t.paint(ansiBold, what+" "+counted(n, "item", "items")))
	for _, g := range groups {
		t.line("    ", place(g))
		t.items(g.items)
	}
}

// items writes ids separated by ", ", wrapped at textWidth, indented.
func (t *textWriter) items(ids []string) {
	const indent = "      "
	var b strings.Builder
	b.WriteString(indent)
	width := len(indent)
	for i, id := range ids {
		if i > 0 {
			b.WriteString(",")
			width++
			if width+1+len(id) > textWidth {
				t.line(b.String())
				b.Reset()
				b.WriteString(indent)
				width = len(indent)
			} else {
				b.WriteString(" ")
				width++
			}
		}
		b.WriteString(id)
		width += len(id)
	}
	t.line(b.String())
}
