package review

import (
	"slices"
	"testing"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/solve"
	"github.com/ramify-tax/ramify/solve/graph"
	"github.com/ramify-tax/ramify/solve/planted"
)

// committeeMoving is a committee over 12 items in three categories of
// four, half of whose trees move item 3 from the first category to the
// second.
func committeeMoving(t *testing.T) (*solve.Tree, *Committee) {
	t.Helper()
	current := tree(t, 12, "((0,1,2,3),(4,5,6,7),(8,9,10,11))")
	moved := tree(t, 12, "((0,1,2),(3,4,5,6,7),(8,9,10,11))")
	var ts []*solve.Tree
	for i := range 10 {
		if i%2 == 0 {
			ts = append(ts, current)
		} else {
			ts = append(ts, moved)
		}
	}
	c, err := NewCommittee(12, ts)
	if err != nil {
		t.Fatal(err)
	}
	return current, c
}

func TestDrawStartsWhereTheCommitteeMovesAnItem(t *testing.T) {
	current, c := committeeMoving(t)
	a := c.Assess(current)
	for x := range 12 {
		if x == 3 {
			continue
		}
		if a.Unsettled[x] > a.Unsettled[3] {
			t.Errorf("item %d is more unsettled (%.3f) than the moved item 3 (%.3f)", x, a.Unsettled[x], a.Unsettled[3])
		}
	}
	// Half the trees give 3 companions that meet it only at the root (12
	// items) instead of in its category of 4: (12−4)/12 on average over
	// half the trees.
	if want := 0.5 * 8.0 / 12; a.Unsettled[3] < want-1e-12 || a.Unsettled[3] > want+1e-12 {
		t.Errorf("Unsettled[3] = %v, want %v", a.Unsettled[3], want)
	}
	ds := Draw(current, c, a, DrawOptions{Count: 1, Size: 4, Seed: 1})
	if len(ds) != 1 || ds[0].Reason != format.ReasonUncertain {
		t.Fatalf("drew %v, want one uncertain packet", ds)
	}
	p := ds[0]
	if !slices.Contains(p.Items, 3) {
		t.Errorf("packet %v misses the moved item 3", p.Items)
	}
	// It holds both places 3 might belong: someone of 0..2 and of 4..7.
	first, second := false, false
	for _, x := range p.Items {
		first = first || x <= 2
		second = second || x >= 4 && x <= 7
	}
	if !first || !second {
		t.Errorf("packet %v does not hold both candidate categories of item 3", p.Items)
	}
	if p.Score <= 0 {
		t.Errorf("score %v, want > 0", p.Score)
	}
}

func TestDrawRespectsAvoidAndAgreement(t *testing.T) {
	current, c := committeeMoving(t)
	a := c.Assess(current)
	avoid := make([]bool, 12)
	avoid[3] = true
	for _, d := range Draw(current, c, a, DrawOptions{Count: 3, Size: 4, Avoid: avoid}) {
		if slices.Contains(d.Items, 3) {
			t.Errorf("packet %v holds the avoided item 3", d.Items)
		}
	}
	// A committee that agrees with the tree everywhere draws no uncertain
	// packet, but audits still come.
	same, err := NewCommittee(12, []*solve.Tree{current, current})
	if err != nil {
		t.Fatal(err)
	}
	ds := Draw(current, same, same.Assess(current), DrawOptions{Count: 4, Size: 4, AuditShare: 0.25, Seed: 5})
	if len(ds) != 1 || ds[0].Reason != format.ReasonAudit || len(ds[0].Items) != 4 {
		t.Errorf("agreeing committee drew %v, want a single audit of 4 items", ds)
	}
}

// TestDrawOnPlantedIsDeterministicAndSpread builds a real committee and
// checks the packets: deterministic, no item twice, audits last and of
// the requested share.
func TestDrawOnPlantedIsDeterministicAndSpread(t *testing.T) {
	in := planted.Generate(4, 300, 3, 3)
	g := fuzzyGraph(in, 6, 1.3, 0.8, 1)
	res, err := solve.Solve(g, nil, testOptions)
	if err != nil {
		t.Fatal(err)
	}
	draw := func() []Draft {
		c, err := BuildCommittee(g, nil, testOptions, 10, 42)
		if err != nil {
			t.Fatal(err)
		}
		return Draw(res.Taxonomy, c, c.Assess(res.Taxonomy), DrawOptions{Count: 8, Size: 8, AuditShare: 0.25, Seed: 42})
	}
	first, second := draw(), draw()
	if !slices.EqualFunc(first, second, func(a, b Draft) bool {
		return a.Reason == b.Reason && a.Score == b.Score && slices.Equal(a.Items, b.Items)
	}) {
		t.Fatal("two draws with the same seed differ")
	}
	if len(first) != 8 {
		t.Fatalf("drew %d packets, want 8", len(first))
	}
	seen := map[int32]bool{}
	for i, d := range first {
		wantReason := format.ReasonUncertain
		if i >= 6 {
			wantReason = format.ReasonAudit
		}
		if d.Reason != wantReason || len(d.Items) != 8 || !slices.IsSorted(d.Items) {
			t.Fatalf("packet %d: %+v", i, d)
		}
		if d.Reason != format.ReasonUncertain {
			continue
		}
		for _, x := range d.Items {
			if seen[x] {
				t.Errorf("item %d is in two uncertain packets", x)
			}
			seen[x] = true
		}
	}
	for i := 1; i < 6; i++ {
		if first[i].Score <= 0 {
			t.Errorf("uncertain packet %d has score %v", i, first[i].Score)
		}
	}
}

// TestCommitteeTellsProgress: with opt.Progress set the committee reports
// each finished member once, counting up to its size, and the trees are
// those of a committee built without it.
func TestCommitteeTellsProgress(t *testing.T) {
	in := planted.Generate(4, 200, 3, 3)
	g := fuzzyGraph(in, 6, 1.3, 0.8, 1)
	var seen []int
	opt := testOptions
	opt.Progress = func(stage string, done, total int) {
		if stage != "committee of trees" || total != 5 {
			t.Errorf("progress %q %d/%d", stage, done, total)
		}
		seen = append(seen, done)
	}
	c, err := BuildViewCommittee([]*graph.CSR{g, g}, nil, opt, 5, 9)
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(seen, []int{1, 2, 3, 4, 5}) {
		t.Errorf("progress counted %v, want 1 to 5", seen)
	}
	quiet, err := BuildViewCommittee([]*graph.CSR{g, g}, nil, testOptions, 5, 9)
	if err != nil {
		t.Fatal(err)
	}
	for i := range c.Trees {
		a, b := c.Trees[i], quiet.Trees[i]
		if a.Root != b.Root || !slices.EqualFunc(a.Kids, b.Kids, slices.Equal[[]int32]) {
			t.Errorf("member %d differs with progress on", i)
		}
	}
}
