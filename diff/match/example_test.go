package match_test

import (
	"fmt"

	"github.com/ramify-tax/ramify/diff/match"
)

func ExampleClusters() {
	old := [][]int32{{0, 1, 2, 3}, {4, 5}}
	new := [][]int32{{0, 1, 2}, {3, 4, 5}}
	for _, p := range match.Clusters(old, new, 0.5) {
		fmt.Printf("old %d -> new %d (Jaccard %.2f)\n", p.Old, p.New, p.Jaccard)
	}
	// Output:
	// old 0 -> new 0 (Jaccard 0.75)
	// old 1 -> new 1 (Jaccard 0.67)
}
