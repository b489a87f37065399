package main

import (
	"bytes"
	"maps"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/parquet-go/parquet-go"
)

const outlineHead = "# ramify outline 1\n"

func badInputCases(t *testing.T) []badInput {
	items := readDemo(t, "items.toml")
	settings := readDemo(t, "ramify.toml")
	deep := strings.Builder{}
	deep.WriteString(outlineHead)
	// Two spaces a level make a 100,000-deep outline 10 GB, far past the
	// size limit; 3,000 levels (9 MB) still probe the depth guard.
	for i := 0; i < 3000; i++ {
		deep.WriteString(strings.Repeat("  ", i))
		deep.WriteString("c/\n")
	}
	withVectors := strings.Replace(settings, "[items]\nfiles = [\"items.toml\"]", "[items]\nfiles = [\"items.toml\"]\nvectors = \"vectors.tsv\"", 1)
	withParquet := strings.Replace(settings, "[items]\nfiles = [\"items.toml\"]", "[items]\nfiles = [\"items.toml\"]\nvectors = \"vectors.parquet\"", 1)
	withLinks := settings + "\n[[similarity.source]]\nkind = \"links\"\nfile = \"links.tsv\"\nweight = 0.5\n"
	tsvSettings := strings.Replace(settings, `files = ["items.toml"]`, `files = ["items.tsv"]`, 1)
	csvSettings := strings.Replace(settings, `files = ["items.toml"]`, `files = ["items.csv"]`, 1)
	bomb := "[[group]]\nitems = [" + strings.Repeat(`"claw-hammer-16oz", `, 200000) + "\"x\"]\n"
	longArray := "[[group]]\nitems = [\n" + strings.Repeat("  \"claw-hammer-16oz\",\n", 150000) + "]\n"
	return []badInput{
		// The outline.
		{"outline tab", map[string]string{"taxonomy.outline": outlineHead + "Hand/\n\tclaw-hammer\n"}, "taxonomy.outline:3:1: tab in the indentation; indent with two spaces per level"},
		{"outline odd indent", map[string]string{"taxonomy.outline": outlineHead + "Hand/\n   claw-hammer\n"}, "taxonomy.outline:3:1: indentation of 3 spaces; use exactly two spaces per level"},
		{"outline over-indented", map[string]string{"taxonomy.outline": outlineHead + "Hand/\n    claw-hammer\n"}, "taxonomy.outline:3:1: indented 2 levels, but here a line can be indented at most 1 level (one level deeper tha"},
		{"outline empty category", map[string]string{"taxonomy.outline": outlineHead + "Hand/\nPower/\n  drill-driver-18v\n"}, "taxonomy.outline:2:1: category \"Hand\" is empty; a category needs at least one item or subcategory"},
		{"outline duplicate item", map[string]string{"taxonomy.outline": outlineHead + "A/\n  claw-hammer\nB/\n  claw-hammer\n"}, "taxonomy.outline:5:3: item \"claw-hammer\" appears twice (first at line 3); every item appears exactly once"},
		{"outline duplicate sibling", map[string]string{"taxonomy.outline": outlineHead + "A/\n  claw-hammer\nA/\n  drill-driver-18v\n"}, "taxonomy.outline:4:1: category \"A\" appears twice in the same parent (first at line 2)"},
		{"outline bad id", map[string]string{"taxonomy.outline": outlineHead + "A/\n  claw hammer\n"}, "taxonomy.outline:3:3: \"claw hammer\" is not an item id (ids have no spaces); a category line ends with \"/\""},
		{"outline 3000-deep", map[string]string{"taxonomy.outline": deep.String()}, "taxonomy.outline:258:1: nesting deeper than 256 levels"},
		{"outline 10 MB line", map[string]string{"taxonomy.outline": outlineHead + strings.Repeat("x", 10<<20) + "\n"}, "taxonomy.outline:2:1: line is 10485760 bytes long; the limit is 1048576"},
		{"outline invalid UTF-8", map[string]string{"taxonomy.outline": outlineHead + "A\xff/\n  claw-hammer\n"}, "taxonomy.outline:2:2: invalid UTF-8 (byte 0xff); files must be UTF-8"},
		{"outline NUL", map[string]string{"taxonomy.outline": outlineHead + "A/\n  claw\x00hammer\n"}, "taxonomy.outline:3:7: NUL byte: this is not a text file"},
		{"outline unknown version", map[string]string{"taxonomy.outline": "# ramify outline 7\nA/\n  claw-hammer\n"}, "taxonomy.outline:1:1: unsupported outline version \"7\"; this ramify reads version 1"},
		// Items.
		{"items unknown key", map[string]string{"items.toml": "[[item]]\nid = \"claw-hammer\"\ntagz = [\"hand\"]\n"}, "items.toml:3:1: unknown key \"tagz\" in [[item]]; did you mean \"tags\"?"},
		{"items duplicate id", map[string]string{"items.toml": "[[item]]\nid = \"claw-hammer\"\n[[item]]\nid = \"claw-hammer\"\n"}, "items.toml:4:1: item \"claw-hammer\" appears twice (first at line 1)"},
		{"items invalid id", map[string]string{"items.toml": "[[item]]\nid = \"-claw\"\n"}, "items.toml:2:1: \"-claw\" is not a valid item id: an item id starts with a letter or digit and continues with le"},
		{"items TOML syntax", map[string]string{"items.toml": "[[item]]\nid = \"claw-hammer\n"}, "items.toml:2:18: TOML syntax: strings cannot contain newlines"},
		{"items missing id", map[string]string{"items.toml": items + "\n[[item]]\nlabel = \"no id\"\n"}, "items.toml:947:1: [[item]] has no id"},
		{"items NUL", map[string]string{"items.toml": "[[item]]\nid = \"a\x00\"\n"}, "items.toml:2:8: NUL byte: this is not a text file"},
		{"items.tsv ragged", map[string]string{"ramify.toml": tsvSettings, "items.tsv": "id\tlabel\na\tA\tB\n"}, "items.tsv:2:5: row has 3 cells but the header has 2"},
		{"items.csv unknown column", map[string]string{"ramify.toml": csvSettings, "items.csv": "id,colour\na,red\n"}, "items.csv:1:4: unknown column \"colour\"; the columns are id, label, tags and text"},
		// Vectors.
		{"vectors NaN", map[string]string{"ramify.toml": withVectors, "vectors.tsv": "id\tx\nclaw-hammer-16oz\tNaN\n"}, "vectors.tsv:2:18: \"NaN\" is not a finite number (feature \"x\")"},
		{"vectors Inf", map[string]string{"ramify.toml": withVectors, "vectors.tsv": "id\tx\nclaw-hammer-16oz\t+Inf\n"}, "vectors.tsv:2:18: \"+Inf\" is not a finite number (feature \"x\")"},
		{"vectors ragged", map[string]string{"ramify.toml": withVectors, "vectors.tsv": "id\tx\ty\nclaw-hammer-16oz\t1\n"}, "vectors.tsv:2:1: row has 2 cells but the header has 3"},
		{"vectors unknown id", map[string]string{"ramify.toml": withVectors, "vectors.tsv": "id\tx\nno-such-tool\t1\n"}, "vectors.tsv:2:1: vector row for unknown item \"no-such-tool\""},
		{"parquet not parquet", map[string]string{"ramify.toml": withParquet, "vectors.parquet": "id\tx\nclaw-hammer-16oz\t1\n"}, "vectors.parquet:1:1: not a Parquet file: it does not start and end with the Parquet magic bytes"},
		{"parquet ragged", map[string]string{"ramify.toml": withParquet, "vectors.parquet": raggedParquet(t)}, "vectors.parquet:1:1: row 2 (item \"drill-driver-18v\"): the vector has 1 values but the first row's has 2"},
		// Links.
		{"links negative weight", map[string]string{"ramify.toml": withLinks, "links.tsv": "a\tb\tweight\nclaw-hammer-16oz\tdrill-driver-18v\t-1\n"}, "links.tsv:2:35: weight \"-1\" must be greater than 0"},
		{"links unknown item", map[string]string{"ramify.toml": withLinks, "links.tsv": "a\tb\tweight\nclaw-hammer-16oz\tno-such-tool\t1\n"}, "links.tsv:2:1: link names unknown item \"no-such-tool\""},
		{"links missing file", map[string]string{"ramify.toml": withLinks}, "ramify.toml:34:1: file links.tsv does not exist"},
		// Constraints.
		{"constraint unknown item", map[string]string{"constraints/new.toml": "[[triplet]]\npair = [\"claw-hammer\", \"claw-hamer\"]\nout = \"drill-driver-18v\"\n"}, "constraints/new.toml:2:9: unknown item \"claw-hammer\"; did you mean \"claw-hammer-16oz\"?"},
		{"constraint unknown kind", map[string]string{"constraints/new.toml": "[[tripplet]]\npair = [\"claw-hammer\", \"drill-driver-18v\"]\n"}, "constraints/new.toml:1:1: unknown key \"tripplet\" in a constraints file (records are [[triplet]], [[group]] and"},
		{"constraint pair twice", map[string]string{"constraints/new.toml": "[[triplet]]\npair = [\"claw-hammer\", \"claw-hammer\"]\nout = \"drill-driver-18v\"\n"}, "constraints/new.toml:2:24: pair names \"claw-hammer\" twice; a triplet pairs two different items"},
		{"constraint out in pair", map[string]string{"constraints/new.toml": "[[triplet]]\npair = [\"claw-hammer\", \"drill-driver-18v\"]\nout = \"claw-hammer\"\n"}, "constraints/new.toml:3:7: out \"claw-hammer\" is also in the pair; a triplet needs three different items"},
		{"constraint small group", map[string]string{"constraints/new.toml": "[[group]]\nitems = [\"claw-hammer\"]\n"}, "constraints/new.toml:2:1: a group needs at least 2 items; it has 1"},
		{"constraint shape tab", map[string]string{"constraints/new.toml": "[[shape]]\noutline = \"\"\"\nA/\n\tclaw-hammer\n  drill-driver-18v\nimpact-driver-18v\n\"\"\"\n"}, "constraints/new.toml:4:1: tab in the indentation; indent with two spaces per level"},
		{"constraint TOML bomb", map[string]string{"constraints/new.toml": bomb}, "constraints/new.toml:2:1: line is 4000013 bytes long; the limit is 1048576"},
		{"constraint long array", map[string]string{"constraints/new.toml": longArray}, "constraints/new.toml:2:9: array has more than 100,000 elements"},
		{"constraint invalid UTF-8", map[string]string{"constraints/new.toml": "[[triplet]]\nnote = \"caf\xe9\"\n"}, "constraints/new.toml:2:12: invalid UTF-8 (byte 0xe9); files must be UTF-8"},
		// Settings.
		{"settings unknown key", map[string]string{"ramify.toml": "[taxonomy]\nmin_sise = 3\n"}, "ramify.toml:2:1: unknown key \"min_sise\" in [taxonomy]; did you mean \"min_size\"?"},
		{"settings out of range", map[string]string{"ramify.toml": "[taxonomy]\nmax_depth = 0\n"}, "ramify.toml:2:1: taxonomy.max_depth must be between 1 and 64; it is 0"},
		{"settings path escapes", map[string]string{"ramify.toml": "[items]\nfiles = [\"../../etc/passwd.toml\"]\n"}, "ramify.toml:2:10: items.files: path \"../../etc/passwd.toml\" leaves the repository (\"..\")"},
		{"settings absolute path", map[string]string{"ramify.toml": "[taxonomy]\nfile = \"/tmp/x.outline\"\n"}, "ramify.toml:2:1: taxonomy.file: path \"/tmp/x.outline\" is absolute; write it relative to the repository"},
		{"settings TOML syntax", map[string]string{"ramify.toml": "[taxonomy\nmin_size = 3\n"}, "ramify.toml:2:1: TOML syntax: expected '.' or ']' to end table name, but got '\\n' instead"},
		{"settings bomb", map[string]string{"ramify.toml": "[items]\nfiles = [" + strings.Repeat("[", 100000) + "\n"}, "ramify.toml:2:17: arrays or tables nested more than 8 deep"},
	}
}

