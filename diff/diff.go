// Package diff compares two versions of a taxonomy: what happened to items
// and categories (the semantic diff), how far apart the two trees are
// (triplet agreement, Robinson–Foulds, cophenetic correlation), and a
// line-level view of the outline text. It also exports the cluster
// matching that carries names from one version to the next.
package diff

import (
	"github.com/ramify-tax/ramify/format"
)

// Path names a category by the display names from the top level down to
// it (the file root is not named). Names may contain "/", so JSON carries
// a path as an array; text joins it with " / ". An empty path is the root.
type Path []string

// Report is the semantic diff of two outlines. Every list is sorted (items
// by id, categories by path), so the same two trees always give the same
// report, byte for byte, in every rendering.
type Report struct {
	Added   []AddedItem   `json:"added"`
	Removed []RemovedItem `json:"removed"`
	Moved   []Move        `json:"moved"`
	// MovedCategories are categories that moved whole: their items are
	// listed there, not in Moved.
	MovedCategories []CategoryMove `json:"moved_categories"`
	Renamed         []Rename       `json:"renamed"`
	Split           []Split        `json:"split"`
	Merged          []Merge        `json:"merged"`
	Created         []Path         `json:"created"`
	Dissolved       []Path         `json:"dissolved"`
	Metrics         Metrics        `json:"metrics"`
	// all is every item move, Moved and the category moves' items.
	all []Move
}

// AddedItem is an item only the new outline has, with where it sits there.
type AddedItem struct {
	Item string `json:"item"`
	To   Path   `json:"to"`
}

// RemovedItem is an item only the old outline has, with where it sat.
type RemovedItem struct {
	Item string `json:"item"`
	From Path   `json:"from"`
}

// Move is an item in both outlines whose category path changed other than
// by renames: From in the old names, To in the new.
type Move struct {
	Item string `json:"item"`
	From Path   `json:"from"`
	To   Path   `json:"to"`
}

// CategoryMove is a category in both outlines (matched) whose place
// changed: its parent is not the category its old parent became. From is
// its path in the old names, To in the new; Items are the items that moved
// with it (their path below the category is unchanged up to renames).
type CategoryMove struct {
	From  Path     `json:"from"`
	To    Path     `json:"to"`
	Items []string `json:"items"`
}

// Rename is a category that kept its members (it was matched) but changed
// its display name; a confirmed provisional name counts as a rename.
type Rename struct {
	From Path `json:"from"`
	To   Path `json:"to"`
}

// Split is one old category whose members now mostly sit in several new
// ones.
type Split struct {
	From Path   `json:"from"`
	Into []Path `json:"into"`
}

// Merge is one new category made mostly of the members of several old
// ones.
type Merge struct {
	From []Path `json:"from"`
	Into Path   `json:"into"`
}

// Metrics compare the two trees restricted to the items they share.
type Metrics struct {
	// CommonItems is the number of items in both outlines.
	CommonItems int `json:"common_items"`
	// TripletAgreement is the share of triples of common items arranged
	// alike (see TripletAgreement); exact up to ExactTripletLimit common
	// items, estimated from TripletSamples random triples above.
	TripletAgreement float64 `json:"triplet_agreement"`
	TripletExact     bool    `json:"triplet_exact"`
	// TripletInterval is the 95% Clopper–Pearson interval [lo, hi] of a
	// sampled estimate; absent when exact.
	TripletInterval []float64 `json:"triplet_interval,omitempty"`
	TripletSamples  int       `json:"triplet_samples,omitempty"`
	// TripletRecall is the share of the triples the old tree resolves
	// that the new one resolves alike (how much of the old structure the
	// new version keeps); TripletPrecision the share of the triples the new
	// tree resolves that the old one resolves alike (see TripletScores).
	// Exact or sampled as TripletAgreement is.
	TripletRecall    float64 `json:"triplet_recall"`
	TripletPrecision float64 `json:"triplet_precision"`
	// RF is the rooted Robinson–Foulds distance; RFNormalized divides it by
	// the number of non-trivial clusters of both trees (see RF).
	RF           int     `json:"rf"`
	RFNormalized float64 `json:"rf_normalized"`
	// Cophenetic is the correlation of lca sizes over item pairs (see
	// CopheneticCorrelation); null when undefined.
	Cophenetic *float64 `json:"cophenetic"`
}

