package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// A hand edit saved while solve runs is kept: solve reads the outline
// again just before its rename, finds it changed, writes nothing and
// exits 1 (issue: "a hand edit saved while solve runs is silently
// overwritten").
func TestSolveKeepsOutlineEditedWhileItRuns(t *testing.T) {
	dir := t.TempDir()
	if err := copyDir(filepath.Join("..", "..", "examples", "tool-library"), dir); err != nil {
		t.Fatal(err)
	}
	os.RemoveAll(filepath.Join(dir, "reviews", "open"))
	var out, errb bytes.Buffer
	if code := run([]string{"solve", "--dir", dir, "-q"}, &out, &errb); code != 0 {
		t.Fatalf("first solve: exit %d: %s", code, errb.String())
	}
	// A new record, so that the next solve writes a different outline.
	rule := "[[triplet]]\npair = [\"heat-gun\", \"carpet-cleaner\"]\nout = \"paint-scraper-set\"\n"
	if err := os.WriteFile(filepath.Join(dir, "constraints", "heat.toml"), []byte(rule), 0o644); err != nil {
		t.Fatal(err)
	}
	outline := filepath.Join(dir, "taxonomy.outline")
	before, err := os.ReadFile(outline)
	if err != nil {
		t.Fatal(err)
	}
	edited := bytes.Replace(before, []byte("  Levels/\n"), []byte("  Spirit and laser levels/\n"), 1)
	beforeOutlineRename = func() {
		if err := os.WriteFile(outline, edited, 0o644); err != nil {
			t.Error(err)
		}
	}
	defer func() { beforeOutlineRename = nil }()
	out.Reset()
	errb.Reset()
	code := run([]string{"solve", "--dir", dir}, &out, &errb)
	if code != exitFailed {
		t.Fatalf("solve with the outline edited while it ran: exit %d, want %d\n%s", code, exitFailed, errb.String())
	}
	if !strings.Contains(errb.String(), "taxonomy.outline changed while solve ran") {
		t.Errorf("solve said %q, want it to say the outline changed while it ran", errb.String())
	}
	got, err := os.ReadFile(outline)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(got, edited) {
		t.Errorf("taxonomy.outline is not the hand edit any more:\n%s", got)
	}
	entries, _ := os.ReadDir(dir)
	for _, e := range entries {
		if strings.Contains(e.Name(), ".tmp-") {
			t.Errorf("solve left %s behind", e.Name())
		}
	}
	// Without an edit, the same solve writes.
	beforeOutlineRename = nil
	if err := os.WriteFile(outline, before, 0o644); err != nil {
		t.Fatal(err)
	}
	if code := run([]string{"solve", "--dir", dir, "-q"}, &out, &errb); code != 0 {
		t.Fatalf("solve: exit %d: %s", code, errb.String())
	}
	if got, _ := os.ReadFile(outline); bytes.Equal(got, before) {
		t.Errorf("solve did not write the outline")
	}
}
