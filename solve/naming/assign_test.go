package naming

import (
	"strings"
	"testing"

	"github.com/ramify-tax/ramify/format"
)

// outline parses a hand-written outline; in tests categories of a new tree
// carry placeholder names ("_") that Assign overwrites.
func outline(t *testing.T, text string) *format.Category {
	t.Helper()
	o, err := format.ParseOutline("test.outline", []byte(text))
	if err != nil {
		t.Fatalf("ParseOutline: %v", err)
	}
	return o.Root
}

// unnamed builds a tree from nested item lists: a string is an item, a
// []any a category with a blank name.
func unnamed(members ...any) *format.Category {
	c := &format.Category{}
	for _, m := range members {
		switch v := m.(type) {
		case string:
			c.Items = append(c.Items, v)
		case []any:
			c.Children = append(c.Children, unnamed(v...))
		}
	}
	return c
}

// tags is a words function from a table.
func tags(table map[string]string) func(string) []string {
	return func(item string) []string { return strings.Fields(table[item]) }
}

// names prints the tree's category lines, one per line, indented: the
// shape and the names at a glance.
func names(root *format.Category) string {
	var b strings.Builder
	root.Walk(func(c *format.Category, depth int) bool {
		if c != root {
			b.WriteString(strings.Repeat("  ", depth-1) + c.DisplayName() + "\n")
		}
		return true
	})
	return b.String()
}

var toolTags = map[string]string{
	"claw-hammer":      "hammer hand striking",
	"mallet-rubber":    "hammer hand striking rubber",
	"drill-driver-18v": "power drill battery",
	"laser-level":      "measure laser level",
	"spirit-level-60":  "measure level spirit",
	"tape-measure-8m":  "measure tape",
}

// toolShelves is the unnamed tree ((claw-hammer, mallet-rubber),
// drill-driver-18v), ((laser-level, spirit-level-60), tape-measure-8m).
func toolShelves() *format.Category {
	return unnamed(
		[]any{[]any{"claw-hammer", "mallet-rubber"}, "drill-driver-18v"},
		[]any{[]any{"laser-level", "spirit-level-60"}, "tape-measure-8m"},
	)
}

func TestAssignProvisionalNames(t *testing.T) {
	root := toolShelves()
	counts := Assign(root, nil, nil, tags(toolTags))
	// Scores hand-computed from the formula in ProvisionalName,
	// p_C·ln(p_C/p_P):
	// {claw, mallet, drill} in all 6: hammer, hand, striking 2/3·ln 2 =
	// 0.462 each (byte order: hammer, hand); rubber, power, drill, battery
	// 1/3·ln 2 = 0.231.
	// {claw, mallet} in those 3: hammer, hand, striking 1·ln 1.5 = 0.405,
	// rubber 0.5·ln 1.5 = 0.203; hammer and hand are in the parent's name,
	// so a name along the path would repeat them: striking and rubber.
	// {laser, spirit, tape} in all 6: measure 1·ln 2 = 0.693, level
	// 2/3·ln 2 = 0.462.
	// {laser, spirit} in those 3: level 1·ln 1.5 = 0.405 but in the
	// parent's name; laser, spirit 0.5·ln 1.5 = 0.203 (byte order: laser);
	// measure is everywhere and in the parent's name.
	want := "~ hammer · hand\n" +
		"  ~ striking · rubber\n" +
		"~ measure · level\n" +
		"  ~ laser · spirit\n"
	checkAssigned(t, root, want, counts, Counts{Provisional: 4})
}

