package format

import (
	"bytes"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// Benchmarks measure the codecs at the sizes the project aims for (up to
// 100,000 items, see README "Capacity and limits");
// run with go test -bench . -benchmem ./format.

func benchOutline(n int) []byte {
	rng := rand.New(rand.NewPCG(7, 8))
	return FormatOutline(randomTree(rng, n, 6))
}

func BenchmarkParseOutline100k(b *testing.B) {
	data := benchOutline(100_000)
	b.SetBytes(int64(len(data)))
	for b.Loop() {
		if _, err := ParseOutline("b.outline", data); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkFormatOutline100k(b *testing.B) {
	o, err := ParseOutline("b.outline", benchOutline(100_000))
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		FormatOutline(o.Root)
	}
}

func BenchmarkParseItemsTSV100k(b *testing.B) {
	var sb strings.Builder
	sb.WriteString("id\tlabel\ttags\ttext\n")
	for i := range 100_000 {
		fmt.Fprintf(&sb, "item-%d\tItem %d\tpower;wood;t%d\tA tool that does task %d well.\n", i, i, i%50, i%300)
	}
	data := []byte(sb.String())
	b.SetBytes(int64(len(data)))
	for b.Loop() {
		if _, err := ParseItemsTable("b.tsv", data, '\t'); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkParseItemsTOML10k(b *testing.B) {
	var sb strings.Builder
	for i := range 10_000 {
		fmt.Fprintf(&sb, "[[item]]\nid = \"item-%d\"\nlabel = \"Item %d\"\ntags = [\"power\", \"t%d\"]\ntext = \"Task %d.\"\n\n", i, i, i%50, i%300)
	}
	data := []byte(sb.String())
	b.SetBytes(int64(len(data)))
	for b.Loop() {
		if _, err := ParseItemsTOML("b.toml", data); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkParseVectors100kx16(b *testing.B) {
	var sb strings.Builder
	sb.WriteString("id")
	for j := range 16 {
		fmt.Fprintf(&sb, "\tf%d", j)
	}
	sb.WriteByte('\n')
	rng := rand.New(rand.NewPCG(9, 10))
	for i := range 100_000 {
		fmt.Fprintf(&sb, "item-%d", i)
		for range 16 {
			fmt.Fprintf(&sb, "\t%.5f", rng.NormFloat64())
		}
		sb.WriteByte('\n')
	}
	data := []byte(sb.String())
	b.SetBytes(int64(len(data)))
	for b.Loop() {
		if _, err := ParseVectors("b.tsv", data); err != nil {
			b.Fatal(err)
		}
	}
}

func benchLinks() []byte {
	var sb strings.Builder
	sb.WriteString(LinksHeader + "\n")
	for i := range 1_000_000 {
		fmt.Fprintf(&sb, "item-%d\titem-%d\t%.3f\n", i%100_000, (i*7+1)%100_000, 0.5+float64(i%100)/200)
	}
	return []byte(sb.String())
}

func BenchmarkParseLinks1M(b *testing.B) {
	data := benchLinks()
	b.SetBytes(int64(len(data)))
	for b.Loop() {
		if _, err := ParseLinks("b.tsv", data); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkParseLinkTable1M reads the same links into columns as a
// repository does, told how many items there are.
func BenchmarkParseLinkTable1M(b *testing.B) {
	data := benchLinks()
	b.SetBytes(int64(len(data)))
	for b.Loop() {
		if _, err := ParseLinkTableWithin("b.tsv", data, fileLinks, 100_000); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkParseConstraints10k(b *testing.B) {
	rng := rand.New(rand.NewPCG(11, 12))
	cf := &ConstraintFile{}
	for len(cf.Triplets)+len(cf.Groups)+len(cf.Shapes) < 10_000 {
		r := randomConstraints(rng)
		cf.Triplets = append(cf.Triplets, r.Triplets...)
		cf.Groups = append(cf.Groups, r.Groups...)
		cf.Shapes = append(cf.Shapes, r.Shapes...)
	}
	data := FormatConstraints(cf)
	b.SetBytes(int64(len(data)))
	for b.Loop() {
		if _, err := ParseConstraints("b.toml", data); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkParseLinkTableMillionIDs reads three million links over a
// million ids, the second column at random, as a large repository's links
// are: the id table outgrows the processor's caches.
func BenchmarkParseLinkTableMillionIDs(b *testing.B) {
	rng := rand.New(rand.NewPCG(1, 1))
	var sb strings.Builder
	sb.WriteString(LinksHeader + "\n")
	for i := range 3_000_000 {
		a, c := i/3, rng.IntN(1_000_000)
		if a == c {
			c = (c + 1) % 1_000_000
		}
		fmt.Fprintf(&sb, "item-%d\titem-%d\t1.5\n", a, c)
	}
	data := []byte(sb.String())
	b.SetBytes(int64(len(data)))
	for b.Loop() {
		if _, err := ParseLinkTableWithin("b.tsv", data, fileLinks, 1_000_000); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkReadFileLimited64M reads a 64 MB file whole, as Load reads a
// large links file.
func BenchmarkReadFileLimited64M(b *testing.B) {
	path := filepath.Join(b.TempDir(), "links.tsv")
	if err := os.WriteFile(path, bytes.Repeat([]byte("item-1\titem-2\t0.5\n"), 64<<20/18), 0o644); err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		if _, err := ReadFileLimited(path, "links.tsv", MaxDataFileBytes); err != nil {
			b.Fatal(err)
		}
	}
}
