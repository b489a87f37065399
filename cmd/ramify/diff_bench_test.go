package main

import (
	"fmt"
	"io"
	"math/rand/v2"
	"os"
	"path/filepath"
	"testing"

	"github.com/ramify-tax/ramify/format"
)

// BenchmarkDiffCommand100k measures `ramify diff` end to end — reading and
// parsing two outline files, comparing them, rendering the report — on two
// generated 100,000-item taxonomies (about 5,500 categories, depth 4) that
// differ in about 1% of the items (640 moved, 340 removed, 170 added): the
// target is under 2 s on a 2-core machine.
func BenchmarkDiffCommand100k(b *testing.B) {
	dir := b.TempDir()
	rng := rand.New(rand.NewPCG(7, 100_000))
	old := benchTaxonomy(rng, 100_000, 4, 10)
	new := benchPerturb(rng, old, 0.01)
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
			args := append([]string{"diff", oldPath, newPath}, form...)
			for b.Loop() {
				if code := run(args, io.Discard, io.Discard); code != 0 {
					b.Fatalf("ramify %v: exit %d", args, code)
				}
			}
		})
	}
}

// benchTaxonomy builds a taxonomy of items items: depth levels of
// categories with about fanout children each, items in the lowest
// categories and one in ten higher up.
func benchTaxonomy(rng *rand.Rand, items, depth, fanout int) *format.Category {
	root := &format.Category{}
	var all, leaves []*format.Category
	var grow func(c *format.Category, level int, name string)
	grow = func(c *format.Category, level int, name string) {
		if level == depth {
			leaves = append(leaves, c)
			return
		}
		for i := range fanout/2 + rng.IntN(fanout+1) {
			ch := &format.Category{Name: fmt.Sprintf("%s-%d", name, i)}
			c.Children = append(c.Children, ch)
			all = append(all, ch)
			grow(ch, level+1, ch.Name)
		}
	}
	grow(root, 0, "c")
	for i := range items {
		at := leaves[rng.IntN(len(leaves))]
		if rng.IntN(10) == 0 {
			at = all[rng.IntN(len(all))]
		}
		at.Items = append(at.Items, fmt.Sprintf("item-%06d", i))
	}
	benchPrune(root)
	return root
}

// benchPerturb copies root with a share of its items changed: two in
// three of them moved to a random category, the rest removed, and a sixth
// as many new items added.
func benchPerturb(rng *rand.Rand, root *format.Category, share float64) *format.Category {
	out := root.Clone()
	var cats []*format.Category
	out.Walk(func(c *format.Category, _ int) bool {
		if c != out {
			cats = append(cats, c)
		}
		return true
	})
	changes := int(share * 100_000)
	for range changes {
		c := cats[rng.IntN(len(cats))]
		if len(c.Items) == 0 {
			continue
		}
		i := rng.IntN(len(c.Items))
		id := c.Items[i]
		c.Items = append(c.Items[:i], c.Items[i+1:]...)
		if rng.IntN(3) != 0 {
			dst := cats[rng.IntN(len(cats))]
			dst.Items = append(dst.Items, id)
		}
	}
	for i := range changes / 6 {
		dst := cats[rng.IntN(len(cats))]
		dst.Items = append(dst.Items, fmt.Sprintf("new-%06d", i))
	}
	benchPrune(out)
	return out
}

// benchPrune drops categories left without items or subcategories.
func benchPrune(c *format.Category) bool {
	kept := c.Children[:0]
	for _, ch := range c.Children {
		if benchPrune(ch) {
			kept = append(kept, ch)
		}
	}
	c.Children = kept
	c.ItemLines = nil
	return len(c.Children) > 0 || len(c.Items) > 0
}
