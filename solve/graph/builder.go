package graph

import "fmt"

// Search chooses how nearest neighbours are found.
type Search int

const (
	// SearchAuto is exact search up to ExactLimit items and NN-Descent
	// beyond.
	SearchAuto Search = iota
	// SearchExact compares every candidate pair: O(n²·d) for vectors,
	// Σ_t df_t² for tags and text; memory stays O(n·k).
	SearchExact
	// SearchApprox is NN-Descent (Dong, Charikar & Li, WWW 2011) whatever
	// n is; it falls back to exact search when k ≥ n-1 or k = 0.
	SearchApprox
)

const (
	// ExactLimit is the largest n SearchAuto searches exactly. It is a
	// rough estimate, not a published figure, of where exact search stops
	// being comfortable on two cores (10–20k items); the benchmarks
	// measure it.
	ExactLimit = 20000
	// AllPairsLimit is the largest n for which k = 0 (keep every pair with
	// a positive similarity) is allowed: its memory is O(n²).
	AllPairsLimit = 5000
	// DefaultSeed is the NN-Descent seed of the package functions Tags,
	// Text and Vectors.
	DefaultSeed = 0x72616d696679 // "ramify"
)

// Builder holds the settings shared by the graph sources. Its zero value
// keeps all pairs (K = 0) with automatic search and seed 0; the package
// functions Tags, Text and Vectors use DefaultSeed.
type Builder struct {
	// K is the number of nearest neighbours each item keeps before the
	// union symmetrisation (an item can end with more edges than K); 0
	// keeps every pair with a positive similarity (n ≤ AllPairsLimit).
	K      int
	Search Search
	// Seed drives the pseudo-random choices of NN-Descent; the same seed
	// gives the same graph on every run and any GOMAXPROCS.
	Seed uint64
	// TextWeighting is the TF-IDF scheme for Text; the zero value is raw tf
	// × textbook idf ln(N/df).
	TextWeighting Weighting
	// KeepPlurals turns off the light plural stemming in Text.
	KeepPlurals bool
	// FarPartners, for cosine vectors with K > 0, is how many items drawn
	// at random each item is also compared with (see
	// DefaultFarPartners); 0 keeps the neighbours alone.
	FarPartners int
}

// checkK validates k for n items.
func (b Builder) checkK(n int) error {
	if b.K < 0 {
		return fmt.Errorf("neighbors must be >= 0, got %d", b.K)
	}
	if b.K == 0 && n > AllPairsLimit {
		return fmt.Errorf("neighbors = 0 (all pairs) is allowed only up to %d items, got %d", AllPairsLimit, n)
	}
	return nil
}
