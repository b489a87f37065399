package regen

import (
	"errors"
	"fmt"
	"slices"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/format/shape"
	"github.com/ramify-tax/ramify/solve"
)

// Record is one editorial decision as the solver's conflict reports refer
// to it: what kind it is, where it is written, and who made it and why.
type Record struct {
	Kind string // "triplet", "group", "shape", or "linked" (see Compiled.link)
	Pos  format.Pos
	format.Provenance
}

// Compiled holds the constraint records turned into triplets and clusters
// over item indices (positions in repo.Repo.Items).
type Compiled struct {
	Constraints *solve.Constraints
	Records     []Record
	// Triplets counts the triplets that shapes and triplet records stand
	// for; Groups counts cluster constraints.
	Triplets, Groups int
	// Linked counts the triplets that link answers through the category
	// names typed in them (shape.Linked); 0 when there are none or when
	// they could not hold with the records (then none is used).
	Linked int
}

// Conflict names the records of a conflicting set, given by the solver's
// record numbers (positions in Records).
func (c *Compiled) Conflict(recs []int) *ConflictError {
	conflict := &ConflictError{}
	for _, r := range recs {
		conflict.Records = append(conflict.Records, c.Records[r])
	}
	return conflict
}

// NameConflict turns the solver's *solve.ConflictError, which numbers
// the records, into a *ConflictError naming them; any other error comes
// back as it is.
func (c *Compiled) NameConflict(err error) error {
	var ce *solve.ConflictError
	if errors.As(err, &ce) {
		return c.Conflict(ce.Records)
	}
	return err
}

// Consistent returns nil when the records over n items can all hold, and
// otherwise a *ConflictError naming a smallest set that cannot.
func (c *Compiled) Consistent(n int) error {
	if ok, recs := solve.Consistent(n, c.Constraints); !ok {
		return c.Conflict(recs)
	}
	return nil
}

// Compile turns every constraint record into solver constraints. It
// assumes repo.Load reported no unknown items (unknown ids are skipped).
func Compile(p *repo.Repo) *Compiled {
	c := &Compiled{Constraints: &solve.Constraints{}}
	tripletRecords, shapeTriplets := 0, int64(0)
	var answers []shape.Answer
	for _, f := range p.Constraints {
		for _, t := range f.Triplets {
			rec := len(c.Records)
			c.Records = append(c.Records, Record{Kind: "triplet", Pos: t.Pos, Provenance: t.Provenance})
			a, ok1 := p.ItemIndex(t.Pair[0])
			b, ok2 := p.ItemIndex(t.Pair[1])
			o, ok3 := p.ItemIndex(t.Out)
			if ok1 && ok2 && ok3 {
				c.Constraints.Triplets = append(c.Constraints.Triplets, solve.Triplet{A: a, B: b, C: o, Record: rec})
				tripletRecords++
			}
		}
		for _, g := range f.Groups {
			rec := len(c.Records)
			c.Records = append(c.Records, Record{Kind: "group", Pos: g.Pos, Provenance: g.Provenance})
			var leaves []int32
			for _, id := range g.Items {
				if i, ok := p.ItemIndex(id); ok {
					leaves = append(leaves, i)
				}
			}
			c.Constraints.Clusters = append(c.Constraints.Clusters, solve.Cluster{Leaves: sortedLeaves(leaves), Record: rec})
		}
		for _, s := range f.Shapes {
			rec := len(c.Records)
			c.Records = append(c.Records, Record{Kind: "shape", Pos: s.Pos, Provenance: s.Provenance})
			answers = append(answers, shape.Answer{Tree: s.Tree, Record: rec})
			nodes := shape.Nodes(s.Tree, p.ItemIndex)
			nodes.Triplets(func(a, b, o int32) {
				c.Constraints.Triplets = append(c.Constraints.Triplets, solve.Triplet{A: a, B: b, C: o, Record: rec})
			})
			shapeTriplets += nodes.Resolved()
			if s.SideBySide {
				nodes.SideBySide(func(branches [][]int32) {
					c.Constraints.SideBySide = append(c.Constraints.SideBySide, solve.SideBySide{Branches: branches, Record: rec})
				})
			}
		}
	}
	// Triplets counts what the records mean, not the (smaller) set the
	// shapes compile to, so the number reported stays that of the records.
	c.Triplets = tripletRecords + int(shapeTriplets)
	c.Groups = len(c.Constraints.Clusters)
	c.link(answers, p)
	return c
}

// link adds the triplets that link the answers through the names typed
// in them, when the records can hold with them: they are what the answers
// mean together, not records of their own, so a reading of the names that
// the records contradict is not used at all, and never turns into a
// conflict an editor would have to resolve.
func (c *Compiled) link(answers []shape.Answer, p *repo.Repo) {
	if len(answers) < 2 {
		return
	}
	editorial, before := len(c.Records), len(c.Constraints.Triplets)
	// Each pair of names apart is a record of its own, so that the local
	// re-solve mends it as one shape (two categories apart), not as part
	// of an answer whose items it does not share.
	shape.Linked(answers, p.ItemIndex, func(l shape.Link) {
		rec := len(c.Records)
		from := c.Records[l.Record]
		prov := from.Provenance
		prov.Note = fmt.Sprintf("categories %q and %q kept apart, as the answers name them", l.Names[0], l.Names[1])
		c.Records = append(c.Records, Record{Kind: "linked", Pos: from.Pos, Provenance: prov})
		for _, t := range l.Triplets {
			c.Constraints.Triplets = append(c.Constraints.Triplets, solve.Triplet{A: t[0], B: t[1], C: t[2], Record: rec})
		}
	})
	linked := len(c.Constraints.Triplets) - before
	if linked == 0 {
		return
	}
	if ok, _ := solve.Consistent(len(p.Items), c.Constraints); !ok {
		c.Constraints.Triplets = c.Constraints.Triplets[:before]
		c.Records = c.Records[:editorial]
		return
	}
	c.Linked = linked
}

// Editorial is how many of Records are records an editor wrote: the
// records of the linked names (Kind "linked") come after them.
func (c *Compiled) Editorial() int {
	n := len(c.Records)
	for n > 0 && c.Records[n-1].Kind == "linked" {
		n--
	}
	return n
}

func sortedLeaves(ls []int32) []int32 {
	slices.Sort(ls)
	return ls
}

// EditorialViolated is the part of violated (record numbers) that are
// records an editor wrote.
func (c *Compiled) EditorialViolated(violated []int) []int {
	n := c.Editorial()
	var out []int
	for _, r := range violated {
		if r < n {
			out = append(out, r)
		}
	}
	return out
}
