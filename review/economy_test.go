package review

import (
	"fmt"
	"math/rand/v2"
	"os"
	"strings"
	"testing"

	"github.com/ramify-tax/ramify/diff"
	"github.com/ramify-tax/ramify/solve"
	"github.com/ramify-tax/ramify/solve/graph"
	"github.com/ramify-tax/ramify/solve/planted"
)

// The review economy, a target the project sets itself: a scripted reviewer
// answers packets from a hidden target tree, a seeded planted hierarchy;
// each round's packets are answered, every "fixed" one becomes a shape (the
// target's triplets among the packet's items), and the taxonomy is solved
// again. Counted: packets until the triplet agreement with the target
// reaches economyTarget, committee-chosen packets against uniformly random
// ones. The target is to need at most half as many.
//
// The graph is fuzzyGraph (decay 1.3, 6 draws per item, noise 0.8), on
// which the data-only solve agrees with the target on about 95% of the
// triplets: the planted graph of solve/planted is so clean that the data
// alone reaches 0.99 and there is nothing to review.

const economyTarget = 0.98

type economyRun struct {
	packets []int     // after each round (0 first: the data-only solve)
	agree   []float64 // triplet agreement with the target after each round
	fixed   int       // packets answered "fixed"
}

// reached is the number of packets after which the agreement first reached
// the target, or -1.
func (r economyRun) reached() int {
	for i, a := range r.agree {
		if a >= economyTarget {
			return r.packets[i]
		}
	}
	return -1
}

// answerFromTarget is the scripted reviewer: "ok" when the current tree
// arranges every triplet of the packet as the target does, else "fixed"
// with the target's resolved triplets as the shape.
func answerFromTarget(target, current *leafIndex, q []int32) (fixed bool, shape []solve.Triplet) {
	for i := 0; i < len(q); i++ {
		for j := i + 1; j < len(q); j++ {
			for k := j + 1; k < len(q); k++ {
				a, b, c := q[i], q[j], q[k]
				want := target.topology(a, b, c)
				fixed = fixed || want != current.topology(a, b, c)
				switch want {
				case topoAB:
					shape = append(shape, solve.Triplet{A: a, B: b, C: c})
				case topoAC:
					shape = append(shape, solve.Triplet{A: a, B: c, C: b})
				case topoBC:
					shape = append(shape, solve.Triplet{A: b, B: c, C: a})
				}
			}
		}
	}
	return fixed, shape
}

// runEconomy plays rounds of perRound packets until the target agreement
// or maxPackets. committee chooses the packets with Draw; otherwise they
// are uniform random sets.
func runEconomy(t *testing.T, in *planted.Instance, g *graph.CSR, committee bool, perRound, maxPackets int) economyRun {
	t.Helper()
	target := newLeafIndex(in.Tree)
	cons := &solve.Constraints{}
	res, err := solve.Solve(g, cons, testOptions)
	if err != nil {
		t.Fatal(err)
	}
	cur := res.Taxonomy
	run := economyRun{packets: []int{0}, agree: []float64{diff.TripletAgreement(cur, in.Tree)}}
	rng := rand.New(rand.NewPCG(in.Seed, 0x72616e646f6d)) // "random"
	packets := 0
	for round := 1; run.agree[len(run.agree)-1] < economyTarget && packets < maxPackets; round++ {
		var drafts [][]int32
		if committee {
			c, err := BuildCommittee(g, cons, testOptions, DefaultCommitteeSize, uint64(round))
			if err != nil {
				t.Fatal(err)
			}
			for _, d := range Draw(cur, c, c.Assess(cur), DrawOptions{Count: perRound, Size: 8, Seed: uint64(round)}) {
				drafts = append(drafts, d.Items)
			}
			if len(drafts) == 0 {
				t.Logf("round %d: the committee agrees with the whole tree", round)
				break
			}
		} else {
			for range perRound {
				drafts = append(drafts, UniformSubset(rng, in.N, 8))
			}
		}
		cx := newLeafIndex(cur)
		for _, q := range drafts {
			packets++
			fixed, shape := answerFromTarget(target, cx, q)
			if !fixed {
				continue
			}
			run.fixed++
			for _, tr := range shape {
				tr.Record = len(cons.Triplets)
				cons.Triplets = append(cons.Triplets, tr)
			}
		}
		res, err := solve.Solve(g, cons, testOptions)
		if err != nil {
			t.Fatal(err)
		}
		cur = res.Taxonomy
		run.packets = append(run.packets, packets)
		run.agree = append(run.agree, diff.TripletAgreement(cur, in.Tree))
	}
	return run
}

// TestReviewEconomy prints the curve of agreement after each round for
// n = 500 and n = 2000 and checks the target. It takes a few minutes, so
// it runs only with RAMIFY_BIG=1:
//
//	RAMIFY_BIG=1 go test -run TestReviewEconomy -v -timeout 30m ./review
func TestReviewEconomy(t *testing.T) {
	if os.Getenv("RAMIFY_BIG") != "1" {
		t.Skip("set RAMIFY_BIG=1 to run the review economy (minutes)")
	}
	for _, tc := range []struct{ n, perRound, maxPackets int }{{500, 4, 400}, {2000, 8, 800}} {
		in := planted.Generate(1, tc.n, 3, 3)
		g := fuzzyGraph(in, 6, 1.3, 0.8, 1)
		com := runEconomy(t, in, g, true, tc.perRound, tc.maxPackets)
		rnd := runEconomy(t, in, g, false, tc.perRound, tc.maxPackets)
		fmt.Print(economyTable(tc.n, tc.perRound, com, rnd))
		c, r := com.reached(), rnd.reached()
		switch {
		case c < 0:
			t.Errorf("n=%d: committee-chosen packets did not reach %.2f in %d packets", tc.n, economyTarget, tc.maxPackets)
		case r < 0 && 2*c > tc.maxPackets:
			t.Errorf("n=%d: committee needed %d packets, random did not reach the target in %d", tc.n, c, tc.maxPackets)
		case r >= 0 && 2*c > r:
			t.Errorf("n=%d: committee needed %d packets, random %d: more than half", tc.n, c, r)
		}
	}
}

// economyTable prints both curves side by side, one row per round.
func economyTable(n, perRound int, com, rnd economyRun) string {
	var b strings.Builder
	fmt.Fprintf(&b, "review economy, n = %d, packets of 8, %d per round, target agreement %.2f\n", n, perRound, economyTarget)
	fmt.Fprintf(&b, "%5s  %8s %10s  %8s %10s\n", "round", "packets", "committee", "packets", "random")
	rows := max(len(com.agree), len(rnd.agree))
	cell := func(r economyRun, i int) string {
		if i >= len(r.agree) {
			return fmt.Sprintf("%8s %10s", "", "")
		}
		return fmt.Sprintf("%8d %10.4f", r.packets[i], r.agree[i])
	}
	for i := range rows {
		fmt.Fprintf(&b, "%5d  %s  %s\n", i, cell(com, i), cell(rnd, i))
	}
	reach := func(r economyRun, limit int) string {
		if p := r.reached(); p >= 0 {
			return fmt.Sprint(p)
		}
		return fmt.Sprintf("not within %d", limit)
	}
	limit := rnd.packets[len(rnd.packets)-1]
	fmt.Fprintf(&b, "packets to %.2f: committee %s (%d fixed), random %s (%d fixed)\n\n", economyTarget,
		reach(com, com.packets[len(com.packets)-1]), com.fixed, reach(rnd, limit), rnd.fixed)
	return b.String()
}
