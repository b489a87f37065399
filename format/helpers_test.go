package format

import (
	"fmt"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
)

// ignoreLines compares trees by content, not by where they were read.
var ignoreLines = cmp.Options{
	cmpopts.IgnoreFields(Category{}, "Line", "ItemLines"),
	cmpopts.EquateEmpty(),
}

// treeDiff compares two trees by content (names, markers, nesting,
// items), not by where they were read. go-cmp re-compares nested slices at
// every level, which is exponential in the depth of a tree, so the trees
// are flattened into one line per category first.
func treeDiff(want, got *Category) string {
	return cmp.Diff(flatten(want), flatten(got))
}

func flatten(c *Category) []string {
	if c == nil {
		return nil
	}
	var out []string
	c.Walk(func(n *Category, depth int) bool {
		out = append(out, fmt.Sprintf("%d %t %q %q %d %s", depth, n.Provisional, n.Name, n.Items, len(n.Children), n.ID))
		return true
	})
	return out
}

// errLines splits a parser error into its "file:line:col: message" lines.
func errLines(err error) []string {
	if err == nil {
		return nil
	}
	return strings.Split(err.Error(), "\n")
}

// checkErrors asserts that err lists exactly want, in order.
func checkErrors(t *testing.T, err error, want []string) {
	t.Helper()
	if _, ok := err.(Diags); err != nil && !ok {
		t.Errorf("error is %T, want Diags", err)
	}
	if diff := cmp.Diff(want, errLines(err)); diff != "" {
		t.Errorf("errors (-want +got):\n%s", diff)
	}
}

// nameRunes are the characters random category names are made of: enough
// of the awkward ones (slash, quotes, backslash, tilde, hash, non-ASCII)
// to exercise the printer's edge cases.
var nameRunes = []rune("abcXYZ019 /\"'\\~#&·äß漢-_.:")

func randomName(rng *rand.Rand) string {
	for {
		n := 1 + rng.IntN(12)
		var b strings.Builder
		for range n {
			b.WriteRune(nameRunes[rng.IntN(len(nameRunes))])
		}
		name := b.String()
		if CheckCategoryName(name) == "" && !strings.HasSuffix(name, " ") {
			return name
		}
	}
}

var idRunes = []byte("abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ0123456789._:-")

func randomID(rng *rand.Rand, i int) string {
	n := 1 + rng.IntN(10)
	b := []byte{idRunes[rng.IntN(62)]}
	for range n {
		b = append(b, idRunes[rng.IntN(len(idRunes))])
	}
	return fmt.Sprintf("%s%d", b, i) // the suffix keeps ids unique
}

// randomTree builds a valid tree over n items, at most maxDepth category
// levels deep: every category non-empty, sibling names unique.
func randomTree(rng *rand.Rand, n, maxDepth int) *Category {
	ids := make([]string, n)
	for i := range ids {
		ids[i] = randomID(rng, i)
	}
	root := &Category{}
	fillCategory(rng, root, ids, 0, maxDepth)
	return root
}

func fillCategory(rng *rand.Rand, c *Category, ids []string, depth, maxDepth int) {
	if depth == maxDepth || len(ids) <= 1 || rng.IntN(6) == 0 {
		c.Items = append(c.Items, ids...)
		return
	}
	direct := rng.IntN(min(len(ids), 4))
	c.Items = append(c.Items, ids[:direct]...)
	rest := ids[direct:]
	k := 1 + rng.IntN(min(len(rest), 5))
	used := map[string]bool{}
	for i := range k {
		lo, hi := i*len(rest)/k, (i+1)*len(rest)/k
		if lo == hi {
			continue
		}
		name := randomName(rng)
		for used[name] {
			name = randomName(rng)
		}
		used[name] = true
		child := &Category{Name: name, Provisional: rng.IntN(4) == 0}
		fillCategory(rng, child, rest[lo:hi], depth+1, maxDepth)
		c.Children = append(c.Children, child)
	}
}

// Problems past MaxProblemsPerFile in one file are counted, not kept; a
// count sorts after its file's problems; Capped keeps MaxProblems.
func TestDiagsAreCapped(t *testing.T) {
	var ds Diags
	for i := 1; i <= 250; i++ {
		ds.Add(Pos{File: "b.outline", Line: i, Col: 1}, "bad %d", i)
	}
	if len(ds) != MaxProblemsPerFile+1 || ds.Count() != 250 || !ds.Full() {
		t.Fatalf("after 250 problems: %d kept, Count %d, Full %v; want %d, 250, true", len(ds), ds.Count(), ds.Full(), MaxProblemsPerFile+1)
	}
	if got := ds[len(ds)-1].String(); got != "b.outline: and 150 more problems in this file" {
		t.Errorf("count line %q", got)
	}
	ds.Add(Pos{File: "a.toml", Line: 3, Col: 1}, "other file")
	ds.Sort()
	if ds[0].File != "a.toml" || ds[len(ds)-1].More != 150 {
		t.Errorf("sorted: first %v, last %v; want a.toml first and the count last", ds[0], ds[len(ds)-1])
	}
	var many Diags
	for f := 0; f < 20; f++ {
		for i := 1; i <= 100; i++ {
			many.Add(Pos{File: fmt.Sprintf("f%02d", f), Line: i}, "x")
		}
	}
	shown := many.Capped()
	if len(shown) != MaxProblems+1 || shown[MaxProblems].String() != "and 1000 more problems" {
		t.Errorf("Capped: %d entries, last %q", len(shown), shown[len(shown)-1].String())
	}
}
