package export

import (
	"bytes"
	"encoding/json"
	"errors"
	"os/exec"
	"reflect"
	"sort"
	"strings"
	"testing"

	"github.com/ramify-tax/ramify/format"
)

func TestNewickLabel(t *testing.T) {
	for _, tc := range []struct{ in, want string }{
		{"claw-hammer", "claw-hammer"},
		{"v1.2", "v1.2"},
		{"mallet_rubber", "'mallet_rubber'"},
		{"plug:uk-eu", "'plug:uk-eu'"},
		{"Hand tools", "'Hand tools'"},
		{"it's", "'it''s'"},
		{"''", "''''''"},
		{"(a,b);", "'(a,b);'"},
		{"[note]", "'[note]'"},
		{"été", "'été'"},
		{"2024", "'2024'"},
		{"1e5", "'1e5'"},
		{"", "''"},
	} {
		if got := newickLabel(tc.in); got != tc.want {
			t.Errorf("newickLabel(%q) = %s, want %s", tc.in, got, tc.want)
		}
	}
}

func TestNewickGolden(t *testing.T) {
	root, _ := fixture(t, "awkward.outline", "")
	var b bytes.Buffer
	if err := Newick(&b, root, NewickOptions{RootLabel: "Tool library's root"}); err != nil {
		t.Fatal(err)
	}
	golden(t, "awkward.nwk", b.Bytes())
}

func TestNewickSmallTrees(t *testing.T) {
	for _, tc := range []struct {
		name string
		root *format.Category
		opt  NewickOptions
		want string
	}{
		{"empty", &format.Category{}, NewickOptions{}, ";\n"},
		{"empty, named root", &format.Category{}, NewickOptions{RootLabel: "all"}, "all;\n"},
		{"flat", &format.Category{Items: []string{"b", "a"}}, NewickOptions{}, "(a,b);\n"},
		{"one child", &format.Category{Children: []*format.Category{{Name: "X", Provisional: true, Items: []string{"a"}}}}, NewickOptions{RootLabel: "r"}, "((a)'~ X')r;\n"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var b bytes.Buffer
			if err := Newick(&b, tc.root, tc.opt); err != nil {
				t.Fatal(err)
			}
			if b.String() != tc.want {
				t.Errorf("got %q, want %q", b.String(), tc.want)
			}
		})
	}
}

func TestNewickRefusesEmptyCategory(t *testing.T) {
	root := &format.Category{Children: []*format.Category{{Name: "Empty"}}, Items: []string{"a"}}
	var b bytes.Buffer
	err := Newick(&b, root, NewickOptions{})
	if !errors.Is(err, errEmptyCategory) || !strings.Contains(err.Error(), `"Empty"`) {
		t.Fatalf("error %v, want the empty-category error naming it", err)
	}
	if b.Len() != 0 {
		t.Error("wrote output despite the error")
	}
}

// newickReading is what an outside reader found: every leaf, and for every
// internal node its label and the leaves below it.
type newickReading struct {
	Leaves   []string          `json:"leaves"`
	Clusters []newickClusterJS `json:"clusters"`
}

type newickClusterJS struct {
	Label  *string  `json:"label"`
	Leaves []string `json:"leaves"`
}

// Readers, run as /usr/bin/python3 -c SCRIPT with the Newick text on
// stdin; each prints a newickReading. Input is read as UTF-8 whatever the
// locale; output is ASCII JSON.
const (
	// Debian's python3-biopython (1.80): Bio.Phylo.read(handle, "newick").
	biopythonReader = `
import io, json, sys
from Bio import Phylo
tree = Phylo.read(io.TextIOWrapper(sys.stdin.buffer, encoding="utf-8"), "newick")
clusters = [{"label": c.name, "leaves": sorted(l.name for l in c.get_terminals())}
            for c in tree.find_clades(order="preorder") if not c.is_terminal()]
print(json.dumps({"leaves": sorted(l.name for l in tree.get_terminals()), "clusters": clusters}))
`
	// Debian's python3-dendropy (4.5.2): dendropy.Tree.get(schema="newick").
	dendropyReader = `
import io, json, sys
import dendropy
text = io.TextIOWrapper(sys.stdin.buffer, encoding="utf-8").read()
taxa = dendropy.TaxonNamespace(is_case_sensitive=True)
tree = dendropy.Tree.get(data=text, schema="newick", preserve_underscores=True,
                         case_sensitive_taxon_labels=True, taxon_namespace=taxa)
leaf = lambda n: n.taxon.label
clusters = [{"label": n.label, "leaves": sorted(leaf(l) for l in n.leaf_iter())}
            for n in tree.preorder_node_iter() if not n.is_leaf()]
print(json.dumps({"leaves": sorted(leaf(l) for l in tree.leaf_node_iter()), "clusters": clusters}))
`
)

