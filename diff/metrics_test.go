package diff

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/ramify-tax/ramify/internal/naivelca"
	"github.com/ramify-tax/ramify/solve/hier"
)

// Small tree pairs whose RF distance (Robinson & Foulds 1981), triplet
// distance (triples that differ; Critchlow, Pearl & Qian 1996) and
// cophenetic correlation of lca sizes were computed by brute force for
// this test, not taken from a publication.
func TestMetricsSmallTrees(t *testing.T) {
	abcd := []string{"a", "b", "c", "d"}
	one8 := []string{"1", "2", "3", "4", "5", "6", "7", "8"}
	one5 := one8[:5]
	tests := []struct {
		name        string
		t1, t2      *hier.Tree
		rf          int
		differ      int64
		triples     int64
		coph        float64
		cophDefined bool
	}{
		{"one swap", mustNewick("(((a,b),c),d);", abcd...), mustNewick("(((a,c),b),d);", abcd...), 2, 1, 4, 0.7, true},
		{"crossed cherries", mustNewick("((a,b),(c,d));", abcd...), mustNewick("((a,c),(b,d));", abcd...), 4, 4, 4, -0.5, true},
		{"against a star", mustNewick("((a,b),(c,d));", abcd...), mustNewick("(a,b,c,d);", abcd...), 2, 4, 4, 0, false},
		{"caterpillar vs balanced", mustNewick("(((((((1,2),3),4),5),6),7),8);", one8...), mustNewick("(((1,2),(3,4)),((5,6),(7,8)));", one8...), 8, 28, 56, 0, false},
		{"reversed caterpillar", mustNewick("((((1,2),3),4),5);", one5...), mustNewick("((((5,4),1),3),2);", one5...), 6, 10, 10, 0, false},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if d, _ := RF(tc.t1, tc.t2); d != tc.rf {
				t.Errorf("RF = %d, want %d", d, tc.rf)
			}
			want := 1 - float64(tc.differ)/float64(tc.triples)
			if got := TripletAgreement(tc.t1, tc.t2); math.Abs(got-want) > 1e-15 {
				t.Errorf("TripletAgreement = %v, want %v = 1 − %d/%d", got, want, tc.differ, tc.triples)
			}
			r, ok := CopheneticCorrelation(tc.t1, tc.t2)
			if tc.name == "against a star" && ok {
				t.Errorf("CopheneticCorrelation = %v, true; want undefined for a star", r)
			}
			if tc.cophDefined && (!ok || math.Abs(r-tc.coph) > 1e-6) {
				t.Errorf("CopheneticCorrelation = %v, %v; want %v", r, ok, tc.coph)
			}
		})
	}
}

// TripletAgreement against the O(n³) definition on 200 random pairs of
// multifurcating trees (some with single-child nodes), n = 3..40; the
// counts are integers, so the shares must be equal to rounding.
func TestTripletAgreementMatchesBruteForce(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for trial := range 200 {
		n := 3 + rng.IntN(38)
		a := randomTree(rng, n, rng.Float64()*0.7, 0.1)
		b := randomTree(rng, n, rng.Float64()*0.7, 0.1)
		if trial%5 == 0 {
			b = a // identical trees must agree fully
		}
		got, want := TripletAgreement(a, b), bruteTripletAgreement(a, b)
		if math.Abs(got-want) > 1e-12 {
			t.Fatalf("trial %d (n=%d): TripletAgreement = %v, brute force %v", trial, n, got, want)
		}
		if b == a && got != 1 {
			t.Fatalf("trial %d: TripletAgreement(t, t) = %v, want 1", trial, got)
		}
	}
}

func TestTripletAgreementSmallN(t *testing.T) {
	for n := 0; n < 3; n++ {
		tr := randomTree(rand.New(rand.NewPCG(3, 4)), max(n, 1), 0, 0)
		if n == 0 {
			tr = hier.NewTree(0)
		}
		if got := TripletAgreement(tr, tr); got != 1 {
			t.Errorf("TripletAgreement on %d leaves = %v, want 1", n, got)
		}
	}
}

