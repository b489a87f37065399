package graph

import (
	"fmt"
	"testing"
)

func TestSearchPolicy(t *testing.T) {
	// The project's choice: exact search for small n, NN-Descent (Dong,
	// Charikar & Li, WWW 2011) beyond;
	// all pairs and k ≥ n-1 are always exact.
	tests := []struct {
		search Search
		n, k   int
		want   bool
	}{
		{SearchAuto, ExactLimit, 15, false},
		{SearchAuto, ExactLimit + 1, 15, true},
		{SearchAuto, ExactLimit + 1, 0, false},
		{SearchExact, 10 * ExactLimit, 15, false},
		{SearchApprox, 100, 15, true},
		{SearchApprox, 100, 99, false},
		{SearchApprox, 100, 0, false},
	}
	for _, tc := range tests {
		if got := (Builder{Search: tc.search}).approximate(tc.n, tc.k); got != tc.want {
			t.Errorf("search %d, n=%d, k=%d: approximate = %v, want %v", tc.search, tc.n, tc.k, got, tc.want)
		}
	}
}

func TestCommonTermsAreCapped(t *testing.T) {
	// commonTermCap: from 1000 items on, a term on more than half of them
	// is dropped. Items 0-599 carry only "common" (on 600 of 1000 items, idf
	// ln(1000/600) > 0 without the cap), so they end up with no edges; the
	// pairs sharing a rare tag keep theirs. Below 1000 items nothing is
	// dropped.
	for _, tc := range []struct {
		n, holders int
		capped     bool
	}{{1000, 600, true}, {1000, 500, false}, {999, 600, false}} {
		t.Run(fmt.Sprintf("n=%d holders=%d", tc.n, tc.holders), func(t *testing.T) {
			tags := make([][]string, tc.n)
			for i := range tags {
				if i < tc.holders {
					tags[i] = []string{"common"}
				} else {
					tags[i] = []string{fmt.Sprintf("pair%d", i/2)}
				}
			}
			g, err := Tags(tags, 5)
			if err != nil {
				t.Fatal(err)
			}
			checkGraph(t, g)
			if got := g.Weight(0, 1) > 0; got == tc.capped {
				t.Errorf("edge between holders of the common tag: %v, capped %v", got, tc.capped)
			}
			last := tc.n - 1
			if last%2 == 1 && last-1 >= tc.holders && g.Weight(last-1, last) <= 0 {
				t.Errorf("pair %d-%d sharing a rare tag is not joined", last-1, last)
			}
		})
	}
}
