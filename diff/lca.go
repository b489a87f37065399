package diff

import (
	"math/bits"

	"github.com/ramify-tax/ramify/solve"
)

// lcaTable answers lowest-common-ancestor queries in O(1) after
// O(m log m) preparation, m the number of nodes: the range-minimum of
// depths over an Euler tour (Bender & Farach-Colton 2000), with a sparse
// table for the minima.
type lcaTable struct {
	first []int32   // first position of each node in the tour
	depth []int32   // depth of each node
	level [][]int32 // level[j][i]: the shallowest node in tour[i : i+2^j]
}

func newLCATable(t *solve.Tree, x *treeIndex) *lcaTable {
	m := len(t.Kids)
	tour := make([]int32, 0, 2*m)
	first := make([]int32, m)
	type frame struct {
		v    int32
		next int
	}
	if x.n > 0 {
		stack := []frame{{t.Root, 0}}
		first[t.Root] = 0
		tour = append(tour, t.Root)
		for len(stack) > 0 {
			f := &stack[len(stack)-1]
			if f.next < len(t.Kids[f.v]) {
				c := t.Kids[f.v][f.next]
				f.next++
				first[c] = int32(len(tour))
				tour = append(tour, c)
				stack = append(stack, frame{c, 0})
				continue
			}
			stack = stack[:len(stack)-1]
			if len(stack) > 0 {
				tour = append(tour, stack[len(stack)-1].v)
			}
		}
	}
	lt := &lcaTable{first: first, depth: x.depth, level: [][]int32{tour}}
	for span := 2; span <= len(tour); span *= 2 {
		prev := lt.level[len(lt.level)-1]
		half := span / 2
		next := make([]int32, len(tour)-span+1)
		for i := range next {
			next[i] = lt.shallower(prev[i], prev[i+half])
		}
		lt.level = append(lt.level, next)
	}
	return lt
}

func (lt *lcaTable) shallower(u, v int32) int32 {
	if lt.depth[v] < lt.depth[u] {
		return v
	}
	return u
}

// lca is the lowest common ancestor of nodes u and v.
func (lt *lcaTable) lca(u, v int32) int32 {
	i, j := lt.first[u], lt.first[v]
	if i > j {
		i, j = j, i
	}
	j++ // half-open [i, j)
	k := bits.Len32(uint32(j-i)) - 1
	row := lt.level[k]
	return lt.shallower(row[i], row[j-(1<<k)])
}
