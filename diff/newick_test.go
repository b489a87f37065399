package diff

import (
	"fmt"
	"strings"

	"github.com/ramify-tax/ramify/solve/hier"
)

// parseNewick is a test-only reader for plain Newick without branch
// lengths: "((a,b),c);". Leaves get ids by their position in labels; an
// internal node may carry a label after ")" that is ignored.
func parseNewick(s string, labels []string) (*hier.Tree, error) {
	id := map[string]int32{}
	for i, l := range labels {
		id[l] = int32(i)
	}
	s = strings.TrimSpace(s)
	s = strings.TrimSuffix(s, ";")
	t := hier.NewTree(len(labels))
	p := &newickParser{src: s, id: id, t: t, seen: map[int32]bool{}}
	root, err := p.node()
	if err != nil {
		return nil, err
	}
	if p.i != len(p.src) {
		return nil, fmt.Errorf("newick: trailing text %q", p.src[p.i:])
	}
	if len(p.seen) != len(labels) {
		return nil, fmt.Errorf("newick: %d of %d leaves", len(p.seen), len(labels))
	}
	t.Root = root
	return t, nil
}

type newickParser struct {
	src  string
	i    int
	id   map[string]int32
	t    *hier.Tree
	seen map[int32]bool
}

func (p *newickParser) label() string {
	j := p.i
	for j < len(p.src) && !strings.ContainsRune("(),:;", rune(p.src[j])) {
		j++
	}
	l := strings.TrimSpace(p.src[p.i:j])
	p.i = j
	if p.i < len(p.src) && p.src[p.i] == ':' { // skip a branch length
		for p.i < len(p.src) && !strings.ContainsRune("(),;", rune(p.src[p.i])) {
			p.i++
		}
	}
	return l
}

func (p *newickParser) node() (int32, error) {
	if p.i < len(p.src) && p.src[p.i] == '(' {
		p.i++
		var kids []int32
		for {
			k, err := p.node()
			if err != nil {
				return 0, err
			}
			kids = append(kids, k)
			if p.i >= len(p.src) {
				return 0, fmt.Errorf("newick: unclosed '('")
			}
			if p.src[p.i] == ',' {
				p.i++
				continue
			}
			if p.src[p.i] == ')' {
				p.i++
				break
			}
			return 0, fmt.Errorf("newick: unexpected %q", p.src[p.i])
		}
		p.label()
		return p.t.Add(kids...), nil
	}
	l := p.label()
	v, ok := p.id[l]
	if !ok {
		return 0, fmt.Errorf("newick: unknown leaf %q", l)
	}
	if p.seen[v] {
		return 0, fmt.Errorf("newick: leaf %q twice", l)
	}
	p.seen[v] = true
	return v, nil
}

// mustNewick parses s over the leaves named by labels and panics on error.
func mustNewick(s string, labels ...string) *hier.Tree {
	t, err := parseNewick(s, labels)
	if err != nil {
		panic(err)
	}
	return t
}
