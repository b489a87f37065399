package review

import (
	"math"
	"testing"

	"github.com/ramify-tax/ramify/solve"
)

func TestVoteEntropyCheckValues(t *testing.T) {
	// Vote entropy in nats of committee votes over the triplet classes;
	// computed by hand from −Σ p ln p, not published values.
	tests := []struct {
		votes []int
		want  float64
		tol   float64
	}{
		{[]int{5, 3, 2}, 1.0297, 5e-5},
		{[]int{4, 3, 3}, 1.0889, 5e-5},
		{[]int{10, 0, 0}, 0, 0},
		{[]int{7, 7, 7}, math.Log(3), 1e-12},    // ln 3 = 1.0986
		{[]int{5, 5, 5, 5}, math.Log(4), 1e-12}, // ln 4 = 1.3863, "star" a fourth class
		{nil, 0, 0},
	}
	for _, tc := range tests {
		if got := VoteEntropy(tc.votes); math.Abs(got-tc.want) > tc.tol {
			t.Errorf("VoteEntropy(%v) = %.6f, want %.4f", tc.votes, got, tc.want)
		}
	}
	// Rounded to four decimals: ln 3 = 1.0986, ln 4 = 1.3863.
	if math.Abs(VoteEntropy([]int{1, 1, 1})-1.0986) > 5e-5 || math.Abs(VoteEntropy([]int{1, 1, 1, 1})-1.3863) > 5e-5 {
		t.Error("even votes over 3 and 4 classes do not give ln 3 and ln 4")
	}
}

func TestMajorityDisagreement(t *testing.T) {
	tests := []struct {
		votes []int
		want  float64
	}{
		{[]int{5, 3, 2}, 0.5},
		{[]int{10, 0, 0, 0}, 0},
		{[]int{1, 1, 1, 1}, 0.75},
		{nil, 0},
	}
	for _, tc := range tests {
		if got := MajorityDisagreement(tc.votes); math.Abs(got-tc.want) > 1e-12 {
			t.Errorf("MajorityDisagreement(%v) = %v, want %v", tc.votes, got, tc.want)
		}
	}
}

// handCommittee is a committee of trees written out, over 5 items.
func handCommittee(t *testing.T, trees ...string) *Committee {
	t.Helper()
	var ts []*solve.Tree
	for _, s := range trees {
		ts = append(ts, tree(t, 5, s))
	}
	c, err := NewCommittee(5, ts)
	if err != nil {
		t.Fatal(err)
	}
	return c
}

func TestVotesAndDisagreementOnHandMadeCommittees(t *testing.T) {
	// Two trees put 0 with 1, one puts 0 with 2, one leaves 0, 1, 2 flat.
	c := handCommittee(t,
		"(((0,1),2),(3,4))",
		"(((0,1),2),(3,4))",
		"(((0,2),1),(3,4))",
		"((0,1,2),(3,4))",
	)
	if got, want := c.Votes(0, 1, 2), [4]int{1, 2, 1, 0}; got != want {
		t.Errorf("votes on 0,1,2 = %v, want %v (star, 01|2, 02|1, 12|0)", got, want)
	}
	// Every tree agrees that 3 and 4 go together apart from 0.
	if got, want := c.Votes(3, 4, 0), [4]int{0, 4, 0, 0}; got != want {
		t.Errorf("votes on 3,4,0 = %v, want %v", got, want)
	}
	// Disagreement averages vote entropy over the one triplet of {0,1,2},
	// and over the C(4,3) = 4 triplets of {0,1,2,3}, of which only {0,1,2}
	// is disputed. Votes 1, 2, 1 of 4 have entropy (3/2) ln 2.
	h012 := 1.5 * math.Ln2
	if got := c.Disagreement([]int32{0, 1, 2}); math.Abs(got-h012) > 1e-12 {
		t.Errorf("Disagreement{0,1,2} = %v, want %v", got, h012)
	}
	if got := c.Disagreement([]int32{0, 1, 2, 3}); math.Abs(got-h012/4) > 1e-12 {
		t.Errorf("Disagreement{0,1,2,3} = %v, want %v", got, h012/4)
	}
	if got := c.Disagreement([]int32{0, 3, 4}); got != 0 {
		t.Errorf("Disagreement{0,3,4} = %v, want 0 (unanimous)", got)
	}
	if got := c.Disagreement([]int32{0, 1}); got != 0 {
		t.Errorf("two items have no triplet, got %v", got)
	}
}

func TestDoubtWeighsContradictionsAndHeight(t *testing.T) {
	current := tree(t, 5, "(((0,1),2),(3,4))")
	// Half the committee moves 2 next to 0 (a contradiction inside the
	// category {0,1,2} of 3 items); the other half agrees.
	c := handCommittee(t, "(((0,1),2),(3,4))", "(((0,2),1),(3,4))")
	// Doubt of {0,1,2}: half the trees disagree, the three meet in a
	// category of 3 of the 5 items: 0.5 × 3/5.
	if got := c.Doubt(current, []int32{0, 1, 2}); math.Abs(got-0.3) > 1e-12 {
		t.Errorf("doubt = %v, want 0.3", got)
	}
	// A member that leaves {0,1,2} flat is only coarser there: no doubt.
	flat := handCommittee(t, "(((0,1),2),(3,4))", "((0,1,2),(3,4))")
	if got := flat.Doubt(current, []int32{0, 1, 2}); got != 0 {
		t.Errorf("doubt from a coarser member = %v, want 0", got)
	}
	// A member that resolves what the tree leaves flat counts in full: an
	// answer would add a triplet the tree lacks.
	coarse := tree(t, 5, "((0,1,2),(3,4))")
	if got := c.Doubt(coarse, []int32{0, 1, 2}); math.Abs(got-0.6) > 1e-12 {
		t.Errorf("doubt where the tree is flat = %v, want 0.6", got)
	}
	if got := c.Doubt(current, []int32{0, 3, 4}); got != 0 {
		t.Errorf("doubt where all agree = %v, want 0", got)
	}
}
