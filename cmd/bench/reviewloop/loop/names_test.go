package loop

import (
	"testing"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/review"
)

// TestUniqueSiblingNames: a restricted reference with two sibling
// categories of one name gets an answer the packet parser accepts.
func TestUniqueSiblingNames(t *testing.T) {
	tree := &format.Category{Children: []*format.Category{
		{Name: "house", Items: []string{"a", "b"}},
		{Name: "house", Items: []string{"c", "d"}},
	}}
	tree = review.Restrict(tree, []string{"a", "b", "c", "d"})
	pk := &format.Packet{Reason: format.ReasonAudit, From: "0123456789ab", Drawn: "2027-01-01", Size: 4, Verdict: format.VerdictFixed, Reviewer: "R", Tree: tree}
	if _, err := format.ParsePacket("p.outline", format.FormatPacket(pk)); err != nil {
		t.Fatal(err)
	}
	if tree.Children[1].Name != "house (2)" {
		t.Errorf("renamed to %q", tree.Children[1].Name)
	}
}
