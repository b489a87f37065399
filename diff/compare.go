package diff

import (
	"slices"

	"github.com/ramify-tax/ramify/diff/match"
	"github.com/ramify-tax/ramify/format"
)

// comparison holds the two flattened trees, their common items and the
// category matching that every part of the report reads.
type comparison struct {
	old, new *flatTree
	common   []string // items in both, sorted
	oldCat   []int    // category of each common item in the old tree
	newCat   []int    // and in the new
	onlyOld  []match.Placed
	onlyNew  []match.Placed
	// overlap lists, per old category (index = id − 1), the new categories
	// sharing members with it and how many.
	overlap match.Candidates
	// byNew lists the same overlaps per new category: (old id, count).
	byNew    [][]catShare
	matchOld []int // new category matched to each old one, −1 if none
	matchNew []int
	// Roles in splits and merges, filled by splitsAndMerges.
	splitOf, pieceOld []bool // old: split source; part of a merge
	mergeOf, pieceNew []bool // new: merge result; part of a split
}

type catShare struct {
	cat   int
	count int64
}

func newComparison(oldRoot, newRoot *format.Category) *comparison {
	c := commonItems(flatten(oldRoot), flatten(newRoot))
	// The root (id 0) takes no part in matching.
	// Where overlaps tie exactly (a category and its only subcategory hold
	// the same items), the pair with equal names wins.
	c.overlap = match.FindCandidates(c.old.members[1:], c.new.members[1:], func(r, x int) bool {
		return c.old.cats[r+1].DisplayName() != c.new.cats[x+1].DisplayName()
	})
	c.byNew = make([][]catShare, len(c.new.cats))
	for r := range len(c.old.cats) - 1 {
		for e := c.overlap.Start[r]; e < c.overlap.Start[r+1]; e++ {
			x := c.overlap.Edges[e]
			c.byNew[x.Col+1] = append(c.byNew[x.Col+1], catShare{r + 1, x.Inter})
		}
	}
	c.matchOld = make([]int, len(c.old.cats))
	c.matchNew = make([]int, len(c.new.cats))
	for i := range c.matchOld {
		c.matchOld[i] = -1
	}
	for i := range c.matchNew {
		c.matchNew[i] = -1
	}
	for r, e := range match.Assign(len(c.old.cats)-1, len(c.new.cats)-1, c.overlap) {
		if e < 0 {
			continue
		}
		x := c.overlap.Edges[e]
		if float64(x.Inter)/float64(x.Union) >= MatchJaccard {
			c.matchOld[r+1], c.matchNew[x.Col+1] = int(x.Col)+1, r+1
		}
	}
	return c
}

func (c *comparison) added() []AddedItem {
	out := make([]AddedItem, 0, len(c.onlyNew))
	for _, it := range c.onlyNew {
		out = append(out, AddedItem{Item: it.ID, To: c.new.path[it.Cat]})
	}
	return out
}

func (c *comparison) removed() []RemovedItem {
	out := make([]RemovedItem, 0, len(c.onlyOld))
	for _, it := range c.onlyOld {
		out = append(out, RemovedItem{Item: it.ID, From: c.old.path[it.Cat]})
	}
	return out
}

// moved compares each common item's category chains through the
// matching. The answer depends only on the item's two categories, so it is
// worked out once per pair of categories. It returns every item move, the
// moves of items that moved on their own, and the category moves.
func (c *comparison) moved() (all, own []Move, cats []CategoryMove) {
	all, own, cats = []Move{}, []Move{}, []CategoryMove{}
	type place struct{ old, new int }
	// carrier is the category pair an item moved with ({0, 0}: none).
	type verdict struct {
		moved   bool
		carrier place
	}
	verdicts := map[place]verdict{}
	catIndex := map[place]int{}
	var chainOld, chainNew []int
	for i, it := range c.common {
		p := place{c.oldCat[i], c.newCat[i]}
		v, seen := verdicts[p]
		if !seen {
			chainOld = c.old.chain(p.old, chainOld)
			chainNew = c.new.chain(p.new, chainNew)
			v.moved = len(chainOld) != len(chainNew)
			for k := 0; !v.moved && k < len(chainOld); k++ {
				v.moved = c.matchOld[chainOld[k]] != chainNew[k]
			}
			// The agreeing lower end: levels matched counted from the
			// item's own category up.
			s := 0
			for s < len(chainOld) && s < len(chainNew) &&
				c.matchOld[chainOld[len(chainOld)-1-s]] == chainNew[len(chainNew)-1-s] {
				s++
			}
			if v.moved && s > 0 {
				v.carrier = place{chainOld[len(chainOld)-s], chainNew[len(chainNew)-s]}
			}
			verdicts[p] = v
		}
		if !v.moved {
			continue
		}
		m := Move{Item: it, From: c.old.path[p.old], To: c.new.path[p.new]}
		all = append(all, m)
		if v.carrier == (place{}) {
			own = append(own, m)
			continue
		}
		k, ok := catIndex[v.carrier]
		if !ok {
			k = len(cats)
			catIndex[v.carrier] = k
			cats = append(cats, CategoryMove{From: c.old.path[v.carrier.old], To: c.new.path[v.carrier.new]})
		}
		cats[k].Items = append(cats[k].Items, it)
	}
	slices.SortFunc(cats, func(a, b CategoryMove) int { return comparePaths(a.From, b.From) })
	return all, own, cats
}

