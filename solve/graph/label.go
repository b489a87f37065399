package graph

import (
	"fmt"
	"math"
	"strings"
)

// TextMix weighs the channels of LabelText. Each channel is a TF-IDF
// cosine of its own; the item similarity is their weighted mean, taken
// before the nearest-neighbour search so that one kNN graph sees all of
// them at once.
type TextMix struct {
	// Heads weighs the head words of the label: the last word of each
	// comma-separated phrase ("hammer" in "claw hammer, framing hammer").
	// In English noun phrases the head comes last and names what kind of
	// thing the item is, which is what a category groups by.
	Heads float64
	// Grams weighs the character 3- to 5-grams of the label's words, which
	// match compounds and word forms that share a stem ("teaspoon" and
	// "spoon", "upholstered" and "upholstery").
	Grams float64
	// Words weighs the words of the description (and, for items without a
	// label, nothing else is there).
	Words float64
}

// DefaultTextMix weighs label heads, label character grams and description
// 1:1:2: chosen on items with a name and a short description (the real
// dev taxonomies of internal/realdata), where it raised triplet recall and F1
// over TF-IDF on label and description together (see cmd/bench/quality).
var DefaultTextMix = TextMix{Heads: 1, Grams: 1, Words: 2}

// Check reports a weight that is negative or not finite, or all zero.
func (m TextMix) Check() error {
	sum := 0.0
	for _, w := range []float64{m.Heads, m.Grams, m.Words} {
		if math.IsNaN(w) || math.IsInf(w, 0) || w < 0 {
			return fmt.Errorf("text channel weights must be finite and >= 0, got %v", w)
		}
		sum += w
	}
	if sum == 0 {
		return fmt.Errorf("text channel weights are all 0")
	}
	return nil
}

// LabelText builds the kNN graph of a label-aware text similarity: for
// each channel of mix (label head words, label character 3–5-grams,
// description words) a TF-IDF cosine with sublinear tf (1 + ln tf) and
// textbook idf ln(N/df) (Salton & Buckley, "Term-weighting approaches in
// automatic text retrieval", Inf. Process. Manage. 24(5), 1988), mixed as
// Σ_c w_c·cos_c / Σ_c w_c before the neighbour search. An item with an
// empty channel (no label, say) is similar through that channel to
// nothing, so its similarities come from the other channels only, scaled
// by their share of the weight. Words are plural-stemmed unless
// b.KeepPlurals. labels and texts must be of the same length.
func (b Builder) LabelText(labels, texts []string, mix TextMix) (*CSR, error) {
	if len(labels) != len(texts) {
		return nil, fmt.Errorf("label text: %d labels but %d texts", len(labels), len(texts))
	}
	if err := mix.Check(); err != nil {
		return nil, err
	}
	return b.sparseGraph(b.labelRows(labels, texts, mix))
}

// labelRows weighs each channel into normalised rows and concatenates
// them, channel c scaled by √(w_c / Σw): the dot product of two
// concatenated rows is then the weighted mean of the channel cosines.
func (b Builder) labelRows(labels, texts []string, mix TextMix) *sparseRows {
	n := len(labels)
	heads := make([][]string, n)
	grams := make([][]string, n)
	words := make([][]string, n)
	for i := range n {
		heads[i] = b.stem(HeadWords(labels[i]))
		grams[i] = CharGrams(labels[i], 3, 5)
		words[i] = b.stem(Tokens(texts[i]))
	}
	tf := Weighting{TF: SublinearTF}
	capDF := commonTermCap(n)
	chans := []struct {
		docs [][]string
		w    float64
	}{{heads, mix.Heads}, {grams, mix.Grams}, {words, mix.Words}}
	total := mix.Heads + mix.Grams + mix.Words
	var parts []*sparseRows
	var scales []float64
	for _, c := range chans {
		if c.w == 0 {
			continue
		}
		_, rows := weighDocs(c.docs, tf, capDF)
		parts = append(parts, rows)
		scales = append(scales, math.Sqrt(c.w/total))
	}
	return concatRows(n, parts, scales)
}

// stem applies PluralStem to every word unless plurals are kept.
func (b Builder) stem(words []string) []string {
	if !b.KeepPlurals {
		for p, w := range words {
			words[p] = PluralStem(w)
		}
	}
	return words
}

// concatRows lays the parts' term spaces side by side (part p's term t
// becomes the sum of the earlier parts' vocabulary sizes plus t, so each
// row stays in increasing term order) and scales part p by scales[p].
func concatRows(n int, parts []*sparseRows, scales []float64) *sparseRows {
	out := &sparseRows{n: n, off: make([]int64, n+1)}
	total := 0
	for _, p := range parts {
		total += len(p.idx)
	}
	out.idx = make([]int32, 0, total)
	out.val = make([]float64, 0, total)
	for i := range n {
		base := int32(0)
		for p, part := range parts {
			idx, val := part.row(i)
			for k, t := range idx {
				out.idx = append(out.idx, base+t)
				out.val = append(out.val, float64(scales[p]*val[k]))
			}
			base += int32(part.nTerms)
		}
		out.off[i+1] = int64(len(out.idx))
	}
	for _, p := range parts {
		out.nTerms += p.nTerms
	}
	return out
}

// HeadWords lists the head word of each comma- or semicolon-separated
// phrase of a label: its last word as Tokens reads it ("hammer" for "claw
// hammer"; "table" for "Lord's table"). Phrases without a word give
// nothing.
func HeadWords(label string) []string {
	var out []string
	for _, phrase := range strings.FieldsFunc(label, func(r rune) bool { return r == ',' || r == ';' }) {
		if toks := Tokens(phrase); len(toks) > 0 {
			out = append(out, toks[len(toks)-1])
		}
	}
	return out
}

// CharGrams lists the character n-grams, lo ≤ n ≤ hi, of each word of the
// label as Tokens reads it (stopwords and one-letter words left out), the
// word padded with a space at either end so that grams at its edges are
// told apart from grams inside it (" spo" starts a word, "spo" does not).
// A padded word shorter than n gives no n-gram.
func CharGrams(label string, lo, hi int) []string {
	var out []string
	for _, w := range Tokens(label) {
		r := []rune(" " + w + " ")
		for n := lo; n <= hi; n++ {
			for s := 0; s+n <= len(r); s++ {
				out = append(out, string(r[s:s+n]))
			}
		}
	}
	return out
}
