package main

import (
	"bytes"
	"maps"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/review"
)

// TestAbsorbRefusesAContradictingAnswer: a reviewer's answer that cannot
// hold together with a recorded decision (here the demo's "Levels" group)
// is reported with both records, and absorb writes nothing.
func TestAbsorbRefusesAContradictingAnswer(t *testing.T) {
	dir := solvedDemo(t)
	p := loadProject(t, dir)
	items := []string{"laser-level-cross", "spirit-level-600", "spirit-level-1200", "claw-hammer-16oz"}
	var idx []int32
	for _, id := range items {
		i, ok := p.Index[id]
		if !ok {
			t.Fatalf("the demo has no item %q", id)
		}
		idx = append(idx, int32(i))
	}
	slices.Sort(idx)
	structure := format.StructureHash(p.Outline.Root)
	pk, id := review.NewPacket(review.Draft{Reason: format.ReasonUncertain, Items: idx, Score: 0.5}, p.Outline.Root, p.Items, structure, "2026-12-02")
	// The answer: the cross-line laser goes with the hammer, apart from the
	// spirit levels. The group says the levels form a category of their own.
	pk.Tree = &format.Category{
		Children: []*format.Category{{Name: "Odd pair", Items: []string{"claw-hammer-16oz", "laser-level-cross"}}},
		Items:    []string{"spirit-level-1200", "spirit-level-600"},
	}
	pk.Verdict, pk.Reviewer = format.VerdictFixed, "Ana"
	openFile := filepath.Join(dir, "reviews", "open", id+".outline")
	if err := os.MkdirAll(filepath.Dir(openFile), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(openFile, format.FormatPacket(pk), 0o644); err != nil {
		t.Fatal(err)
	}
	before := snapshot(t, dir)
	var out, errOut bytes.Buffer
	code := run([]string{"absorb", "--dir", dir, "--date", "2026-12-03"}, &out, &errOut)
	if code != exitFailed {
		t.Fatalf("absorb exited %d, want %d\n%s%s", code, exitFailed, out.String(), errOut.String())
	}
	msg := errOut.String()
	for _, want := range []string{"cannot all hold", "reviews/open/" + id + ".outline:17: shape by Ana", "group by Alba Ortiz"} {
		if !strings.Contains(msg, want) {
			t.Errorf("the report does not say %q:\n%s", want, msg)
		}
	}
	if after := snapshot(t, dir); !maps.Equal(before, after) {
		t.Error("absorb changed files although it failed")
	}
}
