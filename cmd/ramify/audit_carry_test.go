package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/review"
)

// TestAuditsSurviveLocalChange answers eight audits "ok" on the demo, then
// adds one triplet record and solves: every audit whose items the new tree
// arranges as before still answers for it, the others are stale, and the
// next draw asks for the stale sets again before any new one.
func TestAuditsSurviveLocalChange(t *testing.T) {
	dir := t.TempDir()
	copyDemoInto(t, dir)
	os.RemoveAll(filepath.Join(dir, "reviews"))
	settings := filepath.Join(dir, "ramify.toml")
	data, err := os.ReadFile(settings)
	if err != nil {
		t.Fatal(err)
	}
	data = []byte(strings.Replace(string(data), "audit_share = 0.25", "audit_share = 1.0", 1))
	if err := os.WriteFile(settings, data, 0o644); err != nil {
		t.Fatal(err)
	}
	ramify(t, "solve", "--dir", dir)
	ramify(t, "review", "draw", "--dir", dir, "--count", "8", "--date", "2026-12-01")
	files, _ := filepath.Glob(filepath.Join(dir, "reviews", "open", "*.outline"))
	if len(files) != 8 {
		t.Fatalf("%d audit packets drawn, want 8", len(files))
	}
	for _, f := range files {
		answerOK(t, f)
	}
	ramify(t, "absorb", "--dir", dir, "--date", "2026-12-01")
	// One editor record naming three items of different top categories.
	p := loadProject(t, dir)
	top := p.Outline.Root.Children
	a, b, c := top[0].AllItems()[0], top[1].AllItems()[0], top[0].AllItems()[1]
	record := "[[triplet]]\npair = [\"" + a + "\", \"" + b + "\"]\nout = \"" + c + "\"\nby = \"Test Editor\"\ndate = 2026-12-02\n"
	if err := os.WriteFile(filepath.Join(dir, "constraints", "test-editor.toml"), []byte(record), 0o644); err != nil {
		t.Fatal(err)
	}
	ramify(t, "solve", "--dir", dir)
	p = loadProject(t, dir)
	same, stale := 0, map[string]bool{}
	doneFiles, _ := filepath.Glob(filepath.Join(dir, "reviews", "done", "*.outline"))
	for _, f := range doneFiles {
		pk := readPacketFile(t, f)
		items := pk.Tree.AllItems()
		slices.Sort(items)
		if review.SameShape(review.Restrict(p.Outline.Root, items), pk.Tree) {
			same++
		} else {
			stale[strings.Join(items, " ")] = true
		}
	}
	if same == 0 || len(stale) == 0 {
		t.Logf("the record kept %d of 8 audits' projections; the test wants some of each", same)
	}
	var st struct {
		Audits struct {
			Answered, Carried, Older int
		}
	}
	if err := json.Unmarshal([]byte(ramify(t, "review", "status", "--dir", dir, "--json", "--top", "0")), &st); err != nil {
		t.Fatal(err)
	}
	if st.Audits.Answered != same || st.Audits.Carried != same || st.Audits.Older != len(stale) {
		t.Errorf("status counts %+v; %d audits keep their projection, %d do not", st.Audits, same, len(stale))
	}
	// The next draw asks for the stale sets first.
	ramify(t, "review", "draw", "--dir", dir, "--count", "8", "--date", "2026-12-03")
	files, _ = filepath.Glob(filepath.Join(dir, "reviews", "open", "*.outline"))
	redrawn := 0
	for _, f := range files {
		items := readPacketFile(t, f).Tree.AllItems()
		slices.Sort(items)
		if stale[strings.Join(items, " ")] {
			redrawn++
		}
	}
	if redrawn != len(stale) {
		t.Errorf("%d of the %d stale audit sets drawn again", redrawn, len(stale))
	}
}

func loadProject(t *testing.T, dir string) *repo.Repo {
	t.Helper()
	p, ds := repo.Load(dir)
	if len(ds) > 0 {
		t.Fatal(ds)
	}
	return p
}

func readPacketFile(t *testing.T, f string) *format.Packet {
	t.Helper()
	data, err := os.ReadFile(f)
	if err != nil {
		t.Fatal(err)
	}
	pk, err := format.ParsePacket(f, data)
	if err != nil {
		t.Fatal(err)
	}
	return pk
}

func answerOK(t *testing.T, f string) {
	t.Helper()
	pk := readPacketFile(t, f)
	pk.Verdict, pk.Reviewer = format.VerdictOK, "Test Reviewer"
	if err := os.WriteFile(f, format.FormatPacket(pk), 0o644); err != nil {
		t.Fatal(err)
	}
}
