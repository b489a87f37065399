// Command solvebench measures the solver on seeded planted hierarchies
// (solve/planted) and prints a table: wall time, peak memory, Dasgupta
// cost against average linkage on the same graph, and rooted triplet
// agreement with the planted tree.
//
//	go run ./cmd/bench/solvebench                  # n = 1,000 and 10,000
//	go run ./cmd/bench/solvebench -n 1000,10000,100000
//	go run ./cmd/bench/solvebench -peer            # beside fastcluster at 10k, 20k, 40k
//
// Each size runs in a child process of its own, so the peak resident
// memory reported is that size's alone.
package main

import (
	"flag"
	"fmt"
	"os"
	"os/exec"
	"strconv"
	"strings"
	"syscall"
	"time"

	"github.com/ramify-tax/ramify/solve"
	"github.com/ramify-tax/ramify/solve/planted"
)

func main() {
	sizes := flag.String("n", "1000,10000", "comma-separated item counts")
	one := flag.Int("one", 0, "measure one size and print its row (used by the parent)")
	seed := flag.Uint64("seed", 1, "planted-hierarchy seed")
	peer := flag.Bool("peer", false, "compare with fastcluster on planted points (default sizes 10000,20000,40000)")
	peerOne := flag.Int("peer-one", 0, "measure ramify on one size of planted points (used by the parent)")
	avgMax := flag.Int("peer-average-max", 20000, "largest size for fastcluster's average linkage, which keeps all n²/2 distances")
	flag.Parse()
	if *peerOne > 0 {
		printChild(measurePeerOne(*peerOne, *seed))
		return
	}
	if *one > 0 {
		printChild(measure(*one, *seed))
		return
	}
	self, err := os.Executable()
	if err != nil {
		fmt.Fprintln(os.Stderr, err)
		os.Exit(1)
	}
	if *peer {
		list := *sizes
		set := false
		flag.Visit(func(f *flag.Flag) { set = set || f.Name == "n" })
		if !set {
			list = "10000,20000,40000"
		}
		version, have := peerAvailable()
		if have {
			fmt.Printf("fastcluster %s (%s)\n\n", version, debianPython)
		} else {
			fmt.Printf("fastcluster is not installed (apt-get install python3-fastcluster): its columns are skipped\n\n")
		}
		fmt.Println("| n | ramify s | ramify MiB | ramify agreement | linkage_vector Ward s | Ward MiB | Ward agreement | average linkage s | average MiB | average agreement | ramify s / Ward s |")
		fmt.Println("|---:|---:|---:|---|---:|---:|---|---:|---:|---|---:|")
		for _, s := range strings.Split(list, ",") {
			n, err := strconv.Atoi(strings.TrimSpace(s))
			if err != nil || n < 10 {
				fmt.Fprintf(os.Stderr, "bad size %q\n", s)
				os.Exit(2)
			}
			row, err := peerRow(self, n, *seed, *avgMax, have)
			if err != nil {
				fmt.Fprintln(os.Stderr, err)
				os.Exit(1)
			}
			fmt.Println(row)
		}
		return
	}
	fmt.Println("| n | edges | planted categories | solve s | average linkage s | peak RSS MiB | cost / average-linkage cost | taxonomy cost / planted-tree cost | triplet agreement with planted |")
	fmt.Println("|---:|---:|---:|---:|---:|---:|---:|---:|---:|")
	for _, s := range strings.Split(*sizes, ",") {
		n, err := strconv.Atoi(strings.TrimSpace(s))
		if err != nil || n < 10 {
			fmt.Fprintf(os.Stderr, "bad size %q\n", s)
			os.Exit(2)
		}
		out, err := exec.Command(self, "-one", strconv.Itoa(n), "-seed", strconv.FormatUint(*seed, 10)).Output()
		if err != nil {
			fmt.Fprintf(os.Stderr, "n=%d: %v\n", n, err)
			os.Exit(1)
		}
		fmt.Print(string(out))
	}
}

// plantedOptions are the solver options of every solve of a planted
// instance, here and in the peer comparison: max_depth must admit the
// planted depth, or folding has to flatten real levels and the comparison
// with the planted tree is unfair.
func plantedOptions(inst *planted.Instance) solve.Options {
	return solve.Options{MinSize: 3, MaxChildren: 12, MaxDepth: max(6, inst.Depth), Seed: 1}
}

func measure(n int, seed uint64) (string, error) {
	inst := planted.Generate(seed, n, 4, levelsFor(n))
	opt := plantedOptions(inst)
	start := time.Now()
	res, err := solve.Solve(inst.Graph, nil, opt)
	if err != nil {
		return "", err
	}
	solveSec := time.Since(start).Seconds()
	start = time.Now()
	avg := solve.AverageLinkageGraph(inst.Graph)
	avgSec := time.Since(start).Seconds()
	ratio := solve.Cost(inst.Graph, res.Binary) / solve.Cost(inst.Graph, avg)
	// The planted tree's own cost says whether a miss is the solver's: a
	// tree cheaper than the truth is the objective's answer on this graph.
	vsPlanted := solve.Cost(inst.Graph, res.Taxonomy) / solve.Cost(inst.Graph, inst.Tree)
	agreement := agreement(res.Taxonomy, inst.Tree)
	var ru syscall.Rusage
	syscall.Getrusage(syscall.RUSAGE_SELF, &ru)
	peakMiB := float64(ru.Maxrss) / 1024 // Linux reports kilobytes
	categories := inst.Tree.NumNodes() - inst.Tree.N
	return fmt.Sprintf("| %d | %d | %d | %.2f | %.2f | %.0f | %.4f | %.4f | %s |",
		n, inst.Graph.NumEdges(), categories, solveSec, avgSec, peakMiB, ratio, vsPlanted, agreement), nil
}

// printChild prints a child run's row, or its error with exit status 1.
func printChild(row string, err error) {
	if err != nil {
		fmt.Fprintln(os.Stderr, err)
		os.Exit(1)
	}
	fmt.Println(row)
}

// levelsFor picks a planted depth that gives bottom categories of a few
// dozen items at branching 4.
func levelsFor(n int) int {
	d := 1
	for size := n / 4; size > 40; size /= 4 {
		d++
	}
	return d
}
