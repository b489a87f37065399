package main

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/ramify-tax/ramify/solve/planted"
)

// writePlantedRepo writes a repository whose similarities are the edge
// list of a seeded planted hierarchy (solve/planted), as cmd/bench/genrepo does.
func writePlantedRepo(t *testing.T, dir string, n int, seed uint64) {
	t.Helper()
	depth := 1
	for size := n / 4; size > 40; size /= 4 {
		depth++
	}
	inst := planted.Generate(seed, n, 4, depth)
	var items, links strings.Builder
	items.WriteString("id\n")
	for i := range n {
		fmt.Fprintf(&items, "item-%d\n", i)
	}
	links.WriteString("a\tb\tweight\n")
	for _, e := range inst.Graph.Edges() {
		fmt.Fprintf(&links, "item-%d\titem-%d\t%s\n", e.A, e.B, strconv.FormatFloat(e.W, 'g', 6, 64))
	}
	files := map[string]string{
		"ramify.toml": "[items]\nfiles = [\"items.tsv\"]\n\n[similarity]\nneighbors = 15\n\n[[similarity.source]]\nkind = \"links\"\nfile = \"links.tsv\"\nweight = 1.0\n",
		"items.tsv":   items.String(),
		"links.tsv":   links.String(),
	}
	for name, text := range files {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
}

// solve then check must pass at every size and seed: the outline solve
// writes is a fixed point, also after a record and new items arrive (the
// local re-solve). Sizes up to 20,000 run with RAMIFY_BIG=1.
func TestSolveIsAFixedPoint(t *testing.T) {
	sizes := []int{300, 1500}
	if os.Getenv("RAMIFY_BIG") == "1" {
		sizes = append(sizes, 3000, 8000, 20000)
	}
	for _, n := range sizes {
		for seed := uint64(1); seed <= 3; seed++ {
			t.Run(fmt.Sprintf("n=%d/seed=%d", n, seed), func(t *testing.T) {
				dir := t.TempDir()
				writePlantedRepo(t, dir, n, seed)
				mustRun(t, "solve", "--dir", dir, "-q")
				mustRun(t, "check", "--dir", dir, "-q")
				// One record and 1% new items: solve locally, check again.
				rec := "[[triplet]]\npair = [\"item-0\", \"item-" + strconv.Itoa(n/2) + "\"]\nout = \"item-1\"\nby = \"t\"\ndate = 2026-12-02\nnote = \"fixed point\"\n"
				if err := os.MkdirAll(filepath.Join(dir, "constraints"), 0o755); err != nil {
					t.Fatal(err)
				}
				if err := os.WriteFile(filepath.Join(dir, "constraints", "t.toml"), []byte(rec), 0o644); err != nil {
					t.Fatal(err)
				}
				writePlantedRepo(t, dir, n+n/100, seed)
				mustRun(t, "solve", "--dir", dir, "-q")
				mustRun(t, "check", "--dir", dir, "-q")
			})
		}
	}
}

func mustRun(t *testing.T, args ...string) {
	t.Helper()
	var out, errb bytes.Buffer
	if code := run(args, &out, &errb); code != 0 {
		t.Fatalf("ramify %s: exit %d\n%s%s", strings.Join(args, " "), code, out.String(), errb.String())
	}
}
