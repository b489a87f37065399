package diff_test

import (
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
