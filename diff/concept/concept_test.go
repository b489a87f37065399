package concept

import (
	"strings"
	"testing"

	"github.com/ramify-tax/ramify/format"
)

// v1 is the first version of a small tool-library taxonomy.
const v1 = `Fastening/
  Drivers/
    drill-driver
    hex-key
    impact-driver
    screwdriver
  Hammers/
    claw-hammer
    mallet-rubber
    sledge
  glue-gun
  staple-gun
Measuring/
  laser-level
  spirit-level
  tape-measure
`

func parse(t *testing.T, text string) *format.Category {
	t.Helper()
	o, err := format.ParseOutline("t.outline", []byte(text))
	if err != nil {
		t.Fatalf("ParseOutline: %v\n%s", err, text)
	}
	return o.Root
}

// idOf is the identifier of the smallest category holding item.
func idOf(t *testing.T, root *format.Category, item string) string {
	t.Helper()
	id := ""
	var rec func(c *format.Category) bool
	rec = func(c *format.Category) bool {
		for _, ch := range c.Children {
			if rec(ch) {
				if id == "" {
					id = ch.ID
				}
				return true
			}
		}
		for _, it := range c.Items {
			if it == item {
				return true
			}
		}
		return false
	}
	if !rec(root) {
		t.Fatalf("no item %s", item)
	}
	return id
}

// released gives a first version its identifiers and writes it as solve
// would; regenerate is a fresh tree of the given text (no identifiers,
// as the solver builds it) carried from the previous outline file.
func released(t *testing.T) (*format.Category, string) {
	t.Helper()
	root := parse(t, v1)
	if c := Carry(root); c.New != 4 || c.Carried != 0 {
		t.Fatalf("Carry on a first version = %+v, want 4 new", c)
	}
	return root, string(format.FormatOutline(root))
}

func regenerate(t *testing.T, text string, prevFile string) *format.Category {
	t.Helper()
	root := parse(t, text)
	Carry(root, parse(t, prevFile))
	return root
}

func TestIDsAreContentDerived(t *testing.T) {
	a, _ := released(t)
	b, _ := released(t)
	if idOf(t, a, "sledge") != idOf(t, b, "sledge") || idOf(t, a, "sledge") == "" {
		t.Error("the same first version gives different identifiers")
	}
	if !format.ValidConceptID(idOf(t, a, "sledge")) {
		t.Errorf("identifier %q is not of the written form", idOf(t, a, "sledge"))
	}
	seen := map[string]bool{}
	a.Walk(func(c *format.Category, d int) bool {
		if d > 0 && seen[c.ID] {
			t.Errorf("identifier %s given twice", c.ID)
		}
		seen[c.ID] = true
		return true
	})
}

func TestRenameKeepsIDs(t *testing.T) {
	old, file := released(t)
	// An editor renames Hammers by hand; the file is read back, then solved.
	edited := strings.Replace(file, "  Hammers/", "  Striking tools/", 1)
	back := parse(t, edited)
	if got, want := idOf(t, back, "sledge"), idOf(t, old, "sledge"); got != want {
		t.Fatalf("after the hand rename the file binds %s to the category, want %s", got, want)
	}
	renamed := strings.Replace(v1, "  Hammers/", "  Striking tools/", 1)
	cur := regenerate(t, renamed, edited)
	for _, item := range []string{"sledge", "drill-driver", "tape-measure"} {
		if got, want := idOf(t, cur, item), idOf(t, old, item); got != want {
			t.Errorf("category of %s: identifier %s after the rename, want %s", item, got, want)
		}
	}
	if ch := Compare(old, cur); len(ch.Retired) != 0 || len(ch.Added) != 0 {
		t.Errorf("a rename retires or adds concepts: %+v", ch)
	}
}

func TestMoveKeepsIDs(t *testing.T) {
	old, file := released(t)
	// Hammers moves under Measuring (the whole category, re-indented),
	// and the sledge moves from Hammers to Drivers: members change, the
	// paths of Drivers stays.
	moved := `Fastening/
  Drivers/
    drill-driver
    hex-key
    impact-driver
    screwdriver
    sledge
  glue-gun
  staple-gun
Measuring/
  Hammers/
    claw-hammer
    mallet-rubber
  laser-level
  spirit-level
  tape-measure
`
	edited := moved + file[strings.Index(file, "# concepts"):]
	back := parse(t, edited)
	for _, item := range []string{"claw-hammer", "drill-driver", "sledge", "tape-measure"} {
		if idOf(t, back, item) == "" {
			t.Errorf("the hand-edited file lost the identifier of %s's category", item)
		}
	}
	cur := regenerate(t, moved, edited)
	if got, want := idOf(t, cur, "claw-hammer"), idOf(t, old, "claw-hammer"); got != want {
		t.Errorf("moved Hammers: identifier %s, want %s", got, want)
	}
	if got, want := idOf(t, cur, "sledge"), idOf(t, old, "drill-driver"); got != want {
		t.Errorf("Drivers after gaining the sledge: identifier %s, want %s", got, want)
	}
	if ch := Compare(old, cur); len(ch.Retired) != 0 {
		t.Errorf("a move retires concepts: %+v", ch.Retired)
	}
}

