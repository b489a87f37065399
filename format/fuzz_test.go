package format

import (
	"bytes"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
)

// The fuzz targets check that no input makes a parser panic, that every
// reported problem has a place, and that whatever parses prints back in a
// form that parses to the same value and prints the same again.
// Seed corpora live in testdata/fuzz/<target>/; f.Add adds the test data
// files of each format.

func addFiles(f *testing.F, pattern string) {
	files, _ := filepath.Glob(pattern)
	for _, name := range files {
		if data, err := os.ReadFile(name); err == nil {
			f.Add(data)
		}
	}
}

// checkDiags asserts that a parser error is a Diags whose problems all
// name the file and a line, in sorted order.
func checkDiags(t *testing.T, err error, file string) {
	t.Helper()
	if err == nil {
		return
	}
	ds, ok := err.(Diags)
	if !ok || len(ds) == 0 {
		t.Fatalf("error is %T %v, want a non-empty Diags", err, err)
	}
	for i, d := range ds {
		if d.More > 0 {
			// The count of the problems past MaxProblemsPerFile has no
			// place of its own; it closes its file's list.
			if d.File != file || i != len(ds)-1 {
				t.Fatalf("problem count out of place: %+v", d)
			}
			continue
		}
		if d.File != file || d.Line < 1 || d.Col < 1 || d.Msg == "" {
			t.Fatalf("problem without a proper place: %+v", d)
		}
		if i > 0 && (ds[i-1].Line > d.Line || ds[i-1].Line == d.Line && ds[i-1].Col > d.Col) {
			t.Fatalf("problems out of order: %v before %v", ds[i-1], d)
		}
	}
}

func FuzzParseOutline(f *testing.F) {
	addFiles(f, "testdata/outline/*.outline")
	addFiles(f, "testdata/outline/noncanonical/*.in")
	f.Add([]byte("A/\n  x\n\tB/\n   y\n      z\n"))
	f.Add([]byte("A/\n  x\n  y\n# record 0123456789ab x y\n# record 0123456789ab y\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		o, err := ParseOutline("f.outline", data)
		checkDiags(t, err, "f.outline")
		if err != nil {
			return
		}
		text := FormatOutlineRecords(o.Root, o.Records)
		o2, err := ParseOutline("f.outline", text)
		if err != nil {
			t.Fatalf("printed outline does not parse: %v\n%s", err, text)
		}
		if diff := treeDiff(o.Root, o2.Root); diff != "" {
			t.Fatalf("parse(print(t)) != t (-want +got):\n%s", diff)
		}
		if again := FormatOutlineRecords(o2.Root, o2.Records); !bytes.Equal(again, text) {
			t.Fatalf("printing the record lines is not stable:\n%s\n%s", text, again)
		}
		if o2.Edited() {
			t.Fatal("a freshly printed outline counts as edited")
		}
	})
}

func FuzzParsePacket(f *testing.F) {
	addFiles(f, "testdata/packet/*.outline")
	f.Fuzz(func(t *testing.T, data []byte) {
		p, err := ParsePacket("f.outline", data)
		checkDiags(t, err, "f.outline")
		if err != nil {
			return
		}
		text := FormatPacket(p)
		p2, err := ParsePacket("f.outline", text)
		if err != nil {
			t.Fatalf("printed packet does not parse: %v\n%s", err, text)
		}
		if diff := cmp.Diff(p, p2, cmp.FilterPath(func(path cmp.Path) bool {
			s := path.String()
			return s == "Tree" || s == "TreeLine"
		}, cmp.Ignore())); diff != "" {
			t.Fatalf("parse(print(p)) != p (-want +got):\n%s", diff)
		}
		if diff := treeDiff(p.Tree, p2.Tree); diff != "" {
			t.Fatalf("tree (-want +got):\n%s", diff)
		}
		if again := FormatPacket(p2); !bytes.Equal(again, text) {
			t.Fatalf("printing is not stable:\n%s\n%s", text, again)
		}
	})
}

