package review

import (
	"os"
	"runtime"
	"slices"
	"strconv"
	"testing"

	"github.com/ramify-tax/ramify/solve"
	"github.com/ramify-tax/ramify/solve/planted"
)

// TestCommitteeIgnoresGOMAXPROCS: the committee's trees depend on the seed
// alone, however many threads solve them.
func TestCommitteeIgnoresGOMAXPROCS(t *testing.T) {
	in := planted.Generate(6, 200, 3, 2)
	build := func(procs int) *Committee {
		defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(procs))
		c, err := BuildCommittee(in.Graph, nil, testOptions, 8, 77)
		if err != nil {
			t.Fatal(err)
		}
		return c
	}
	one, many := build(1), build(4)
	for b := range one.Trees {
		x, y := one.Trees[b], many.Trees[b]
		if x.Root != y.Root || !slices.EqualFunc(x.Kids, y.Kids, slices.Equal[[]int32]) {
			t.Fatalf("committee tree %d differs between GOMAXPROCS 1 and 4", b)
		}
	}
	// And different seeds give different committees.
	other, err := BuildCommittee(in.Graph, nil, testOptions, 8, 78)
	if err != nil {
		t.Fatal(err)
	}
	same := true
	for b := range one.Trees {
		same = same && slices.EqualFunc(one.Trees[b].Kids, other.Trees[b].Kids, slices.Equal[[]int32])
	}
	if same {
		t.Error("seeds 77 and 78 gave the same committee")
	}
}

func benchInstance(b *testing.B, n int) (*planted.Instance, *solve.Tree) {
	b.Helper()
	if n > 2000 && os.Getenv("RAMIFY_BIG") != "1" {
		b.Skip("set RAMIFY_BIG=1 for the large sizes")
	}
	in := planted.Generate(1, n, 3, 4)
	res, err := solve.Solve(in.Graph, nil, testOptions)
	if err != nil {
		b.Fatal(err)
	}
	return in, res.Taxonomy
}

// BenchmarkCommittee solves the default committee of 20 trees.
func BenchmarkCommittee(b *testing.B) {
	for _, n := range []int{2000, 10000} {
		b.Run(sizeName(n), func(b *testing.B) {
			in, _ := benchInstance(b, n)
			b.ResetTimer()
			for range b.N {
				if _, err := BuildCommittee(in.Graph, nil, testOptions, DefaultCommitteeSize, 1); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkAssessAndDraw measures what follows the committee: support and
// unsettledness of every category and item, then eight packets.
func BenchmarkAssessAndDraw(b *testing.B) {
	for _, n := range []int{2000, 10000} {
		b.Run(sizeName(n), func(b *testing.B) {
			in, tree := benchInstance(b, n)
			c, err := BuildCommittee(in.Graph, nil, testOptions, DefaultCommitteeSize, 1)
			if err != nil {
				b.Fatal(err)
			}
			b.ResetTimer()
			for range b.N {
				a := c.Assess(tree)
				Draw(tree, c, a, DrawOptions{Count: 8, Size: 8, AuditShare: 0.25, Seed: 1})
			}
		})
	}
}

func sizeName(n int) string {
	if n%1000 == 0 {
		return "n=" + strconv.Itoa(n/1000) + "k"
	}
	return "n=" + strconv.Itoa(n)
}