// A category whose items equal a named group's takes that name,
// confirmed; the group's item order does not matter; a group matching no
// category, and a group whose name is not a valid category name, change
// nothing.
func TestAssignFixedNames(t *testing.T) {
	root := toolShelves()
	fixed := []Fixed{
		{Items: []string{"spirit-level-60", "laser-level"}, Name: "Levels"},
		{Items: []string{"spirit-level-60", "laser-level"}, Name: "Second name for the same group"},
		{Items: []string{"claw-hammer", "drill-driver-18v"}, Name: "Not a category"},
		{Items: []string{"claw-hammer", "mallet-rubber"}, Name: "# comment-like"},
	}
	counts := Assign(root, nil, fixed, tags(toolTags))
	want := "~ hammer · hand\n" +
		"  ~ striking · rubber\n" +
		"~ measure · level\n" +
		"  Levels\n"
	checkAssigned(t, root, want, counts, Counts{Fixed: 1, Provisional: 3})
}

// Names travel with membership: each category of the previous outline
// hands its name (and its provisional mark) to the new category it
// overlaps most, at Jaccard ≥ 0.5 over the items both trees hold. New
// items do not count against the overlap.
func TestAssignCarriesPreviousNames(t *testing.T) {
	prev := outline(t, `Fastening/
  Hammers/
    claw-hammer
    mallet-rubber
  drill-driver-18v
Measuring/
  ~ laser · level/
    laser-level
    spirit-level-60
  tape-measure-8m
`)
	// New version: a new item, sledge-4lb, joins the hammers; over the
	// common items Hammers still matches at 1 and Fastening at 1, while the
	// crossed pairs would score 2/3 each. Measuring and its subcategory
	// are unchanged and keep their names, the provisional mark included.
	root := unnamed(
		[]any{[]any{"claw-hammer", "mallet-rubber", "sledge-4lb"}, "drill-driver-18v"},
		[]any{[]any{"laser-level", "spirit-level-60"}, "tape-measure-8m"},
	)
	counts := Assign(root, prev, nil, tags(toolTags))
	want := "Fastening\n" +
		"  Hammers\n" +
		"Measuring\n" +
		"  ~ laser · level\n"
	checkAssigned(t, root, want, counts, Counts{Carried: 4})
}

// A previous category that overlaps less than half gives no name: the new
// category gets a provisional one. A group name beats a carried name.
func TestAssignCarryThresholdAndPrecedence(t *testing.T) {
	prev := outline(t, `Hand tools/
  claw-hammer
  mallet-rubber
  drill-driver-18v
Measuring/
  laser-level
  spirit-level-60
  tape-measure-8m
`)
	// {claw, laser}: Jaccard 1/4 with Hand tools, 1/4 with Measuring.
	root := unnamed(
		[]any{"claw-hammer", "laser-level"},
		[]any{"mallet-rubber", "drill-driver-18v"},
		[]any{"spirit-level-60", "tape-measure-8m"},
	)
	fixed := []Fixed{{Items: []string{"mallet-rubber", "drill-driver-18v"}, Name: "Workshop"}}
	Assign(root, prev, fixed, tags(toolTags))
	var got []string
	for _, c := range root.Children {
		got = append(got, c.DisplayName())
	}
	// {mallet, drill}: Hand tools at 2/3, but the group's name wins.
	// {spirit, tape}: Measuring at 2/3.
	// {claw, laser}: no name carried, so made from words (hand-computed,
	// p_C·ln(p_C/p_P) over the 6 items): laser 0.5·ln 3 = 0.549; hammer,
	// hand, level, striking 0.5·ln 1.5 = 0.203 (byte order: hammer);
	// measure 0.5·ln 1 = 0.
	want := []string{"~ laser · hammer", "Workshop", "Measuring"}
	if strings.Join(got, "|") != strings.Join(want, "|") {
		t.Errorf("names = %q, want %q", got, want)
	}
}

