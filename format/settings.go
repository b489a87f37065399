package format

import (
	"fmt"
	"strconv"
	"strings"
)

// Settings is a parsed ramify.toml. Keys a file leaves
// out keep the values of DefaultSettings.
type Settings struct {
	Items      ItemsSettings
	Similarity SimilaritySettings
	Taxonomy   TaxonomySettings
	Review     ReviewSettings
	Release    ReleaseSettings
	Limits     LimitsSettings
	// File is the name the settings were parsed under ("" for defaults).
	File string
	// KeyPos holds where each key present in the file is written, by its
	// dotted name: "items.files", "similarity.source[0].file" (array
	// indices count from 0, like Similarity.Sources). Tables are recorded
	// too ("taxonomy", "similarity.source[1]"), and the strings of an array
	// ("items.files[1]"). Use PosOf to fall back to the nearest enclosing
	// key.
	KeyPos map[string]Pos
}

// ItemsSettings says where the items are.
type ItemsSettings struct {
	Files   []string // .toml, .tsv or .csv, relative to the repository
	Vectors string   // optional vectors.tsv, a .npy matrix or a .parquet table
	// VectorIDs names the rows of a .npy vectors file: one item id a line.
	VectorIDs string
	// VectorColumn names the list column of a .parquet vectors file; ""
	// takes its only list of floats.
	VectorColumn string
}

// SimilaritySettings says how the similarity graph is built.
type SimilaritySettings struct {
	// Neighbors is k of the k-nearest-neighbour graph; 0 means all pairs.
	Neighbors int
	Sources   []Source
	// Text weighs the channels of the text source.
	Text TextSettings
}

// TextSettings weighs the three channels the text source mixes before the
// neighbour search: the head words of the label's comma-separated phrases,
// the label's character 3–5-grams, and the words of the description. A
// weight of 0 leaves its channel out; at least one must be above 0.
type TextSettings struct {
	LabelHeads  float64
	LabelGrams  float64
	Description float64
}

// Source is one ingredient of the similarity graph.
type Source struct {
	Kind   string // tags, text, vector or links
	File   string // the links file, for kind links
	Weight float64
}

// Source kinds.
const (
	SourceTags   = "tags"
	SourceText   = "text"
	SourceVector = "vector"
	SourceLinks  = "links"
)

// SourceKinds lists the source kinds in the order messages name them.
var SourceKinds = []string{SourceTags, SourceText, SourceVector, SourceLinks}

// TaxonomySettings bounds the generated tree.
type TaxonomySettings struct {
	File        string
	MinSize     int
	MaxChildren int
	MaxDepth    int
	Stability   float64
}

// ReviewSettings shapes review packets.
type ReviewSettings struct {
	Size       int     // items per packet
	AuditShare float64 // share of packets drawn uniformly at random
	Committee  int     // trees in the committee that looks for disagreement
}

// ReleaseSettings are the gates and names of a release.
type ReleaseSettings struct {
	MinAudits     int
	MaxRejectRate float64 // upper end of the 95% Clopper-Pearson interval
	BaseIRI       string  // prefix of concept IRIs in the SKOS export
}

// LimitsSettings are the repository's budgets: how much a load may read
// and keep in all, checked while reading (from file sizes before a file
// is read, and from counts as rows and records arrive), so a pull request
// that adds too much gets a file:line:col problem naming the setting, not
// an out-of-memory crash.
type LimitsSettings struct {
	Items   int // items, over every items file
	Links   int // rows, over every links file
	Records int // constraint records ([[triplet]], [[group]], [[shape]]) over every constraint file
	Bytes   int // bytes of every input file: items, vectors, links, constraints, outline
}

