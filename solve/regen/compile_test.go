package regen

import (
	"os"
	"path/filepath"
	"testing"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
)

// linkRepo writes a repository of six tool-library items, similar only
// by their texts, with two answered packets that both name "Sanders" and
// "Saws" (and extra records, when given), and loads it.
func linkRepo(t *testing.T, extra string) *repo.Repo {
	t.Helper()
	dir := t.TempDir()
	items := "id\tlabel\ttext\n" +
		"i0\tbelt sander\tsander belt abrasive\n" +
		"i1\torbital sander\tsander orbital abrasive\n" +
		"i2\tjigsaw\tsaw blade cut\n" +
		"i3\tcircular saw\tsaw blade cut round\n" +
		"i4\tdetail sander\tsmall corner tool\n" +
		"i5\tmitre saw\tangle tool\n"
	answers := `
[[shape]]
outline = """
Sanders/
  i0
  i1
Saws/
  i2
"""
by = "Scripted Reviewer"
date = 2027-01-01

[[shape]]
outline = """
Sanders/
  i4
Saws/
  i3
  i5
"""
by = "Scripted Reviewer"
date = 2027-01-02
` + extra
	for name, body := range map[string]string{
		"items.tsv":               items,
		repo.SettingsFile:         "[items]\nfiles = [\"items.tsv\"]\n\n[[similarity.source]]\nkind = \"text\"\n",
		"constraints/review.toml": answers,
	} {
		path := filepath.Join(dir, name)
		if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, []byte(body), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	p, ds := repo.Load(dir)
	if len(ds) > 0 {
		t.Fatal(ds)
	}
	return p
}

// Two answers that name the same categories link: the solved tree keeps
// the detail sander (named a sander only in the second answer) apart from
// every saw, though its text shares nothing with the other sanders.
func TestCompileLinksAnswersByName(t *testing.T) {
	p := linkRepo(t, "")
	c := Compile(p)
	if c.Linked == 0 {
		t.Fatal("no linked triplets from two answers naming the same categories")
	}
	sol, err := Regenerate(p, MethodConstrained, nil)
	if err != nil {
		t.Fatal(err)
	}
	tree := sol.Tree
	sanders, saws := []int32{0, 1, 4}, []int32{2, 3, 5}
	if !apartIn(tree.Parents(), sanders, saws) {
		t.Errorf("sanders and saws not apart in\n%s", sol.Text)
	}
	// Each name the answers agree on names one category, the one that
	// holds all its items.
	for _, name := range []string{"Sanders", "Saws"} {
		var at []*format.Category
		sol.Root.Walk(func(c *format.Category, _ int) bool {
			if c.Name == name {
				at = append(at, c)
			}
			return true
		})
		if len(at) != 1 {
			t.Errorf("%d categories named %s, want 1:\n%s", len(at), name, sol.Text)
		}
	}
}

// A record that the linked reading contradicts wins, and no conflict
// comes of it: the detail sander is recorded with a saw.
func TestCompileDropsLinksTheRecordsContradict(t *testing.T) {
	p := linkRepo(t, `
[[triplet]]
pair = ["i4", "i3"]
out = "i0"
by = "Editor"
date = 2027-01-03
`)
	c := Compile(p)
	if c.Linked != 0 {
		t.Errorf("%d linked triplets kept against a record", c.Linked)
	}
	if err := c.Consistent(len(p.Items)); err != nil {
		t.Errorf("records alone reported as conflicting: %v", err)
	}
}

// apartIn reports whether the lowest common ancestors of a and b (in a
// tree given by its parent array) lie neither one at nor above the other.
func apartIn(parent []int32, a, b []int32) bool {
	ancestors := func(v int32) []int32 {
		var out []int32
		for ; v >= 0; v = parent[v] {
			out = append(out, v)
		}
		return out
	}
	lca := func(s []int32) int32 {
		common := ancestors(s[0])
		for _, x := range s[1:] {
			up := map[int32]bool{}
			for _, v := range ancestors(x) {
				up[v] = true
			}
			var keep []int32
			for _, v := range common {
				if up[v] {
					keep = append(keep, v)
				}
			}
			common = keep
		}
		return common[0]
	}
	u, v := lca(a), lca(b)
	for _, w := range ancestors(u) {
		if w == v {
			return false
		}
	}
	for _, w := range ancestors(v) {
		if w == u {
			return false
		}
	}
	return true
}

// Per answer, a typed name lands on the lowest category that holds that
// answer's items under it, so two answers name two categories down one
// path. Linked, the name lands once: on the lowest category holding every
// item the answers put under it and none of the names apart from it.
func TestAgreedNameNamesOneCategory(t *testing.T) {
	p := linkRepo(t, `
[[shape]]
outline = """
Sanders/
  i0
  i1
  i4
Saws/
  i5
"""
by = "Scripted Reviewer"
date = 2027-01-03
`)
	build := func() *format.Category {
		o, err := format.ParseOutline("t", []byte("# ramify outline 1\nA/\n  B/\n    i0\n    i1\n  i4\nC/\n  i2\n  i3\n  i5\n"))
		if err != nil {
			t.Fatal(err)
		}
		return o.Root
	}
	count := func(root *format.Category, name string) int {
		n := 0
		root.Walk(func(c *format.Category, _ int) bool {
			if c.Name == name {
				n++
			}
			return true
		})
		return n
	}
	apart := build()
	nameCategories(p, apart, nil, nil, false)
	linked := build()
	nameCategories(p, linked, nil, nil, true)
	if got := count(apart, "Sanders"); got != 2 {
		t.Errorf("answers read apart: %d categories named Sanders, want 2 (A and B)", got)
	}
	if got := count(linked, "Sanders"); got != 1 || linked.Children[0].Name != "Sanders" {
		t.Errorf("answers linked: %d categories named Sanders (top: %q), want 1, the top one", got, linked.Children[0].Name)
	}
}
