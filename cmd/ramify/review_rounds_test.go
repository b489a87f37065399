package main

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/ramify-tax/ramify/cmd/bench/reviewloop/loop"
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/review"
	"github.com/ramify-tax/ramify/solve"
	"github.com/ramify-tax/ramify/solve/regen"
)

// TestReviewRoundsKeepApprovedPackets runs the review loop on a copy of
// the demo for several rounds — draw, answer, absorb, solve — with a
// scripted reviewer who answers from a hidden target tree (the first
// solved outline with every seventh item moved elsewhere), and checks
// after every round that every shape recorded so far, from this round or
// an earlier one, still holds in the regenerated taxonomy.
func TestReviewRoundsKeepApprovedPackets(t *testing.T) {
	dir := solvedDemo(t)
	target := hiddenTarget(t, dir)
	var shapes []string // constraint files of approved packets, in order
	for round := 1; round <= 4; round++ {
		date := fmt.Sprintf("2026-12-%02d", round)
		ramify(t, "review", "draw", "--dir", dir, "--date", date, "--count", "4")
		answerFromHiddenTarget(t, dir, target)
		ramify(t, "absorb", "--dir", dir, "--date", date)
		ramify(t, "solve", "--dir", dir)
		files, err := filepath.Glob(filepath.Join(dir, "constraints", "review-*.toml"))
		if err != nil {
			t.Fatal(err)
		}
		for _, f := range files {
			if rel := "constraints/" + filepath.Base(f); !slices.Contains(shapes, rel) {
				shapes = append(shapes, rel)
			}
		}
		p, ds := repo.Load(dir)
		if len(ds) > 0 {
			t.Fatalf("round %d: %v", round, ds)
		}
		compiled := regen.Compile(p)
		tree := regen.FromCategory(p.Outline.Root, p.Index, len(p.Items))
		broken := map[string]bool{}
		for _, r := range solve.Satisfies(tree, compiled.Constraints) {
			broken[compiled.Records[r].Pos.File] = true
		}
		recorded := map[string]*format.Shape{}
		for _, cf := range p.Constraints {
			for i := range cf.Shapes {
				recorded[cf.File] = &cf.Shapes[i]
			}
		}
		for _, s := range shapes {
			if broken[s] {
				t.Errorf("round %d: the approved packet %s no longer holds", round, s)
			}
			// The record is the reviewer's answer: the target's arrangement.
			shape := recorded[s]
			if shape == nil {
				t.Errorf("round %d: %s has no shape record", round, s)
			} else if !sameShape(shape.Tree, review.Restrict(target, shape.Tree.AllItems())) {
				t.Errorf("round %d: %s does not record the reviewer's answer", round, s)
			}
		}
		t.Logf("round %d: %d approved packets, all holding", round, len(shapes))
		ramify(t, "check", "--dir", dir)
	}
	if len(shapes) < 3 {
		t.Errorf("only %d packets were answered fixed in four rounds; the test needs several", len(shapes))
	}
}

// ramify runs one command in-process and fails the test unless it exits 0.
func ramify(t *testing.T, args ...string) string {
	t.Helper()
	var out, errOut bytes.Buffer
	if code := run(args, &out, &errOut); code != 0 {
		t.Fatalf("ramify %s: exit %d\n%s%s", strings.Join(args, " "), code, out.String(), errOut.String())
	}
	return out.String()
}

// hiddenTarget is the outline as solved, with every seventh item (in id
// order) moved into the category of the item 50 places further on.
func hiddenTarget(t *testing.T, dir string) *format.Category {
	t.Helper()
	p := loadProject(t, dir)
	root := p.Outline.Root.Clone()
	holder := map[string]*format.Category{}
	root.Walk(func(c *format.Category, _ int) bool {
		for _, it := range c.Items {
			holder[it] = c
		}
		return true
	})
	ids := p.ItemIDs()
	slices.Sort(ids)
	for i := 0; i < len(ids); i += 7 {
		x, y := ids[i], ids[(i+50)%len(ids)]
		from, to := holder[x], holder[y]
		if from == to || len(from.Items)+len(from.Children) < 3 {
			continue
		}
		from.Items = slices.DeleteFunc(from.Items, func(s string) bool { return s == x })
		from.ItemLines = nil
		to.Items = append(to.Items, x)
		to.ItemLines = nil
		holder[x] = to
	}
	root.Sort()
	return root
}

// answerFromHiddenTarget answers every open packet: "ok" when the packet
// arranges its items as the target does, else "fixed" with the target's
// arrangement.
func answerFromHiddenTarget(t *testing.T, dir string, target *format.Category) {
	t.Helper()
	if _, err := loop.AnswerOpen(dir, target); err != nil {
		t.Fatal(err)
	}
}

// sameShape reports whether two trees resolve the same triplets.
func sameShape(a, b *format.Category) bool { return review.SameShape(a, b) }

// copyDemoInto copies the demo repository into dir.
func copyDemoInto(t *testing.T, dst string) { copyTree(t, demoDir, dst) }

// solvedDemo is a copy of the demo in a new temporary folder, without its
// open review packets, solved: where the review tests start.
func solvedDemo(t *testing.T) string {
	t.Helper()
	dir := t.TempDir()
	copyDemoInto(t, dir)
	os.RemoveAll(filepath.Join(dir, "reviews", "open"))
	ramify(t, "solve", "--dir", dir)
	return dir
}