// TestBadInput runs check on each broken repository and asserts exit
// status 2, the exact position of the first problem, and that no file of
// the repository changed.
func TestBadInput(t *testing.T) {
	cases := badInputCases(t)
	if len(cases) < 30 {
		t.Fatalf("only %d bad-input cases", len(cases))
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			dir := t.TempDir()
			copyTree(t, demoDir, dir)
			for rel, content := range tc.files {
				full := filepath.Join(dir, filepath.FromSlash(rel))
				if err := os.MkdirAll(filepath.Dir(full), 0o755); err != nil {
					t.Fatal(err)
				}
				if err := os.WriteFile(full, []byte(content), 0o644); err != nil {
					t.Fatal(err)
				}
			}
			before := snapshot(t, dir)
			for _, cmd := range badInputCommands {
				code, _, stderr := runIn(append([]string{cmd}, "--dir", dir)...)
				if code != exitUsage {
					t.Fatalf("%s: exit %d, want %d; stderr:\n%s", cmd, code, exitUsage, clipText(stderr))
				}
				first, _, _ := strings.Cut(stderr, "\n")
				if !strings.HasPrefix(first, tc.want) {
					t.Errorf("%s: first problem\n  %s\nwant prefix\n  %s", cmd, clipText(first), tc.want)
				}
				if after := snapshot(t, dir); !maps.Equal(before, after) {
					t.Errorf("%s changed files on bad input", cmd)
				}
			}
		})
	}
}

// badInputCommands are the commands each broken repository is run
// through; every one must refuse it the same way.
var badInputCommands = []string{"check"}

func clipText(s string) string {
	if len(s) > 600 {
		return s[:600] + "..."
	}
	return s
}

// raggedParquet is a Parquet table (written with parquet-go v0.32.0,
// parquet.Write) whose second vector is shorter than the first.
func raggedParquet(t *testing.T) string {
	type row struct {
		ID        string    `parquet:"id"`
		Embedding []float32 `parquet:"embedding,list"`
	}
	var b bytes.Buffer
	if err := parquet.Write(&b, []row{{"claw-hammer-16oz", []float32{1, 2}}, {"drill-driver-18v", []float32{3}}}); err != nil {
		t.Fatal(err)
	}
	return b.String()
}
