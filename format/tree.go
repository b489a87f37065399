package format

import (
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"sort"
	"strings"
	"unicode"
)

// Category is a node of a taxonomy: subcategories and the ids of the items
// placed directly in it. The root of a tree is a Category with an empty
// name; every other category has a name.
type Category struct {
	Name string
	// Provisional marks a name ramify made up from the members' tags or
	// words and no editor has confirmed yet (written with a "~ " prefix).
	Provisional bool
	Children    []*Category
	Items       []string
	// Line is the 1-based line of the category in the file it was parsed
	// from; 0 for the root and for trees built in memory.
	Line int
	// ItemLines holds, parallel to Items, the line of each item in the
	// parsed file (nil for trees built in memory).
	ItemLines []int
	// ID is the category's stable concept identifier (see concepts.go),
	// "" when it has none yet.
	ID string
}

// MaxIDLen bounds an item id; longer ids are refused as malformed.
const MaxIDLen = 256

// ValidItemID reports whether id is a well-formed item id: it matches
// [A-Za-z0-9][A-Za-z0-9._:-]* and is at most MaxIDLen bytes. Checked by
// hand rather than by a regular expression because every row of a
// million-item file goes through it.
func ValidItemID(id string) bool {
	if id == "" || len(id) > MaxIDLen || !isAlnum(id[0]) {
		return false
	}
	for i := 1; i < len(id); i++ {
		if c := id[i]; !isAlnum(c) && c != '.' && c != '_' && c != ':' && c != '-' {
			return false
		}
	}
	return true
}

func isAlnum(c byte) bool {
	return c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9'
}

// ItemIDRule says in words what ValidItemID accepts, for error messages.
const ItemIDRule = "an item id starts with a letter or digit and continues with letters, digits, '.', '_', ':' or '-'"

// CheckCategoryName says what is wrong with a category name, or "" if it is
// fine. Names must survive a round trip through the outline format, so they
// cannot be empty, cannot start with '#' (a comment) or "~ " (the
// provisional marker), and cannot hold control characters or surrounding
// spaces.
func CheckCategoryName(name string) string {
	switch {
	case name == "":
		return "category name is empty"
	case strings.TrimSpace(name) != name:
		return "category name has leading or trailing spaces"
	case strings.HasPrefix(name, "#"):
		return "category name cannot start with '#' (that starts a comment)"
	case strings.HasPrefix(name, "~ ") || name == "~":
		return "category name cannot start with \"~ \" (that marks a provisional name)"
	case len(name) > 200:
		return "category name is longer than 200 bytes"
	}
	for _, r := range name {
		if unicode.IsControl(r) {
			return "category name contains a control character"
		}
	}
	if _, r := FirstInvisible(name); r >= 0 {
		return InvisibleMessage("category name", r)
	}
	return ""
}

// FirstInvisible is the byte offset and the character of the first
// invisible or bidirectional formatting character of s (IsInvisible), or
// -1, -1.
func FirstInvisible(s string) (int, rune) {
	for i, r := range s {
		if IsInvisible(r) {
			return i, r
		}
	}
	return -1, -1
}

// InvisibleMessage says that what (an item id, a category name) holds the
// invisible character r: two names that look the same would differ in it.
func InvisibleMessage(what string, r rune) string {
	return fmt.Sprintf("%s contains U+%04X, an invisible or bidirectional formatting character; names that look the same would differ in it, so it is not allowed", what, r)
}

// Sort puts the tree in canonical order, recursively: subcategories by name
// (then by their smallest item, so equal names still order stably), then
// items by id, byte order.
func (c *Category) Sort() {
	c.sortRec(0)
}

