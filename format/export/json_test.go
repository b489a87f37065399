package export

import (
	"bytes"
	"encoding/json"
	"strings"
	"testing"

	"github.com/ramify-tax/ramify/format"
)

func TestJSONGolden(t *testing.T) {
	root, items := fixture(t, "awkward.outline", "awkward.items.toml")
	var b bytes.Buffer
	if err := JSON(&b, root, items); err != nil {
		t.Fatal(err)
	}
	golden(t, "awkward.json", b.Bytes())
}

// TestJSONReadBack decodes the export with encoding/json and rebuilds the
// tree from it.
func TestJSONReadBack(t *testing.T) {
	root, items := fixture(t, "awkward.outline", "awkward.items.toml")
	var b bytes.Buffer
	if err := JSON(&b, root, items); err != nil {
		t.Fatal(err)
	}
	var doc jsonCategory
	dec := json.NewDecoder(&b)
	dec.DisallowUnknownFields()
	if err := dec.Decode(&doc); err != nil {
		t.Fatal(err)
	}
	labels := map[string]string{}
	var rebuild func(n jsonCategory) *format.Category
	rebuild = func(n jsonCategory) *format.Category {
		c := &format.Category{Name: n.Name, Provisional: n.Provisional}
		for _, ch := range n.Categories {
			c.Children = append(c.Children, rebuild(ch))
		}
		for _, it := range n.Items {
			c.Items = append(c.Items, it.ID)
			labels[it.ID] = it.Label
		}
		return c
	}
	got := rebuild(doc)
	if g, w := string(format.FormatTree(got)), string(format.FormatTree(root.Clone())); g != w {
		t.Errorf("tree read back\n%s\nwant\n%s", g, w)
	}
	for _, tc := range []struct{ id, label string }{
		{"claw-hammer", `Claw hammer, 16 oz "everyday"`},
		{"garden-fork", "Garden fork 道具"},
		{"tape-measure-8m", "tape-measure-8m"}, // no label: its id
	} {
		if labels[tc.id] != tc.label {
			t.Errorf("label of %s = %q, want %q", tc.id, labels[tc.id], tc.label)
		}
	}
}

func TestJSONEmptyListsAreArrays(t *testing.T) {
	var b bytes.Buffer
	if err := JSON(&b, &format.Category{Items: []string{"a"}}, nil); err != nil {
		t.Fatal(err)
	}
	want := "{\n  \"name\": \"\",\n  \"provisional\": false,\n  \"categories\": [],\n  \"items\": [\n    {\n      \"id\": \"a\",\n      \"label\": \"a\"\n    }\n  ]\n}\n"
	if b.String() != want {
		t.Errorf("got\n%s\nwant\n%s", b.String(), want)
	}
	if strings.Contains(b.String(), "null") {
		t.Error("a list is written as null")
	}
}
