package regen

import (
	"bytes"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/internal/realdata"
)

// solveItems writes a repository whose items are the given TSV files and
// returns the outline solve writes.
func solveItems(t *testing.T, files map[string]string) []byte {
	t.Helper()
	dir := t.TempDir()
	var names []string
	for name, body := range files {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(body), 0o644); err != nil {
			t.Fatal(err)
		}
		names = append(names, `"`+name+`"`)
	}
	// Listing order of the files is part of what may vary.
	rand.Shuffle(len(names), func(i, j int) { names[i], names[j] = names[j], names[i] })
	settings := "[items]\nfiles = [" + strings.Join(names, ", ") + "]\n\n[[similarity.source]]\nkind = \"text\"\n"
	if err := os.WriteFile(filepath.Join(dir, repo.SettingsFile), []byte(settings), 0o644); err != nil {
		t.Fatal(err)
	}
	return regenerateDir(t, dir)
}

// regenerateDir loads the repository in dir and returns the outline a
// solve from scratch writes.
func regenerateDir(t *testing.T, dir string) []byte {
	t.Helper()
	p, ds := repo.Load(dir)
	if len(ds) > 0 {
		t.Fatal(ds)
	}
	sol, err := Regenerate(p, MethodConstrained, nil)
	if err != nil {
		t.Fatal(err)
	}
	return sol.Text
}

// Property: the outline depends on the items, not on the order of their
// lines nor on how they are split over files. On a real dev taxonomy
// (internal/realdata, WordNet 3.0 furniture), shuffled lines and a random
// split over two files give the same outline bytes as the file as shipped.
func TestOutlineIndependentOfItemOrder(t *testing.T) {
	set, err := realdata.Load("furniture")
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimRight(string(set.ItemsTSV), "\n"), "\n")
	header, rows := lines[0]+"\n", lines[1:]
	want := solveItems(t, map[string]string{"items.tsv": string(set.ItemsTSV)})
	rng := rand.New(rand.NewPCG(11, 12))
	for trial := range 4 {
		shuffled := append([]string(nil), rows...)
		rng.Shuffle(len(shuffled), func(i, j int) { shuffled[i], shuffled[j] = shuffled[j], shuffled[i] })
		var files map[string]string
		if trial%2 == 0 {
			files = map[string]string{"items.tsv": header + strings.Join(shuffled, "\n") + "\n"}
		} else {
			cut := 1 + rng.IntN(len(shuffled)-1)
			files = map[string]string{
				"a.tsv": header + strings.Join(shuffled[:cut], "\n") + "\n",
				"b.tsv": header + strings.Join(shuffled[cut:], "\n") + "\n",
			}
		}
		if got := solveItems(t, files); !bytes.Equal(got, want) {
			t.Errorf("trial %d (%d files): outline differs from the one of the file as shipped", trial, len(files))
		}
	}
}
