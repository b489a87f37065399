package diff

import (
	"bufio"
	"fmt"
	"io"
	"strings"
)

// collapseAfter is the longest list shown open in Markdown; longer ones
// fold into a <details> block so a pull request stays readable.
const collapseAfter = 10

// Markdown writes the report for a pull request or review comment: a
// heading and a one-line summary, a table of category changes, tables of
// moved, added and removed items (folded when long), and the measures.
func (r *Report) Markdown(w io.Writer) {
	b := bufio.NewWriter(w)
	defer b.Flush()
	p := func(format string, args ...any) { fmt.Fprintf(b, format, args...) }
	p("### Taxonomy changes\n\n")
	m := r.Metrics
	if r.Empty() {
		p("**No changes**: %s in the same places.\n", counted(m.CommonItems, "item", "items"))
	} else {
		p("**%s** (%s in both versions)\n", strings.Join(r.summaryParts(), ", "), counted(m.CommonItems, "item", "items"))
	}

	var rows [][3]string
	for _, s := range r.Split {
		rows = append(rows, [3]string{"split", mdPath(s.From), mdPaths(s.Into)})
	}
	for _, g := range r.Merged {
		rows = append(rows, [3]string{"merged", mdPaths(g.From), mdPath(g.Into)})
	}
	for _, n := range r.Renamed {
		rows = append(rows, [3]string{"renamed", mdPath(n.From), mdPath(n.To)})
	}
	for _, mv := range r.MovedCategories {
		rows = append(rows, [3]string{"moved", mdPath(mv.From), mdPath(mv.To) + " (" + counted(len(mv.Items), "item", "items") + ")"})
	}
	for _, c := range r.Created {
		rows = append(rows, [3]string{"created", "", mdPath(c)})
	}
	for _, d := range r.Dissolved {
		rows = append(rows, [3]string{"dissolved", mdPath(d), ""})
	}
	mdTable(b, "Categories", "category change", "category changes", "| change | before | after |\n| --- | --- | --- |\n",
		len(rows), func(i int) []string { return rows[i][:] })
	mdTable(b, "Moved items", "moved item", "moved items", "| item | from | to |\n| --- | --- | --- |\n",
		len(r.Moved), func(i int) []string {
			mv := r.Moved[i]
			return []string{"`" + mv.Item + "`", mdPath(mv.From), mdPath(mv.To)}
		})
	mdTable(b, "Added items", "added item", "added items", "| item | in |\n| --- | --- |\n",
		len(r.Added), func(i int) []string { return []string{"`" + r.Added[i].Item + "`", mdPath(r.Added[i].To)} })
	mdTable(b, "Removed items", "removed item", "removed items", "| item | was in |\n| --- | --- |\n",
		len(r.Removed), func(i int) []string { return []string{"`" + r.Removed[i].Item + "`", mdPath(r.Removed[i].From)} })

	p("\n#### Tree comparison\n\n")
	p("On the %s in both versions.\n\n", counted(m.CommonItems, "item", "items"))
	p("| measure | value |\n| --- | --- |\n")
	p("| triplet agreement | %s |\n", m.tripletText())
	p("| triplets of the old version kept (recall) | %s |\n", fixed4(m.TripletRecall))
	p("| triplets of the new version found in the old (precision) | %s |\n", fixed4(m.TripletPrecision))
	p("| Robinson–Foulds distance | %s |\n", m.rfText())
	p("| cophenetic correlation | %s |\n", m.copheneticText())
}

// mdTable writes one titled table of n rows (nothing when n is 0): the
// header, then the cells row(i) gives for each row, folded when long under
// a summary that counts them as noun or nouns.
func mdTable(b *bufio.Writer, title, noun, nouns, header string, n int, row func(i int) []string) {
	if n == 0 {
		return
	}
	fmt.Fprintf(b, "\n#### %s\n\n", title)
	folded(b, n, counted(n, noun, nouns), func() {
		b.WriteString(header)
		for i := range n {
			b.WriteString("| " + strings.Join(row(i), " | ") + " |\n")
		}
	})
}

// folded writes body directly when it has at most collapseAfter rows, and
// inside a <details> block titled summary otherwise. The blank lines
// around the body let the Markdown inside render.
func folded(b *bufio.Writer, rows int, summary string, body func()) {
	if rows <= collapseAfter {
		body()
		return
	}
	fmt.Fprintf(b, "<details><summary>%s</summary>\n\n", summary)
	body()
	b.WriteString("\n</details>\n")
}

func mdPath(p Path) string { return mdEscape(p.String()) }

func mdPaths(ps []Path) string {
	parts := make([]string, len(ps))
	for i, p := range ps {
		parts[i] = mdPath(p)
	}
	return strings.Join(parts, "<br>")
}

// mdEscape keeps a category name literal in a table cell: Markdown's
// punctuation is backslash-escaped (CommonMark allows that before any ASCII
// punctuation) and "|" cannot end the cell.
func mdEscape(s string) string {
	var b strings.Builder
	for _, r := range s {
		if strings.ContainsRune("\\`*_{}[]<>()#+!|~&", r) {
			b.WriteByte('\\')
		}
		b.WriteRune(r)
	}
	return b.String()
}
