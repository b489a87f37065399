package export

import (
	"encoding/csv"
	"fmt"
	"io"
	"strings"

	"github.com/ramify-tax/ramify/format"
)

// PathSeparator joins category names in the path column of the CSV
// export; `ramify init --from` reads the same separator back.
const PathSeparator = " > "

// CSVColumns are the columns of the CSV export, in order.
var CSVColumns = []string{"id", "label", "tags", "text", "path", "concepts"}

// CSV writes one row per item under the header CSVColumns: the item's
// id, its label (empty when it has none), its tags joined by ";"
// (format.TagSeparator, which no tag holds), its text (line breaks
// kept, inside quotes), the names of the categories from the top down to
// it joined by PathSeparator, a provisional name with its "~ " marker, as
// the outline shows it, and the concept identifiers of those categories
// joined the same way (empty for a category without one). An item at the
// top level has an empty path. So `ramify init --from` reads back the
// same tree, names, identifiers and items: the export loses nothing.
// Rows follow the outline's order; quoting is RFC 4180's (encoding/csv),
// lines end in a line feed. A cell that a spreadsheet would run as a
// formula (it begins with "=", "+", "-", "@", a tab or a carriage return)
// is written with a single quote before it (GuardCell); the import takes
// it away again.
//
// A category name that holds PathSeparator cannot be told apart from two
// levels, so it is refused rather than written ambiguously.
func CSV(w io.Writer, root *format.Category, items []format.Item) error {
	tree := sortedCopy(root)
	idx := itemIndex(items)
	var rows [][]string
	var bad error
	var rec func(c *format.Category, path, ids []string)
	rec = func(c *format.Category, path, ids []string) {
		for _, ch := range c.Children {
			if strings.Contains(ch.Name, PathSeparator) && bad == nil {
				bad = fmt.Errorf("category %q holds %q, which separates the levels of a path in the CSV export; rename it to export CSV", ch.DisplayName(), PathSeparator)
			}
			rec(ch, append(path[:len(path):len(path)], ch.DisplayName()), append(ids[:len(ids):len(ids)], ch.ID))
		}
		for _, id := range c.Items {
			var label, tags, text string
			if it, ok := idx[id]; ok {
				label, tags, text = it.Label, strings.Join(it.Tags, format.TagSeparator), it.Text
			}
			concepts := strings.Join(ids, PathSeparator)
			if strings.Trim(concepts, " >") == "" {
				concepts = ""
			}
			row := []string{id, label, tags, text, strings.Join(path, PathSeparator), concepts}
			for k := range row {
				row[k] = GuardCell(row[k])
			}
			rows = append(rows, row)
		}
	}
	rec(tree, nil, nil)
	if bad != nil {
		return bad
	}
	cw := csv.NewWriter(w)
	if err := cw.Write(CSVColumns); err != nil {
		return err
	}
	if err := cw.WriteAll(rows); err != nil {
		return err
	}
	return cw.Error()
}
