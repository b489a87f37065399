package format

import (
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
)

var settingsCmp = cmpopts.IgnoreFields(Settings{}, "File", "KeyPos")

func TestSettingsTemplateIsTheDefaults(t *testing.T) {
	s, err := ParseSettings("ramify.toml", []byte(SettingsTemplate))
	if err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff(DefaultSettings(), s, settingsCmp); diff != "" {
		t.Errorf("template != defaults (-want +got):\n%s", diff)
	}
	// Every key ramify knows is written out (or shown commented) in the
	// template, so a newcomer sees all of them.
	for sec, keys := range settingsKeys {
		if !strings.Contains(SettingsTemplate, "["+sec+"]") {
			t.Errorf("template lacks [%s]", sec)
		}
		for _, k := range keys {
			if k == "source" || k == "text" {
				continue // tables of their own, checked below
			}
			if !strings.Contains(SettingsTemplate, "\n"+k+" = ") && !strings.Contains(SettingsTemplate, "\n# "+k+" = ") {
				t.Errorf("template does not show %s.%s", sec, k)
			}
		}
	}
	for _, k := range textKeys {
		if !strings.Contains(SettingsTemplate, "\n"+k+" = ") {
			t.Errorf("template does not show similarity.text.%s", k)
		}
	}
	for _, k := range append([]string{"file"}, SourceKinds...) {
		if !strings.Contains(SettingsTemplate, k) {
			t.Errorf("template does not explain %q", k)
		}
	}
}

func TestParseSettingsText(t *testing.T) {
	s, err := ParseSettings("ramify.toml", []byte("[similarity.text]\nlabel_heads = 0\ndescription = 3.5\n"))
	if err != nil {
		t.Fatal(err)
	}
	want := TextSettings{LabelHeads: 0, LabelGrams: 1, Description: 3.5}
	if s.Similarity.Text != want {
		t.Errorf("ParseSettings: text = %+v, want %+v", s.Similarity.Text, want)
	}
	for _, c := range []struct{ in, msg string }{
		{"[similarity.text]\nlabel_heads = 0\nlabel_grams = 0\ndescription = 0\n", "ramify.toml:1:1: similarity.text weighs every channel 0"},
		{"[similarity.text]\nlabel_grams = -1\n", "ramify.toml:2:1: similarity.text.label_grams must be between 0 and 100"},
		{"[similarity.text]\nheads = 1\n", "ramify.toml:2:1: unknown key"},
		{"[similarity]\ntext = 2\n", "ramify.toml:2:1: similarity.text must be a table"},
	} {
		_, err := ParseSettings("ramify.toml", []byte(c.in))
		if err == nil || !strings.Contains(err.Error(), c.msg) {
			t.Errorf("ParseSettings(%q) = %v, want an error containing %q", c.in, err, c.msg)
		}
	}
}

func TestParseSettingsEmptyFileIsTheDefaults(t *testing.T) {
	s, err := ParseSettings("ramify.toml", []byte("# nothing here\n"))
	if err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff(DefaultSettings(), s, settingsCmp); diff != "" {
		t.Errorf("(-want +got):\n%s", diff)
	}
}

func TestParseSettingsOverrides(t *testing.T) {
	in := "[items]\nfiles = [\"items.tsv\", \"more/items.csv\"]\nvectors = \"vectors.tsv\"\n" +
		"[[similarity.source]]\nkind = \"vector\"\n" +
		"[[similarity.source]]\nkind = \"links\"\nfile = \"links.tsv\"\nweight = 2\n" +
		"[taxonomy]\nmax_depth = 4\nstability = 0\n" +
		"[review]\ncommittee = 5\n" +
		"[release]\nbase_iri = \"https://tools.example/concept#\"\n"
	s, err := ParseSettings("ramify.toml", []byte(in))
	if err != nil {
		t.Fatal(err)
	}
	want := DefaultSettings()
	want.Items = ItemsSettings{Files: []string{"items.tsv", "more/items.csv"}, Vectors: "vectors.tsv"}
	want.Similarity.Sources = []Source{{Kind: "vector", Weight: 1}, {Kind: "links", File: "links.tsv", Weight: 2}}
	want.Taxonomy.MaxDepth, want.Taxonomy.Stability = 4, 0
	want.Review.Committee = 5
	want.Release.BaseIRI = "https://tools.example/concept#"
	if diff := cmp.Diff(want, s, settingsCmp); diff != "" {
		t.Errorf("(-want +got):\n%s", diff)
	}
	at := func(line, col int) Pos { return Pos{"ramify.toml", line, col} }
	for key, want := range map[string]Pos{
		"items":                     at(1, 1),
		"items.files":               at(2, 1),
		"items.files[1]":            at(2, 23),
		"similarity.source[0]":      at(4, 1),
		"similarity.source[1].file": at(8, 1),
		"taxonomy.max_depth":        at(11, 1),
	} {
		if got := s.KeyPos[key]; got != want {
			t.Errorf("KeyPos[%q] = %v, want %v", key, got, want)
		}
	}
	if got := s.PosOf("similarity.source[1].weight.nothing"); got != at(9, 1) {
		t.Errorf("PosOf falls back to %v, want 9:1", got)
	}
	if got := s.PosOf("review.size"); got != at(13, 1) {
		t.Errorf("PosOf(review.size) = %v, want the [review] header at 13:1", got)
	}
	if got := s.PosOf("nothing"); got != at(1, 1) {
		t.Errorf("PosOf(nothing) = %v, want the top of the file", got)
	}
}