// checkScannerFollows asserts that the position scanner understands every
// text the TOML decoder accepts; otherwise positions would go missing.
func checkScannerFollows(t *testing.T, data []byte) {
	t.Helper()
	text, ds := CleanText("f.toml", data)
	if len(ds) > 0 {
		return
	}
	scan, lerr := scanTOML(text, constraintLimits)
	if lerr != nil {
		return
	}
	if _, err := safeDecode(text); err == nil && scan.Confused {
		t.Fatalf("the decoder accepts text the scanner cannot follow: %q", text)
	}
}

func FuzzParseConstraints(f *testing.F) {
	addFiles(f, "testdata/constraints/*.toml")
	f.Add([]byte(designExample))
	f.Fuzz(func(t *testing.T, data []byte) {
		checkScannerFollows(t, data)
		cf, err := ParseConstraints("f.toml", data)
		checkDiags(t, err, "f.toml")
		if err != nil {
			return
		}
		text := FormatConstraints(cf)
		cf2, err := ParseConstraints("f.toml", text)
		if err != nil {
			t.Fatalf("printed constraints do not parse: %v\n%s", err, text)
		}
		if diff := cmp.Diff(cf, cf2, constraintsCmp); diff != "" {
			t.Fatalf("parse(print(cf)) != cf (-want +got):\n%s", diff)
		}
		for i := range cf.Shapes {
			if diff := treeDiff(cf.Shapes[i].Tree, cf2.Shapes[i].Tree); diff != "" {
				t.Fatalf("shape %d (-want +got):\n%s", i, diff)
			}
		}
		if again := FormatConstraints(cf2); !bytes.Equal(again, text) {
			t.Fatalf("printing is not stable:\n%s\n%s", text, again)
		}
		checkRefsPointAtIDs(t, text, cf2)
	})
}

// checkItems asserts what every successfully parsed item list must hold.
func checkItems(t *testing.T, items []Item) {
	t.Helper()
	seen := map[string]bool{}
	for _, it := range items {
		if !ValidItemID(it.ID) || seen[it.ID] {
			t.Fatalf("bad or repeated id %q accepted", it.ID)
		}
		seen[it.ID] = true
		if len(it.Tags) > MaxTagsPerItem {
			t.Fatalf("item %q has %d tags", it.ID, len(it.Tags))
		}
		for _, tag := range it.Tags {
			if tag == "" || strings.TrimSpace(tag) != tag || strings.Contains(tag, TagSeparator) {
				t.Fatalf("bad tag %q accepted", tag)
			}
		}
	}
}

func FuzzParseItemsTOML(f *testing.F) {
	f.Add([]byte("[[item]]\nid = \"a\"\nlabel = \"A\"\ntags = [\"x\", \"y\"]\ntext = \"\"\"\nmulti\nline\"\"\"\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		checkScannerFollows(t, data)
		items, err := ParseItemsTOML("f.toml", data)
		checkDiags(t, err, "f.toml")
		if err == nil {
			checkItems(t, items)
		}
	})
}

func FuzzParseItemsTable(f *testing.F) {
	f.Add([]byte("id\tlabel\ttags\ttext\na\tA\tx; y\tsome text\n"), true)
	f.Add([]byte("id,label,text\na,\"A, with comma\",\"multi\nline\"\n"), false)
	f.Fuzz(func(t *testing.T, data []byte, tsv bool) {
		sep := byte(',')
		if tsv {
			sep = '\t'
		}
		items, err := ParseItemsTable("f.tsv", data, sep)
		checkDiags(t, err, "f.tsv")
		if err == nil {
			checkItems(t, items)
		}
	})
}

