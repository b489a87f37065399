package committee

import (
	"os"
	"testing"

	"github.com/ramify-tax/ramify/format/repo"
)

// BenchmarkSolve solves the review committee of a solved repository, as
// `review draw` and `review status` do with the cache off. It runs only
// when RAMIFY_BENCH_REPO names such a repository, for example one made by
//
//	go run ./cmd/bench/genrepo -n 20000 -text -out r20k
//	ramify solve --dir r20k
//	RAMIFY_BENCH_REPO=$PWD/r20k go test -run - -bench Solve -benchtime 1x ./review/committee
func BenchmarkSolve(b *testing.B) {
	dir := os.Getenv("RAMIFY_BENCH_REPO")
	if dir == "" {
		b.Skip("set RAMIFY_BENCH_REPO to a solved repository")
	}
	b.Setenv("RAMIFY_CACHE", "off")
	p, ds := repo.Load(dir)
	if p == nil || len(ds) > 0 {
		b.Fatalf("loading %s: %v", dir, ds)
	}
	if p.Outline == nil {
		b.Fatalf("%s has no taxonomy; run ramify solve there first", dir)
	}
	b.ResetTimer()
	for range b.N {
		c, _, err := Solve(p, "bench", nil)
		if err != nil {
			b.Fatal(err)
		}
		if c.Size() < 2 {
			b.Fatalf("committee of %d trees", c.Size())
		}
	}
	b.ReportMetric(float64(len(p.ItemIDs())), "items")
}
