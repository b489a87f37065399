// Package brackets reads the bracket notation that tests write small trees
// in: a leaf is one of the numbers 0..n−1, a group is its members between
// parentheses, separated by commas, as in "((0,1),2,(3,4))".
package brackets

import (
	"fmt"
	"strconv"
)

// Parse reads s over the leaves 0..n−1. It calls join once for each group,
// children before parents, with the ids of its members in written order
// (a leaf's id is its number), and returns the id of the root: the node
// join returned for the outermost group, or the leaf when s is a single
// leaf. It fails on a leaf outside 0..n−1, a group that is not closed, or
// text after the tree.
func Parse(s string, n int, join func(kids []int32) int32) (int32, error) {
	p := &parser{s: s, n: n, join: join}
	root, err := p.node()
	if err != nil {
		return 0, err
	}
	if p.pos != len(s) {
		return 0, fmt.Errorf("tree %q: trailing text at %d", s, p.pos)
	}
	return root, nil
}

type parser struct {
	s    string
	pos  int
	n    int
	join func([]int32) int32
}

func (p *parser) node() (int32, error) {
	if p.pos < len(p.s) && p.s[p.pos] == '(' {
		p.pos++
		var kids []int32
		for {
			kid, err := p.node()
			if err != nil {
				return 0, err
			}
			kids = append(kids, kid)
			if p.pos < len(p.s) && p.s[p.pos] == ',' {
				p.pos++
				continue
			}
			if p.pos >= len(p.s) || p.s[p.pos] != ')' {
				return 0, fmt.Errorf("tree %q: want ')' at %d", p.s, p.pos)
			}
			p.pos++
			return p.join(kids), nil
		}
	}
	start := p.pos
	for p.pos < len(p.s) && p.s[p.pos] >= '0' && p.s[p.pos] <= '9' {
		p.pos++
	}
	v, err := strconv.Atoi(p.s[start:p.pos])
	if err != nil || v >= p.n {
		return 0, fmt.Errorf("tree %q: bad leaf at %d", p.s, start)
	}
	return int32(v), nil
}
