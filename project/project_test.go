package project

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/ramify-tax/ramify/format"
)

// TestResolveStaysInside: configured paths come from files an untrusted
// pull request can change, so none may lead out of the repository — not
// by an absolute path, not by "..", not through a symbolic link.
func TestResolveStaysInside(t *testing.T) {
	root := t.TempDir()
	outside := t.TempDir()
	if err := os.MkdirAll(filepath.Join(root, "data"), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.Symlink(outside, filepath.Join(root, "escape")); err != nil {
		t.Fatal(err)
	}
	if err := os.Symlink(filepath.Join(root, "data"), filepath.Join(root, "alias")); err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		rel  string
		ok   bool
		want string // part of the error
	}{
		{"items.toml", true, ""},
		{"data/items.tsv", true, ""},
		{"data/new/out.csv", true, ""}, // not there yet: an output
		{"alias/items.tsv", true, ""},  // a link that stays inside
		{"/etc/passwd", false, "must be relative"},
		{"../x.toml", false, "leaves the repository"},
		{"data/../../x.toml", false, "leaves the repository"},
		{"escape/items.toml", false, "leads outside the repository"},
		{`data\items.tsv`, false, "must be relative"},
		{"", false, "empty path"},
		{".git/config", false, "points into .git"},
		{"data/.GIT/hooks/x", false, "points into .git"},
	}
	for _, c := range cases {
		got, err := Resolve(root, c.rel)
		if c.ok {
			if err != nil {
				t.Errorf("%q: %v", c.rel, err)
			} else if !strings.HasPrefix(got, root) {
				t.Errorf("%q resolved to %q, outside %q", c.rel, got, root)
			}
			continue
		}
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%q: error %v, want one saying %q", c.rel, err, c.want)
		}
	}
}

// TestCategoryRoundTrip: an outline turned into a solver tree and back
// keeps its clusters; single-child categories collapse into their child.
func TestCategoryRoundTrip(t *testing.T) {
	o, err := format.ParseOutline("t.outline", []byte("A/\n  B/\n    a\n    b\n  c\nD/\n  E/\n    d\n    e\n"))
	if err != nil {
		t.Fatal(err)
	}
	ids := []string{"a", "b", "c", "d", "e"}
	index := map[string]int{}
	for i, id := range ids {
		index[id] = i
	}
	tree, nodes := CategoryNodes(o.Root, index, len(ids))
	back := ToCategory(tree, ids)
	// D/E/ collapses to one category: the same tree without D.
	want, err := format.ParseOutline("w.outline", []byte("A/\n  B/\n    a\n    b\n  c\nE/\n  d\n  e\n"))
	if err != nil {
		t.Fatal(err)
	}
	if got, want := format.StructureHash(back), format.StructureHash(want.Root); got != want {
		t.Errorf("structure %s after the round trip, want %s:\n%s", got, want, format.FormatTree(back))
	}
	// D has the single child E: both map to the node over {d, e}.
	var d, e *format.Category
	for _, c := range o.Root.Children {
		if c.Name == "D" {
			d, e = c, c.Children[0]
		}
	}
	if nodes[d] != nodes[e] {
		t.Errorf("D and its only child E map to different nodes %d, %d", nodes[d], nodes[e])
	}
	prior := PriorClusters(o.Root, index)
	if len(prior) != 4 { // A, B, D, E
		t.Errorf("%d prior clusters, want 4: %v", len(prior), prior)
	}
}
