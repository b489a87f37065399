package solve

// Shared is what a solve leaves for later solves of reweighted copies of
// the same graph, such as the bootstrap members of the review committee:
// the average-linkage guide of the graph (guide.go). A member solved with
// it (Options.SharedFrom) consults that guide instead of building its own
// from its reweighted graph. The guide only proposes a second split of
// each set, which is scored by ψ on the member's own weights and taken
// only when it is sparser there, so the member is still solved from its
// own weights; it saves one average linkage of the whole graph per member.
// A Shared is read-only once its solve returned and may be used by any
// number of solves at once.
type Shared struct {
	n     int
	guide *guide
}
