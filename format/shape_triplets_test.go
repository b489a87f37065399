package format

import (
	"slices"
	"testing"
)

// TestShapeTriplets: a shape record's outline stands for the triplets it
// resolves. For ((a,b),c),d written as nested categories the
// resolved triplets are ab|c, ab|d, ac|d and bc|d — C(4,3) = 4 triples,
// each resolved; three items meeting in one category resolve nothing.
func TestShapeTriplets(t *testing.T) {
	o, err := ParseOutline("s.outline", []byte("X/\n  Y/\n    a\n    b\n  c\nd\n"))
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, tr := range ShapeTriplets(o.Root) {
		pair := []string{tr[0], tr[1]} // the pair is unordered
		slices.Sort(pair)
		got = append(got, pair[0]+pair[1]+"|"+tr[2])
	}
	slices.Sort(got)
	want := []string{"ab|c", "ab|d", "ac|d", "bc|d"}
	if !slices.Equal(got, want) {
		t.Errorf("triplets %v, want %v", got, want)
	}
	flat, err := ParseOutline("f.outline", []byte("X/\n  a\n  b\n  c\n"))
	if err != nil {
		t.Fatal(err)
	}
	if tr := ShapeTriplets(flat.Root); len(tr) != 0 {
		t.Errorf("a flat category resolves %v, want nothing", tr)
	}
}
