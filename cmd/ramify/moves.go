package main

import (
	"strings"

	"github.com/ramify-tax/ramify/diff"
)

// categoryMoveJSON is a category that moved whole, in solve's --json
// report: its paths (display names joined by " / ") and its items.
type categoryMoveJSON struct {
	From  string   `json:"from"`
	To    string   `json:"to"`
	Items []string `json:"items"`
}

// movesReport splits what moved between two versions as editors see it:
// the items that moved on their own, and the categories that moved whole
// (each one move, not one per item; see diff.Report.MovedCategories).
func movesReport(rep *diff.Report) (items []string, cats []categoryMoveJSON) {
	items, cats = []string{}, []categoryMoveJSON{}
	for _, m := range rep.Moved {
		items = append(items, m.Item)
	}
	for _, cm := range rep.MovedCategories {
		cats = append(cats, categoryMoveJSON{From: cm.From.String(), To: cm.To.String(), Items: cm.Items})
	}
	return items, cats
}

// describeMoves puts moves in words: "1 category (4 items) and 2 items",
// "3 items", "no items".
func describeMoves(items int, cats []categoryMoveJSON) string {
	var parts []string
	if len(cats) > 0 {
		carried := 0
		for _, c := range cats {
			carried += len(c.Items)
		}
		parts = append(parts, plural(len(cats), "category", "categories")+" ("+plural(carried, "item", "items")+")")
	}
	if items > 0 || len(cats) == 0 {
		parts = append(parts, plural(items, "item", "items"))
	}
	return strings.Join(parts, " and ")
}
