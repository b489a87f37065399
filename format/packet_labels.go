package format

import (
	"strings"
	"unicode"
	"unicode/utf8"
)

// maxCommentRunes bounds the label a packet shows beside an item id; a
// longer one is cut and ends in "…". A packet is read on a screen, and
// the label is only a reminder of what the item is.
const maxCommentRunes = 100

// PacketComment is how label is shown as a trailing comment in a packet:
// every control, format or separator character (a line break, a tab, a
// bidirectional override) becomes a space, runs of spaces become one,
// and the result is trimmed and cut to maxCommentRunes. Labels come from
// the items files, which anyone may edit, so nothing in one can break
// the comment's line or change how the lines around it read. A line that
// ends in "/" is a category line, so trailing slashes are dropped too.
// Applying it twice gives what applying it once gives.
func PacketComment(label string) string {
	var b strings.Builder
	space := false
	n := 0
	for _, r := range label {
		if unicode.IsSpace(r) || unicode.IsControl(r) || unicode.In(r, unicode.Cf, unicode.Zl, unicode.Zp) || r == utf8.RuneError {
			space = b.Len() > 0
			continue
		}
		if space {
			b.WriteByte(' ')
			n++
			space = false
		}
		b.WriteRune(r)
		n++
	}
	s := b.String()
	if n <= maxCommentRunes {
		return strings.TrimRight(s, "/ ")
	}
	runes := []rune(s)[:maxCommentRunes-1]
	return strings.TrimRight(string(runes), " ") + "…"
}

// cutItemComments removes the trailing comment from every item line of a
// packet's tree ("  claw-hammer  # Claw hammer" becomes "  claw-hammer")
// and returns the comments by item id. The lines keep their length up to
// the id, so the tree parser's columns stay those of the file. A line
// that ends in "/" is a category line and is left alone (a category name
// may hold " #", and PacketComment never ends in "/"); so is a comment
// line.
func cutItemComments(lines []string) map[string]string {
	var labels map[string]string
	for i, line := range lines {
		body := strings.TrimLeft(line, " ")
		if strings.HasSuffix(strings.TrimRight(body, " "), "/") {
			continue
		}
		word, rest, ok := strings.Cut(body, " ")
		if !ok || word == "" || strings.HasPrefix(word, "#") {
			continue
		}
		comment, ok := strings.CutPrefix(strings.TrimLeft(rest, " "), "#")
		if !ok {
			continue
		}
		lines[i] = line[:len(line)-len(body)+len(word)]
		if label := PacketComment(comment); label != "" && ValidItemID(word) {
			if labels == nil {
				labels = map[string]string{}
			}
			labels[word] = label
		}
	}
	return labels
}
