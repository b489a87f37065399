package main

import (
	"bytes"
	"fmt"
	"strings"

	"github.com/ramify-tax/ramify/diff"
	"github.com/ramify-tax/ramify/format"
)

// staleReason says what differs between the committed outline and the
// one solve writes now, in the words of the semantic diff (moves, renames,
// categories made or dropped, items added or removed) and, when the trees
// are the same, in the words of the file: the order of its lines, or its
// header.
func staleReason(committed *format.Category, committedText []byte, fresh *format.Category, freshText []byte) string {
	rep := diff.CompareChanges(committed, fresh)
	var parts []string
	items, cats := movesReport(rep)
	if len(items)+len(cats) > 0 {
		parts = append(parts, describeMoves(len(items), cats)+" would move")
	}
	if n := len(rep.Renamed); n > 0 {
		parts = append(parts, plural(n, "category", "categories")+" would be renamed")
	}
	if n := len(rep.Created); n > 0 {
		parts = append(parts, plural(n, "category", "categories")+" would be added")
	}
	if n := len(rep.Dissolved); n > 0 {
		parts = append(parts, plural(n, "category", "categories")+" would be dropped")
	}
	if n := len(rep.Split) + len(rep.Merged); n > 0 {
		parts = append(parts, plural(n, "category", "categories")+" would be split or merged")
	}
	if n := len(rep.Added); n > 0 {
		parts = append(parts, plural(n, "item", "items")+" would be added")
	}
	if n := len(rep.Removed); n > 0 {
		parts = append(parts, plural(n, "item", "items")+" would be removed")
	}
	if len(parts) > 0 {
		return strings.Join(parts, ", ")
	}
	line := firstDifferentLine(committedText, freshText)
	var records []format.OutlineRecord
	if o, err := format.ParseOutline("fresh", freshText); err == nil {
		records = o.Records
	}
	if bytes.Equal(format.FormatOutlineRecords(committed.Clone(), records), freshText) {
		if line <= 2 {
			return "the same tree; only the header lines differ"
		}
		return fmt.Sprintf("the same tree, with its lines in another order from line %d: solve writes subcategories sorted by name, then items by id", line)
	}
	return fmt.Sprintf("the same items in the same places, but line %d differs", line)
}

// firstDifferentLine is the 1-based number of the first line where a and
// b differ.
func firstDifferentLine(a, b []byte) int {
	la, lb := bytes.Split(a, []byte("\n")), bytes.Split(b, []byte("\n"))
	for i := range min(len(la), len(lb)) {
		if !bytes.Equal(la[i], lb[i]) {
			return i + 1
		}
	}
	return min(len(la), len(lb)) + 1
}
