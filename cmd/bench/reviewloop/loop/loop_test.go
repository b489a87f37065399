package loop

import (
	"math"
	"testing"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/solve"
)

// TestAUC checks the rank statistic on cases worked by hand: perfect and
// reversed separation, all ties, and one of four positive–negative pairs
// out of order (Hanley & McNeil 1982: AUC = U / (n₊ n₋)), and NaN scores.
func TestAUC(t *testing.T) {
	for _, c := range []struct {
		score []float64
		pos   []bool
		want  float64
	}{
		{[]float64{0.9, 0.8, 0.1, 0.2}, []bool{true, true, false, false}, 1},
		{[]float64{0.1, 0.2, 0.9, 0.8}, []bool{true, true, false, false}, 0},
		{[]float64{1, 1, 1, 1}, []bool{true, false, true, false}, 0.5},
		{[]float64{0.9, 0.3, 0.5, 0.1}, []bool{true, true, false, false}, 0.75},
		{[]float64{0.5, 0.5, 0.1}, []bool{true, false, false}, 0.75},
		{[]float64{0.3, 0.2}, []bool{true, true}, 0.5},
		// NaN ranks lowest: the positive at 0.5 beats both negatives.
		{[]float64{math.NaN(), 0.5, math.NaN()}, []bool{false, true, false}, 1},
		{[]float64{math.NaN(), math.NaN(), 0.1}, []bool{true, false, false}, 0.25},
	} {
		if got := AUC(c.score, c.pos); math.Abs(got-c.want) > 1e-12 {
			t.Errorf("AUC(%v, %v) = %v, want %v", c.score, c.pos, got, c.want)
		}
	}
}

// TestCompareTriples checks the triple counts on four leaves: the
// reference ((0 1) (2 3)) resolves all four triples; the star resolves
// none, and ((0 2) (1 3)) gets every triple wrong, so moving from the star
// to the reference repairs four and the other way breaks four.
func TestCompareTriples(t *testing.T) {
	ref := solve.NewTree(4)
	ref.Root = ref.Add(ref.Add(0, 1), ref.Add(2, 3))
	star := solve.NewTree(4)
	star.Root = star.Add(0, 1, 2, 3)
	crossed := solve.NewTree(4)
	crossed.Root = crossed.Add(crossed.Add(0, 2), crossed.Add(1, 3))
	if rc := compareTriples(ref, star, ref); rc.resolved != 4 || rc.repaired != 4 || rc.broken != 0 || rc.wrong != 0 {
		t.Errorf("star to reference: %+v", rc)
	}
	if rc := compareTriples(ref, ref, crossed); rc.repaired != 0 || rc.broken != 4 || rc.wrong != 4 {
		t.Errorf("reference to crossed: %+v", rc)
	}
	if rc := compareTriples(ref, crossed, crossed); rc.wrongWith[0] != 3 || rc.triplesWith[0] != 3 {
		t.Errorf("crossed: leaf 0 is in 3 wrong triples of 3, got %d of %d", rc.wrongWith[0], rc.triplesWith[0])
	}
}

// TestResolvedTriples counts by hand: ((a b) (c d)) resolves all four
// triples, ((a b) c d) the two that hold a and b, the star none.
func TestResolvedTriples(t *testing.T) {
	for _, c := range []struct {
		outline string
		want    int
	}{
		{"A/\n  a\n  b\nB/\n  c\n  d\n", 4},
		{"A/\n  a\n  b\nc\nd\n", 2},
		{"a\nb\nc\nd\n", 0},
		{"A/\n  a\n  B/\n    b\n    c\nd\ne\n", 3 + 3 + 1},
	} {
		o, err := format.ParseOutline("t", []byte("# ramify outline 1\n"+c.outline))
		if err != nil {
			t.Fatal(err)
		}
		if got := resolvedTriples(o.Root); got != c.want {
			t.Errorf("resolvedTriples(%q) = %d, want %d", c.outline, got, c.want)
		}
	}
}

// TestPacketTriplesWrong counts by hand the triples an answer resolves
// that the packet as drawn arranges otherwise: against ((a b) (c d)),
// ((a c) (b d)) gets all four wrong; ((a b) c d) resolves abc and abd as
// the answer does and leaves acd and bcd unresolved, so two are wrong; the
// answer itself has none wrong.
func TestPacketTriplesWrong(t *testing.T) {
	parse := func(s string) *format.Category {
		o, err := format.ParseOutline("t", []byte("# ramify outline 1\n"+s))
		if err != nil {
			t.Fatal(err)
		}
		return o.Root
	}
	want := parse("A/\n  a\n  b\nB/\n  c\n  d\n")
	for _, c := range []struct {
		shown      string
		wrongCount int
	}{
		{"A/\n  a\n  c\nB/\n  b\n  d\n", 4},
		{"A/\n  a\n  b\nc\nd\n", 2},
		{"A/\n  a\n  b\nB/\n  c\n  d\n", 0},
	} {
		resolved, wrong := packetTriples(want, parse(c.shown))
		if resolved != 4 || wrong != c.wrongCount {
			t.Errorf("packetTriples(answer, %q) = %d resolved, %d wrong; want 4, %d", c.shown, resolved, wrong, c.wrongCount)
		}
	}
}
