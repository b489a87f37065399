// Command genrepo writes a taxonomy repository of n items whose only
// similarity source is an edge list (links.tsv) drawn from a seeded planted
// hierarchy (solve/planted), for timing `ramify solve` end to end:
//
//	go run ./cmd/bench/genrepo -n 100000 -out big-repo
//	ramify solve --dir big-repo
//
// With -text the items also get tags, a label and a description drawn from
// words of their planted categories, and the repository compares them by
// tags and text besides the links: the documented capacity (a million items
// with tags and text, ten million links) is
//
//	go run ./cmd/bench/genrepo -n 1000000 -text -out capacity-repo
package main

import (
	"bufio"
	"flag"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/ramify-tax/ramify/solve/planted"
)

func main() {
	n := flag.Int("n", 100000, "number of items")
	out := flag.String("out", "", "folder to create (must not exist)")
	seed := flag.Uint64("seed", 1, "planted-hierarchy seed")
	text := flag.Bool("text", false, "give items tags, a label and a description, and compare them by tags and text too")
	flag.Parse()
	if *out == "" {
		fmt.Fprintln(os.Stderr, "genrepo: -out is required")
		os.Exit(2)
	}
	if err := write(*out, *n, *seed, *text); err != nil {
		fmt.Fprintln(os.Stderr, "genrepo:", err)
		os.Exit(1)
	}
}

func write(dir string, n int, seed uint64, text bool) error {
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
	if text {
		settings += `
[[similarity.source]]
kind = "tags"
weight = 0.5

[[similarity.source]]
kind = "text"
weight = 0.5
`
	}
	if err := os.WriteFile(filepath.Join(dir, "ramify.toml"), []byte(settings), 0o644); err != nil {
		return err
	}
	id := func(i int) string { return "item-" + strconv.Itoa(i) }
	if err := writeLines(filepath.Join(dir, "items.tsv"), func(w *bufio.Writer) {
		if !text {
			w.WriteString("id\n")
			for i := 0; i < n; i++ {
				w.WriteString(id(i) + "\n")
			}
			return
		}
		r := rand.New(rand.NewPCG(seed, 0x74657874)) // "text"
		w.WriteString("id\tlabel\ttags\ttext\n")
		for i := 0; i < n; i++ {
			w.WriteString(id(i) + "\t" + itemText(inst, r, i) + "\n")
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

// itemText is an item's label, tags and description cells (tab-separated):
// words named after its planted categories, one chance in five each of a
// word from a random category instead, so the words follow the hierarchy
// with noise. Tags are a ";"-separated list, as the items table reads them.
func itemText(in *planted.Instance, r *rand.Rand, i int) string {
	word := func(level, k int) string {
		c := in.Ancestor(i, level)
		if r.IntN(5) == 0 {
			c = r.IntN(pow(in.Branching, level))
		}
		return "w" + strconv.Itoa(level) + "c" + strconv.Itoa(c) + "k" + strconv.Itoa(k)
	}
	d := max(in.Depth, 1)
	label := word(d, r.IntN(3)) + " " + word(d, 3+r.IntN(3))
	var tags []string
	for level := 1; level <= d; level++ {
		tags = append(tags, "t"+word(level, 0))
	}
	var desc []string
	for k := 0; k < 8; k++ {
		desc = append(desc, word(1+r.IntN(d), r.IntN(6)))
	}
	return label + "\t" + strings.Join(tags, ";") + "\t" + strings.Join(desc, " ")
}

func pow(b, e int) int {
	p := 1
	for ; e > 0; e-- {
		p *= b
	}
	return p
}
