package format

import (
	"fmt"
	"math"
	"net/url"
	"path"
	"strings"
)

var settingsLimits = tomlLimits{
	MaxNesting:  8,
	MaxArray:    10_000,
	MaxKeyParts: 8,
	MaxHeaders:  1_000,
	MaxKeys:     10_000,
	WantStrings: true,
}

var (
	settingsSections = []string{"items", "similarity", "taxonomy", "review", "release", "limits"}
	settingsKeys     = map[string][]string{
		"items":      {"files", "vectors", "vector_ids", "vector_column"},
		"similarity": {"neighbors", "source", "text"},
		"taxonomy":   {"file", "min_size", "max_children", "max_depth", "stability"},
		"review":     {"size", "audit_share", "committee"},
		"release":    {"min_audits", "max_reject_rate", "base_iri"},
		"limits":     {"items", "links", "records", "bytes"},
	}
	sourceKeys = []string{"kind", "weight", "file"}
	textKeys   = []string{"label_heads", "label_grams", "description"}
)

// ParseSettings reads a ramify.toml. Keys it leaves out keep their
// defaults; a file that gives any [[similarity.source]] replaces the
// default sources. Unknown keys, values out of range and paths that leave
// the repository are all reported.
func ParseSettings(file string, data []byte) (*Settings, error) {
	doc, ds := decodeTOML(file, data, settingsLimits)
	if len(ds) > 0 {
		return nil, ds
	}
	s := DefaultSettings()
	s.File = file
	s.KeyPos = keyPositions(doc)
	r := &settingsReader{s: s}
	r.ds = append(r.ds, unknownKeys(doc.root, settingsSections, "ramify.toml", s.PosOf)...)
	for _, sec := range settingsSections {
		v, ok := doc.root[sec]
		if !ok {
			continue
		}
		tbl, ok := v.(map[string]any)
		if !ok {
			r.ds.Add(s.PosOf(sec), "%s must be a table ([%s]), not %s", sec, sec, tomlType(v))
			continue
		}
		r.ds = append(r.ds, unknownKeys(tbl, settingsKeys[sec], "["+sec+"]", func(k string) Pos { return s.PosOf(sec + "." + k) })...)
		r.section(sec, tbl)
	}
	r.crossChecks()
	return orProblems(s, r.ds)
}

type settingsReader struct {
	s  *Settings
	ds Diags
}

func (r *settingsReader) section(sec string, t map[string]any) {
	s := r.s
	switch sec {
	case "items":
		if v, ok := t["files"]; ok {
			files, msg := asStrings(v)
			switch {
			case msg != "":
				r.ds.Add(s.PosOf("items.files"), "items.files %s", msg)
			case len(files) == 0:
				r.ds.Add(s.PosOf("items.files"), "items.files must name at least one items file")
			default:
				s.Items.Files = files
			}
		}
		r.str(t, "items.vectors", &s.Items.Vectors)
		r.str(t, "items.vector_ids", &s.Items.VectorIDs)
		r.str(t, "items.vector_column", &s.Items.VectorColumn)
	case "similarity":
		r.int(t, "similarity.neighbors", &s.Similarity.Neighbors, 0, 200)
		if v, ok := t["source"]; ok {
			r.sources(v)
		}
		if v, ok := t["text"]; ok {
			r.text(v)
		}
	case "taxonomy":
		r.str(t, "taxonomy.file", &s.Taxonomy.File)
		r.int(t, "taxonomy.min_size", &s.Taxonomy.MinSize, 1, 1000)
		r.int(t, "taxonomy.max_children", &s.Taxonomy.MaxChildren, 2, 1000)
		r.int(t, "taxonomy.max_depth", &s.Taxonomy.MaxDepth, 1, 64)
		r.float(t, "taxonomy.stability", &s.Taxonomy.Stability, 0, 1, false)
	case "review":
		r.int(t, "review.size", &s.Review.Size, 3, 12)
		r.float(t, "review.audit_share", &s.Review.AuditShare, 0, 1, false)
		r.int(t, "review.committee", &s.Review.Committee, 2, 200)
	case "release":
		r.int(t, "release.min_audits", &s.Release.MinAudits, 1, 100_000)
		r.float(t, "release.max_reject_rate", &s.Release.MaxRejectRate, 0, 1, true)
		r.str(t, "release.base_iri", &s.Release.BaseIRI)
	case "limits":
		r.int(t, "limits.items", &s.Limits.Items, 1, 100_000_000)
		r.int(t, "limits.links", &s.Limits.Links, 0, 1_000_000_000)
		r.int(t, "limits.records", &s.Limits.Records, 0, 1_000_000_000)
		r.int(t, "limits.bytes", &s.Limits.Bytes, 1, 1<<40)
	}
}

// last is the final part of a dotted settings key, as written in its table.
func last(key string) string { return key[strings.LastIndexByte(key, '.')+1:] }

