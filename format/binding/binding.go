// Package binding says which editorial decisions bind which items and
// categories: the records that name an item, and the records a category
// of the tree carries out. The report and explain commands both show
// them; the solver never needs them (it works on compiled constraints).
package binding

import (
	"fmt"
	"sort"
	"strings"

	"github.com/ramify-tax/ramify/format"
)

// Record is one editorial decision with the items it names.
type Record struct {
	Kind string // "triplet", "group" or "shape"
	Pos  format.Pos
	format.Provenance
	// Inside are the items the record holds together: a triplet's pair, a
	// group's items, a shape's items. Out is a triplet's third item, the
	// one kept apart from the pair; "" for other kinds.
	Inside []string
	Out    string
	// Name is a named group's category name.
	Name string
}

// Items lists every item the record names, Inside then Out.
func (r *Record) Items() []string {
	if r.Out == "" {
		return r.Inside
	}
	return append(append([]string(nil), r.Inside...), r.Out)
}

// Summary says in a few words what the record decides.
func (r *Record) Summary() string {
	switch r.Kind {
	case "triplet":
		return fmt.Sprintf("%s and %s together before %s", r.Inside[0], r.Inside[1], r.Out)
	case "group":
		s := fmt.Sprintf("exactly these %d items form one category", len(r.Inside))
		if r.Name != "" {
			s += fmt.Sprintf(", named %q", r.Name)
		}
		return s
	default:
		return fmt.Sprintf("an approved packet of %d items", len(r.Inside))
	}
}

// Role says what the record asks of one item it names.
func (r *Record) Role(item string) string {
	switch r.Kind {
	case "triplet":
		if item == r.Out {
			return fmt.Sprintf("kept apart from %s and %s", r.Inside[0], r.Inside[1])
		}
		other := r.Inside[0]
		if other == item {
			other = r.Inside[1]
		}
		return fmt.Sprintf("joins %s before %s", other, r.Out)
	case "group":
		if r.Name != "" {
			return fmt.Sprintf("one of the %d items of the group %q", len(r.Inside), r.Name)
		}
		return fmt.Sprintf("one of the %d items of a group", len(r.Inside))
	default:
		return fmt.Sprintf("placed as an approved packet of %d items shows", len(r.Inside))
	}
}

// Index holds every record of a repository and finds them by item and by
// category.
type Index struct {
	Records []Record
	byItem  map[string][]int
}

// New indexes the records of the constraint files, in file order (the
// order the project loads them, sorted by file name).
func New(files []*format.ConstraintFile) *Index {
	x := &Index{byItem: map[string][]int{}}
	for _, f := range files {
		for _, t := range f.Triplets {
			x.add(Record{Kind: "triplet", Pos: t.Pos, Provenance: t.Provenance, Inside: []string{t.Pair[0], t.Pair[1]}, Out: t.Out})
		}
		for _, g := range f.Groups {
			x.add(Record{Kind: "group", Pos: g.Pos, Provenance: g.Provenance, Inside: sortedCopy(g.Items), Name: g.Name})
		}
		for _, s := range f.Shapes {
			x.add(Record{Kind: "shape", Pos: s.Pos, Provenance: s.Provenance, Inside: sortedCopy(s.Tree.AllItems())})
		}
	}
	return x
}

func sortedCopy(s []string) []string {
	out := append([]string(nil), s...)
	sort.Strings(out)
	return out
}

func (x *Index) add(r Record) {
	i := len(x.Records)
	x.Records = append(x.Records, r)
	seen := map[string]bool{}
	for _, id := range r.Items() {
		if !seen[id] {
			seen[id] = true
			x.byItem[id] = append(x.byItem[id], i)
		}
	}
}

// ForItem lists the records that name item, in record order.
func (x *Index) ForItem(item string) []int { return x.byItem[item] }

// ForCategories finds, for every category of the tree under root, the
// records it carries out:
//   - a triplet ab|c is carried by every category that holds a and b but
//     not c (the categories that keep the pair apart from c);
//   - a group or a shape by the smallest category that holds all its
//     items (a group is exactly that category's items when the tree
//     honours it).
//
// Items the tree does not hold are passed over. Lists are in record order.
func (x *Index) ForCategories(root *format.Category) map[*format.Category][]int {
	chain := Chains(root)
	out := map[*format.Category][]int{}
	for i, r := range x.Records {
		switch r.Kind {
		case "triplet":
			a, b, c := chain[r.Inside[0]], chain[r.Inside[1]], chain[r.Out]
			if a == nil || b == nil || c == nil {
				continue
			}
			ab := commonDepth(a, b)
			abc := commonDepth(a, c)
			for d := ab - 1; d >= abc && d > 0; d-- {
				out[a[d]] = append(out[a[d]], i)
			}
		default:
			var common []*format.Category
			for _, id := range r.Inside {
				ch := chain[id]
				if ch == nil {
					continue
				}
				if common == nil {
					common = ch
					continue
				}
				common = common[:commonDepth(common, ch)]
			}
			if len(common) > 1 {
				c := common[len(common)-1]
				out[c] = append(out[c], i)
			}
		}
	}
	return out
}

// Chains maps every item under root to its chain of categories, root
// first, down to the category that holds it.
func Chains(root *format.Category) map[string][]*format.Category {
	out := map[string][]*format.Category{}
	var rec func(c *format.Category, path []*format.Category)
	rec = func(c *format.Category, path []*format.Category) {
		path = append(path, c)
		// A copy per category: siblings reuse path's backing array.
		own := append([]*format.Category(nil), path...)
		for _, it := range c.Items {
			out[it] = own
		}
		for _, ch := range c.Children {
			rec(ch, path)
		}
	}
	rec(root, nil)
	return out
}

// commonDepth is the length of the common prefix of two chains.
func commonDepth(a, b []*format.Category) int {
	d := 0
	for d < len(a) && d < len(b) && a[d] == b[d] {
		d++
	}
	return d
}

// Where is a record's place as people write it: file:line.
func Where(r *Record) string {
	if r.Pos.Line > 0 {
		return fmt.Sprintf("%s:%d", r.Pos.File, r.Pos.Line)
	}
	return r.Pos.File
}

// PathText joins display names as reports show a path.
func PathText(path []string) string {
	if len(path) == 0 {
		return "(top level)"
	}
	return strings.Join(path, " / ")
}
