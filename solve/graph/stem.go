package graph

import "strings"

// PluralStem maps a common English plural to its singular with a few
// suffix rules ("batteries" → "battery", "boxes" → "box", "benches" →
// "bench", "hammers" → "hammer") and leaves words that only look plural
// ("glass", "cactus", "analysis") alone. It is deliberately light: it never
// cuts a word to something that is not a word stem a reader would
// recognise, at the price of missing irregular plurals. Words shorter than
// four characters are returned unchanged.
func PluralStem(w string) string {
	if len(w) < 4 {
		return w
	}
	switch {
	case strings.HasSuffix(w, "ies") && len(w) > 4:
		return w[:len(w)-3] + "y"
	case strings.HasSuffix(w, "sses"),
		strings.HasSuffix(w, "xes"),
		strings.HasSuffix(w, "ches"),
		strings.HasSuffix(w, "shes"),
		strings.HasSuffix(w, "zzes"):
		return w[:len(w)-2]
	case strings.HasSuffix(w, "ss"),
		strings.HasSuffix(w, "us"),
		strings.HasSuffix(w, "is"):
		return w
	case strings.HasSuffix(w, "s"):
		return w[:len(w)-1]
	}
	return w
}
