package diff

// fenwick counts points on the levels 0..len-1 and answers "how many at or
// below level l" in O(log len) (Fenwick 1994, binary indexed tree).
type fenwick []int32

// reset empties the tree and resizes it to levels 0..levels-1.
func (f *fenwick) reset(levels int) {
	if cap(*f) < levels {
		*f = make(fenwick, levels)
		return
	}
	*f = (*f)[:levels]
	clear(*f)
}

// add counts one point at level l.
func (f fenwick) add(l int32) {
	for i := int(l) + 1; i <= len(f); i += i & -i {
		f[i-1]++
	}
}

// atMost is the number of points at levels 0..l (0 when l < 0).
func (f fenwick) atMost(l int32) int32 {
	s := int32(0)
	for i := int(l) + 1; i > 0; i -= i & -i {
		s += f[i-1]
	}
	return s
}