// Siblings never share a name: the stronger claim keeps it and the others
// get " 2", " 3", skipping numbers a sibling already uses.
func TestAssignMakesSiblingNamesUnique(t *testing.T) {
	words := tags(map[string]string{
		"a1": "red", "a2": "red",
		"b1": "red", "b2": "red",
		"c1": "red", "c2": "red",
		"d1": "blue",
	})
	root := unnamed([]any{"a1", "a2"}, []any{"b1", "b2"}, []any{"c1", "c2"}, []any{"d1"})
	fixed := []Fixed{{Items: []string{"c1", "c2"}, Name: "red"}, {Items: []string{"d1"}, Name: "red 2"}}
	counts := Assign(root, nil, fixed, words)
	var got []string
	for _, c := range root.Children {
		got = append(got, c.DisplayName())
	}
	// The fixed "red" keeps its name; the made-up "red" names of {a} and
	// {b} become "red 3" and "red 4" (in order of their smallest item),
	// since a fixed sibling holds "red 2".
	want := []string{"~ red 3", "~ red 4", "red", "red 2"}
	if strings.Join(got, "|") != strings.Join(want, "|") {
		t.Errorf("names = %q, want %q", got, want)
	}
	if counts.Suffixed != 2 {
		t.Errorf("counts = %+v, want 2 suffixed", counts)
	}
}

// Words that cannot start a category name are skipped; with no usable
// word the smallest member id names the category.
func TestProvisionalNameFallbacks(t *testing.T) {
	words := tags(map[string]string{
		"x1": "#hash ~ \x01ctl", "x2": "#hash",
		"y1": "plain", "y2": "",
	})
	tests := []struct {
		name            string
		members, parent []string
		want            string
	}{
		{"only unusable words", []string{"x2", "x1"}, []string{"x1", "x2", "y1"}, "x1"},
		{"one usable word", []string{"y1", "y2"}, []string{"x1", "x2", "y1", "y2"}, "plain"},
		{"no words anywhere", []string{"y2"}, []string{"y2", "x1"}, "y2"},
		// Every word is everywhere in the parent: no positive score, the
		// most frequent words are used.
		{"nothing distinctive", []string{"y1"}, []string{"y1"}, "plain"},
	}
	for _, tc := range tests {
		got := ProvisionalName(tc.members, tc.parent, words)
		if got != tc.want {
			t.Errorf("%s: ProvisionalName(%q, %q) = %q, want %q", tc.name, tc.members, tc.parent, got, tc.want)
		}
		if msg := format.CheckCategoryName(got); msg != "" {
			t.Errorf("%s: %q: %s", tc.name, got, msg)
		}
	}
}

// The named tree is a valid outline: it prints and parses back to the
// same names, and naming a copy again gives the same result.
func TestAssignRoundTripsAndIsDeterministic(t *testing.T) {
	build := func() *format.Category {
		return unnamed(
			[]any{[]any{"claw-hammer", "mallet-rubber"}, "drill-driver-18v"},
			[]any{[]any{"laser-level", "spirit-level-60"}, "tape-measure-8m"},
			[]any{"x-1", "x-2"}, []any{"x-3", "x-4"}, // no words: named by id
		)
	}
	a, b := build(), build()
	Assign(a, nil, nil, tags(toolTags))
	Assign(b, nil, nil, tags(toolTags))
	ta, tb := string(format.FormatOutline(a)), string(format.FormatOutline(b))
	if ta != tb {
		t.Fatalf("two runs differ:\n%s\n%s", ta, tb)
	}
	o, err := format.ParseOutline("named.outline", []byte(ta))
	if err != nil {
		t.Fatalf("named tree does not parse: %v\n%s", err, ta)
	}
	if got := string(format.FormatOutline(o.Root)); got != ta {
		t.Errorf("round trip changed the outline:\n%s\nwant:\n%s", got, ta)
	}
}

