package diff

import (
	"bytes"
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/rogpeppe/go-internal/txtar"

	"github.com/ramify-tax/ramify/format"
)

var update = flag.Bool("update", false, "rewrite the golden files under testdata/")

func parseOutline(t *testing.T, name string, data []byte) *format.Category {
	t.Helper()
	o, err := format.ParseOutline(name, data)
	if err != nil {
		t.Fatalf("ParseOutline(%s): %v", name, err)
	}
	return o.Root
}

// renderings are the outputs a golden scenario checks, by archive file.
func renderings(r *Report) map[string][]byte {
	var js, md, txt, color bytes.Buffer
	if err := r.WriteJSON(&js); err != nil {
		panic(err)
	}
	r.Markdown(&md)
	r.Text(&txt, false)
	r.Text(&color, true)
	return map[string][]byte{
		"want.json":      js.Bytes(),
		"want.md":        md.Bytes(),
		"want.txt":       txt.Bytes(),
		"want.color.txt": color.Bytes(),
	}
}

// Each testdata/compare/*.txtar holds an old and a new outline of a small
// hand-made taxonomy and the exact expected report as JSON, Markdown and
// terminal text; the comment at the top says what the edit is. The
// expected files were written with -update and then checked by hand
// against the rules in Compare's documentation.
func TestCompareGolden(t *testing.T) {
	files, err := filepath.Glob("testdata/compare/*.txtar")
	if err != nil || len(files) == 0 {
		t.Fatalf("no scenarios: %v", err)
	}
	for _, file := range files {
		name := strings.TrimSuffix(filepath.Base(file), ".txtar")
		t.Run(name, func(t *testing.T) {
			ar, err := txtar.ParseFile(file)
			if err != nil {
				t.Fatal(err)
			}
			in := map[string][]byte{}
			for _, f := range ar.Files {
				in[f.Name] = f.Data
			}
			old := parseOutline(t, "old.outline", in["old.outline"])
			new := parseOutline(t, "new.outline", in["new.outline"])
			oldText := string(format.FormatTree(old.Clone()))
			r := Compare(old, new)
			if got := string(format.FormatTree(old.Clone())); got != oldText {
				t.Errorf("Compare changed its input")
			}
			got := renderings(r)
			if *update {
				files := []txtar.File{{Name: "old.outline", Data: in["old.outline"]}, {Name: "new.outline", Data: in["new.outline"]}}
				for _, k := range []string{"want.json", "want.md", "want.txt", "want.color.txt"} {
					files = append(files, txtar.File{Name: k, Data: got[k]})
				}
				ar.Files = files
				if err := os.WriteFile(file, txtar.Format(ar), 0o644); err != nil {
					t.Fatal(err)
				}
				return
			}
			for k, want := range in {
				if !strings.HasPrefix(k, "want.") {
					continue
				}
				if !bytes.Equal(got[k], want) {
					t.Errorf("%s differs (run go test -update to accept)\n--- got:\n%s\n--- want:\n%s\n--- line diff:\n%s", k, got[k], want, LineDiff(string(want), string(got[k])))
				}
			}
			if _, ok := in["want.json"]; !ok {
				t.Errorf("no want.json; run go test -update")
			}
		})
	}
}
