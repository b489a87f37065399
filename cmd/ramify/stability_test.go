package main

import (
	"fmt"
	"os"
	"path/filepath"
	"testing"

	"github.com/ramify-tax/ramify/cmd/bench/stability/stable"
)

// TestOneDecisionMovesLittle runs the stability benchmark of
// cmd/bench/stability in-process on the demo: each kind of decision (a
// triplet, a group, a fixed packet, an absorbed hand move), added alone
// to the solved demo, must move at most 1% of the other items in the
// median and dissolve no top-level category it names no item of (the
// target the repository's design sets for a local re-solve). With
// RAMIFY_BIG=1 it runs generated repositories of 1,000 and 20,000 items
// too.
func TestOneDecisionMovesLittle(t *testing.T) {
	type repo struct {
		name  string
		setup func(t *testing.T, dir string)
	}
	repos := []repo{{"demo", func(t *testing.T, dir string) {
		copyTree(t, demoDir, dir)
		if err := os.RemoveAll(filepath.Join(dir, "reviews", "open")); err != nil {
			t.Fatal(err)
		}
	}}}
	trials := 8
	if os.Getenv("RAMIFY_BIG") == "1" {
		for _, n := range []int{1000, 20000} {
			repos = append(repos, repo{fmt.Sprintf("planted %d", n), func(t *testing.T, dir string) { writePlantedRepo(t, dir, n, 1) }})
		}
		trials = 15
	}
	for _, r := range repos {
		t.Run(r.name, func(t *testing.T) {
			dir := filepath.Join(t.TempDir(), "repo")
			r.setup(t, dir)
			mustRun(t, "solve", "--dir", dir, "--quiet")
			for _, kind := range stable.Kinds {
				res, err := stable.Measure(inProcess, dir, kind, trials)
				if err != nil {
					t.Fatalf("%s: %v", kind, err)
				}
				t.Logf("%-8s %2d trials  median moved %.2f%%  max %.2f%%  top-level dissolved %d", kind, len(res.Shares), 100*res.Median(), 100*res.Max(), res.Dissolved)
				if len(res.Shares) == 0 {
					t.Errorf("%s: no decision could be measured", kind)
				}
				if res.Median() > 0.01 {
					t.Errorf("%s: a decision moves %.2f%% of the other items in the median, more than 1%%", kind, 100*res.Median())
				}
				if res.Dissolved > 0 {
					t.Errorf("%s: %d top-level categories dissolved by decisions that name none of their items", kind, res.Dissolved)
				}
			}
			mustRun(t, "check", "--dir", dir, "--quiet")
		})
	}
}