// Two independent uniform binary trees agree on a given triplet with
// probability 1/3 (by label symmetry each of the three resolutions is
// equally likely in the second tree); random-merge trees on 60 leaves
// are not uniform over shapes but are label-symmetric, which is all the
// argument needs. The sampled interval must also cover the exact value.
func TestTripletAgreementSampled(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	var sum float64
	const pairs = 20
	for i := range pairs {
		a := randomTree(rng, 60, 0, 0)
		b := randomTree(rng, 60, 0, 0)
		exact := TripletAgreement(a, b)
		sum += exact
		est, lo, hi := TripletAgreementSampled(a, b, 4000, uint64(i))
		if !(lo <= est && est <= hi) || hi-lo > 0.04 {
			t.Errorf("pair %d: sampled %v in [%v, %v]: not an interval around the estimate of width ≤ 0.04", i, est, lo, hi)
		}
		// A 95% interval misses now and then; with a fixed seed this is
		// deterministic, and a miss by more than 0.02 would be a bug.
		if exact < lo-0.02 || exact > hi+0.02 {
			t.Errorf("pair %d: exact %v far outside sampled interval [%v, %v]", i, exact, lo, hi)
		}
	}
	if mean := sum / pairs; math.Abs(mean-1.0/3) > 0.03 {
		t.Errorf("mean agreement of independent random binary trees = %v, want ≈ 1/3", mean)
	}
	// Same seed, same draws.
	a, b := randomTree(rng, 30, 0.3, 0), randomTree(rng, 30, 0.3, 0)
	e1, _, _ := TripletAgreementSampled(a, b, 500, 9)
	e2, _, _ := TripletAgreementSampled(a, b, 500, 9)
	if e1 != e2 {
		t.Errorf("TripletAgreementSampled with one seed gave %v and %v", e1, e2)
	}
	if est, lo, hi := TripletAgreementSampled(a, a, 500, 1); est != 1 || hi != 1 || lo >= 1 {
		t.Errorf("TripletAgreementSampled(t, t) = %v [%v, %v], want 1 [<1, 1]", est, lo, hi)
	}
}

func TestRFMatchesBruteForce(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	for trial := range 200 {
		n := 2 + rng.IntN(50)
		a := randomTree(rng, n, rng.Float64()*0.8, 0.15)
		b := randomTree(rng, n, rng.Float64()*0.8, 0.15)
		d, norm := RF(a, b)
		if want := bruteRF(a, b); d != want {
			t.Fatalf("trial %d: RF = %d, brute force %d", trial, d, want)
		}
		total := len(bruteClusters(a)) + len(bruteClusters(b))
		if total == 0 && norm != 0 || total > 0 && math.Abs(norm-float64(d)/float64(total)) > 1e-15 {
			t.Fatalf("trial %d: normalised RF = %v, want %d/%d", trial, norm, d, total)
		}
		if d2, _ := RF(a, a); d2 != 0 {
			t.Fatalf("trial %d: RF(t, t) = %d", trial, d2)
		}
	}
}

// Two binary trees on n leaves are at most 2(n−2) apart (each has n−2
// non-trivial clusters; Robinson & Foulds 1981), reached by the reversed
// caterpillars of TestMetricsSmallTrees.
func TestRFBinaryMaximum(t *testing.T) {
	one5 := []string{"1", "2", "3", "4", "5"}
	d, norm := RF(mustNewick("((((1,2),3),4),5);", one5...), mustNewick("((((5,4),1),3),2);", one5...))
	if d != 2*(5-2) || norm != 1 {
		t.Errorf("RF of reversed caterpillars = %d (%v), want %d (1)", d, norm, 2*(5-2))
	}
	star := mustNewick("(1,2,3,4,5);", one5...)
	if d, norm := RF(star, star); d != 0 || norm != 0 {
		t.Errorf("RF(star, star) = %d, %v; want 0, 0", d, norm)
	}
}

// CopheneticCorrelation against the float two-pass Pearson on all pairs,
// on shallow trees (telescoped intersections) and on deep binary ones
// (the pair scan), so both paths are checked.
func TestCopheneticMatchesBruteForce(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 10))
	paths := map[bool]int{}
	for trial := range 200 {
		n := 2 + rng.IntN(60)
		collapse := 0.0
		if trial%2 == 0 {
			collapse = 0.6 + 0.3*rng.Float64()
		}
		a := randomTree(rng, n, collapse, 0.05)
		b := randomTree(rng, n, collapse, 0.05)
		x, y := newTreeIndex(a), newTreeIndex(b)
		paths[usesTelescope(x, y)]++
		got, ok := CopheneticCorrelation(a, b)
		want, wantOK := bruteCophenetic(a, b)
		if ok != wantOK || ok && math.Abs(got-want) > 1e-12 {
			t.Fatalf("trial %d (n=%d): CopheneticCorrelation = %v, %v; brute force %v, %v", trial, n, got, ok, want, wantOK)
		}
	}
	if paths[true] < 20 || paths[false] < 20 {
		t.Errorf("paths taken: telescoped %d, pair scan %d; want both exercised", paths[true], paths[false])
	}
}

