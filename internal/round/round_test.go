package round

import (
	"math"
	"testing"
)

func TestSig(t *testing.T) {
	for _, tc := range []struct {
		x    float64
		n    int
		want float64
	}{
		{0, 6, 0},
		{0.8418861169915811, 6, 0.841886},
		{123456.789, 3, 123000},
		{-0.000123456, 2, -0.00012},
		{1.0 / 3, 10, 0.3333333333},
	} {
		if got := Sig(tc.x, tc.n); got != tc.want {
			t.Errorf("Sig(%v, %d) = %v, want %v", tc.x, tc.n, got, tc.want)
		}
	}
	if got := Sig(math.Inf(1), 3); !math.IsInf(got, 1) {
		t.Errorf("Sig(+Inf, 3) = %v, want +Inf", got)
	}
	if got := Sig(math.NaN(), 3); !math.IsNaN(got) {
		t.Errorf("Sig(NaN, 3) = %v, want NaN", got)
	}
}
