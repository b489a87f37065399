package review

import (
	"strings"
	"testing"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/internal/brackets"
	"github.com/ramify-tax/ramify/solve"
)

// tree parses a bracket notation over leaves 0..n−1, such as
// "((0,1),2,(3,4))", into a solver tree.
func tree(t testing.TB, n int, s string) *solve.Tree {
	t.Helper()
	tr := solve.NewTree(n)
	root, err := brackets.Parse(s, n, func(kids []int32) int32 { return tr.Add(kids...) })
	if err != nil {
		t.Fatal(err)
	}
	tr.Root = root
	return tr
}

// outline parses outline lines (no header) into a category tree.
func outline(t testing.TB, text string) *format.Category {
	t.Helper()
	o, err := format.ParseOutline("test.outline", []byte(strings.TrimLeft(text, "\n")))
	if err != nil {
		t.Fatalf("outline: %v", err)
	}
	return o.Root
}
