package naming

import (
	"fmt"
	"testing"

	"github.com/ramify-tax/ramify/format"
)

// synthetic builds a tree of depth levels with fanout children per
// category and items spread evenly over the lowest level; each item has
// words naming its branch at every level and one of its own.
func synthetic(items, depth, fanout int, named bool) (*format.Category, map[string][]string) {
	root := &format.Category{}
	var leaves []*format.Category
	var paths [][]string
	var grow func(c *format.Category, level int, path []string)
	grow = func(c *format.Category, level int, path []string) {
		if level == depth {
			leaves = append(leaves, c)
			paths = append(paths, path)
			return
		}
		for i := range fanout {
			ch := &format.Category{}
			p := append(append([]string(nil), path...), fmt.Sprintf("w%d-%d", level, i))
			if named {
				ch.Name = fmt.Sprintf("cat-%v", p)
			}
			c.Children = append(c.Children, ch)
			grow(ch, level+1, p)
		}
	}
	grow(root, 0, nil)
	words := map[string][]string{}
	for i := range items {
		id := fmt.Sprintf("item-%06d", i)
		k := i % len(leaves)
		leaves[k].Items = append(leaves[k].Items, id)
		words[id] = append(append([]string(nil), paths[k]...), fmt.Sprintf("own%d", i%7))
	}
	return root, words
}

// BenchmarkAssign100k names a 100,000-item tree of about 4,700
// categories, carrying names from a previous version of the same shape.
func BenchmarkAssign100k(b *testing.B) {
	prev, _ := synthetic(100_000, 4, 8, true)
	for b.Loop() {
		b.StopTimer()
		root, words := synthetic(100_000, 4, 8, false)
		b.StartTimer()
		Assign(root, prev, nil, func(it string) []string { return words[it] })
	}
}

// BenchmarkProvisional100k makes every name from words (no previous
// version).
func BenchmarkProvisional100k(b *testing.B) {
	for b.Loop() {
		b.StopTimer()
		root, words := synthetic(100_000, 4, 8, false)
		b.StartTimer()
		Assign(root, nil, nil, func(it string) []string { return words[it] })
	}
}
