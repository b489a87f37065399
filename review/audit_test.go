package review

import (
	"math/rand/v2"
	"slices"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"
)

func TestUniformSubsetIsASortedSubset(t *testing.T) {
	r := rand.New(rand.NewPCG(7, 8))
	for _, tc := range []struct{ n, k, want int }{{10, 3, 3}, {8, 8, 8}, {5, 9, 5}, {4, 0, 0}, {1000, 12, 12}} {
		s := UniformSubset(r, tc.n, tc.k)
		if len(s) != tc.want || !slices.IsSorted(s) {
			t.Fatalf("UniformSubset(%d, %d) = %v", tc.n, tc.k, s)
		}
		for i, x := range s {
			if x < 0 || int(x) >= tc.n || i > 0 && s[i-1] == x {
				t.Fatalf("UniformSubset(%d, %d) = %v: not distinct items of 0..n-1", tc.n, tc.k, s)
			}
		}
	}
}

// TestUniformSubsetIsUniform draws many 3-subsets of 6 items and compares
// the counts of the C(6,3) = 20 subsets with the uniform distribution by
// Pearson's chi-square test. The critical value is the 0.999 quantile of
// chi-square with 19 degrees of freedom, from gonum, so a correct sampler
// fails this seeded test with probability 1/1000 over seeds; this seed
// passes.
func TestUniformSubsetIsUniform(t *testing.T) {
	const n, k, draws = 6, 3, 40000
	r := rand.New(rand.NewPCG(11, 12))
	counts := map[[3]int32]int{}
	for range draws {
		s := UniformSubset(r, n, k)
		counts[[3]int32{s[0], s[1], s[2]}]++
	}
	if len(counts) != 20 {
		t.Fatalf("saw %d distinct subsets, want all 20", len(counts))
	}
	expected := float64(draws) / 20
	chi2 := 0.0
	for _, c := range counts {
		d := float64(c) - expected
		chi2 += d * d / expected
	}
	crit := distuv.ChiSquared{K: 19}.Quantile(0.999)
	if chi2 > crit {
		t.Errorf("chi-square %.2f exceeds the 0.999 critical value %.2f", chi2, crit)
	}
}

func TestAuditCount(t *testing.T) {
	for _, tc := range []struct {
		count int
		share float64
		want  int
	}{{4, 0.25, 1}, {1, 0.25, 0}, {2, 0.25, 1}, {10, 0, 0}, {3, 1, 3}, {8, 0.5, 4}} {
		if got := AuditCount(tc.count, tc.share); got != tc.want {
			t.Errorf("AuditCount(%d, %v) = %d, want %d", tc.count, tc.share, got, tc.want)
		}
	}
}