func FuzzParseNPYVectors(f *testing.F) {
	f.Add(npyBytes(f, [2][2]float64{{1, 2}, {3, 4}}), []byte("a\nb\n"))
	f.Add(npyBytes(f, [1][3]float32{{1, 2, 3}}), []byte("a\n"))
	f.Fuzz(func(t *testing.T, data, ids []byte) {
		v, err := ParseNPYVectors("e.npy", data, "ids.txt", ids)
		if err != nil {
			for _, d := range err.(Diags) {
				if d.Pos.File != "e.npy" && d.Pos.File != "ids.txt" {
					t.Fatalf("diagnostic for %q: %v", d.Pos.File, d)
				}
			}
			return
		}
		checkVectors(t, v)
	})
}

func FuzzParseVectors(f *testing.F) {
	f.Add([]byte("id\tf1\tf2\na\t1\t2.5\nb\t-3e2\t0x1p-2\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		v, err := ParseVectors("f.tsv", data)
		checkDiags(t, err, "f.tsv")
		if err != nil {
			return
		}
		checkVectors(t, v)
	})
}

// checkVectors checks what every vectors reader promises: one value array
// of rows × features finite values, a position per row.
func checkVectors(t *testing.T, v *Vectors) {
	t.Helper()
	n := len(v.Values) + len(v.Values32)
	if (v.Values == nil) == (v.Values32 == nil) || n != len(v.IDs)*len(v.Features) || len(v.RowPos) != len(v.IDs) {
		t.Fatalf("%d float64 and %d float32 values for %d rows of %d features", len(v.Values), len(v.Values32), len(v.IDs), len(v.Features))
	}
	for p := range n {
		if x := v.value(p); math.IsNaN(x) || math.IsInf(x, 0) {
			t.Fatalf("non-finite value %v accepted", x)
		}
	}
}

func FuzzParseLinks(f *testing.F) {
	f.Add([]byte("a\tb\tweight\nx\ty\t0.5\ny\tz\t2\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		links, err := ParseLinks("f.tsv", data)
		checkDiags(t, err, "f.tsv")
		for _, l := range links {
			if l.A == l.B || !ValidItemID(l.A) || !ValidItemID(l.B) || !(l.Weight > 0) || math.IsInf(l.Weight, 0) {
				t.Fatalf("bad link accepted: %+v", l)
			}
		}
	})
}

func FuzzParseSettings(f *testing.F) {
	f.Add([]byte(SettingsTemplate))
	f.Fuzz(func(t *testing.T, data []byte) {
		checkScannerFollows(t, data)
		s, err := ParseSettings("f.toml", data)
		checkDiags(t, err, "f.toml")
		if err != nil {
			return
		}
		paths := append([]string{s.Taxonomy.File}, s.Items.Files...)
		for _, src := range s.Similarity.Sources {
			if src.Kind == SourceLinks {
				paths = append(paths, src.File)
			}
			if !(src.Weight > 0) || math.IsInf(src.Weight, 0) {
				t.Fatalf("bad weight accepted: %+v", src)
			}
		}
		for _, p := range paths {
			if msg := CheckRepoPath(p); msg != "" {
				t.Fatalf("bad path accepted: %s", msg)
			}
		}
		if s.Review.Size < 3 || s.Review.Size > 12 || s.Taxonomy.MaxDepth < 1 || s.Taxonomy.MaxDepth > 64 ||
			!(s.Release.MaxRejectRate > 0 && s.Release.MaxRejectRate < 1) || len(s.Similarity.Sources) == 0 {
			t.Fatalf("out-of-range settings accepted: %+v", s)
		}
	})
}

func FuzzParseParquetVectors(f *testing.F) {
	f.Add(parquetBytes(f, []listRow32{{"a", []float32{1, 2}}, {"b", []float32{3, 4}}}), "")
	f.Add(parquetBytes(f, []listRow64{{"a", []float64{1}}}), "embedding")
	f.Add(parquetBytes(f, []repeatedRow32{{"a", []float32{1, 2}, "x"}}), "")
	f.Fuzz(func(t *testing.T, data []byte, column string) {
		v, err := ParseParquetVectors("e.parquet", data, column)
		checkDiags(t, err, "e.parquet")
		if err != nil {
			return
		}
		checkVectors(t, v)
	})
}
