package main

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/ramify-tax/ramify/cmd/bench/reviewloop/loop"
	"github.com/ramify-tax/ramify/internal/realdata"
)

// inProcess runs ramify commands through run, as the review-loop benchmark
// runs the built binary.
func inProcess(args ...string) (string, error) {
	var out, errOut bytes.Buffer
	if code := run(args, &out, &errOut); code != 0 {
		return "", fmt.Errorf("ramify %s: exit %d\n%s%s", strings.Join(args, " "), code, out.String(), errOut.String())
	}
	return out.String(), nil
}

// TestReviewLoopOnRealData runs the review loop of cmd/bench/reviewloop on the
// WordNet furniture dev set (internal/realdata) for three rounds of every
// arm (the oracle's included), with the scripted reviewer answering from the reference. Answers
// from the reference can only be consistent with each other, so every
// round must absorb and solve cleanly, `check` must pass, and the tree
// must end closer to the reference than it started. With RAMIFY_BIG=1 it
// runs every dev set for ten rounds and logs the benchmark's tables.
func TestReviewLoopOnRealData(t *testing.T) {
	sets, rounds := []string{"furniture"}, 3
	if os.Getenv("RAMIFY_BIG") == "1" {
		sets, rounds = realdata.Names(), 10
	}
	var results []loop.Result
	for _, name := range sets {
		set, err := realdata.Load(name)
		if err != nil {
			t.Fatal(err)
		}
		for _, arm := range loop.Arms {
			dir := filepath.Join(t.TempDir(), "repo")
			rs, err := loop.Run(loop.Config{Set: set, Arm: arm, Rounds: rounds, Count: 4, Dir: dir, Run: inProcess})
			if err != nil {
				t.Fatalf("%s %s: %v", name, arm.Name, err)
			}
			ramify(t, "check", "--dir", dir)
			first, last := rs[0], rs[len(rs)-1]
			if last.F1 <= first.F1 {
				t.Errorf("%s %s: F1 went from %.4f to %.4f in %d rounds of answers from the reference", name, arm.Name, first.F1, last.F1, rounds)
			}
			if last.Packets == 0 {
				t.Errorf("%s %s: no packet was drawn", name, arm.Name)
			}
			for _, r := range rs {
				if r.AUC < 0 || r.AUC > 1 || r.F1 < 0 || r.F1 > 1 {
					t.Errorf("%s %s round %d: AUC %.3f, F1 %.3f out of range", name, arm.Name, r.Round, r.AUC, r.F1)
				}
			}
			results = append(results, loop.Result{Set: name, Arm: arm.Name, Rounds: rs})
		}
	}
	var table bytes.Buffer
	loop.PrintRounds(&table, results)
	loop.PrintSummary(&table, results, sets, 4)
	t.Log("\n" + table.String())
}
