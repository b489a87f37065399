package main

import (
	"fmt"
	"io"
	"math/rand/v2"
	"os"
	"path/filepath"
	"testing"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/internal/taxgen"
)

// BenchmarkDiffCommand100k measures `ramify diff` end to end — reading and
// parsing two outline files, comparing them, rendering the report — on two
// generated 100,000-item taxonomies (about 6,100 categories, depth 4) that
// differ in about 1% of the items (679 moved, 321 removed, 166 added): the
// target is under 2 s on a 2-core machine.
func BenchmarkDiffCommand100k(b *testing.B) {
	dir := b.TempDir()
	rng := rand.New(rand.NewPCG(7, 100_000))
	old := taxgen.Taxonomy(rng, 100_000, 4, 10)
	new := taxgen.Perturb(rng, old, 0.01, 0)
	oldPath, newPath := filepath.Join(dir, "old.outline"), filepath.Join(dir, "new.outline")
	for path, root := range map[string]*format.Category{oldPath: old, newPath: new} {
		if err := os.WriteFile(path, format.FormatOutline(root), 0o644); err != nil {
			b.Fatal(err)
		}
	}
	for _, form := range [][]string{
		{"--format", "text"},
		{"--format", "markdown"},
		{"--json"},
		{"--format", "text", "--lines"},
	} {
		b.Run(fmt.Sprint(form), func(b *testing.B) {
			args := append([]string{"diff", "--dir", dir, oldPath, newPath}, form...)
			for b.Loop() {
				if code := run(args, io.Discard, io.Discard); code != 0 {
					b.Fatalf("ramify %v: exit %d", args, code)
				}
			}
		})
	}
}
