package binding

import (
	"reflect"
	"testing"

	"github.com/ramify-tax/ramify/format"
)

func parse(t *testing.T, text string) *format.Category {
	t.Helper()
	o, err := format.ParseOutline("t.outline", []byte(text))
	if err != nil {
		t.Fatal(err)
	}
	return o.Root
}

func TestForCategories(t *testing.T) {
	root := parse(t, `Hand/
  Hammers/
    claw
    mallet
  Saws/
    tenon
    coping
Power/
  drill
  driver
`)
	cf := &format.ConstraintFile{
		Triplets: []format.Triplet{
			{Pair: [2]string{"claw", "mallet"}, Out: "drill"}, // held by Hammers and Hand
			{Pair: [2]string{"claw", "tenon"}, Out: "mallet"}, // violated: held by none
			{Pair: [2]string{"drill", "driver"}, Out: "claw"}, // held by Power
		},
		Groups: []format.Group{{Items: []string{"tenon", "coping"}, Name: "Saws"}},
	}
	x := New([]*format.ConstraintFile{cf})
	byName := map[string][]int{}
	for c, recs := range x.ForCategories(root) {
		byName[c.Name] = recs
	}
	want := map[string][]int{"Hammers": {0}, "Hand": {0}, "Power": {2}, "Saws": {3}}
	if !reflect.DeepEqual(byName, want) {
		t.Errorf("ForCategories = %v, want %v", byName, want)
	}
	if got := x.ForItem("claw"); !reflect.DeepEqual(got, []int{0, 1, 2}) {
		t.Errorf("ForItem(claw) = %v, want [0 1 2]", got)
	}
	if got := x.Records[0].Role("drill"); got != "kept apart from claw and mallet" {
		t.Errorf("Role(drill) = %q", got)
	}
	if got := x.Records[0].Role("mallet"); got != "joins claw before drill" {
		t.Errorf("Role(mallet) = %q", got)
	}
}

func TestChainsSiblings(t *testing.T) {
	// Siblings must not share a chain's backing array.
	root := parse(t, "A/\n  B/\n    x\n  C/\n    y\n")
	ch := Chains(root)
	if ch["x"][2].Name != "B" || ch["y"][2].Name != "C" {
		t.Errorf("chains: x under %s, y under %s", ch["x"][2].Name, ch["y"][2].Name)
	}
}
