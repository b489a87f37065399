package export

import (
	"encoding/json"
	"io"

	"github.com/ramify-tax/ramify/format"
)

// jsonCategory is one category of the JSON export. The root has the same
// shape with an empty name, so one reader walks the whole document.
type jsonCategory struct {
	Name        string         `json:"name"`
	Provisional bool           `json:"provisional"`
	Categories  []jsonCategory `json:"categories"`
	Items       []jsonItem     `json:"items"`
}

type jsonItem struct {
	ID    string `json:"id"`
	Label string `json:"label"`
}

// JSON writes the taxonomy as one nested document:
//
//	{"name": "", "provisional": false, "categories": [...], "items": [{"id": ..., "label": ...}]}
//
// where every category has the same four keys. Names are given without
// the provisional marker ("provisional" says it); an item's label is its
// id when it has none. Lists are in canonical order (subcategories by
// name, items by id), never null, and the text is indented by two spaces
// and ends in a line feed.
func JSON(w io.Writer, root *format.Category, items []format.Item) error {
	doc := toJSON(sortedCopy(root), itemIndex(items))
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	// Names are data, not markup: keep "&" and "<" as they are.
	enc.SetEscapeHTML(false)
	return enc.Encode(doc)
}

func toJSON(c *format.Category, idx map[string]*format.Item) jsonCategory {
	out := jsonCategory{
		Name:        c.Name,
		Provisional: c.Provisional,
		Categories:  make([]jsonCategory, 0, len(c.Children)),
		Items:       make([]jsonItem, 0, len(c.Items)),
	}
	for _, ch := range c.Children {
		out.Categories = append(out.Categories, toJSON(ch, idx))
	}
	for _, id := range c.Items {
		out.Items = append(out.Items, jsonItem{ID: id, Label: labelOf(idx, id)})
	}
	return out
}
