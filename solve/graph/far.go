package graph

import (
	"math/rand/v2"
	"slices"
)

// DefaultFarPartners is how many items drawn at random each item of a
// cosine vector source is also compared with, beside its K nearest
// neighbours, when a repository's vectors are read (Builder.FarPartners).
//
// Why: a k-nearest-neighbour graph of points is a union of tight local
// patches. Between two patches it keeps only the few edges of points on
// their borders, so the top splits of the tree, which cut between
// patches, are decided by those few edges and not by how far apart the
// patches are; the coarse geometry of the points is lost. A handful of
// random partners per item, weighted by their cosine like any neighbour,
// is a uniform sample of the complete similarity graph: summed over the
// items of two large groups it measures how similar the groups are as a
// whole, which is what the top of the tree needs, while each item's own
// neighbourhood still dominates its edges. Negative cosines are dropped,
// as for neighbours, so unrelated groups get no edges between them.
//
// Measured on planted points (16 dimensions, 10,000 items, the solver
// benchmark's peer mode): triplet agreement with the planted tree went
// from 0.23 with neighbours alone to 0.78 with 5 random partners, 0.79
// with 15 and 40. Text and tag sources are not sampled this way: their
// random pairs mostly share no word, and on the real dev taxonomies
// sampling them lowered triplet F1 (0.277 to 0.272 with 5).
const DefaultFarPartners = 5

// streamFar is the random stream of the far partners.
const streamFar = 0x666172 // "far"

// farPartners lists, for every row of lists, up to far random partners:
// items other than the row's own and not already listed in it (nor drawn
// before), scored by s, each drawn from a stream fixed by seed and visited
// in row order, so the graph is the same for any GOMAXPROCS. They are a
// list set of their own, which symmetrize reads beside the neighbours, so
// the neighbour lists are never copied. With far ≤ 0 or fewer than three
// items it returns nil.
func farPartners(lists *neighborLists, s interface{ score(i, j int) float64 }, far int, seed uint64) *neighborLists {
	n := lists.n
	if far <= 0 || n < 3 {
		return nil
	}
	rng := rand.New(rand.NewPCG(seed, streamFar))
	out := &neighborLists{n: n, off: make([]int64, n+1), ids: make([]int32, 0, n*far), sims: make([]float64, 0, n*far)}
	for i := 0; i < n; i++ {
		near, _ := lists.row(i)
		start := len(out.ids)
		for range far {
			j := int32(rng.IntN(n))
			if int(j) == i || slices.Contains(near, j) || slices.Contains(out.ids[start:], j) {
				continue
			}
			out.ids = append(out.ids, j)
			out.sims = append(out.sims, s.score(i, int(j)))
		}
		out.off[i+1] = int64(len(out.ids))
	}
	return out
}
