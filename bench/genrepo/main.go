// Command genrepo writes a taxonomy repository of n items whose only
// similarity source is an edge list (links.tsv) drawn from a seeded planted
// hierarchy (solve/planted), for timing `ramify solve` end to end:
//
//	go run ./bench/genrepo -n 100000 -out big-repo
//	ramify solve --dir big-repo
package main

import (
	"bufio"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"strconv"

	"github.com/ramify-tax/ramify/solve/planted"
)

func main() {
	n := flag.Int("n", 100000, "number of items")
	out := flag.String("out", "", "folder to create (must not exist)")
	seed := flag.Uint64("seed", 1, "planted-hierarchy seed")
	flag.Parse()
	if *out == "" {
		fmt.Fprintln(os.Stderr, "genrepo: -out is required")
		os.Exit(2)
	}
	if err := write(*out, *n, *seed); err != nil {
		fmt.Fprintln(os.Stderr, "genrepo:", err)
		os.Exit(1)
	}
}

func write(dir string, n int, seed uint64) error {
	if err := os.Mkdir(dir, 0o755); err != nil {
		return err
	}
	depth := 1
	for size := n / 4; size > 40; size /= 4 {
		depth++
	}
	inst := planted.Generate(seed, n, 4, depth)
	settings := `[items]
files = ["items.tsv"]

[similarity]
neighbors = 15

[[similarity.source]]
kind = "links"
file = "links.tsv"
weight = 1.0
`
	if err := os.WriteFile(filepath.Join(dir, "ramify.toml"), []byte(settings), 0o644); err != nil {
		return err
	}
	id := func(i int) string { return "item-" + strconv.Itoa(i) }
	if err := writeLines(filepath.Join(dir, "items.tsv"), func(w *bufio.Writer) {
		w.WriteString("id\n")
		for i := 0; i < n; i++ {
			w.WriteString(id(i) + "\n")
		}
	}); err != nil {
		return err
	}
	return writeLines(filepath.Join(dir, "links.tsv"), func(w *bufio.Writer) {
		w.WriteString("a\tb\tweight\n")
		for _, e := range inst.Graph.Edges() {
			fmt.Fprintf(w, "%s\t%s\t%s\n", id(int(e.A)), id(int(e.B)), strconv.FormatFloat(e.W, 'g', 6, 64))
		}
	})
}

func writeLines(path string, fill func(w *bufio.Writer)) error {
	f, err := os.Create(path)
	if err != nil {
		return err
	}
	w := bufio.NewWriter(f)
	fill(w)
	if err := w.Flush(); err != nil {
		f.Close()
		return err
	}
	return f.Close()
}
