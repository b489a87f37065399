package report

import (
	"bufio"
	_ "embed"
	"encoding/json"
	"html"
	"io"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"
)

// The page's parts. They are kept as files of their own so that they can
// be read and checked as what they are; WriteHTML puts them inline.
var (
	//go:embed page.html
	pageHTML string
	//go:embed page.css
	pageCSS string
	//go:embed page.js
	pageJS string
)

// WriteHTML writes the page: the fixed markup, style and script, with the
// data as one JSON document inside a script element of type
// application/json. The script parses it once and builds rows only for
// the categories a reader opens, so a page of 100,000 items shows its top
// level at once.
func (pg *Page) WriteHTML(w io.Writer) error {
	bw := bufio.NewWriterSize(w, 1<<16)
	head, rest, ok1 := strings.Cut(pageHTML, "{{META}}")
	middle, tail, ok2 := strings.Cut(rest, "{{ITEMS}}")
	if !ok1 || !ok2 {
		panic("report: page.html lacks the {{META}} or {{ITEMS}} place")
	}
	r := strings.NewReplacer("{{TITLE}}", html.EscapeString(pg.Title), "{{CSS}}", pageCSS, "{{JS}}", pageJS)
	r.WriteString(bw, head)
	pg.writeMeta(&jsonWriter{w: bw})
	r.WriteString(bw, middle)
	pg.writeItems(&jsonWriter{w: bw})
	r.WriteString(bw, tail)
	return bw.Flush()
}

// The data is written compactly, categories and items as arrays rather
// than objects since they are most of the bytes, in two documents: the
// items, which the page parses only after it has shown the top level,
// and everything else. The layout is documented in page.js, which reads
// it.

// writeMeta writes everything but the items.
func (pg *Page) writeMeta(j *jsonWriter) {
	j.key(`{"title"`)
	j.str(pg.Title)
	j.key(`,"structure"`)
	j.str(pg.Structure)
	j.key(`,"base"`)
	j.str(pg.Base)
	j.key(`,"note"`)
	j.str(pg.Note)
	j.key(`,"support"`)
	j.value(pg.Support)
	j.key(`,"weakest"`)
	j.ints(pg.Weakest)
	j.key(`,"tags"`)
	j.strs(pg.Tags)
	j.key(`,"recs"`)
	j.open()
	for _, r := range pg.Recs {
		j.strs([]string{r.Kind, r.Where, r.By, r.Date, r.Note, r.Summary})
	}
	j.close()
	j.key(",\n\"cats\"")
	j.open()
	for i := range pg.Cats {
		c := &pg.Cats[i]
		j.row(i)
		j.str(c.Name)
		j.bit(c.Provisional)
		j.int(c.Parent)
		j.int(c.Size)
		j.fraction(c.Support)
		j.ints(c.Children)
		j.ints(c.Items)
		j.ints(c.Records)
		j.strs(c.Marks)
		j.str(c.Was)
		j.close()
	}
	j.close()
	j.key(",\n\"moved\"")
	j.open()
	for i := range pg.Items {
		if it := &pg.Items[i]; it.Mark == "moved" {
			j.open()
			j.int(i)
			j.str(it.ID)
			j.str(it.From)
			j.close()
		}
	}
	j.close()
	j.key(",\n\"changes\"")
	j.value(pg.Changes)
	j.key(`,"review"`)
	j.value(reviewJSON(pg.Review))
	j.w.WriteString("}")
}

// writeItems writes the items.
func (pg *Page) writeItems(j *jsonWriter) {
	j.open()
	for i := range pg.Items {
		it := &pg.Items[i]
		j.row(i)
		j.str(it.ID)
		j.str(it.Label)
		j.str(it.Text)
		j.ints(it.Tags)
		j.int(it.Cat)
		// Trailing fields only when there is something in them.
		if len(it.Records) > 0 || it.Mark != "" {
			j.ints(it.Records)
		}
		if it.Mark != "" {
			j.str(it.Mark)
			j.str(it.From)
		}
		j.close()
	}
	j.close()
}

// reviewJSON is the review state with the names page.js reads.
func reviewJSON(r Review) any {
	type open struct {
		File    string   `json:"file"`
		Reason  string   `json:"reason"`
		Drawn   string   `json:"drawn"`
		Verdict string   `json:"verdict"`
		Current bool     `json:"current"`
		Items   []string `json:"items"`
	}
	type audits struct {
		Answered int       `json:"answered"`
		Rejected int       `json:"rejected"`
		Rate     float64   `json:"rate"`
		Interval []float64 `json:"interval"`
		Older    int       `json:"older"`
	}
	out := struct {
		Open      []open  `json:"open"`
		Audits    *audits `json:"audits"`
		MinAudits int     `json:"min_audits"`
		MaxReject float64 `json:"max_reject_rate"`
		Passed    bool    `json:"gate_passed"`
	}{Open: []open{}, MinAudits: r.Gate.MinAudits, MaxReject: r.Gate.MaxRejectRate, Passed: r.GatePassed}
	for _, o := range r.Open {
		out.Open = append(out.Open, open(o))
	}
	if a := r.Audits; a != nil {
		out.Audits = &audits{a.Audits, a.Rejected, round4(a.Rate), []float64{round4(a.Lo), round4(a.Hi)}, a.Older}
	}
	return out
}