// The default budgets are the documented capacity, which loads and solves
// inside the 8 GB memory target: a million items with tags and text and
// ten million links peak at 7.3 GB resident (cmd/bench/genrepo -n 1000000
// -text; README, "Capacity"). Records and bytes leave the rest of the
// target as headroom: the capacity's input files are 0.4 GB (items 0.18,
// links 0.22), so 512 MiB admits them and refuses a 1 GB items file, and
// a triplet record costs about half a kilobyte from its text to the
// solver, so a million records take about 0.5 GB. Binary vector matrices
// (.npy, .parquet) are read in place, not whole, and count against their
// own per-file limit instead.
const (
	DefaultLimitItems   = 1_000_000
	DefaultLimitLinks   = 10_000_000
	DefaultLimitRecords = 1_000_000
	DefaultLimitBytes   = 512 << 20
)

// OverLimit is the problem reported where a budget is passed: what
// passed it, the limit, and the ramify.toml setting that raises it.
func OverLimit(what string, limit int, key string) string {
	return fmt.Sprintf("more than %s %s in this repository; %s in %s raises the limit (its default keeps a solve inside 8 GB of memory)", grouped(limit), what, key, "ramify.toml")
}

// DefaultSettings returns the settings a repository has when ramify.toml
// says nothing.
func DefaultSettings() *Settings {
	return &Settings{
		Items: ItemsSettings{Files: []string{"items.toml"}},
		Similarity: SimilaritySettings{
			Neighbors: 15,
			Sources: []Source{
				{Kind: SourceTags, Weight: 1.0},
				{Kind: SourceText, Weight: 0.5},
			},
			Text: TextSettings{LabelHeads: 1, LabelGrams: 1, Description: 2},
		},
		Taxonomy: TaxonomySettings{
			File:        "taxonomy.outline",
			MinSize:     3,
			MaxChildren: 12,
			MaxDepth:    6,
			Stability:   0.3,
		},
		Review: ReviewSettings{Size: 8, AuditShare: 0.25, Committee: 20},
		// 36 clean audits are the fewest whose interval ends at or below
		// 0.10: 1 − 0.025^(1/36) = 0.0974, while 35 give 0.10003 (the
		// review package's tests derive it with bounds.MinCleanAudits).
		Release: ReleaseSettings{MinAudits: 36, MaxRejectRate: 0.10, BaseIRI: "https://example.org/taxonomy/"},
		Limits:  LimitsSettings{Items: DefaultLimitItems, Links: DefaultLimitLinks, Records: DefaultLimitRecords, Bytes: DefaultLimitBytes},
		KeyPos:  map[string]Pos{},
	}
}

// PosOf is where key (a dotted name as in KeyPos) is written, or where the
// nearest enclosing key or table is, or the top of the file.
func (s *Settings) PosOf(key string) Pos {
	for key != "" {
		if p, ok := s.KeyPos[key]; ok {
			return p
		}
		cut := strings.LastIndexAny(key, ".[")
		if cut < 0 {
			break
		}
		key = key[:cut]
	}
	return Pos{File: s.File, Line: 1, Col: 1}
}

// keyPositions names every header and key of the file by its dotted path,
// numbering arrays of tables from 0.
func keyPositions(doc *tomlDoc) map[string]Pos {
	out := map[string]Pos{}
	put := func(k string, at lineCol) {
		if _, ok := out[k]; !ok {
			out[k] = doc.pos(at)
		}
	}
	count := map[string]int{}
	prefix := make([]string, len(doc.scan.Headers))
	for i, h := range doc.scan.Headers {
		p := strings.Join(h.Path, ".")
		if h.Array {
			n := count[p]
			count[p]++
			p += "[" + strconv.Itoa(n) + "]"
		}
		prefix[i] = p
		put(p, h.At)
	}
	for _, k := range doc.scan.Keys {
		base := ""
		if k.Header >= 0 && k.Header < len(prefix) {
			base = prefix[k.Header] + "."
		}
		for j := 1; j <= len(k.Path); j++ {
			put(base+strings.Join(k.Path[:j], "."), k.At)
		}
		// Strings in an array value: "items.files[1]" is the second file.
		if k.Array {
			full := base + strings.Join(k.Path, ".")
			for j, str := range k.Strings {
				put(full+"["+strconv.Itoa(j)+"]", str.At)
			}
		}
	}
	return out
}
