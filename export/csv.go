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

// CSV writes one row per item under the header id,label,path: the item's
// id, its label (its id when it has none) and the names of the categories
// from the top down to it joined by PathSeparator, a provisional name with
// its "~ " marker, as the outline shows it. An item at the top level has
// an empty path. Rows follow the outline's order; quoting is RFC 4180's
// (encoding/csv), lines end in a line feed.
//
// A category name that holds PathSeparator cannot be told apart from two
// levels, so it is refused rather than written ambiguously.
func CSV(w io.Writer, root *format.Category, items []format.Item) error {
	tree := sortedCopy(root)
	idx := itemIndex(items)
	var rows [][]string
	var bad error
	var rec func(c *format.Category, path []string)
	rec = func(c *format.Category, path []string) {
		for _, ch := range c.Children {
			if strings.Contains(ch.Name, PathSeparator) && bad == nil {
				bad = fmt.Errorf("category %q holds %q, which separates the levels of a path in the CSV export; rename it to export CSV", ch.DisplayName(), PathSeparator)
			}
			rec(ch, append(path[:len(path):len(path)], ch.DisplayName()))
		}
		for _, id := range c.Items {
			rows = append(rows, []string{id, labelOf(idx, id), strings.Join(path, PathSeparator)})
		}
	}
	rec(tree, nil)
	if bad != nil {
		return bad
	}
	cw := csv.NewWriter(w)
	if err := cw.Write([]string{"id", "label", "path"}); err != nil {
		return err
	}
	if err := cw.WriteAll(rows); err != nil {
		return err
	}
	return cw.Error()
}
