package bounds

import (
	"math"
	"testing"
)

// TestMinCleanAuditsAtReferenceValues checks the derivation against the
// SciPy upper ends of testdata/clopper_pearson_95.csv for 0 failures: a
// gate set just above hi(0, n) is first met at exactly n clean audits.
func TestMinCleanAuditsAtReferenceValues(t *testing.T) {
	for _, row := range readCSV(t, "clopper_pearson_95.csv") {
		x, n, hi := atoi(t, row[0]), atoi(t, row[1]), atof(t, row[3])
		if x != 0 {
			continue
		}
		// The file rounds to 10 significant digits; 1e-9 is above that
		// and far below the gap to hi(0, n−1).
		if got := MinCleanAudits(hi+1e-9, 0.95); got != n {
			t.Errorf("gate %.10f: %d clean audits, want %d (SciPy hi(0,%d) = %.10f)", hi+1e-9, got, n, n, hi)
		}
		if got := MinCleanAudits(hi-1e-9, 0.95); got != n+1 {
			t.Errorf("gate %.10f: %d clean audits, want %d", hi-1e-9, got, n+1)
		}
	}
}

// TestMinCleanAuditsClosedForm compares with ⌈ln(α/2)/ln(1−r)⌉, the
// closed form of the x = 0 upper end (common practice; see
// MoreCleanAudits), over a range of gates.
func TestMinCleanAuditsClosedForm(t *testing.T) {
	for _, r := range []float64{0.5, 0.2, 0.15, 0.10, 0.05, 0.02, 0.01} {
		want := int(math.Ceil(math.Log(0.025) / math.Log(1-r)))
		if got := MinCleanAudits(r, 0.95); got != want {
			t.Errorf("max rate %v: %d, want %d", r, got, want)
		}
	}
	if got := MinCleanAudits(0.10, 0.95); got != 36 {
		t.Errorf("the default gate 0.10 needs %d clean audits, want 36", got)
	}
}

// TestMoreCleanAudits checks the counts after some audits: the answer j
// meets the gate and j−1 does not, the minimum number of audits binds,
// and an unreachable gate says so.
func TestMoreCleanAudits(t *testing.T) {
	for _, c := range []struct{ x, n, min int }{{0, 0, 0}, {0, 20, 20}, {1, 20, 20}, {2, 50, 20}, {5, 100, 20}, {0, 40, 20}, {0, 10, 60}} {
		j := MoreCleanAudits(c.x, c.n, 0.10, 0.95, c.min)
		if j < 0 {
			t.Fatalf("%+v: unreachable", c)
		}
		_, hi := ClopperPearson(c.x, c.n+j, 0.95)
		if hi > 0.10 || c.n+j < c.min {
			t.Errorf("%+v: after %d more, hi %.4f, %d audits", c, j, hi, c.n+j)
		}
		if j > 0 {
			_, before := ClopperPearson(c.x, c.n+j-1, 0.95)
			if before <= 0.10 && c.n+j-1 >= c.min {
				t.Errorf("%+v: %d more would already do (hi %.4f)", c, j-1, before)
			}
		}
	}
	if j := MoreCleanAudits(0, 40, 0.10, 0.95, 20); j != 0 {
		t.Errorf("40 clean audits pass a 0.10 gate; asked for %d more", j)
	}
	if j := MoreCleanAudits(1, 10, 0, 0.95, 1); j != -1 {
		t.Errorf("a zero gate after a rejection is unreachable; got %d", j)
	}
}
