package solve

// Constraints are the editorial decisions compiled to leaf ids. Record is
// the index of the source record in the caller's list, so that a conflict
// can be reported as the records (with file, line, author and reason) that
// cause it. A shape record compiles to the triplets its outline resolves,
// all carrying the shape's record index.
type Constraints struct {
	Triplets []Triplet
	Clusters []Cluster
	// SideBySide are kept after solving (KeepSideBySide), not by the
	// solver itself.
	SideBySide []SideBySide
}

// Triplet is the rooted triplet ab|c: lca(a,b) lies strictly below
// lca(a,c) = lca(b,c).
type Triplet struct {
	A, B, C int32
	Record  int
}

// Cluster requires that exactly Leaves form the leaf set of some node.
type Cluster struct {
	Leaves []int32
	Record int
}