func TestSplitKeepsOneIDAndNamesTheParts(t *testing.T) {
	old, file := released(t)
	split := strings.Replace(v1, `  Drivers/
    drill-driver
    hex-key
    impact-driver
    screwdriver
`, `  Hand drivers/
    hex-key
    screwdriver
  Powered drivers/
    drill-driver
    impact-driver
`, 1)
	cur := regenerate(t, split, file)
	drivers := idOf(t, old, "drill-driver")
	hand, powered := idOf(t, cur, "hex-key"), idOf(t, cur, "drill-driver")
	// Each part holds half the old category (Jaccard 1/2, at the carrying
	// threshold): one part keeps the identifier, the other gets a new one.
	if (hand == drivers) == (powered == drivers) {
		t.Fatalf("split parts %s and %s: exactly one should keep %s", hand, powered, drivers)
	}
	ch := Compare(old, cur)
	if len(ch.Split) != 1 || ch.Split[0].ID != drivers || strings.Join(ch.Split[0].Into, ",") != strings.Join(sorted(hand, powered), ",") {
		t.Errorf("Compare split = %+v, want %s into %s and %s", ch.Split, drivers, hand, powered)
	}
	if len(ch.Retired) != 0 || len(ch.Added) != 1 {
		t.Errorf("split: retired %+v, added %v; want none retired, one added", ch.Retired, ch.Added)
	}
}

func TestThreeWaySplitRetiresWithSuccessors(t *testing.T) {
	old, file := released(t)
	split := strings.Replace(v1, `  Drivers/
    drill-driver
    hex-key
    impact-driver
    screwdriver
`, `  Drills/
    drill-driver
  Keys/
    hex-key
  Power/
    impact-driver
    screwdriver
`, 1)
	cur := regenerate(t, split, file)
	// Hold each part's member count at the threshold: Power has 2 of 4
	// (Jaccard 1/2) and keeps the identifier; a part of 1 of 4 would not.
	ch := Compare(old, cur)
	drivers := idOf(t, old, "drill-driver")
	if idOf(t, cur, "impact-driver") != drivers {
		t.Fatalf("the half-sized part should keep %s, has %s", drivers, idOf(t, cur, "impact-driver"))
	}
	if len(ch.Retired) != 0 {
		t.Errorf("retired %+v, want none", ch.Retired)
	}
}

func TestMergeRetiresTheSmallerWithItsSuccessor(t *testing.T) {
	old, file := released(t)
	merged := `Fastening/
  Hand and power tools/
    claw-hammer
    drill-driver
    hex-key
    impact-driver
    mallet-rubber
    screwdriver
    sledge
  glue-gun
  staple-gun
Measuring/
  laser-level
  spirit-level
  tape-measure
`
	cur := regenerate(t, merged, file)
	drivers, hammers := idOf(t, old, "drill-driver"), idOf(t, old, "sledge")
	into := idOf(t, cur, "sledge")
	// Drivers holds 4 of the 7 members (Jaccard 4/7 ≥ 1/2) and keeps its
	// identifier; Hammers (3/7) is retired, taken over by the merge.
	if into != drivers {
		t.Fatalf("merged category has %s, want Drivers' %s", into, drivers)
	}
	ch := Compare(old, cur)
	want := Retired{ID: hammers, Name: "Fastening > Hammers", Successors: []string{drivers}}
	if len(ch.Retired) != 1 || ch.Retired[0].ID != want.ID || ch.Retired[0].Name != want.Name || strings.Join(ch.Retired[0].Successors, ",") != drivers {
		t.Errorf("Compare retired = %+v, want [%+v]", ch.Retired, want)
	}
	if len(ch.Merged) != 1 || ch.Merged[0].ID != drivers || strings.Join(ch.Merged[0].From, ",") != strings.Join(sorted(drivers, hammers), ",") {
		t.Errorf("Compare merged = %+v", ch.Merged)
	}
}

func TestBranchMergeKeepsBothSidesIDs(t *testing.T) {
	_, file := released(t)
	// Each branch makes a new category; the merged tree has both.
	ours := strings.Replace(v1, "  laser-level\n  spirit-level\n", "  Levels/\n    laser-level\n    spirit-level\n", 1)
	theirs := strings.Replace(v1, "    claw-hammer\n    mallet-rubber\n    sledge\n", "    Heavy/\n      sledge\n    claw-hammer\n    mallet-rubber\n", 1)
	oursRoot := regenerate(t, ours, file)
	theirsRoot := regenerate(t, theirs, file)
	both := strings.Replace(ours, "    claw-hammer\n    mallet-rubber\n    sledge\n", "    Heavy/\n      sledge\n    claw-hammer\n    mallet-rubber\n", 1)
	merged := parse(t, both)
	Carry(merged, parse(t, string(format.FormatOutline(oursRoot))), parse(t, string(format.FormatOutline(theirsRoot))))
	if got, want := idOf(t, merged, "laser-level"), idOf(t, oursRoot, "laser-level"); got != want {
		t.Errorf("Levels (ours): %s, want %s", got, want)
	}
	if got, want := idOf(t, merged, "sledge"), idOf(t, theirsRoot, "sledge"); got != want {
		t.Errorf("Heavy (theirs): %s, want %s", got, want)
	}
}

func TestHandEditCannotDropALineUnnoticed(t *testing.T) {
	_, file := released(t)
	lines := strings.Split(file, "\n")
	var kept []string
	dropped := false
	for _, l := range lines {
		if strings.HasPrefix(l, "# concept ") && !dropped {
			dropped = true
			continue
		}
		kept = append(kept, l)
	}
	_, err := format.ParseOutline("t.outline", []byte(strings.Join(kept, "\n")))
	if err == nil || !strings.Contains(err.Error(), "counts 4 identifiers but holds 3 lines") {
		t.Errorf("a deleted concept line: ParseOutline = %v, want the count error", err)
	}
}

func sorted(a, b string) []string {
	if a > b {
		return []string{b, a}
	}
	return []string{a, b}
}
