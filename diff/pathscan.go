package diff

// ancestors appends to path the nodes from leaf a up to the root: path[0]
// is a, path[len-1] the root.
func (x treeIndex) ancestors(a int32, path []int32) []int32 {
	path = path[:0]
	for v := a; v >= 0; v = x.Parent[v] {
		path = append(path, v)
	}
	return path
}

// eachNewlyCovered calls visit(c) for every leaf c in the leaf set of
// path[k] but not of path[k-1]: the leaves whose lowest common ancestor with
// path[0] is path[k]. Both sets are ranges of the leaf order, the smaller
// nested in the larger, so the difference is two ranges.
func (x treeIndex) eachNewlyCovered(path []int32, k int, visit func(c int32)) {
	u, prev := path[k], path[k-1]
	for p := x.Lo[u]; p < x.Lo[prev]; p++ {
		visit(x.LeafAt[p])
	}
	for p := x.Hi[prev]; p < x.Hi[u]; p++ {
		visit(x.LeafAt[p])
	}
}

// labelLevels sets level[c], for every leaf c, to the index k of the lowest
// node path[k] on a's root path whose leaf set holds c; level[a] = 0.
// Afterwards |L(lca(a, c))| = size(path[level[c]]).
func (x treeIndex) labelLevels(path []int32, level []int32) {
	level[path[0]] = 0
	for k := 1; k < len(path); k++ {
		u, prev := path[k], path[k-1]
		for p := x.Lo[u]; p < x.Lo[prev]; p++ {
			level[x.LeafAt[p]] = int32(k)
		}
		for p := x.Hi[prev]; p < x.Hi[u]; p++ {
			level[x.LeafAt[p]] = int32(k)
		}
	}
}