func (r *settingsReader) int(t map[string]any, key string, dst *int, lo, hi int) {
	v, ok := t[last(key)]
	if !ok {
		return
	}
	n, isInt := v.(int64)
	switch {
	case !isInt:
		r.ds.Add(r.s.PosOf(key), "%s must be a whole number, not %s", displayKey(key), tomlType(v))
	case n < int64(lo) || n > int64(hi):
		r.ds.Add(r.s.PosOf(key), "%s must be between %d and %d; it is %d", displayKey(key), lo, hi, n)
	default:
		*dst = int(n)
	}
}

// float reads a number in [lo, hi], or in (lo, hi) when open.
func (r *settingsReader) float(t map[string]any, key string, dst *float64, lo, hi float64, open bool) {
	v, ok := t[last(key)]
	if !ok {
		return
	}
	x, msg := asNumber(v, displayKey(key))
	if msg == "" {
		if open && (x <= lo || x >= hi) {
			msg = fmt.Sprintf("%s must be greater than %g and less than %g; it is %g", displayKey(key), lo, hi, x)
		} else if x < lo || x > hi {
			msg = fmt.Sprintf("%s must be between %g and %g; it is %g", displayKey(key), lo, hi, x)
		}
	}
	if msg != "" {
		r.ds.Add(r.s.PosOf(key), "%s", msg)
		return
	}
	*dst = x
}

// asNumber reads an integer or a float as a finite float64.
func asNumber(v any, key string) (float64, string) {
	switch x := v.(type) {
	case int64:
		return float64(x), ""
	case float64:
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return 0, fmt.Sprintf("%s must be a finite number; it is %v", key, x)
		}
		return x, ""
	}
	return 0, fmt.Sprintf("%s must be a number, not %s", key, tomlType(v))
}

func (r *settingsReader) str(t map[string]any, key string, dst *string) {
	v, ok := t[last(key)]
	if !ok {
		return
	}
	s, isString := v.(string)
	if !isString {
		r.ds.Add(r.s.PosOf(key), "%s must be a string, not %s", displayKey(key), tomlType(v))
		return
	}
	*dst = s
}

// sources reads the [[similarity.source]] tables, replacing the defaults.
func (r *settingsReader) sources(v any) {
	var tables []map[string]any
	switch v := v.(type) {
	case []map[string]any:
		tables = v
	case []any: // an inline array of inline tables
		for _, x := range v {
			m, ok := x.(map[string]any)
			if !ok {
				r.ds.Add(r.s.PosOf("similarity.source"), "similarity.source must be a list of tables, one per [[similarity.source]]")
				return
			}
			tables = append(tables, m)
		}
	default:
		r.ds.Add(r.s.PosOf("similarity.source"), "similarity.source must be a list of tables, one per [[similarity.source]], not %s", tomlType(v))
		return
	}
	if len(tables) == 0 {
		r.ds.Add(r.s.PosOf("similarity.source"), "similarity.source is empty; name at least one source")
		return
	}
	sources := make([]Source, 0, len(tables))
	for i, t := range tables {
		name := fmt.Sprintf("similarity.source[%d]", i)
		r.ds = append(r.ds, unknownKeys(t, sourceKeys, "[[similarity.source]]", func(k string) Pos { return r.s.PosOf(name + "." + k) })...)
		src := Source{Weight: 1}
		if _, ok := t["kind"]; !ok {
			r.ds.Add(r.s.PosOf(name), "[[similarity.source]] has no kind; it is one of %s", joinOr(SourceKinds))
		}
		r.str(t, name+".kind", &src.Kind)
		r.str(t, name+".file", &src.File)
		if w, ok := t["weight"]; ok {
			x, msg := asNumber(w, "similarity.source.weight")
			if msg == "" && x <= 0 {
				msg = fmt.Sprintf("similarity.source.weight must be greater than 0; it is %g", x)
			}
			if msg != "" {
				r.ds.Add(r.s.PosOf(name+".weight"), "%s", msg)
			} else {
				src.Weight = x
			}
		}
		sources = append(sources, src)
	}
	r.s.Similarity.Sources = sources
}

// text reads [similarity.text], the weights of the text source's channels.
func (r *settingsReader) text(v any) {
	t, ok := v.(map[string]any)
	if !ok {
		r.ds.Add(r.s.PosOf("similarity.text"), "similarity.text must be a table ([similarity.text]), not %s", tomlType(v))
		return
	}
	r.ds = append(r.ds, unknownKeys(t, textKeys, "[similarity.text]", func(k string) Pos { return r.s.PosOf("similarity.text." + k) })...)
	ts := &r.s.Similarity.Text
	r.float(t, "similarity.text.label_heads", &ts.LabelHeads, 0, 100, false)
	r.float(t, "similarity.text.label_grams", &ts.LabelGrams, 0, 100, false)
	r.float(t, "similarity.text.description", &ts.Description, 0, 100, false)
	if ts.LabelHeads+ts.LabelGrams+ts.Description == 0 {
		r.ds.Add(r.s.PosOf("similarity.text"), "similarity.text weighs every channel 0; give at least one of label_heads, label_grams and description a weight above 0")
	}
}