func round4(x float64) float64 { return math.Round(x*1e4) / 1e4 }

// jsonWriter writes JSON values straight to the page. Inside an array
// each value but the first is preceded by a comma, which the writer adds
// itself: every value starts with sep, and comma says whether one is due,
// that is whether a value has been written since the last opening bracket
// or key. One flag serves for nested arrays too, since closing an array
// leaves its parent holding a value.
type jsonWriter struct {
	w     *bufio.Writer
	buf   []byte
	comma bool
}

// sep writes the comma that goes before a value, if one does.
func (j *jsonWriter) sep() {
	if j.comma {
		j.w.WriteByte(',')
	}
	j.comma = true
}

// key writes an object's key (with whatever punctuation leads to it) and
// the colon, after which the next value needs no comma.
func (j *jsonWriter) key(k string) {
	j.w.WriteString(k)
	j.w.WriteByte(':')
	j.comma = false
}

// open starts an array as a value.
func (j *jsonWriter) open() {
	j.sep()
	j.w.WriteByte('[')
	j.comma = false
}

// row starts the array of the i-th category or item, on a line of its own
// after the first so that the page's source stays readable.
func (j *jsonWriter) row(i int) {
	if i > 0 {
		j.w.WriteString(",\n")
		j.comma = false
	}
	j.open()
}

// close ends the array; it is a value of its parent.
func (j *jsonWriter) close() {
	j.w.WriteByte(']')
	j.comma = true
}

func (j *jsonWriter) int(x int) {
	j.sep()
	j.buf = strconv.AppendInt(j.buf[:0], int64(x), 10)
	j.w.Write(j.buf)
}

// bit writes a flag as 1 or 0.
func (j *jsonWriter) bit(b bool) {
	if b {
		j.int(1)
	} else {
		j.int(0)
	}
}

func (j *jsonWriter) ints(xs []int) {
	j.open()
	for _, x := range xs {
		j.int(x)
	}
	j.close()
}

// strs writes a JSON array of strings.
func (j *jsonWriter) strs(ss []string) {
	j.open()
	for _, s := range ss {
		j.str(s)
	}
	j.close()
}

// fraction writes a share with four decimals, or -1.
func (j *jsonWriter) fraction(x float64) {
	j.sep()
	if x < 0 {
		j.w.WriteString("-1")
		return
	}
	j.buf = strconv.AppendFloat(j.buf[:0], round4(x), 'f', -1, 64)
	j.w.Write(j.buf)
}

// value writes v with encoding/json, which escapes <, > and & so that no
// text can close the script element it sits in.
func (j *jsonWriter) value(v any) {
	j.sep()
	b, err := json.Marshal(v)
	if err != nil {
		panic("report: " + err.Error()) // only plain data is passed
	}
	j.w.Write(b)
}

// str writes s as a JSON string, escaped as encoding/json escapes it for
// HTML: <, > and & as \u003c and so on, the line separators U+2028 and
// U+2029, control characters, and invalid UTF-8 as U+FFFD.
func (j *jsonWriter) str(s string) {
	const hex = "0123456789abcdef"
	j.sep()
	w := j.w
	w.WriteByte('"')
	start := 0
	for i := 0; i < len(s); {
		c := s[i]
		if c < utf8.RuneSelf {
			if c >= 0x20 && c != '"' && c != '\\' && c != '<' && c != '>' && c != '&' {
				i++
				continue
			}
			w.WriteString(s[start:i])
			switch c {
			case '"', '\\':
				w.WriteByte('\\')
				w.WriteByte(c)
			case '\n':
				w.WriteString(`\n`)
			case '\t':
				w.WriteString(`\t`)
			case '\r':
				w.WriteString(`\r`)
			default:
				w.WriteString(`\u00`)
				w.WriteByte(hex[c>>4])
				w.WriteByte(hex[c&0xf])
			}
			i++
			start = i
			continue
		}
		r, size := utf8.DecodeRuneInString(s[i:])
		if r == utf8.RuneError && size == 1 {
			w.WriteString(s[start:i])
			w.WriteString(`\ufffd`)
			i += size
			start = i
			continue
		}
		if r == '\u2028' || r == '\u2029' {
			w.WriteString(s[start:i])
			w.WriteString(`\u202`)
			w.WriteByte(hex[r&0xf])
			i += size
			start = i
			continue
		}
		i += size
	}
	w.WriteString(s[start:])
	w.WriteByte('"')
}
