package naming

import (
	"slices"
	"strconv"

	"github.com/ramify-tax/ramify/format"
)

// makeUnique renames siblings that share a name (provisional or not: the
// outline compares names without the "~ " marker) and returns how many it
// renamed. The strongest claim keeps the name; see Assign.
func makeUnique(root *format.Category, cats []category, claims []claim) int {
	index := make(map[*format.Category]int, len(cats))
	for i, c := range cats {
		index[c.cat] = i
	}
	renamed := 0
	root.Walk(func(p *format.Category, _ int) bool {
		byName := map[string][]int{}
		var names []string
		for _, ch := range p.Children {
			i := index[ch]
			if _, ok := byName[ch.Name]; !ok {
				names = append(names, ch.Name)
			}
			byName[ch.Name] = append(byName[ch.Name], i)
		}
		taken := make(map[string]bool, len(names))
		for _, n := range names {
			taken[n] = true
		}
		slices.Sort(names)
		for _, n := range names {
			group := byName[n]
			if len(group) < 2 {
				continue
			}
			slices.SortFunc(group, func(a, b int) int {
				if claims[a] != claims[b] {
					return int(claims[a]) - int(claims[b])
				}
				return compareFirst(cats[a].members, cats[b].members)
			})
			k := 2
			for _, i := range group[1:] {
				for taken[suffixed(n, k)] {
					k++
				}
				cats[i].cat.Name = suffixed(n, k)
				taken[cats[i].cat.Name] = true
				renamed++
			}
		}
		return true
	})
	return renamed
}

// suffixed appends " k" to name, shortening name (at a character
// boundary) if the result would pass the 200-byte limit on names.
func suffixed(name string, k int) string {
	suffix := " " + strconv.Itoa(k)
	for len(name)+len(suffix) > 200 {
		r := []rune(name)
		name = string(r[:len(r)-1])
	}
	return name + suffix
}

// compareFirst orders two sorted member lists by their smallest item.
func compareFirst(a, b []string) int {
	switch {
	case len(a) == 0 && len(b) == 0:
		return 0
	case len(a) == 0:
		return -1
	case len(b) == 0:
		return 1
	case a[0] < b[0]:
		return -1
	case a[0] > b[0]:
		return 1
	}
	return 0
}
