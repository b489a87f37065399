package repo

import (
	"fmt"
	"strconv"
	"testing"

	"github.com/ramify-tax/ramify/format"
)

// A shape of wide categories that would need more than
// shape.MaxTripletsPerItem triplets per item is refused at its header.
func TestShapeProblemsRefusesWideShapes(t *testing.T) {
	p := &Repo{Index: map[string]int{}}
	root := &format.Category{}
	// 1,200 pairs under the root: 1,200 × 1,199 triplets, about 600 per
	// item, more than the limit.
	for i := 0; i < 1200; i++ {
		a, b := fmt.Sprintf("a%d", i), fmt.Sprintf("b%d", i)
		p.Index[a], p.Index[b] = 2*i, 2*i+1
		root.Children = append(root.Children, &format.Category{Name: "p" + strconv.Itoa(i), Items: []string{a, b}})
	}
	refs := make([]format.Ref, 2400)
	cf := &format.ConstraintFile{Shapes: []format.Shape{{Tree: root, Refs: refs, Pos: format.Pos{File: "constraints/x.toml", Line: 7, Col: 1}}}}
	ds := p.shapeProblems(cf)
	if len(ds) != 1 || ds[0].Pos.Line != 7 {
		t.Fatalf("shapeProblems = %v; want one problem at line 7", ds)
	}
	// 100 pairs need 100 × 99 triplets, about 50 per item: accepted.
	root.Children = root.Children[:100]
	cf.Shapes[0].Refs = refs[:200]
	if ds := p.shapeProblems(cf); len(ds) != 0 {
		t.Fatalf("100 pairs: shapeProblems = %v; want none", ds)
	}
}
