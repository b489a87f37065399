package graph

import (
	"strings"
	"unicode"

	"golang.org/x/text/unicode/norm"
)

// Tokens splits text into lower-case words for TF-IDF and for naming
// categories: a word is a maximal run of Unicode letters and digits
// (combining marks stay with their letter, so a decomposed accent does not
// split a word); everything else separates words. Words of one character
// and the stopwords below are dropped. Plurals are kept as written; see
// PluralStem.
//
// The text is put in Unicode Normalization Form C first (UAX #15), so
// that one word typed with a precomposed letter ("café", U+00E9) and with
// a letter and a combining mark ("cafe" + U+0301) is one term, not two.
// Text already in NFC, nearly all text, passes through unchanged.
func Tokens(text string) []string {
	text = norm.NFC.String(text)
	var out []string
	var b strings.Builder
	runes := 0
	flush := func() {
		if runes > 1 {
			if w := b.String(); !stopwords[w] {
				out = append(out, w)
			}
		}
		b.Reset()
		runes = 0
	}
	for _, r := range text {
		if unicode.IsLetter(r) || unicode.IsDigit(r) || (runes > 0 && unicode.Is(unicode.Mn, r)) {
			b.WriteRune(unicode.ToLower(r))
			runes++
			continue
		}
		flush()
	}
	flush()
	return out
}

// stopwords are English function words that say nothing about what an item
// is. The list is short on purpose: in item descriptions most other words
// carry meaning, and very common content words are handled by idf.
var stopwords = func() map[string]bool {
	m := map[string]bool{}
	for _, w := range strings.Fields(`
		about above after all also am an and any are as at be been being
		both but by can could did do does each few for from had has have
		he her here hers him his how if in into is it its itself just may
		me might more most must my no nor not of off on once only or other
		our ours out over own same she should so some such than that the
		their theirs them then there these they this those through to too
		under until up upon us very was we were what when where which while
		who whom why will with within without would you your yours`) {
		m[w] = true
	}
	return m
}()
