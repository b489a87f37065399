// Command vectorload measures what embeddings cost to bring in: it writes
// a repository of n items with generated float32 embeddings of dim
// dimensions as a Parquet table (items around n/1000 random centres), then
// in a child process per stage loads it (repo.Load) and, with -graph,
// also builds the similarity graph, and prints a table of the seconds and
// the peak resident memory of each child:
//
//	go run ./cmd/bench/vectorload -n 1000000 -dim 384 -dir big-vectors
//	go run ./cmd/bench/vectorload -n 1000000 -dim 384 -dir big-vectors -graph
//
// An existing -dir with a ramify.toml is reused as it is.
package main

import (
	"bufio"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"syscall"
	"time"

	"github.com/parquet-go/parquet-go"

	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/solve/regen"
)

type row struct {
	ID        string    `parquet:"id"`
	Embedding []float32 `parquet:"embedding,list"`
}

type result struct {
	Stage   string
	Seconds float64
	PeakKB  int64
	Edges   int64
}

func main() {
	n := flag.Int("n", 100000, "number of items")
	dim := flag.Int("dim", 384, "embedding dimensions")
	dir := flag.String("dir", "", "repository folder (written unless it has a ramify.toml)")
	withGraph := flag.Bool("graph", false, "also build the similarity graph")
	stage := flag.String("stage", "", "run one stage and print its result (used by the parent)")
	flag.Parse()
	if *dir == "" {
		fail(errors.New("-dir is required"))
	}
	if *stage != "" {
		runStage(*dir, *stage)
		return
	}
	if _, err := os.Stat(filepath.Join(*dir, repo.SettingsFile)); err != nil {
		if err := write(*dir, *n, *dim); err != nil {
			fail(err)
		}
	}
	info, err := os.Stat(filepath.Join(*dir, "embeddings.parquet"))
	if err != nil {
		fail(err)
	}
	stages := []string{"load"}
	if *withGraph {
		stages = append(stages, "graph")
	}
	fmt.Println("| items | dimensions | file MB | stage | seconds | peak RSS MiB | edges |")
	fmt.Println("|---:|---:|---:|---|---:|---:|---:|")
	self, err := os.Executable()
	if err != nil {
		fail(err)
	}
	for _, s := range stages {
		out, err := exec.Command(self, "-dir", *dir, "-stage", s).Output()
		if err != nil {
			fail(fmt.Errorf("stage %s: %w", s, err))
		}
		var r result
		if err := json.Unmarshal(out, &r); err != nil {
			fail(err)
		}
		fmt.Printf("| %d | %d | %.0f | %s | %.1f | %.0f | %d |\n", *n, *dim, float64(info.Size())/1e6, r.Stage, r.Seconds, float64(r.PeakKB)/1024, r.Edges)
	}
}

func fail(err error) {
	fmt.Fprintln(os.Stderr, "vectorload:", err)
	os.Exit(1)
}

// runStage loads the repository (and builds its graph for "graph") and
// prints the time and this process's peak memory as JSON.
func runStage(dir, stage string) {
	start := time.Now()
	p, ds := repo.Load(dir)
	if len(ds) > 0 {
		fail(ds)
	}
	r := result{Stage: stage}
	if stage == "graph" {
		g, err := regen.Graph(p, regen.Seed)
		if err != nil {
			fail(err)
		}
		r.Edges = int64(len(g.Targets) / 2)
	}
	r.Seconds = time.Since(start).Seconds()
	var ru syscall.Rusage
	syscall.Getrusage(syscall.RUSAGE_SELF, &ru)
	r.PeakKB = ru.Maxrss
	b, err := json.Marshal(r)
	if err != nil {
		fail(err)
	}
	os.Stdout.Write(b)
}

// write creates the repository: items.tsv, embeddings.parquet (row groups
// of 65,536 rows, so the writer never holds the whole table) and a
// ramify.toml whose only source is the vectors.
func write(dir string, n, dim int) error {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	settings := "[items]\nfiles = [\"items.tsv\"]\nvectors = \"embeddings.parquet\"\n\n[[similarity.source]]\nkind = \"vector\"\nweight = 1.0\n"
	if err := os.WriteFile(filepath.Join(dir, repo.SettingsFile), []byte(settings), 0o644); err != nil {
		return err
	}
	id := func(i int) string { return "item-" + strconv.Itoa(i) }
	f, err := os.Create(filepath.Join(dir, "items.tsv"))
	if err != nil {
		return err
	}
	w := bufio.NewWriter(f)
	w.WriteString("id\n")
	for i := range n {
		w.WriteString(id(i) + "\n")
	}
	if err := w.Flush(); err != nil {
		return err
	}
	if err := f.Close(); err != nil {
		return err
	}
	rng := rand.New(rand.NewPCG(1, uint64(n)))
	centres := make([][]float32, max(1, n/1000))
	for c := range centres {
		centres[c] = make([]float32, dim)
		for j := range centres[c] {
			centres[c][j] = float32(rng.NormFloat64())
		}
	}
	pf, err := os.Create(filepath.Join(dir, "embeddings.parquet"))
	if err != nil {
		return err
	}
	const group = 1 << 16
	pw := parquet.NewGenericWriter[row](pf, parquet.MaxRowsPerRowGroup(group))
	batch := make([]row, 0, 4096)
	flat := make([]float32, 4096*dim)
	for i := 0; i < n; i++ {
		c := centres[rng.IntN(len(centres))]
		v := flat[len(batch)*dim : (len(batch)+1)*dim]
		for j := range v {
			v[j] = c[j] + float32(0.3*rng.NormFloat64())
		}
		batch = append(batch, row{ID: id(i), Embedding: v})
		if len(batch) == cap(batch) || i == n-1 {
			if _, err := pw.Write(batch); err != nil {
				return err
			}
			batch = batch[:0]
		}
	}
	if err := pw.Close(); err != nil {
		return err
	}
	return pf.Close()
}
