package review

import (
	"strconv"
	"strings"
	"testing"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/solve"
)

// tree parses a bracket notation over leaves 0..n−1, such as
// "((0,1),2,(3,4))", into a solver tree.
func tree(t testing.TB, n int, s string) *solve.Tree {
	t.Helper()
	tr := solve.NewTree(n)
	pos := 0
	var parse func() int32
	parse = func() int32 {
		if s[pos] == '(' {
			pos++
			var kids []int32
			for {
				kids = append(kids, parse())
				if s[pos] == ',' {
					pos++
					continue
				}
				if s[pos] != ')' {
					t.Fatalf("tree %q: want ')' at %d", s, pos)
				}
				pos++
				return tr.Add(kids...)
			}
		}
		end := pos
		for end < len(s) && s[end] >= '0' && s[end] <= '9' {
			end++
		}
		v, err := strconv.Atoi(s[pos:end])
		if err != nil || v >= n {
			t.Fatalf("tree %q: bad leaf at %d", s, pos)
		}
		pos = end
		return int32(v)
	}
	tr.Root = parse()
	if pos != len(s) {
		t.Fatalf("tree %q: trailing text at %d", s, pos)
	}
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
