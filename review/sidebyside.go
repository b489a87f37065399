package review

import (
	"slices"

	"github.com/ramify-tax/ramify/format"
)

// SideBySide lists the groupings an answer takes away by laying items
// side by side: the triplets ab|c that shown (the packet as drawn)
// resolves where the answer lays a and b side by side as items of one
// category that holds c too, so that all three meet there. Triplets
// cannot record this (format.ShapeTriplets lists only what an outline
// resolves); the answer's shape keeps it as a side-by-side statement
// (format.Shape.SideBySide, kept by solve.KeepSideBySide). Triplets the
// answer resolves another way, and a pair the answer parts by moving one
// of them into another category, are recorded as triplets and not
// listed. The list is in the order of format.ShapeTriplets over shown.
func SideBySide(shown, answer *format.Category) [][3]string {
	resolved := map[[3]string]bool{} // the answer's resolved triples, as sorted item sets
	for _, t := range format.ShapeTriplets(answer) {
		resolved[sortedTriple(t)] = true
	}
	holder := map[string]*format.Category{} // the answer category each item is written in
	answer.Walk(func(c *format.Category, _ int) bool {
		for _, id := range c.Items {
			holder[id] = c
		}
		return true
	})
	var out [][3]string
	for _, t := range format.ShapeTriplets(shown) {
		if holder[t[0]] == holder[t[1]] && !resolved[sortedTriple(t)] {
			out = append(out, t)
		}
	}
	return out
}

func sortedTriple(t [3]string) [3]string {
	s := t
	slices.Sort(s[:])
	return s
}
