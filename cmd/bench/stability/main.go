// Command stability measures how much one new editorial record moves: on
// the demo and on generated repositories it adds one record at a time to
// the same solved base (a triplet the tree breaks, a group over items
// from two categories, a fixed packet, a hand move absorbed; see package
// stable), runs `ramify solve`, and counts the items whose
// category changed beyond those the record names, and the top-level
// categories that vanished although the record names none of their items.
//
//	go run ./cmd/bench/stability [-sizes 1000,20000] [-trials 15] [-ramify BIN]
//
// Target (the project's stability goal): median at most 1% of the items per
// record, and no top-level category dissolved by a record that does not
// name it.
package main

import (
	"bytes"
	"flag"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"text/tabwriter"

	"github.com/ramify-tax/ramify/cmd/bench/stability/stable"
)

func main() {
	sizes := flag.String("sizes", "1000,20000", "generated repository sizes (0 for none)")
	trials := flag.Int("trials", 15, "records of each kind per repository")
	bin := flag.String("ramify", "", "ramify binary (default: build ./cmd/ramify)")
	flag.Parse()
	tmp, err := os.MkdirTemp("", "ramify-stability-")
	check(err)
	defer os.RemoveAll(tmp)
	if *bin == "" {
		*bin = filepath.Join(tmp, "ramify")
		run("go", "build", "-o", *bin, "./cmd/ramify")
	}
	type repo struct{ name, dir string }
	repos := []repo{{"demo", filepath.Join(tmp, "demo")}}
	run("cp", "-r", "examples/tool-library", repos[0].dir)
	os.RemoveAll(filepath.Join(repos[0].dir, "reviews", "open"))
	for _, s := range strings.Split(*sizes, ",") {
		n, err := strconv.Atoi(strings.TrimSpace(s))
		if err != nil || n <= 0 {
			continue
		}
		d := filepath.Join(tmp, "gen"+s)
		run("go", "run", "./cmd/bench/genrepo", "-n", s, "-out", d)
		repos = append(repos, repo{"generated " + s, d})
	}
	binary := func(args ...string) (string, error) {
		var out bytes.Buffer
		cmd := exec.Command(*bin, args...)
		cmd.Stdout, cmd.Stderr = &out, &out
		if err := cmd.Run(); err != nil {
			return out.String(), fmt.Errorf("ramify %s: %v\n%s", strings.Join(args, " "), err, out.String())
		}
		return out.String(), nil
	}
	tw := tabwriter.NewWriter(os.Stdout, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "repository\trecord\ttrials\tmedian moved\tmax moved\ttop-level dissolved\t")
	for _, r := range repos {
		_, err := binary("solve", "--dir", r.dir, "--quiet")
		check(err)
		for _, kind := range stable.Kinds {
			res, err := stable.Measure(binary, r.dir, kind, *trials)
			check(err)
			if len(res.Shares) == 0 {
				continue
			}
			fmt.Fprintf(tw, "%s\t%s\t%d\t%.2f%%\t%.2f%%\t%d\t\n", r.name, kind, len(res.Shares),
				100*res.Median(), 100*res.Max(), res.Dissolved)
		}
	}
	tw.Flush()
}

func run(name string, args ...string) {
	cmd := exec.Command(name, args...)
	cmd.Stderr = os.Stderr
	check(cmd.Run())
}

func check(err error) {
	if err != nil {
		fmt.Fprintln(os.Stderr, "stability:", err)
		os.Exit(1)
	}
}