func (c *comparison) renamed() []Rename {
	out := []Rename{}
	for o := 1; o < len(c.old.cats); o++ {
		n := c.matchOld[o]
		if n > 0 && c.old.cats[o].DisplayName() != c.new.cats[n].DisplayName() {
			out = append(out, Rename{From: c.old.path[o], To: c.new.path[n]})
		}
	}
	slices.SortFunc(out, func(a, b Rename) int { return comparePaths(a.From, b.From) })
	return out
}

// mostly reports part ≥ 80% of whole, in integers.
func mostly(part, whole int64) bool { return 5*part >= 4*whole }

// share reports part ≥ 20% of whole.
func share(part, whole int64) bool { return 5*part >= whole }

// parts finds the pieces of category a of tree t in the other tree u (the
// split rule when t is old, the merge rule when t is new; see Compare).
// shares lists u's categories overlapping a with the overlap counts; match
// maps u's categories to t's.
func parts(a int, t, u *flatTree, shares []catShare, match []int) (pieces []int, covered int64) {
	size := int64(len(t.members[a]))
	inA := make(map[int]int64, len(shares))
	for _, s := range shares {
		if mostly(s.count, int64(len(u.members[s.cat]))) {
			inA[s.cat] = s.count
		}
	}
	for x, count := range inA {
		maximal := true
		for p := u.parent[x]; p > 0; p = u.parent[p] {
			if _, ok := inA[p]; ok {
				maximal = false
				break
			}
		}
		if !maximal || (match[x] >= 0 && match[x] != a) || !share(count, size) {
			continue
		}
		pieces = append(pieces, x)
		covered += count
	}
	slices.Sort(pieces)
	return pieces, covered
}

// brokenUp returns the sorted paths of the categories of u that together
// hold most of category a of t (see parts), marking each in piece; ok is
// false unless there are two or more. From old to new that is a split,
// from new to old a merge.
func brokenUp(a int, t, u *flatTree, shares []catShare, match []int, piece []bool) (paths []Path, ok bool) {
	pieces, covered := parts(a, t, u, shares, match)
	if len(pieces) < 2 || !mostly(covered, int64(len(t.members[a]))) {
		return nil, false
	}
	for _, x := range pieces {
		paths = append(paths, u.path[x])
		piece[x] = true
	}
	slices.SortFunc(paths, comparePaths)
	return paths, true
}

func (c *comparison) splitsAndMerges() ([]Split, []Merge) {
	splits, merges := []Split{}, []Merge{}
	c.splitOf = make([]bool, len(c.old.cats))
	c.pieceNew = make([]bool, len(c.new.cats))
	c.mergeOf = make([]bool, len(c.new.cats))
	c.pieceOld = make([]bool, len(c.old.cats))
	for a := 1; a < len(c.old.cats); a++ {
		r := a - 1
		shares := make([]catShare, 0, c.overlap.Start[r+1]-c.overlap.Start[r])
		for e := c.overlap.Start[r]; e < c.overlap.Start[r+1]; e++ {
			x := c.overlap.Edges[e]
			shares = append(shares, catShare{int(x.Col) + 1, x.Inter})
		}
		if into, ok := brokenUp(a, c.old, c.new, shares, c.matchNew, c.pieceNew); ok {
			c.splitOf[a] = true
			splits = append(splits, Split{From: c.old.path[a], Into: into})
		}
	}
	for x := 1; x < len(c.new.cats); x++ {
		if from, ok := brokenUp(x, c.new, c.old, c.byNew[x], c.matchOld, c.pieceOld); ok {
			c.mergeOf[x] = true
			merges = append(merges, Merge{From: from, Into: c.new.path[x]})
		}
	}
	slices.SortFunc(splits, func(a, b Split) int { return comparePaths(a.From, b.From) })
	slices.SortFunc(merges, func(a, b Merge) int { return comparePaths(a.Into, b.Into) })
	return splits, merges
}

func (c *comparison) createdAndDissolved() (created, dissolved []Path) {
	created, dissolved = []Path{}, []Path{}
	for x := 1; x < len(c.new.cats); x++ {
		if c.matchNew[x] < 0 && !c.pieceNew[x] && !c.mergeOf[x] {
			created = append(created, c.new.path[x])
		}
	}
	for a := 1; a < len(c.old.cats); a++ {
		if c.matchOld[a] < 0 && !c.splitOf[a] && !c.pieceOld[a] {
			dissolved = append(dissolved, c.old.path[a])
		}
	}
	slices.SortFunc(created, comparePaths)
	slices.SortFunc(dissolved, comparePaths)
	return created, dissolved
}

// commonItems pairs the items both flattened trees hold (in id order:
// common[i] is item i) and fills each category's members with them.
func commonItems(old, new *flatTree) *comparison {
	c := &comparison{old: old, new: new}
	s := match.Common(old.items, new.items)
	c.common, c.oldCat, c.newCat, c.onlyOld, c.onlyNew = s.IDs, s.OldCat, s.NewCat, s.OnlyOld, s.OnlyNew
	c.old.members = match.Members(c.old.parent, c.oldCat)
	c.new.members = match.Members(c.new.parent, c.newCat)
	return c
}
