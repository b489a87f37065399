package explain

import (
	"fmt"
	"sort"
	"strings"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/binding"
)

// Category is why a category holds what it holds.
type Category struct {
	Path        []string `json:"path"`
	Provisional bool     `json:"provisional"`
	Items       int      `json:"items"`
	// Words are its most distinctive tags and words: the share of its
	// items that have each, against the share of the rest of its parent
	// (where a provisional name comes from).
	Words []Word `json:"words"`
	// Cohesion is the mean similarity of two of its items (pairs the
	// graph links count their weight, other pairs 0); Apart the mean
	// similarity between one of its items and one of the rest of its
	// parent.
	Cohesion float64 `json:"cohesion"`
	Apart    float64 `json:"apart"`
	// Nearest is the sibling category it is most similar to (mean
	// similarity of a pair across the two); nil without siblings.
	Nearest *Sibling `json:"nearest_sibling"`
	// Records are the records it carries out (see binding.ForCategories).
	Records []Record `json:"records"`
	// Support is its committee support, nil when not computed.
	Support *float64 `json:"support"`
}

// Word is a distinctive word or tag.
type Word struct {
	Word    string  `json:"word"`
	Inside  float64 `json:"inside"`  // share of the category's items
	Outside float64 `json:"outside"` // share of the rest of the parent's items
}

// Sibling is a neighbouring category.
type Sibling struct {
	Path       []string `json:"path"`
	Similarity float64  `json:"similarity"`
}

// distinctiveWords is how many words a category explanation lists.
const distinctiveWords = 6

// FindCategory finds a category by its path of display names, written
// "A/B/" (or "A / B /"); a single name may be given alone when it is
// unique in the tree.
func FindCategory(root *format.Category, arg string) (*format.Category, []string, error) {
	parts := []string{}
	for _, s := range strings.Split(strings.TrimSuffix(strings.TrimSpace(arg), "/"), "/") {
		parts = append(parts, strings.TrimSpace(s))
	}
	var found []*format.Category
	var foundPaths [][]string
	var rec func(c *format.Category, path []string)
	rec = func(c *format.Category, path []string) {
		for _, ch := range c.Children {
			p := append(append([]string(nil), path...), ch.DisplayName())
			if endsWith(p, parts) && (len(p) == len(parts) || len(parts) == 1) {
				found = append(found, ch)
				foundPaths = append(foundPaths, p)
			}
			rec(ch, p)
		}
	}
	rec(root, nil)
	switch len(found) {
	case 0:
		return nil, nil, fmt.Errorf("no category %s in the taxonomy", arg)
	case 1:
		return found[0], foundPaths[0], nil
	}
	var alts []string
	for _, p := range foundPaths {
		alts = append(alts, strings.Join(p, "/")+"/")
	}
	return nil, nil, fmt.Errorf("%d categories are named %s; give the whole path: %s", len(found), arg, strings.Join(alts, ", "))
}

func endsWith(path, tail []string) bool {
	if len(tail) > len(path) {
		return false
	}
	off := len(path) - len(tail)
	for i := range tail {
		name := path[off+i]
		if tail[i] != name && "~ "+tail[i] != name {
			return false
		}
	}
	return true
}

// ExplainCategory explains category c found at path.
func ExplainCategory(in Input, c *format.Category, path []string) *Category {
	p := in.Project
	out := &Category{Path: path, Provisional: c.Provisional, Items: c.Size(), Words: []Word{}, Records: []Record{}}
	parent := parentOf(p.Outline.Root, c)
	members := indices(in, c.AllItems())
	rest := []int{}
	inC := map[int]bool{}
	for _, i := range members {
		inC[i] = true
	}
	for _, i := range indices(in, parent.AllItems()) {
		if !inC[i] {
			rest = append(rest, i)
		}
	}
	out.Words = distinctive(in, members, rest)
	out.Cohesion = round4(meanBetween(in, members, inC, inC, len(members)*(len(members)-1)))
	restSet := map[int]bool{}
	for _, i := range rest {
		restSet[i] = true
	}
	out.Apart = round4(meanBetween(in, members, inC, restSet, 2*len(members)*len(rest)))
	for _, sib := range parent.Children {
		if sib == c {
			continue
		}
		sm := map[int]bool{}
		for _, i := range indices(in, sib.AllItems()) {
			sm[i] = true
		}
		s := round4(meanBetween(in, members, inC, sm, 2*len(members)*len(sm)))
		if out.Nearest == nil || s > out.Nearest.Similarity {
			sp := append(append([]string(nil), path[:len(path)-1]...), sib.DisplayName())
			out.Nearest = &Sibling{Path: sp, Similarity: s}
		}
	}
	for _, r := range in.Records.ForCategories(p.Outline.Root)[c] {
		rec := &in.Records.Records[r]
		out.Records = append(out.Records, Record{Kind: rec.Kind, Where: binding.Where(rec), By: rec.By, Date: rec.Date, Note: rec.Note, Role: rec.Summary()})
	}
	if in.Support != nil {
		if s, ok := in.Support[c]; ok {
			out.Support = &s
		}
	}
	return out
}

func parentOf(root, c *format.Category) *format.Category {
	var found *format.Category
	root.Walk(func(n *format.Category, _ int) bool {
		for _, ch := range n.Children {
			if ch == c {
				found = n
			}
		}
		return found == nil
	})
	return found
}

func indices(in Input, ids []string) []int {
	out := make([]int, 0, len(ids))
	for _, id := range ids {
		if i, ok := in.Project.Index[id]; ok {
			out = append(out, i)
		}
	}
	sort.Ints(out)
	return out
}

// meanBetween sums the weights of the graph's edges from members (in
// set from) to items of set to, counting each ordered pair, over pairs
// ordered pairs.
func meanBetween(in Input, members []int, from, to map[int]bool, pairs int) float64 {
	if pairs <= 0 {
		return 0
	}
	sum := 0.0
	for _, i := range members {
		ts, ws := in.Graph.Neighbors(i)
		for k, t := range ts {
			if int(t) != i && to[int(t)] {
				if from[int(t)] {
					sum += ws[k] // both ends inside: counted from each end
				} else {
					sum += 2 * ws[k] // once from here, once for the other end
				}
			}
		}
	}
	return sum / float64(pairs)
}

// distinctive ranks words by how much more common they are inside than
// in the rest of the parent.
func distinctive(in Input, members, rest []int) []Word {
	count := func(set []int) map[string]int {
		df := map[string]int{}
		for _, i := range set {
			seen := map[string]bool{}
			for _, w := range words(in.Project.Items[i]) {
				if !seen[w] {
					seen[w] = true
					df[w]++
				}
			}
		}
		return df
	}
	dfIn, dfOut := count(members), count(rest)
	var out []Word
	for w, n := range dfIn {
		if n < 2 && len(members) > 2 {
			continue
		}
		x := Word{Word: w, Inside: round4(float64(n) / float64(len(members)))}
		if len(rest) > 0 {
			x.Outside = round4(float64(dfOut[w]) / float64(len(rest)))
		}
		out = append(out, x)
	}
	sort.Slice(out, func(i, j int) bool {
		di, dj := out[i].Inside-out[i].Outside, out[j].Inside-out[j].Outside
		if di != dj {
			return di > dj
		}
		return out[i].Word < out[j].Word
	})
	return out[:min(distinctiveWords, len(out))]
}
