// Command reviewloop runs the review loop on the bundled real taxonomies
// (package realdata) with a scripted reviewer who answers every packet
// from the reference tree, and prints a table per round — triplet
// precision, recall and F1 against the reference, the triples each round
// repaired and broke, and how well the committee's per-item uncertainty
// predicts the misplaced items — then a summary with the targets:
//
//	go run ./cmd/bench/reviewloop                      # all sets, both arms, 3 orders, 10 rounds
//	go run ./cmd/bench/reviewloop -sets furniture -orders 1 -rounds 3
//	go run ./cmd/bench/reviewloop -sets music -orders 1 -keep      # keep each repository and its rounds' solve --json
//	go run ./cmd/bench/reviewloop -orders 1 -arms default,oracle   # beside packets an oracle who knows the reference picks
//
// It builds the ramify command once and runs it as a user would.
package main

import (
	"bytes"
	"flag"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"time"

	"github.com/ramify-tax/ramify/cmd/bench/reviewloop/loop"
	"github.com/ramify-tax/ramify/internal/realdata"
)

func main() {
	sets := flag.String("sets", strings.Join(realdata.Names(), ","), "comma-separated dev sets")
	rounds := flag.Int("rounds", 10, "rounds per run")
	count := flag.Int("count", 4, "packets drawn per round (review draw --count)")
	orders := flag.Int("orders", 3, "item orders per set and arm")
	arms := flag.String("arms", "default,random", "arms to run: default, random, oracle")
	bin := flag.String("ramify", "", "ramify binary to run (default: build ./cmd/ramify)")
	perRound := flag.Bool("rounds-table", true, "print the per-round table")
	keep := flag.Bool("keep", false, "keep each run's repository (with each round's solve --json) and print where")
	flag.Parse()
	if err := run(strings.Split(*sets, ","), strings.Split(*arms, ","), *rounds, *count, *orders, *bin, *perRound, *keep); err != nil {
		fmt.Fprintln(os.Stderr, "reviewloop:", err)
		os.Exit(1)
	}
}

func run(sets, arms []string, rounds, count, orders int, bin string, perRound, keep bool) error {
	work, err := os.MkdirTemp("", "reviewloop-")
	if err != nil {
		return err
	}
	if keep {
		fmt.Fprintln(os.Stderr, "repositories kept in", work)
	} else {
		defer os.RemoveAll(work)
	}
	if bin == "" {
		bin = filepath.Join(work, "ramify")
		build := exec.Command("go", "build", "-o", bin, "./cmd/ramify")
		build.Stderr = os.Stderr
		if err := build.Run(); err != nil {
			return fmt.Errorf("building ramify (run from the module root): %w", err)
		}
	}
	runner := func(args ...string) (string, error) {
		cmd := exec.Command(bin, args...)
		var out, errOut bytes.Buffer
		cmd.Stdout, cmd.Stderr = &out, &errOut
		if err := cmd.Run(); err != nil {
			return "", fmt.Errorf("ramify %s: %v\n%s%s", strings.Join(args, " "), err, out.String(), errOut.String())
		}
		return out.String(), nil
	}
	var results []loop.Result
	for _, name := range sets {
		set, err := realdata.Load(name)
		if err != nil {
			return err
		}
		for _, arm := range loop.Arms {
			if !contains(arms, arm.Name) {
				continue
			}
			for order := range orders {
				start := time.Now()
				dir := filepath.Join(work, fmt.Sprintf("%s-%s-%d", name, arm.Name, order))
				rs, err := loop.Run(loop.Config{Set: set, Arm: arm, Order: order, Rounds: rounds, Count: count, Dir: dir, Run: runner})
				if err != nil {
					return fmt.Errorf("%s %s order %d: %w", name, arm.Name, order, err)
				}
				last := rs[len(rs)-1]
				fmt.Fprintf(os.Stderr, "%s %s order %d: F1 %.4f -> %.4f in %.0fs\n", name, arm.Name, order, rs[0].F1, last.F1, time.Since(start).Seconds())
				results = append(results, loop.Result{Set: name, Arm: arm.Name, Order: order, Rounds: rs})
				if !keep {
					os.RemoveAll(dir)
				}
			}
		}
	}
	if perRound {
		loop.PrintRounds(os.Stdout, results)
	}
	loop.PrintSummary(os.Stdout, results, sets, count)
	return nil
}

func contains(xs []string, x string) bool {
	for _, y := range xs {
		if y == x {
			return true
		}
	}
	return false
}