func TestParseSettingsErrors(t *testing.T) {
	tests := []struct {
		name string
		in   string
		want []string
	}{
		{"unknown keys and values out of range",
			"[items]\nfile = [\"x\"]\n[taxonomy]\nmax_dept = 3\nmin_size = 0\nmax_children = 1.5\nstability = 2\n" +
				"[review]\nsize = 13\naudit_share = -0.1\ncommittee = 1\n" +
				"[release]\nmin_audits = 0\nmax_reject_rate = 1\nbase_iri = \"ftp://x/\"\n" +
				"[similarity]\nneighbors = 201\n[extra]\n", []string{
				`ramify.toml:2:1: unknown key "file" in [items]; did you mean "files"?`,
				`ramify.toml:4:1: unknown key "max_dept" in [taxonomy]; did you mean "max_depth"?`,
				"ramify.toml:5:1: taxonomy.min_size must be between 1 and 1000; it is 0",
				"ramify.toml:6:1: taxonomy.max_children must be a whole number, not a number with a fraction",
				"ramify.toml:7:1: taxonomy.stability must be between 0 and 1; it is 2",
				"ramify.toml:9:1: review.size must be between 3 and 12; it is 13",
				"ramify.toml:10:1: review.audit_share must be between 0 and 1; it is -0.1",
				"ramify.toml:11:1: review.committee must be between 2 and 200; it is 1",
				"ramify.toml:13:1: release.min_audits must be between 1 and 100000; it is 0",
				"ramify.toml:14:1: release.max_reject_rate must be greater than 0 and less than 1; it is 1",
				`ramify.toml:15:1: release.base_iri "ftp://x/" must be an http:// or https:// address`,
				"ramify.toml:17:1: similarity.neighbors must be between 0 and 200; it is 201",
				`ramify.toml:18:1: unknown key "extra" in ramify.toml`,
			}},
		{"did-you-mean on section names", "[taxonomie]\n[Review]\n", []string{
			`ramify.toml:1:1: unknown key "taxonomie" in ramify.toml; did you mean "taxonomy"?`,
			`ramify.toml:2:1: unknown key "Review" in ramify.toml; did you mean "review"?`,
		}},
		{"paths escaping the repository",
			"[items]\nfiles = [\"../items.toml\", \"/abs.toml\", \"a\\\\b.toml\", \"-x.toml\", \"./a.toml\", \"a//b.toml\", \"items.json\", \".git/x.toml\", \"c:/x.toml\", \"\"]\nvectors = \"v.csv\"\n[taxonomy]\nfile = \"sub/../../tax.outline\"\n", []string{
				`ramify.toml:2:10: items.files: path "../items.toml" leaves the repository ("..")`,
				`ramify.toml:2:27: items.files: path "/abs.toml" is absolute; write it relative to the repository`,
				`ramify.toml:2:40: items.files: path "a\\b.toml" contains a backslash; write paths with forward slashes`,
				`ramify.toml:2:53: items.files: path "-x.toml" starts with "-"`,
				`ramify.toml:2:64: items.files: path "./a.toml" is not clean; write it as "a.toml"`,
				`ramify.toml:2:76: items.files: path "a//b.toml" is not clean; write it as "a/b.toml"`,
				`ramify.toml:2:89: items.files: "items.json" must end in .toml, .tsv or .csv`,
				`ramify.toml:2:103: items.files: path ".git/x.toml" points into .git`,
				`ramify.toml:2:118: items.files: path "c:/x.toml" looks like a drive letter; write it relative to the repository`,
				`ramify.toml:2:131: items.files: path is empty`,
				`ramify.toml:3:1: items.vectors: "v.csv" must end in .tsv, .npy or .parquet`,
				`ramify.toml:5:1: taxonomy.file: path "sub/../../tax.outline" leaves the repository ("..")`,
			}},
		{"sources",
			"[[similarity.source]]\nkind = \"tag\"\nweight = 0\n" +
				"[[similarity.source]]\nkind = \"vector\"\nfile = \"x.tsv\"\nweight = nan\n" +
				"[[similarity.source]]\nkind = \"links\"\n" +
				"[[similarity.source]]\nweight = 1\n" +
				"[[similarity.source]]\nkind = \"text\"\n" +
				"[[similarity.source]]\nkind = \"text\"\nextra = 1\n" +
				"[[similarity.source]]\nkind = \"links\"\nfile = \"../links.tsv\"\nweight = \"heavy\"\n", []string{
				`ramify.toml:2:1: unknown source kind "tag"; it is one of tags, text, vector or links; did you mean "tags"?`,
				"ramify.toml:3:1: similarity.source.weight must be greater than 0; it is 0",
				"ramify.toml:5:1: a vector source needs items.vectors to name the vectors file",
				"ramify.toml:6:1: file is only for links sources; a vector source reads the items",
				"ramify.toml:7:1: similarity.source.weight must be a finite number; it is NaN",
				`ramify.toml:8:1: a links source needs file = "links.tsv" (the file with the links)`,
				"ramify.toml:10:1: [[similarity.source]] has no kind; it is one of tags, text, vector or links",
				`ramify.toml:14:1: similarity source "text" appears twice`,
				`ramify.toml:16:1: unknown key "extra" in [[similarity.source]]`,
				`ramify.toml:19:1: similarity.source.file: path "../links.tsv" leaves the repository ("..")`,
				"ramify.toml:20:1: similarity.source.weight must be a number, not a string",
			}},
		{"wrong shapes of tables", "items = 3\n[similarity]\nsource = 4\n", []string{
			"ramify.toml:1:1: items must be a table ([items]), not an integer",
			"ramify.toml:3:1: similarity.source must be a list of tables, one per [[similarity.source]], not an integer",
		}},
		{"empty lists", "[items]\nfiles = []\n[similarity]\nsource = []\n", []string{
			"ramify.toml:2:1: items.files must name at least one items file",
			"ramify.toml:4:1: similarity.source is empty; name at least one source",
		}},
		{"base IRI forms", "[release]\nbase_iri = \"https://example.org/t\"\n", []string{
			`ramify.toml:2:1: release.base_iri "https://example.org/t" must end in "/" or "#" so concept names can follow it`,
		}},
		{"TOML syntax", "[items\nfiles = 1\n", []string{
			`ramify.toml:2:1: TOML syntax: expected '.' or ']' to end table name, but got '\n' instead`,
		}},
		{"nested array bomb", "[items]\nfiles = " + strings.Repeat("[", 100_000) + "\n", []string{
			"ramify.toml:2:17: arrays or tables nested more than 8 deep",
		}},
		{"huge array", "[items]\nfiles = [" + strings.Repeat(`"a.toml",`, 10_001) + "]\n", []string{
			"ramify.toml:2:9: array has more than 10,000 elements",
		}},
		{"NUL byte", "[items]\x00\n", []string{"ramify.toml:1:8: NUL byte: this is not a text file"}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := ParseSettings("ramify.toml", []byte(tt.in))
			checkErrors(t, err, tt.want)
		})
	}
}

func TestParseSettingsAcceptsCRLFAndBOM(t *testing.T) {
	in := "\xef\xbb\xbf" + strings.ReplaceAll(SettingsTemplate, "\n", "\r\n")
	s, err := ParseSettings("ramify.toml", []byte(in))
	if err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff(DefaultSettings(), s, settingsCmp); diff != "" {
		t.Errorf("(-want +got):\n%s", diff)
	}
}

func TestCheckRepoPath(t *testing.T) {
	for _, ok := range []string{"items.toml", "data/items.tsv", "a-b/c_d.e", ".hidden/x", "x..y"} {
		if msg := CheckRepoPath(ok); msg != "" {
			t.Errorf("CheckRepoPath(%q) = %q, want ok", ok, msg)
		}
	}
	for _, bad := range []string{"", "..", "../x", "a/../b", "a/..", "/x", `a\b`, "-x", "./x", "x/", "a//b", ".git", ".git/config", "c:x", "a\nb", "."} {
		if CheckRepoPath(bad) == "" {
			t.Errorf("CheckRepoPath(%q) accepted it", bad)
		}
	}
}
