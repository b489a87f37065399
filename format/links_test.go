package format

import (
	"bytes"
	"fmt"
	"math/rand/v2"
	"runtime"
	"testing"

	"github.com/google/go-cmp/cmp"
)

func TestParseLinks(t *testing.T) {
	got, err := ParseLinks("l.tsv", []byte("a\tb\tweight\r\nx\ty\t0.5\r\n\r\ny\tx\t2\r\nx\tz\t1e-3\r\n"))
	if err != nil {
		t.Fatal(err)
	}
	want := []Link{
		{A: "x", B: "y", Weight: 0.5, Pos: Pos{"l.tsv", 2, 1}},
		{A: "y", B: "x", Weight: 2, Pos: Pos{"l.tsv", 4, 1}},
		{A: "x", B: "z", Weight: float64(float32(0.001)), Pos: Pos{"l.tsv", 5, 1}}, // weights are kept in single precision
	}
	if diff := cmp.Diff(want, got); diff != "" {
		t.Errorf("(-want +got):\n%s", diff)
	}
	empty, err := ParseLinks("l.tsv", []byte("a\tb\tweight\n"))
	if err != nil || empty == nil || len(empty) != 0 {
		t.Errorf("header only: %v, %v; want an empty list", empty, err)
	}
}

func TestParseLinksErrors(t *testing.T) {
	tests := []struct {
		name string
		in   string
		want []string
	}{
		{"wrong header", "a\tb\tw\n", []string{
			`l.tsv:1:1: the header must be a, b and weight separated by tabs ("a\tb\tweight"), not "a\tb\tw"`,
		}},
		{"header with spaces instead of tabs", "a  b  weight\n", []string{
			`l.tsv:1:1: the header must be a, b and weight separated by tabs ("a\tb\tweight"), not "a  b  weight"`,
		}},
		{"bad rows", "a\tb\tweight\nx\tx\t1\nx\ty\t-1\nx\ty\t0\nx\ty\tNaN\nx\ty\nbad id\ty\t1\nx\ty\t+Inf\nx\ty\tabc\n", []string{
			`l.tsv:2:3: item "x" is linked to itself`,
			`l.tsv:3:5: weight "-1" must be greater than 0`,
			`l.tsv:4:5: weight "0" must be greater than 0`,
			`l.tsv:5:5: weight: "NaN" is not a finite number`,
			"l.tsv:6:1: row has 2 cells; a link row has 3: a, b and weight",
			`l.tsv:7:1: "bad id" is not a valid item id: ` + ItemIDRule,
			`l.tsv:8:5: weight: "+Inf" is not a finite number`,
			`l.tsv:9:5: weight: "abc" is not a number`,
		}},
		{"ragged long row", "a\tb\tweight\nx\ty\t1\textra\n", []string{
			"l.tsv:2:7: row has 4 cells; a link row has 3: a, b and weight",
		}},
		{"empty file", "", []string{`l.tsv:1:1: the file is empty; it needs the header "a\tb\tweight"`}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := ParseLinks("l.tsv", []byte(tt.in))
			checkErrors(t, err, tt.want)
		})
	}
}

// Weights are kept in single precision: one past its range is refused
// at its cell rather than turned into infinity or 0.
func TestParseLinksSinglePrecision(t *testing.T) {
	for _, w := range []string{"1e39", "1e-46"} {
		_, err := ParseLinks("l.tsv", []byte("a\tb\tweight\nx\ty\t"+w+"\n"))
		ds, _ := err.(Diags)
		if len(ds) != 1 || ds[0].Line != 2 || ds[0].Col != 5 {
			t.Errorf("weight %s: %v; want one problem at l.tsv:2:5", w, err)
		}
	}
	got, err := ParseLinks("l.tsv", []byte("a\tb\tweight\nx\ty\t3e38\n"))
	if err != nil || got[0].Weight != float64(float32(3e38)) {
		t.Errorf("weight 3e38: %v, %v", got, err)
	}
}

