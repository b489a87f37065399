package format

import (
	"bytes"
	"fmt"
	"slices"
	"sort"
	"strings"
)

var itemKeys = []string{"id", "label", "tags", "text"}

// itemsLimits bounds an items.toml: one header per item, a few keys each.
var itemsLimits = tomlLimits{
	MaxNesting:     8,
	MaxArray:       100_000,
	MaxKeyParts:    8,
	MaxHeaders:     MaxItems,
	TooManyHeaders: fmt.Sprintf("more than %s items in one file", grouped(MaxItems)),
	MaxKeys:        8 * MaxItems,
}

// ParseItemsTOML reads items written as [[item]] tables:
//
//	[[item]]
//	id = "claw-hammer"
//	label = "Claw hammer"
//	tags = ["hand", "wood"]
//	text = "A 16 oz hammer with a curved claw for pulling nails."
func ParseItemsTOML(file string, data []byte) ([]Item, error) {
	return parseItemsTOML(file, data, fileItems)
}

func parseItemsTOML(file string, data []byte, b Budget) ([]Item, error) {
	// One header per item: the scan stops at the first item past the
	// budget, before its tables are built.
	lim := itemsLimits
	lim.MaxHeaders, lim.TooManyHeaders, lim.MaxKeys = max(b.Left, 0), b.Over, 8*max(b.Left, 1)
	doc, ds := decodeTOML(file, data, lim)
	if len(ds) > 0 {
		return nil, ds
	}
	unknown := unknownKeys(doc.root, []string{"item"}, "an items file", doc.rootKeyPos)
	records, rds := doc.records("item")
	set := newItemSet(file, b, len(records))
	set.ds = append(append(set.ds, unknown...), rds...)
	for i := range records {
		if !addTOMLItem(set, &records[i]) {
			break
		}
	}
	return set.result()
}

func addTOMLItem(set *itemSet, r *tomlRecord) bool {
	set.ds = append(set.ds, unknownKeys(r.Values, itemKeys, "[[item]]", r.keyPos)...)
	it := Item{Pos: r.At}
	at := itemPlaces{id: r.keyPos("id"), label: r.keyPos("label"), tags: r.keyPos("tags"), text: r.keyPos("text")}
	at.tag = func(int) Pos { return at.tags }
	stringField := func(key string, dst *string) {
		v, ok := r.Values[key]
		if !ok {
			return
		}
		s, ok := v.(string)
		if !ok {
			set.ds.Add(r.keyPos(key), "%s must be a string, not %s", key, tomlType(v))
			return
		}
		*dst = s
	}
	if _, ok := r.Values["id"]; !ok {
		set.ds.Add(r.At, "[[item]] has no id")
		return true
	}
	stringField("id", &it.ID)
	stringField("label", &it.Label)
	stringField("text", &it.Text)
	if v, ok := r.Values["tags"]; ok {
		tags, msg := asStrings(v)
		if msg != "" {
			set.ds.Add(at.tags, "tags %s", msg)
		}
		it.Tags = tags
	}
	if it.ID == "" {
		if _, isString := r.Values["id"].(string); !isString {
			return true // already reported as the wrong type
		}
	}
	return set.add(it, at)
}

// FormatItemsTOML writes items as an items.toml file that ParseItemsTOML
// reads back: header (comment lines, written as given), then one [[item]]
// table per item in id order with only the keys that have values, every
// string a TOML basic string.
func FormatItemsTOML(header string, items []Item) []byte {
	var b bytes.Buffer
	b.WriteString(header)
	sorted := slices.Clone(items)
	sort.Slice(sorted, func(i, j int) bool { return sorted[i].ID < sorted[j].ID })
	for _, it := range sorted {
		b.WriteString("\n[[item]]\n")
		b.WriteString("id = " + tomlQuote(it.ID) + "\n")
		if it.Label != "" {
			b.WriteString("label = " + tomlQuote(it.Label) + "\n")
		}
		if len(it.Tags) > 0 {
			quoted := make([]string, len(it.Tags))
			for i, t := range it.Tags {
				quoted[i] = tomlQuote(t)
			}
			b.WriteString("tags = [" + strings.Join(quoted, ", ") + "]\n")
		}
		if it.Text != "" {
			b.WriteString("text = " + tomlQuote(it.Text) + "\n")
		}
	}
	return b.Bytes()
}