// TestNewickReadBack reads exports with two independent Newick readers
// and checks they find the same leaves and the same clusters, each with
// its category's label.
//
// Biopython 1.80 does not follow the convention for a quote inside a
// quoted label (it reads 'it”s' as two labels) and keeps backslashes as
// escapes, so its fixture has neither; DendroPy follows the convention
// and reads the full set of awkward labels.
func TestNewickReadBack(t *testing.T) {
	for _, tc := range []struct {
		name, module, pkg, script, outline, root string
	}{
		{"biopython", "Bio.Phylo", "python3-biopython", biopythonReader, "biopython.outline", "root (all): Ü"},
		{"dendropy", "dendropy", "python3-dendropy", dendropyReader, "awkward.outline", "Tool library's root"},
		{"biopython demo", "Bio.Phylo", "python3-biopython", biopythonReader, demoOutline, ""},
		{"dendropy demo", "dendropy", "python3-dendropy", dendropyReader, demoOutline, "demo"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			python := needTool(t, "/usr/bin/python3", tc.pkg, "-c", "import "+tc.module)
			root, _ := fixture(t, tc.outline, "")
			var b bytes.Buffer
			if err := Newick(&b, root, NewickOptions{RootLabel: tc.root}); err != nil {
				t.Fatal(err)
			}
			cmd := exec.Command(python, "-c", tc.script)
			cmd.Stdin = bytes.NewReader(b.Bytes())
			var stderr bytes.Buffer
			cmd.Stderr = &stderr
			out, err := cmd.Output()
			if err != nil {
				t.Fatalf("%s could not read the export: %v\n%s\n%s", tc.name, err, stderr.String(), b.String())
			}
			var got newickReading
			if err := json.Unmarshal(out, &got); err != nil {
				t.Fatalf("reader output %q: %v", out, err)
			}
			want := expectedReading(root, tc.root)
			sortClusters(got.Clusters)
			if !reflect.DeepEqual(got.Leaves, want.Leaves) {
				t.Errorf("leaves read back %q, want %q", got.Leaves, want.Leaves)
			}
			if !reflect.DeepEqual(clusterStrings(got.Clusters), clusterStrings(want.Clusters)) {
				t.Errorf("clusters read back\n%s\nwant\n%s", strings.Join(clusterStrings(got.Clusters), "\n"), strings.Join(clusterStrings(want.Clusters), "\n"))
			}
		})
	}
}

// expectedReading is what a reader should find: the ids as leaves, the
// root and every category as a cluster labelled as the outline shows it.
func expectedReading(root *format.Category, rootLabel string) newickReading {
	var r newickReading
	r.Leaves = root.AllItems()
	sort.Strings(r.Leaves)
	label := func(s string) *string {
		if s == "" {
			return nil
		}
		return &s
	}
	root.Walk(func(c *format.Category, depth int) bool {
		leaves := c.AllItems()
		sort.Strings(leaves)
		name := c.DisplayName()
		if depth == 0 {
			name = rootLabel
		}
		r.Clusters = append(r.Clusters, newickClusterJS{Label: label(name), Leaves: leaves})
		return true
	})
	sortClusters(r.Clusters)
	return r
}

func sortClusters(cs []newickClusterJS) {
	sort.Slice(cs, func(i, j int) bool { return clusterString(cs[i]) < clusterString(cs[j]) })
}

func clusterString(c newickClusterJS) string {
	l := "<none>"
	if c.Label != nil {
		l = *c.Label
	}
	return l + " = {" + strings.Join(c.Leaves, ", ") + "}"
}

func clusterStrings(cs []newickClusterJS) []string {
	out := make([]string, len(cs))
	for i, c := range cs {
		out[i] = clusterString(c)
	}
	return out
}