// AllMoved lists every common item whose path changed other than by
// renames, sorted by id, each with its own old and new path: the moves of
// Moved and the items of every category move.
func (r *Report) AllMoved() []Move { return r.all }

// Thresholds of the semantic diff.
const (
	// MatchJaccard is the least Jaccard overlap, on common items, at which
	// an old and a new category count as the same category (matched).
	// Above 1/2 the candidates of a category are nested: two disjoint
	// categories X, Y cannot both overlap A by more than half, as that
	// would need |A∩X| + |A∩Y| > |A|.
	MatchJaccard = 0.5
	// Mostly is the share that "mostly" means in the split and merge
	// rules: at least 80%, checked in integers as 5·part ≥ 4·whole.
	Mostly = 0.8
	// ExactTripletLimit is the largest number of common items for which
	// the triplet agreement is computed exactly (O(n²)); above it the
	// agreement is estimated from TripletSamples random triples.
	ExactTripletLimit = 5000
	// TripletSamples is the number of triples drawn for the estimate
	// (its 95% interval is at most about ±0.0045 wide).
	TripletSamples = 50000
	// TripletSeed seeds the sampling, so a diff is reproducible.
	TripletSeed = 1
)

// Compare computes the semantic diff of two outlines. Neither tree is
// changed. Membership below means the items of a category and of all its
// subcategories, counting only items present in both outlines ("common
// items"), so growth by new items does not change a category's identity.
//
//   - Added, removed: items in only one of the outlines.
//   - Matched: old and new categories are paired by match.Clusters on the
//     Jaccard overlap of their members, kept at ≥ MatchJaccard. Where the
//     overlaps tie exactly (a category and its only subcategory hold the
//     same items), pairs with equal display names are preferred. The root
//     is never matched; categories without common members never are.
//   - Renamed: a matched pair whose display names differ.
//   - Moved: a common item whose chain of categories, top level to its
//     own, mapped through the matching, is not its chain in the new
//     outline — its path changed other than by renames. When the lower
//     end of the two chains agrees (the item's own category, and maybe some
//     above it, matched level by level), the item moved with the highest
//     category of that agreeing part: it is listed under that category's
//     move in MovedCategories instead. So a category cut and pasted
//     elsewhere is one category move, not one move per item.
//   - Split: an old category A is split when at least two new categories
//     are parts of it and the parts hold at least 80% of A's members. A new
//     category X is a part of A when X is unmatched or matched to A, at
//     least 80% of X's members come from A, no ancestor of X has that
//     property too, and X holds at least 20% of A's members. (So A's
//     subcategories moving up a level is not a split: they are matched to
//     old categories of their own.)
//   - Merged: the mirror image, a new category X made of at least two old
//     parts that hold at least 80% of X's members; an old category A is a
//     part of X when A is unmatched or matched to X, at least 80% of A's
//     members are in X, no ancestor of A has that property too, and A
//     gives at least 20% of X's members.
//   - Created: a new category that is unmatched, not a part of a split and
//     not the result of a merge. Dissolved: an old category that is
//     unmatched, not split and not a part of a merge.
//   - Metrics: the trees restricted to the common items, indexed by
//     sorted id, categories left empty dropped.
func Compare(old, new *format.Category) *Report {
	r, c := compareChanges(old, new)
	r.Metrics = c.metrics()
	return r
}

// CompareChanges is Compare without the tree metrics (Metrics is left
// zero): what moved, was added, removed, renamed, split, merged, created
// and dissolved, for a caller that only reports those.
func CompareChanges(old, new *format.Category) *Report {
	r, _ := compareChanges(old, new)
	return r
}

func compareChanges(old, new *format.Category) (*Report, *comparison) {
	c := newComparison(old, new)
	r := &Report{
		Added:     c.added(),
		Removed:   c.removed(),
		Renamed:   c.renamed(),
		Created:   []Path{},
		Dissolved: []Path{},
	}
	r.all, r.Moved, r.MovedCategories = c.moved()
	r.Split, r.Merged = c.splitsAndMerges()
	r.Created, r.Dissolved = c.createdAndDissolved()
	return r, c
}
