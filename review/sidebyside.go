package review

import (
	"slices"

	"github.com/ramify-tax/ramify/format"
)

// SideBySide lists the groupings an answer takes away that its shape
// cannot record: the triplets ab|c that shown (the packet as drawn)
// resolves where the answer lays a and b side by side as items of one
// category that holds c too, so that all three meet there. A shape
// records only the triplets its outline resolves (format.ShapeTriplets):
// items laid side by side state nothing the solver must keep, and the
// next solve may group a with b again. absorb says so instead of letting
// the answer pass as recorded. Triplets the answer resolves another way
// are recorded, and a pair the answer parts by moving one of them into
// another category is left to the triplets that move records; neither is
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
