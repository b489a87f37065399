package main

import (
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/review"
)

// answerPlan is what absorbing the answered packets will write.
type answerPlan struct {
	writes   []absorbWrite
	added    []*format.ConstraintFile // the new shape files, parsed back
	absorbed []absorbedJSON
	pending  int
}

// planAnswers checks every answered packet of reviews/open and plans its
// files: a shape constraint for "fixed", the packet in reviews/done for
// every answer, the open file removed. Every problem of every packet is
// returned together, and then nothing is planned.
func planAnswers(p *repo.Repo, open []*review.Answer, names *reviewerNames, date string) (*answerPlan, error) {
	plan := &answerPlan{absorbed: []absorbedJSON{}}
	var ds format.Diags
	for _, a := range open {
		if !a.Answered() {
			plan.pending++
			continue
		}
		reviewer := a.Packet.Reviewer
		if reviewer == "" {
			reviewer = names.get()
		}
		var shown *format.Category
		if p.Outline != nil && !p.Outline.Edited() && a.Packet.From == format.StructureHash(p.Outline.Root) {
			shown = review.Restrict(p.Outline.Root, a.Items())
		}
		known := func(id string) bool { _, ok := p.Index[id]; return ok }
		pds := review.CheckAnswer(a, known, shown)
		if reviewer == "" {
			pds.Add(format.Pos{File: a.File, Line: lineStarting(a.Data, "reviewer:"), Col: 1},
				"who answered this packet? write your name after \"reviewer:\", or pass --by NAME")
		}
		// The audit log only grows: an answer is never written over.
		doneRel := review.DoneDir + "/" + a.ID + ".outline"
		done, err := repo.Resolve(p.Dir, doneRel)
		if err != nil {
			return nil, err
		}
		if fileExists(done) {
			pds.Add(format.Pos{File: a.File, Line: 1, Col: 1}, "this packet was absorbed already (%s); remove it from %s", doneRel, review.OpenDir)
		}
		if len(pds) > 0 {
			ds = append(ds, pds...)
			continue
		}
		item := absorbedJSON{Packet: a.ID, Reason: a.Packet.Reason, Verdict: a.Packet.Verdict, Reviewer: reviewer, Done: doneRel}
		if a.Packet.Verdict == format.VerdictFixed {
			rel := review.ShapePath(a.ID)
			cf, text, cds := parsedConstraintFile(rel, review.ShapeFile(a, reviewer, date))
			if len(cds) > 0 {
				ds = append(ds, cds...)
				continue
			}
			// A conflict names the answer where the reviewer can change it.
			cf.Shapes[0].Pos = format.Pos{File: a.File, Line: a.Packet.TreeLine, Col: 1}
			if shown != nil {
				item.SideBySide = len(review.SideBySide(shown, a.Packet.Tree))
			}
			plan.added = append(plan.added, cf)
			plan.writes = append(plan.writes, absorbWrite{rel: rel, data: text})
			item.Constraint = rel
		}
		plan.writes = append(plan.writes,
			absorbWrite{rel: item.Done, data: review.DoneText(a, reviewer, date)},
			absorbWrite{rel: a.File, remove: true})
		plan.absorbed = append(plan.absorbed, item)
	}
	if len(ds) > 0 {
		ds.Sort()
		return nil, ds
	}
	return plan, nil
}
