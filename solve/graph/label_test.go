package graph

import (
	"math"
	"slices"
	"testing"
)

func TestHeadWords(t *testing.T) {
	for _, c := range []struct {
		label string
		want  []string
	}{
		{"claw hammer", []string{"hammer"}},
		{"altar, communion table, Lord's table", []string{"altar", "table", "table"}},
		{"Bench; work bench", []string{"bench", "bench"}},
		{"", nil},
		{" , of the, drill", []string{"drill"}}, // stopwords only: no head
	} {
		if got := HeadWords(c.label); !slices.Equal(got, c.want) {
			t.Errorf("HeadWords(%q) = %q, want %q", c.label, got, c.want)
		}
	}
}

func TestCharGrams(t *testing.T) {
	// " saw " has 5 runes: three 3-grams, two 4-grams, one 5-gram.
	want := []string{" sa", "saw", "aw ", " saw", "saw ", " saw "}
	if got := CharGrams("Saw", 3, 5); !slices.Equal(got, want) {
		t.Errorf("CharGrams(%q) = %q, want %q", "Saw", got, want)
	}
	// One-letter words and stopwords are not words, so give nothing.
	if got := CharGrams("a of", 3, 5); len(got) != 0 {
		t.Errorf("CharGrams(%q) = %q, want none", "a of", got)
	}
}

// LabelText's similarity is the weighted mean of the three channel cosines,
// each computed here independently with TFIDF (sublinear tf, textbook idf
// ln(N/df)) on the channel's own documents.
func TestLabelTextMixesChannelCosines(t *testing.T) {
	labels := []string{"claw hammer", "sledge hammer, sledgehammer", "hand saw", "hacksaw", "tape measure", ""}
	texts := []string{
		"drives nails and pulls them",
		"heavy head for breaking stone",
		"cuts wood by hand",
		"cuts metal with a fine blade",
		"measures length",
		"cuts wood and metal",
	}
	mix := TextMix{Heads: 1, Grams: 1, Words: 2}
	g, err := Builder{}.LabelText(labels, texts, mix)
	if err != nil {
		t.Fatal(err)
	}
	checkGraph(t, g)
	n := len(labels)
	heads, grams, words := make([][]string, n), make([][]string, n), make([][]string, n)
	for i := range n {
		for _, w := range HeadWords(labels[i]) {
			heads[i] = append(heads[i], PluralStem(w))
		}
		grams[i] = CharGrams(labels[i], 3, 5)
		for _, w := range Tokens(texts[i]) {
			words[i] = append(words[i], PluralStem(w))
		}
	}
	sub := Weighting{TF: SublinearTF}
	_, hv := TFIDF(heads, sub)
	_, gv := TFIDF(grams, sub)
	_, wv := TFIDF(words, sub)
	for i := range n {
		for j := i + 1; j < n; j++ {
			want := (hv[i].Cosine(hv[j]) + gv[i].Cosine(gv[j]) + 2*wv[i].Cosine(wv[j])) / 4
			if got := g.Weight(i, j); math.Abs(got-want) > 1e-12 {
				t.Errorf("LabelText weight(%d,%d) = %v, want %v", i, j, got, want)
			}
		}
	}
	// The two hammers share their head word and the grams of "hammer";
	// "hacksaw" meets "hand saw" through the grams "saw" and "saw ".
	if g.Weight(0, 1) <= g.Weight(0, 2) {
		t.Errorf("claw hammer is no closer to sledge hammer (%v) than to hand saw (%v)", g.Weight(0, 1), g.Weight(0, 2))
	}
	if g.Weight(2, 3) <= 0 {
		t.Errorf("hand saw and hacksaw are not similar")
	}
}

func TestLabelTextRejectsBadMix(t *testing.T) {
	for _, m := range []TextMix{{}, {Heads: -1, Words: 1}, {Grams: math.NaN()}, {Words: math.Inf(1)}} {
		if _, err := (Builder{}).LabelText([]string{"a"}, []string{"b"}, m); err == nil {
			t.Errorf("LabelText with mix %+v: no error", m)
		}
	}
	if _, err := (Builder{}).LabelText([]string{"a"}, nil, DefaultTextMix); err == nil {
		t.Errorf("LabelText with 1 label and 0 texts: no error")
	}
}
