// Package disjoint is a disjoint-set forest (union–find; Tarjan, "Efficiency
// of a good but not linear set union algorithm", JACM 1975) over the
// integers 0..n−1, shared by the solver's component splits, the grouping
// of broken records and the planted instances' bridges.
package disjoint

// Sets holds each element's parent; a root is its own parent. Find halves
// paths as it walks; Union hangs the larger root under the smaller, so
// every set is represented by its smallest member and the result does not
// depend on the order of unions. A caller may reset an element to a
// singleton by writing s[x] = x, or link a root under another itself.
type Sets []int32

// New returns n singletons.
func New(n int) Sets {
	s := make(Sets, n)
	for i := range s {
		s[i] = int32(i)
	}
	return s
}

// Find returns the representative of x's set.
func (s Sets) Find(x int32) int32 {
	for s[x] != x {
		s[x] = s[s[x]]
		x = s[x]
	}
	return x
}

// Union joins the sets of a and b, reporting whether they were apart.
func (s Sets) Union(a, b int32) bool {
	ra, rb := s.Find(a), s.Find(b)
	if ra == rb {
		return false
	}
	if ra < rb {
		s[rb] = ra
	} else {
		s[ra] = rb
	}
	return true
}
