package main

import (
	"bytes"
	"fmt"
	"strings"

	"github.com/ramify-tax/ramify/export"
	"github.com/ramify-tax/ramify/format"
)

// formatImportedItems writes items as items.toml: a comment saying where
// they came from, then one [[item]] table per item in id order, with only
// the keys the import had values for.
func formatImportedItems(source string, items []format.Item) []byte {
	var b bytes.Buffer
	fmt.Fprintf(&b, "# The items of this taxonomy, one [[item]] table each, imported from\n# %s by `ramify init --from`. Add tags and a text to each item: they\n# are what ramify tells similar items by.\n", source)
	for _, it := range itemsByID(items) {
		b.WriteString("\n[[item]]\n")
		b.WriteString("id = " + importTOMLString(it.ID) + "\n")
		if it.Label != "" {
			b.WriteString("label = " + importTOMLString(it.Label) + "\n")
		}
		if len(it.Tags) > 0 {
			quoted := make([]string, len(it.Tags))
			for i, t := range it.Tags {
				quoted[i] = importTOMLString(t)
			}
			b.WriteString("tags = [" + strings.Join(quoted, ", ") + "]\n")
		}
		if it.Text != "" {
			b.WriteString("text = " + importTOMLString(it.Text) + "\n")
		}
	}
	return b.Bytes()
}

// importTOMLString writes s as a TOML basic string: quote and backslash
// escaped, the control characters TOML forbids in a basic string as
// their short escapes or \uXXXX, everything else as it is (TOML 1.0,
// "Basic strings").
func importTOMLString(s string) string { return export.QuotedString(s) }
