package diff

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/ramify-tax/ramify/internal/brackets"
	"github.com/ramify-tax/ramify/solve/hier"
)

// parseNewick is a test-only reader for plain Newick: "((a,b),c);".
// Leaves get ids by their position in labels; a label after ")" and a
// branch length after ":" are ignored. It writes the tree in the bracket
// notation of internal/brackets, each leaf as its number, and reads that;
// every leaf must stand exactly once.
func parseNewick(s string, labels []string) (*hier.Tree, error) {
	id := map[string]int{}
	for i, l := range labels {
		id[l] = i
	}
	s = strings.TrimSuffix(strings.TrimSpace(s), ";")
	var b strings.Builder
	seen := map[int]bool{}
	for i := 0; i < len(s); {
		if strings.IndexByte("(),", s[i]) >= 0 {
			b.WriteByte(s[i])
			i++
			continue
		}
		j := i + strings.IndexAny(s[i:]+";", "(),;")
		label, _, _ := strings.Cut(s[i:j], ":") // the rest is a branch length
		label = strings.TrimSpace(label)
		afterGroup := i > 0 && s[i-1] == ')'
		i = j
		if afterGroup {
			continue // an internal node's label
		}
		v, ok := id[label]
		if !ok {
			return nil, fmt.Errorf("newick: unknown leaf %q", label)
		}
		if seen[v] {
			return nil, fmt.Errorf("newick: leaf %q twice", label)
		}
		seen[v] = true
		b.WriteString(strconv.Itoa(v))
	}
	if len(seen) != len(labels) {
		return nil, fmt.Errorf("newick: %d of %d leaves", len(seen), len(labels))
	}
	t := hier.NewTree(len(labels))
	root, err := brackets.Parse(b.String(), len(labels), func(kids []int32) int32 { return t.Add(kids...) })
	if err != nil {
		return nil, fmt.Errorf("newick: %v", err)
	}
	t.Root = root
	return t, nil
}

// mustNewick parses s over the leaves named by labels and panics on error.
func mustNewick(s string, labels ...string) *hier.Tree {
	t, err := parseNewick(s, labels)
	if err != nil {
		panic(err)
	}
	return t
}
