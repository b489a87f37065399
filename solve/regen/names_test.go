package regen

import (
	"slices"
	"testing"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
)

// Description words that stand in no item's label ("used", "usually")
// cannot name a category; label words, tags and description words that
// some label holds can. Plurals fold into their singular.
func TestNamingWordsKeepWordsThatName(t *testing.T) {
	p := &repo.Repo{Items: []format.Item{
		{ID: "a", Label: "claw hammer", Tags: []string{"striking"}, Text: "usually used for nails; a kind of mallet"},
		{ID: "b", Label: "rubber mallet", Text: "used on tiles"},
	}, Index: map[string]int{"a": 0, "b": 1}}
	words := namingWords(p)
	if got, want := words("a"), []string{"striking", "claw", "hammer", "mallet"}; !slices.Equal(got, want) {
		t.Errorf("namingWords(a) = %q, want %q", got, want)
	}
	if got, want := words("b"), []string{"rubber", "mallet"}; !slices.Equal(got, want) {
		t.Errorf("namingWords(b) = %q, want %q", got, want)
	}
	// Without labels, every description word may name.
	q := &repo.Repo{Items: []format.Item{{ID: "a", Text: "usually used for nails"}}, Index: map[string]int{"a": 0}}
	if got, want := namingWords(q)("a"), []string{"usually", "used", "nail"}; !slices.Equal(got, want) {
		t.Errorf("namingWords without labels = %q, want %q", got, want)
	}
}