func (c *Category) sortRec(depth int) string {
	mins := make(map[*Category]string, len(c.Children))
	minItem := ""
	for _, ch := range c.Children {
		m := ch.sortRec(depth + 1)
		mins[ch] = m
		if minItem == "" || m < minItem {
			minItem = m
		}
	}
	sort.SliceStable(c.Children, func(i, j int) bool {
		a, b := c.Children[i], c.Children[j]
		if a.Name != b.Name {
			return a.Name < b.Name
		}
		return mins[a] < mins[b]
	})
	if c.ItemLines != nil && len(c.ItemLines) == len(c.Items) {
		idx := make([]int, len(c.Items))
		for i := range idx {
			idx[i] = i
		}
		sort.SliceStable(idx, func(i, j int) bool { return c.Items[idx[i]] < c.Items[idx[j]] })
		items := make([]string, len(idx))
		lines := make([]int, len(idx))
		for k, i := range idx {
			items[k], lines[k] = c.Items[i], c.ItemLines[i]
		}
		c.Items, c.ItemLines = items, lines
	} else {
		sort.Strings(c.Items)
	}
	if len(c.Items) > 0 && (minItem == "" || c.Items[0] < minItem) {
		minItem = c.Items[0]
	}
	return minItem
}

// Walk visits c and every category below it depth-first in child order,
// passing each category's depth (c itself has depth 0). Returning false
// from visit skips that category's subtree.
func (c *Category) Walk(visit func(n *Category, depth int) bool) {
	type frame struct {
		n     *Category
		depth int
	}
	stack := []frame{{c, 0}}
	for len(stack) > 0 {
		f := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		if !visit(f.n, f.depth) {
			continue
		}
		for i := len(f.n.Children) - 1; i >= 0; i-- {
			stack = append(stack, frame{f.n.Children[i], f.depth + 1})
		}
	}
}

// AllItems lists every item id below c, in walk order.
func (c *Category) AllItems() []string {
	var ids []string
	c.Walk(func(n *Category, _ int) bool {
		ids = append(ids, n.Items...)
		return true
	})
	return ids
}

// Size is the number of items below c.
func (c *Category) Size() int {
	n := 0
	c.Walk(func(x *Category, _ int) bool {
		n += len(x.Items)
		return true
	})
	return n
}

// CountCategories is the number of categories below c, c excluded.
func (c *Category) CountCategories() int {
	n := -1
	c.Walk(func(*Category, int) bool { n++; return true })
	return n
}

// Depth is the number of category levels below c (0 for a flat list).
func (c *Category) Depth() int {
	d := 0
	c.Walk(func(n *Category, depth int) bool {
		if depth > d {
			d = depth
		}
		return true
	})
	return d
}

// Clone returns a deep copy of c.
func (c *Category) Clone() *Category {
	out := &Category{Name: c.Name, Provisional: c.Provisional, Line: c.Line, ID: c.ID}
	out.Items = append([]string(nil), c.Items...)
	if c.ItemLines != nil {
		out.ItemLines = append([]int(nil), c.ItemLines...)
	}
	for _, ch := range c.Children {
		out.Children = append(out.Children, ch.Clone())
	}
	return out
}

// StructureHash is a 12-hex-digit hash of the tree's shape: which items sit
// together in which nested groups, names excluded. Renaming a category
// keeps the hash; moving an item or a category changes it. It is computed
// bottom-up over sorted child hashes, so line order does not matter.
func StructureHash(root *Category) string {
	sum := shapeHash(root)
	return hex.EncodeToString(sum[:6])
}

func shapeHash(c *Category) [32]byte {
	// Iterative post-order so a deep tree does not need a deep stack.
	type frame struct {
		n    *Category
		next int
		subs [][32]byte
	}
	stack := []*frame{{n: c}}
	var result [32]byte
	for len(stack) > 0 {
		f := stack[len(stack)-1]
		if f.next < len(f.n.Children) {
			stack = append(stack, &frame{n: f.n.Children[f.next]})
			f.next++
			continue
		}
		parts := make([]string, 0, len(f.n.Items)+len(f.subs))
		for _, it := range f.n.Items {
			parts = append(parts, "i"+it)
		}
		for _, s := range f.subs {
			parts = append(parts, "c"+hex.EncodeToString(s[:]))
		}
		sort.Strings(parts)
		h := sha256.Sum256([]byte(strings.Join(parts, "\n")))
		stack = stack[:len(stack)-1]
		if len(stack) == 0 {
			result = h
		} else {
			parent := stack[len(stack)-1]
			parent.subs = append(parent.subs, h)
		}
	}
	return result
}
