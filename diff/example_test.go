package diff_test

import (
	"fmt"
	"os"

	"github.com/ramify-tax/ramify/diff"
	"github.com/ramify-tax/ramify/format"
)

func ExampleCompare() {
	parse := func(text string) *format.Category {
		o, err := format.ParseOutline("example.outline", []byte(text))
		if err != nil {
			panic(err)
		}
		return o.Root
	}
	old := parse("Hand tools/\n  claw-hammer\n  mallet-rubber\n  tape-measure-8m\n~ level/\n  laser-level\n  spirit-level-60\n")
	new := parse("Hand tools/\n  claw-hammer\n  mallet-rubber\nMeasuring/\n  laser-level\n  spirit-level-60\n  tape-measure-8m\n")
	r := diff.Compare(old, new)
	r.Text(os.Stdout, false)
	// Output:
	// 1 rename, 1 item moved
	// triplet agreement 0.4000 (exact) · recall 0.4444 · precision 0.4444 · RF 4 (normalised 1.0000) · cophenetic 0.3023 · 5 common items
	//
	// = renamed   ~ level
	//               to   Measuring
	//
	// > moved 1 item
	//     Hand tools  ->  Measuring
	//       tape-measure-8m
}

func ExampleMatchClusters() {
	old := [][]int32{{0, 1, 2, 3}, {4, 5}}
	new := [][]int32{{0, 1, 2}, {3, 4, 5}}
	for _, p := range diff.MatchClusters(old, new, 0.5) {
		fmt.Printf("old %d -> new %d (Jaccard %.2f)\n", p.Old, p.New, p.Jaccard)
	}
	// Output:
	// old 0 -> new 0 (Jaccard 0.75)
	// old 1 -> new 1 (Jaccard 0.67)
}