func TestIDTableNumbersInOrderOfFirstAppearance(t *testing.T) {
	for _, room := range []int{0, 5, 100_000} {
		var ids []string
		table := newIDTable(room, &ids)
		want := map[string]int32{}
		for i := range 5000 {
			id := fmt.Sprintf("n%d", (i*37)%1500)
			if i%3 == 0 {
				id += "-a-name-longer-than-a-slot-keeps" // kept by number, not inline
			}
			col := i % 2
			got := table.lookup(col, id)
			if w, seen := want[id]; seen != (got >= 0) || seen && got != w {
				t.Fatalf("room %d, row %d: lookup(%q) = %d, want %d (seen %v)", room, i, id, got, w, seen)
			}
			if got < 0 {
				want[id] = int32(len(want))
				if k := table.add(col, id); k != want[id] {
					t.Fatalf("room %d: add(%q) = %d, want %d", room, id, k, want[id])
				}
			}
		}
		if len(ids) != len(want) {
			t.Fatalf("room %d: %d ids numbered, want %d", room, len(ids), len(want))
		}
		for id, k := range want {
			if ids[k] != id {
				t.Errorf("room %d: id %d is %q, want %q", room, k, ids[k], id)
			}
		}
	}
}

// randomLinkText is a links file of rows over ids drawn from a few hundred,
// some long enough to be kept by number, with blank lines between some.
func randomLinkText(rng *rand.Rand, rows int) []byte {
	var b bytes.Buffer
	b.WriteString(LinksHeader + "\n")
	id := func() string {
		k := rng.IntN(400)
		if k%7 == 0 {
			return fmt.Sprintf("item-with-a-long-name-%d", k)
		}
		return fmt.Sprintf("i%d", k)
	}
	for range rows {
		a, c := id(), id()
		for c == a {
			c = id()
		}
		fmt.Fprintf(&b, "%s\t%s\t%.3g\n", a, c, 0.01+rng.Float64())
		if rng.IntN(10) == 0 {
			b.WriteString("\n")
		}
	}
	return b.Bytes()
}

// Read in pieces, a links file gives the table read from the top: the
// same ids in the same order, the same columns and lines.
func TestLinkPiecesMatchReadingFromTheTop(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 9))
	for _, rows := range []int{1, 2, 5, 300, 5000} {
		text := randomLinkText(rng, rows)
		want, err := parseLinkText("l.tsv", text, Budget{Left: 1 << 30}, 0)
		if err != nil {
			t.Fatal(err)
		}
		for n := 2; n <= 6; n++ {
			got := parseLinkPieces("l.tsv", text, Budget{Left: 1 << 30}, 400, n)
			if got == nil {
				t.Fatalf("%d rows in %d pieces: no table", rows, n)
			}
			if diff := cmp.Diff(want, got); diff != "" {
				t.Errorf("%d rows in %d pieces (-top +pieces):\n%s", rows, n, diff)
			}
		}
	}
}

// A problem in any piece, or more links than the budget, sends the reader
// back to the top, so the problems are those of one read in file order.
func TestLinkPiecesLeaveProblemsToTheTopRead(t *testing.T) {
	defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(4))
	rng := rand.New(rand.NewPCG(3, 4))
	text := randomLinkText(rng, 150_000) // several pieces of linkPieceBytes
	lines := bytes.Split(text, []byte{'\n'})
	late := len(lines) * 9 / 10
	lines[late] = []byte("i1\ti1\t1")
	broken := bytes.Join(lines, []byte{'\n'})
	_, err := ParseLinkTableWithin("l.tsv", broken, Budget{Left: 1 << 30}, 0)
	want := []string{fmt.Sprintf(`l.tsv:%d:4: item "i1" is linked to itself`, late+1)}
	checkErrors(t, err, want)

	full, err := parseLinkText("l.tsv", text, Budget{Left: 1 << 30}, 0)
	if err != nil {
		t.Fatal(err)
	}
	if parseLinkPieces("l.tsv", text, Budget{Left: full.Len() - 1}, 0, 4) != nil {
		t.Errorf("pieces over the budget gave a table")
	}
	_, err = ParseLinkTableWithin("l.tsv", text, Budget{Left: full.Len() - 1, Over: "too many links"}, 0)
	checkErrors(t, err, []string{fmt.Sprintf("l.tsv:%d:1: too many links", full.Line[full.Len()-1])})
	got, err := ParseLinkTableWithin("l.tsv", text, Budget{Left: full.Len()}, 0)
	if err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff(full, got); diff != "" {
		t.Errorf("(-top +pieces):\n%s", diff)
	}
}
