package bounds

import (
	"encoding/csv"
	"math"
	"os"
	"strconv"
	"testing"
)

// readCSV loads a reference table from testdata, skipping its header row.
func readCSV(t *testing.T, name string) [][]string {
	t.Helper()
	f, err := os.Open("testdata/" + name)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatalf("%s: %v", name, err)
	}
	if len(rows) < 2 {
		t.Fatalf("%s: no data rows", name)
	}
	return rows[1:]
}

func atoi(t *testing.T, s string) int {
	t.Helper()
	v, err := strconv.Atoi(s)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

func atof(t *testing.T, s string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

// The files hold SciPy 1.10.1 values, scipy.stats.beta.ppf, rounded to 10
// significant digits (see testdata/README.md); 1e-8 absolute is well inside
// that rounding for every row.
func TestClopperPearsonMatchesSciPy(t *testing.T) {
	for _, row := range readCSV(t, "clopper_pearson_95.csv") {
		x, n := atoi(t, row[0]), atoi(t, row[1])
		wantLo, wantHi := atof(t, row[2]), atof(t, row[3])
		lo, hi := ClopperPearson(x, n, 0.95)
		if math.Abs(lo-wantLo) > 1e-8 || math.Abs(hi-wantHi) > 1e-8 {
			t.Errorf("ClopperPearson(%d, %d, 0.95) = [%.10g, %.10g], want [%.10g, %.10g] (SciPy 1.10.1 beta.ppf)", x, n, lo, hi, wantLo, wantHi)
		}
	}
}

func TestClopperPearsonUpperMatchesSciPy(t *testing.T) {
	for _, row := range readCSV(t, "clopper_pearson_one_sided_upper_95.csv") {
		x, n := atoi(t, row[0]), atoi(t, row[1])
		want := atof(t, row[2])
		if got := ClopperPearsonUpper(x, n, 0.95); math.Abs(got-want) > 1e-8 {
			t.Errorf("ClopperPearsonUpper(%d, %d, 0.95) = %.10g, want %.10g (SciPy 1.10.1 beta.ppf(0.95, x+1, n-x))", x, n, got, want)
		}
	}
}

// Published reference values: R's binom.confint(method="exact") as stored
// in statsmodels' test results (and reproduced independently by bisection
// on the binomial tail to 1e-8). The 8/10 intervals at three levels were
// computed for this test by the same bisection, not taken from a
// publication.
func TestClopperPearsonPublishedValues(t *testing.T) {
	tests := []struct {
		x, n           int
		level          float64
		lo, hi, within float64
	}{
		{18, 20, 0.95, 0.6830172860, 0.9876514728, 1e-9},
		{4, 20, 0.95, 0.0573339971, 0.4366140030, 1e-9},
		{4, 200, 0.95, 0.0054755659, 0.0504136091, 1e-9},
		{190, 200, 0.95, 0.9099724623, 0.9757658345, 1e-9},
		{1, 30, 0.95, 0.0008435709, 0.1721694556, 1e-9},
		{29, 30, 0.95, 0.8278305444, 0.9991564291, 1e-9},
		{0, 30, 0.95, 0, 0.1157033082, 1e-9},
		{30, 30, 0.95, 0.8842966918, 1, 1e-9},
		// 8/10, computed by bisection (see above), six decimals.
		{8, 10, 0.95, 0.443905, 0.974789, 1e-6},
		{8, 10, 0.99, 0.351799, 0.989149, 1e-6},
		{8, 10, 0.90, 0.493099, 0.963229, 1e-6},
	}
	for _, tc := range tests {
		lo, hi := ClopperPearson(tc.x, tc.n, tc.level)
		if math.Abs(lo-tc.lo) > tc.within || math.Abs(hi-tc.hi) > tc.within {
			t.Errorf("ClopperPearson(%d, %d, %v) = [%.10f, %.10f], want [%.10f, %.10f]", tc.x, tc.n, tc.level, lo, hi, tc.lo, tc.hi)
		}
	}
}

// Two-sided 95% intervals, four decimals: computed for this test by
// bisection on the binomial tail, not published values.
func TestClopperPearsonTable(t *testing.T) {
	xs := []int{0, 1, 2, 5}
	table := map[int][4][2]float64{
		6:   {{0, .4593}, {.0042, .6412}, {.0433, .7772}, {.3588, .9958}},
		8:   {{0, .3694}, {.0032, .5265}, {.0319, .6509}, {.2449, .9148}},
		10:  {{0, .3085}, {.0025, .4450}, {.0252, .5561}, {.1871, .8129}},
		20:  {{0, .1684}, {.0013, .2487}, {.0123, .3170}, {.0866, .4910}},
		30:  {{0, .1157}, {.0008, .1722}, {.0082, .2207}, {.0564, .3472}},
		50:  {{0, .0711}, {.0005, .1065}, {.0049, .1371}, {.0333, .2181}},
		100: {{0, .0362}, {.0003, .0545}, {.0024, .0704}, {.0164, .1128}},
	}
	for _, n := range []int{6, 8, 10, 20, 30, 50, 100} {
		for i, x := range xs {
			want := table[n][i]
			lo, hi := ClopperPearson(x, n, 0.95)
			if math.Abs(lo-want[0]) > 5e-5 || math.Abs(hi-want[1]) > 5e-5 {
				t.Errorf("ClopperPearson(%d, %d, 0.95) = [%.4f, %.4f], want [%.4f, %.4f]", x, n, lo, hi, want[0], want[1])
			}
		}
	}
}

// One-sided 95% upper bounds, five decimals: computed by bisection on the
// binomial tail, not published values.
func TestClopperPearsonUpperTable(t *testing.T) {
	want := map[int][3]float64{
		10:  {.25887, .39416, .50690},
		30:  {.09503, .14860, .19533},
		100: {.02951, .04656, .06162},
		300: {.00994, .01571, .02084},
	}
	for _, n := range []int{10, 30, 100, 300} {
		for x := 0; x < 3; x++ {
			if got := ClopperPearsonUpper(x, n, 0.95); math.Abs(got-want[n][x]) > 5e-6 {
				t.Errorf("ClopperPearsonUpper(%d, %d, 0.95) = %.5f, want %.5f", x, n, got, want[n][x])
			}
		}
	}
}

// Rule of three (J. A. Hanley & A. Lippman-Hand, "If nothing goes wrong,
// is everything all right?", JAMA 249(13), 1983): with no failures in n
// trials the one-sided 95% upper bound is close to 3/n, since
// −ln 0.05 = 2.9957; exactly 1 − 0.05^(1/n): 0.09503 vs 0.1 at n = 30 and
// 0.02951 vs 0.03 at n = 100 (computed from the closed form).
func TestRuleOfThree(t *testing.T) {
	tests := []struct {
		n     int
		exact float64
	}{{30, 0.09503}, {100, 0.02951}}
	for _, tc := range tests {
		got := ClopperPearsonUpper(0, tc.n, 0.95)
		if math.Abs(got-tc.exact) > 5e-6 {
			t.Errorf("ClopperPearsonUpper(0, %d, 0.95) = %.5f, want %.5f", tc.n, got, tc.exact)
		}
		if closed := 1 - math.Pow(0.05, 1/float64(tc.n)); math.Abs(got-closed) > 1e-12 {
			t.Errorf("ClopperPearsonUpper(0, %d, 0.95) = %.15f, closed form 1-0.05^(1/n) = %.15f", tc.n, got, closed)
		}
		// Below 3/n, and within 10% of it: the rule is a slightly
		// conservative approximation (−ln 0.05 = 2.9957 < 3).
		three := 3 / float64(tc.n)
		if got >= three || got < 0.9*three {
			t.Errorf("ClopperPearsonUpper(0, %d, 0.95) = %.5f, want just below 3/n = %.5f", tc.n, got, three)
		}
	}
}

// Zero-failure audit sizes ⌈ln 0.05 / ln(1−p₀)⌉ for "rejection rate < p₀"
// at one-sided 95%, from solving 1 − 0.05^(1/n) < p₀ for n (derived here).
// The bound at that size is below p₀ and one packet fewer is not.
func TestZeroFailureAuditSizes(t *testing.T) {
	tests := []struct {
		p0 float64
		n  int
	}{{0.20, 14}, {0.10, 29}, {0.05, 59}, {0.02, 149}, {0.01, 299}}
	for _, tc := range tests {
		if got := ClopperPearsonUpper(0, tc.n, 0.95); got >= tc.p0 {
			t.Errorf("ClopperPearsonUpper(0, %d, 0.95) = %.6f, want < %v", tc.n, got, tc.p0)
		}
		if got := ClopperPearsonUpper(0, tc.n-1, 0.95); got < tc.p0 {
			t.Errorf("ClopperPearsonUpper(0, %d, 0.95) = %.6f, want >= %v", tc.n-1, got, tc.p0)
		}
	}
}

// Properties that hold for every x and n: the interval is ordered, holds
// the observed share, the one-sided bound lies inside the two-sided upper
// end, and the closed forms at the ends hold.
func TestClopperPearsonProperties(t *testing.T) {
	for n := 1; n <= 60; n++ {
		for x := 0; x <= n; x++ {
			lo, hi := ClopperPearson(x, n, 0.95)
			p := float64(x) / float64(n)
			if !(0 <= lo && lo <= p && p <= hi && hi <= 1) {
				t.Fatalf("ClopperPearson(%d, %d, 0.95) = [%v, %v] does not hold %v", x, n, lo, hi, p)
			}
			up := ClopperPearsonUpper(x, n, 0.95)
			if up > hi+1e-12 || up < p {
				t.Fatalf("ClopperPearsonUpper(%d, %d, 0.95) = %v, two-sided upper %v", x, n, up, hi)
			}
			// Symmetry: x failures is n−x successes.
			lo2, hi2 := ClopperPearson(n-x, n, 0.95)
			if math.Abs(lo-(1-hi2)) > 1e-9 || math.Abs(hi-(1-lo2)) > 1e-9 {
				t.Fatalf("ClopperPearson(%d, %d) = [%v, %v] but ClopperPearson(%d, %d) = [%v, %v]", x, n, lo, hi, n-x, n, lo2, hi2)
			}
		}
		_, hi := ClopperPearson(0, n, 0.95)
		if closed := 1 - math.Pow(0.025, 1/float64(n)); math.Abs(hi-closed) > 1e-12 {
			t.Errorf("ClopperPearson(0, %d, 0.95) upper = %v, want 1-0.025^(1/n) = %v", n, hi, closed)
		}
	}
}

func TestClopperPearsonNoTrials(t *testing.T) {
	if lo, hi := ClopperPearson(0, 0, 0.95); lo != 0 || hi != 1 {
		t.Errorf("ClopperPearson(0, 0, 0.95) = [%v, %v], want [0, 1]", lo, hi)
	}
	if up := ClopperPearsonUpper(0, 0, 0.95); up != 1 {
		t.Errorf("ClopperPearsonUpper(0, 0, 0.95) = %v, want 1", up)
	}
}

func TestClopperPearsonPanicsOnBadArguments(t *testing.T) {
	tests := []struct {
		name  string
		x, n  int
		level float64
	}{
		{"negative failures", -1, 10, 0.95},
		{"more failures than trials", 11, 10, 0.95},
		{"level one", 1, 10, 1},
		{"level zero", 1, 10, 0},
		{"level NaN", 1, 10, math.NaN()},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			defer func() {
				if recover() == nil {
					t.Errorf("ClopperPearson(%d, %d, %v) did not panic", tc.x, tc.n, tc.level)
				}
			}()
			ClopperPearson(tc.x, tc.n, tc.level)
		})
	}
}