// crossChecks looks at what only the whole file can tell: kinds and their
// files, and every path.
func (r *settingsReader) crossChecks() {
	s := r.s
	seenFile := map[string]bool{}
	for i, f := range s.Items.Files {
		key := fmt.Sprintf("items.files[%d]", i)
		r.path(key, f, ".toml", ".tsv", ".csv")
		if seenFile[f] {
			r.ds.Add(s.PosOf(key), "items.files names %q twice", clip(f))
		}
		seenFile[f] = true
	}
	if s.Items.Vectors != "" {
		r.path("items.vectors", s.Items.Vectors, ".tsv", ".npy", ".parquet")
	}
	npy := strings.EqualFold(path.Ext(s.Items.Vectors), ".npy")
	parquet := strings.EqualFold(path.Ext(s.Items.Vectors), ".parquet")
	if s.Items.VectorColumn != "" && !parquet {
		r.ds.Add(s.PosOf("items.vector_column"), "items.vector_column is only for a .parquet vectors file; it names the column that holds the vectors")
	}
	switch {
	case npy && s.Items.VectorIDs == "":
		r.ds.Add(s.PosOf("items.vectors"), "a .npy vectors file needs items.vector_ids, a text file with the id of each row, one a line")
	case s.Items.VectorIDs != "" && !npy:
		r.ds.Add(s.PosOf("items.vector_ids"), "items.vector_ids is only for a .npy vectors file; a .tsv file names its rows itself")
	case s.Items.VectorIDs != "":
		r.path("items.vector_ids", s.Items.VectorIDs, ".txt")
	}
	r.path("taxonomy.file", s.Taxonomy.File, ".outline")
	seenSource := map[Source]bool{}
	for i, src := range s.Similarity.Sources {
		name := fmt.Sprintf("similarity.source[%d]", i)
		switch src.Kind {
		case SourceLinks:
			if src.File == "" {
				r.ds.Add(s.PosOf(name), "a links source needs file = \"links.tsv\" (the file with the links)")
			} else {
				r.path(name+".file", src.File, ".tsv")
			}
		case SourceTags, SourceText, SourceVector:
			if src.File != "" {
				r.ds.Add(s.PosOf(name+".file"), "file is only for links sources; a %s source reads the items", src.Kind)
			}
			if src.Kind == SourceVector && s.Items.Vectors == "" {
				r.ds.Add(s.PosOf(name+".kind"), "a vector source needs items.vectors to name the vectors file")
			}
		case "":
			// Reported as missing or mistyped already.
		default:
			r.ds.Add(s.PosOf(name+".kind"), "unknown source kind %q; it is one of %s%s", clip(src.Kind), joinOr(SourceKinds), didYouMean(src.Kind, SourceKinds))
		}
		key := Source{Kind: src.Kind, File: src.File}
		if src.Kind != "" && seenSource[key] {
			what := src.Kind
			if src.File != "" {
				what += " " + src.File
			}
			r.ds.Add(s.PosOf(name), "similarity source %q appears twice", what)
		}
		seenSource[key] = true
	}
	r.baseIRI()
}

// path checks a path the settings name: it must stay inside the
// repository and end in one of exts.
func (r *settingsReader) path(key, p string, exts ...string) {
	name := displayKey(key)
	if msg := CheckRepoPath(p); msg != "" {
		r.ds.Add(r.s.PosOf(key), "%s: %s", name, msg)
		return
	}
	ext := strings.ToLower(path.Ext(p))
	if !contains(exts, ext) {
		r.ds.Add(r.s.PosOf(key), "%s: %q must end in %s", name, clip(p), joinOr(exts))
	}
}

func (r *settingsReader) baseIRI() {
	iri := r.s.Release.BaseIRI
	u, err := url.Parse(iri)
	switch {
	case err != nil || hasControl(iri, "") || strings.ContainsAny(iri, " <>\"{}|^`"):
		r.ds.Add(r.s.PosOf("release.base_iri"), "release.base_iri %q is not a valid IRI", clip(iri))
	case u.Scheme != "http" && u.Scheme != "https" || u.Host == "":
		r.ds.Add(r.s.PosOf("release.base_iri"), "release.base_iri %q must be an http:// or https:// address", clip(iri))
	case !strings.HasSuffix(iri, "/") && !strings.HasSuffix(iri, "#"):
		r.ds.Add(r.s.PosOf("release.base_iri"), "release.base_iri %q must end in \"/\" or \"#\" so concept names can follow it", clip(iri))
	}
}

// displayKey is a settings key as a message names it: without array
// indices, since the position already says which table is meant.
func displayKey(key string) string {
	var b strings.Builder
	skip := false
	for _, c := range key {
		switch {
		case c == '[':
			skip = true
		case c == ']':
			skip = false
		case !skip:
			b.WriteRune(c)
		}
	}
	return b.String()
}
