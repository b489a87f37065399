package main

import (
	"fmt"

	"github.com/ramify-tax/ramify/format"
)

// formatImportedItems writes items as items.toml: a comment saying where
// they came from, then one [[item]] table per item in id order, with only
// the keys the import had values for.
func formatImportedItems(source string, items []format.Item) []byte {
	header := fmt.Sprintf("# The items of this taxonomy, one [[item]] table each, imported from\n# %s by `ramify init --from`. Add tags and a text to each item: they\n# are what ramify tells similar items by.\n", source)
	return format.FormatItemsTOML(header, items)
}
