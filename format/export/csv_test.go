package export

import (
	"bytes"
	"encoding/csv"
	"strings"
	"testing"

	"github.com/ramify-tax/ramify/format"
)

func TestCSVGolden(t *testing.T) {
	root, items := fixture(t, "awkward.outline", "awkward.items.toml")
	var b bytes.Buffer
	if err := CSV(&b, root, items); err != nil {
		t.Fatal(err)
	}
	golden(t, "awkward.csv", b.Bytes())
}

// TestCSVReadBack reads the export with encoding/csv (RFC 4180) and
// rebuilds the tree from the paths alone.
func TestCSVReadBack(t *testing.T) {
	root, items := fixture(t, "awkward.outline", "awkward.items.toml")
	rows := csvRows(t, root, items)
	if len(rows) == 0 || strings.Join(rows[0], ",") != "id,label,tags,text,path,concepts" {
		t.Fatalf("header %v, want id,label,tags,text,path,concepts", rows)
	}
	got := &format.Category{}
	labels := map[string]string{}
	for _, row := range rows[1:] {
		c := got
		if row[4] != "" {
			for _, seg := range strings.Split(row[4], PathSeparator) {
				name, prov := strings.CutPrefix(seg, "~ ")
				var next *format.Category
				for _, ch := range c.Children {
					if ch.Name == name && ch.Provisional == prov {
						next = ch
					}
				}
				if next == nil {
					next = &format.Category{Name: name, Provisional: prov}
					c.Children = append(c.Children, next)
				}
				c = next
			}
		}
		c.Items = append(c.Items, row[0])
		labels[row[0]] = row[1]
	}
	if g, w := string(format.FormatTree(got)), string(format.FormatTree(root.Clone())); g != w {
		t.Errorf("tree read back\n%s\nwant\n%s", g, w)
	}
	if labels["claw-hammer"] != `Claw hammer, 16 oz "everyday"` || labels["tape-measure-8m"] != "" {
		t.Errorf("labels read back wrong: %q, %q", labels["claw-hammer"], labels["tape-measure-8m"])
	}
	if len(rows)-1 != root.Size() {
		t.Errorf("%d rows for %d items", len(rows)-1, root.Size())
	}
}

func TestCSVRefusesAmbiguousName(t *testing.T) {
	root := &format.Category{Children: []*format.Category{{Name: "Tools > Saws", Items: []string{"a"}}}}
	var b bytes.Buffer
	err := CSV(&b, root, nil)
	if err == nil || !strings.Contains(err.Error(), `"Tools > Saws"`) {
		t.Fatalf("error %v, want one naming the category", err)
	}
	if b.Len() != 0 {
		t.Error("wrote output despite the error")
	}
}

// csvRows is the CSV export of the tree, read back with encoding/csv.
func csvRows(t *testing.T, root *format.Category, items []format.Item) [][]string {
	t.Helper()
	var b bytes.Buffer
	if err := CSV(&b, root, items); err != nil {
		t.Fatal(err)
	}
	rows, err := csv.NewReader(&b).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	return rows
}