// A name typed in an answered packet replaces a provisional name wherever
// the category it names still exists, and never a confirmed one.
func TestAssignTypedNames(t *testing.T) {
	parse := func(s string) *format.Category {
		o, err := format.ParseOutline("t", []byte(s))
		if err != nil {
			t.Fatal(err)
		}
		return o.Root
	}
	words := func(string) []string { return []string{"pastry", "tart"} }
	tree := parse("Bakery/\n  A/\n    apple-tart\n    lemon-tart\n  croissant\n  eclair\nBread/\n  rye\n  sourdough\n")
	for _, c := range tree.Children {
		c.Name, c.Provisional = "", false
		for _, g := range c.Children {
			g.Name, g.Provisional = "", false
		}
	}
	prev := parse("Bread/\n  rye\n  sourdough\n  spelt\n")
	typed := []Typed{
		// A packet over four items named the tarts; a later one named
		// them again: the later name wins.
		{Items: []string{"apple-tart", "lemon-tart"}, Scope: []string{"apple-tart", "lemon-tart", "croissant", "rye"}, Name: "Tarts"},
		{Items: []string{"apple-tart", "lemon-tart"}, Scope: []string{"apple-tart", "lemon-tart", "eclair"}, Name: "Fruit tarts"},
		// Bread keeps its confirmed name.
		{Items: []string{"rye", "sourdough"}, Scope: []string{"rye", "sourdough", "eclair"}, Name: "Loaves"},
		// A category that no longer exists names nothing.
		{Items: []string{"croissant", "rye"}, Scope: []string{"croissant", "rye", "eclair"}, Name: "Breakfast"},
	}
	counts := AssignTyped(tree, prev, nil, typed, words)
	got := string(format.FormatTree(tree))
	for _, want := range []string{"  Fruit tarts/\n", "Bread/\n"} {
		if !strings.Contains(got, want) {
			t.Errorf("AssignTyped gave\n%s\nwant a line %q", got, want)
		}
	}
	for _, bad := range []string{"Tarts/", "Loaves/", "Breakfast/"} {
		if strings.Contains(got, "\n"+bad) || strings.Contains(got, " "+bad) {
			t.Errorf("AssignTyped gave\n%s\nwith %q", got, bad)
		}
	}
	if counts.Typed != 1 || counts.Carried != 1 {
		t.Errorf("AssignTyped counts = %+v, want Typed 1, Carried 1", counts)
	}
}

// Provisional names repeat no word of the names above them and no
// sibling's name: two sibling categories whose best words are the same
// get different pairs, and a child never reuses its parent's words.
func TestProvisionalNamesDistinctAlongPathsAndSiblings(t *testing.T) {
	// Under the parent every word of a and b scores 0 (all its items hold
	// them), so both children would take the first pair, "hand · saw";
	// the second takes the next, "hand · tooth", instead of a number.
	words := map[string]string{
		"a1": "blade fine hand saw tooth", "a2": "blade fine hand saw tooth",
		"b1": "blade fine hand saw tooth", "b2": "blade fine hand saw tooth",
		"c1": "metal drill", "c2": "metal drill", "c3": "metal file",
	}
	root := unnamed(
		[]any{[]any{"a1", "a2"}, []any{"b1", "b2"}},
		[]any{"c1", "c2", "c3"},
	)
	if counts := Assign(root, nil, nil, tags(words)); counts.Suffixed != 0 {
		t.Errorf("Assign numbered %d names apart:\n%s", counts.Suffixed, names(root))
	}
	var check func(c *format.Category, above map[string]bool)
	check = func(c *format.Category, above map[string]bool) {
		seen := map[string]bool{}
		for _, ch := range c.Children {
			if seen[ch.Name] {
				t.Errorf("siblings share the name %q:\n%s", ch.Name, names(root))
			}
			seen[ch.Name] = true
			mine := map[string]bool{}
			for k := range above {
				mine[k] = true
			}
			for _, w := range strings.Split(ch.Name, Separator) {
				if above[w] {
					t.Errorf("%q repeats %q from a name above it:\n%s", ch.Name, w, names(root))
				}
				mine[w] = true
			}
			check(ch, mine)
		}
	}
	check(root, map[string]bool{})
}

// checkAssigned compares the names Assign gave (as names prints them) and
// its counts with the expected ones.
func checkAssigned(t *testing.T, root *format.Category, want string, counts, wantCounts Counts) {
	t.Helper()
	if got := names(root); got != want {
		t.Errorf("names:\n%s\nwant:\n%s", got, want)
	}
	if counts != wantCounts {
		t.Errorf("counts = %+v, want %+v", counts, wantCounts)
	}
}