// usesTelescope repeats crossSum's choice of method.
func usesTelescope(x, y treeIndex) bool {
	work := int64(0)
	seen := map[[2]int32]bool{}
	for c := int32(0); c < int32(x.N); c++ {
		g := [2]int32{x.Parent[c], y.Parent[c]}
		if !seen[g] {
			seen[g] = true
			work += int64(x.Depth[g[0]]) * int64(y.Depth[g[1]])
		}
	}
	return work <= int64(x.N)*int64(x.N)/2
}

func TestMetricsPanicOnMismatchedTrees(t *testing.T) {
	a := mustNewick("((a,b),c);", "a", "b", "c")
	b := mustNewick("((a,b),(c,d));", "a", "b", "c", "d")
	for name, f := range map[string]func(){
		"TripletAgreement":      func() { TripletAgreement(a, b) },
		"RF":                    func() { RF(a, b) },
		"CopheneticCorrelation": func() { CopheneticCorrelation(a, b) },
	} {
		func() {
			defer func() {
				if recover() == nil {
					t.Errorf("%s on trees over 3 and 4 leaves did not panic", name)
				}
			}()
			f()
		}()
	}
}

// TripletScores against the definition in the dev sets' scoring rule (a
// tree resolves {a,b,c} as the pair whose lca is strictly deepest), counted
// over all C(n,3) triples on 200 random pairs of multiway trees.
func TestTripletScoresMatchBruteForce(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	for trial := range 200 {
		n := 3 + rng.IntN(38)
		a := randomTree(rng, n, rng.Float64()*0.8, 0.1)
		b := randomTree(rng, n, rng.Float64()*0.8, 0.1)
		na, nb := naivelca.New(a.Parents()), naivelca.New(b.Parents())
		var same, resA, resB int
		for p := int32(0); p < int32(n); p++ {
			for q := p + 1; q < int32(n); q++ {
				for r := q + 1; r < int32(n); r++ {
					ta, tb := na.Topology(p, q, r), nb.Topology(p, q, r)
					if ta != 0 {
						resA++
					}
					if tb != 0 {
						resB++
					}
					if ta != 0 && ta == tb {
						same++
					}
				}
			}
		}
		wantP, wantR := 1.0, 1.0
		if resA > 0 {
			wantP = float64(same) / float64(resA)
		}
		if resB > 0 {
			wantR = float64(same) / float64(resB)
		}
		gotP, gotR := TripletScores(a, b)
		if math.Abs(gotP-wantP) > 1e-12 || math.Abs(gotR-wantR) > 1e-12 {
			t.Fatalf("trial %d (n=%d): TripletScores = %v, %v; brute force %v, %v", trial, n, gotP, gotR, wantP, wantR)
		}
	}
}

// The sampled scores estimate the exact ones: on random multiway trees of
// 300 leaves, 50,000 triples put each estimate within 0.02 of the exact
// share (a binomial share's standard error is at most 0.5/√resolved,
// about 0.003 here, so 0.02 is over six of them).
func TestTripletScoresSampledNearExact(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	for trial := range 5 {
		a := randomTree(rng, 300, 0.5, 0)
		b := randomTree(rng, 300, 0.3, 0)
		p, r := TripletScores(a, b)
		sp, sr := TripletScoresSampled(a, b, 50000, uint64(trial))
		if math.Abs(p-sp) > 0.02 || math.Abs(r-sr) > 0.02 {
			t.Errorf("trial %d: TripletScoresSampled = %.4f, %.4f; exact %.4f, %.4f", trial, sp, sr, p, r)
		}
	}
}

// Compare's metrics carry the scores with the old tree as reference:
// recall is how much of the old structure the new outline keeps. A new
// outline that flattens everything keeps nothing (recall 0) and claims
// nothing false (precision 1); the converse swaps them.
func TestCompareTripletRecallPrecision(t *testing.T) {
	nested := parseOutline(t, "nested", []byte("# ramify outline 1\na/\n  b/\n    x1\n    x2\n  x3\ny1\ny2\n"))
	flat := parseOutline(t, "flat", []byte("# ramify outline 1\nx1\nx2\nx3\ny1\ny2\n"))
	m := Compare(nested, flat).Metrics
	if m.TripletRecall != 0 || m.TripletPrecision != 1 {
		t.Errorf("Compare(nested, flat): recall %v, precision %v; want 0, 1", m.TripletRecall, m.TripletPrecision)
	}
	m = Compare(flat, nested).Metrics
	if m.TripletRecall != 1 || m.TripletPrecision != 0 {
		t.Errorf("Compare(flat, nested): recall %v, precision %v; want 1, 0", m.TripletRecall, m.TripletPrecision)
	}
	m = Compare(nested, nested).Metrics
	if m.TripletRecall != 1 || m.TripletPrecision != 1 {
		t.Errorf("Compare(nested, nested): recall %v, precision %v; want 1, 1", m.TripletRecall, m.TripletPrecision)
	}
}
