package main

import (
	"os"
	"path/filepath"
	"slices"
	"testing"

	"github.com/ramify-tax/ramify/format"
)

// TestImportedTopLevelSurvivesFirstSolve: a team brings its taxonomy as a
// CSV of id, label and path only — no tags, no descriptions, so the
// similarity graph rests on a few label words. The first solve must keep
// the shelves they know: every imported top-level category is still a
// top-level category, and no new provisional layer is put above them.
func TestImportedTopLevelSurvivesFirstSolve(t *testing.T) {
	code, csvText, stderr := runIn("export", "--dir", demoDir, "--format", "csv")
	if code != 0 {
		t.Fatalf("export: %s", stderr)
	}
	tmp := t.TempDir()
	from := filepath.Join(tmp, "existing.csv")
	if err := os.WriteFile(from, []byte(csvText), 0o644); err != nil {
		t.Fatal(err)
	}
	repo := filepath.Join(tmp, "lib")
	if code, _, stderr := runIn("init", "--dir", repo, "--from", from); code != 0 {
		t.Fatalf("init --from: %s", stderr)
	}
	imported := topNames(t, filepath.Join(repo, "taxonomy.outline"))
	if code, _, stderr := runIn("solve", "--dir", repo); code != 0 {
		t.Fatalf("solve: %s", stderr)
	}
	solved := topNames(t, filepath.Join(repo, "taxonomy.outline"))
	for _, name := range imported {
		if !slices.Contains(solved, name) {
			t.Errorf("imported top-level category %q is gone; top level now %v", name, solved)
		}
	}
	for _, name := range solved {
		if !slices.Contains(imported, name) {
			t.Errorf("new top-level category %q over the imported ones", name)
		}
	}
}

func topNames(t *testing.T, path string) []string {
	t.Helper()
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	o, err := format.ParseOutline(path, data)
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, c := range o.Root.Children {
		names = append(names, c.DisplayName())
	}
	return names
}
