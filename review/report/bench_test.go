package report

import (
	"bytes"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"testing"
	"time"

	"github.com/chromedp/chromedp"
	"github.com/ramify-tax/ramify/diff"
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/binding"
	"github.com/ramify-tax/ramify/internal/browsertest"
	"github.com/ramify-tax/ramify/review"
)

// syntheticInput is a report input of n items, invented for timing: a
// tree of three levels of twelve categories (1,728 shelves), items with a
// label, three tags of 300 and a one-line description, 500 triplet
// records, support on every category and 1% of the items moved.
func syntheticInput(n int) Input {
	rng := rand.New(rand.NewPCG(1, 2))
	root := &format.Category{}
	var shelves []*format.Category
	for a := 0; a < 12; a++ {
		ca := &format.Category{Name: fmt.Sprintf("Aisle %02d", a)}
		for b := 0; b < 12; b++ {
			cb := &format.Category{Name: fmt.Sprintf("Bay %02d-%02d", a, b), Provisional: b%5 == 0}
			for c := 0; c < 12; c++ {
				cc := &format.Category{Name: fmt.Sprintf("Shelf %02d-%02d-%02d", a, b, c)}
				cb.Children = append(cb.Children, cc)
				shelves = append(shelves, cc)
			}
			ca.Children = append(ca.Children, cb)
		}
		root.Children = append(root.Children, ca)
	}
	items := make([]format.Item, n)
	index := make(map[string]int, n)
	for i := range items {
		id := fmt.Sprintf("tool-%06d", i)
		items[i] = format.Item{
			ID:    id,
			Label: fmt.Sprintf("Tool number %d, size %d", i, rng.IntN(40)),
			Tags:  []string{fmt.Sprintf("tag%03d", rng.IntN(300)), fmt.Sprintf("tag%03d", rng.IntN(300)), fmt.Sprintf("tag%03d", rng.IntN(300))},
			Text:  fmt.Sprintf("a borrowed tool for job %d, kept on shelf %d and lent for a week", rng.IntN(1000), i%len(shelves)),
		}
		index[id] = i
		s := shelves[i%len(shelves)]
		s.Items = append(s.Items, id)
	}
	var cf format.ConstraintFile
	cf.File = "constraints/bench.toml"
	for r := 0; r < 500; r++ {
		a, b, c := rng.IntN(n), rng.IntN(n), rng.IntN(n)
		cf.Triplets = append(cf.Triplets, format.Triplet{
			Pair: [2]string{items[a].ID, items[b].ID}, Out: items[c].ID,
			Pos:        format.Pos{File: cf.File, Line: 1 + 6*r, Col: 1},
			Provenance: format.Provenance{By: "bench", Date: "2026-12-01", Note: "invented for timing"},
		})
	}
	support := map[*format.Category]float64{}
	root.Walk(func(c *format.Category, depth int) bool {
		if depth > 0 {
			support[c] = rng.Float64()
		}
		return true
	})
	changes := &diff.Report{}
	for i := 0; i < n/100; i++ {
		changes.Moved = append(changes.Moved, diff.Move{Item: items[i*100].ID, From: diff.Path{"Aisle 00", "Bay 00-00"}, To: nil})
	}
	return Input{
		Title: "bench", Root: root, Structure: format.StructureHash(root), Items: items, Index: index,
		Records: binding.New([]*format.ConstraintFile{&cf}), Changes: changes, Base: "v1:taxonomy.outline",
		Support: support, Trees: 20, Audits: &review.AuditSummary{Audits: 12, Rejected: 1, Rate: 1.0 / 12, Hi: 0.38},
		Gate: Gate{MinAudits: 20, MaxRejectRate: 0.1},
	}
}

// BenchmarkWrite100k builds and writes the report of 100,000 items: the
// time is what `ramify report` spends after loading (without --support's
// committee), and MB the size of the page.
func BenchmarkWrite100k(b *testing.B) {
	in := syntheticInput(100_000)
	var size int
	for b.Loop() {
		var buf bytes.Buffer
		if err := Build(in).WriteHTML(&buf); err != nil {
			b.Fatal(err)
		}
		size = buf.Len()
	}
	b.ReportMetric(float64(size)/(1<<20), "MB")
}

// BenchmarkBrowserTopLevel100k opens the page of 100,000 items in chromium
// and measures the page's own clock from the start of navigation until
// the top level is built (performance.now() when the script is done), and
// until the items are parsed, so that opening any category is immediate.
func BenchmarkBrowserTopLevel100k(b *testing.B) {
	ctx := browsertest.Start(b, 10*time.Minute)
	path := filepath.Join(b.TempDir(), "report.html")
	var buf bytes.Buffer
	if err := Build(syntheticInput(100_000)).WriteHTML(&buf); err != nil {
		b.Fatal(err)
	}
	if err := os.WriteFile(path, buf.Bytes(), 0o644); err != nil {
		b.Fatal(err)
	}
	top, all := 0.0, 0.0
	for b.Loop() {
		if err := chromedp.Do(ctx, chromedp.Navigate("file://"+path), chromedp.WaitVisible(chromedp.CSS(`body[data-items="true"]`))); err != nil {
			b.Fatal(err)
		}
		ms, err := chromedp.Run(ctx, chromedp.Evaluate[[]float64](`[window.ramifyReport.readyAt, window.ramifyReport.itemsAt]`))
		if err != nil {
			b.Fatal(err)
		}
		top += ms[0]
		all += ms[1]
	}
	b.ReportMetric(top/float64(b.N), "ms-to-top-level")
	b.ReportMetric(all/float64(b.N), "ms-to-items")
}
