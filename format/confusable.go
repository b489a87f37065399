package format

import (
	"fmt"
	"strings"

	"golang.org/x/text/unicode/norm"
)

// lookAlike maps characters to the Latin letters or digits they are
// commonly mistaken for. It is a subset of the confusable mappings of
// Unicode Technical Standard #39 (confusables.txt), written from memory:
// the Cyrillic and Greek capitals and small letters drawn the same as a
// Latin one in common fonts, and the digits and letters that TR39 folds
// together (0 with O; 1, I and l; "rn" stands for m). It is not the whole
// table: a name may still be confused in ways it does not know.
var lookAlike = map[rune]string{
	// Cyrillic capitals
	'А': "A", 'В': "B", 'Е': "E", 'К': "K", 'М': "M", 'Н': "H", 'О': "O", 'Р': "P",
	'С': "C", 'Т': "T", 'Х': "X", 'Ѕ': "S", 'І': "l", 'Ј': "J", 'Ү': "Y", 'Һ': "H",
	'Ԛ': "Q", 'Ԝ': "W", 'Ӏ': "l",
	// Cyrillic small letters
	'а': "a", 'е': "e", 'о': "o", 'р': "p", 'с': "c", 'у': "y", 'х': "x", 'ѕ': "s",
	'і': "i", 'ј': "j", 'һ': "h", 'ԁ': "d", 'ԛ': "q", 'ԝ': "w", 'ӏ': "l", 'ү': "y",
	// Greek capitals
	'Α': "A", 'Β': "B", 'Ε': "E", 'Ζ': "Z", 'Η': "H", 'Ι': "l", 'Κ': "K", 'Μ': "M",
	'Ν': "N", 'Ο': "O", 'Ρ': "P", 'Τ': "T", 'Υ': "Y", 'Χ': "X",
	// Greek small letters
	'ο': "o", 'ν': "v", 'α': "a", 'ι': "i", 'ρ': "p", 'χ': "x", 'ϲ': "c", 'ϳ': "j",
	'υ': "u",
	// Latin and digits folded together
	'0': "O", '1': "l", 'I': "l", '|': "l", 'm': "rn",
}

// Skeleton is the form under which two names that look alike are equal:
// compatibility-normalised (NFKC, so "ﬁ" is "fi" and a full-width letter
// its ordinary one), then with each look-alike character replaced by what
// it is mistaken for (lookAlike). This follows the skeleton of Unicode
// TR39, section 4, with a subset of its table.
func Skeleton(name string) string {
	var b strings.Builder
	for _, r := range norm.NFKC.String(name) {
		if s, ok := lookAlike[r]; ok {
			b.WriteString(s)
		} else {
			b.WriteRune(r)
		}
	}
	return b.String()
}

// ConfusableSiblings warns of sibling categories of the tree whose names
// differ but look alike (equal Skeleton): a reader cannot tell them
// apart, and an editor who types one may mean the other. Each warning is
// at the later sibling's line in file.
func ConfusableSiblings(file string, root *Category) Diags {
	var ds Diags
	root.Walk(func(c *Category, _ int) bool {
		seen := map[string]*Category{}
		for _, ch := range c.Children {
			if ch.Name == "" {
				continue
			}
			key := Skeleton(ch.Name)
			prev, dup := seen[key]
			if !dup {
				seen[key] = ch
				continue
			}
			if prev.Name != ch.Name {
				ds.Add(Pos{File: file, Line: ch.Line, Col: 1}, "category %q looks like its sibling %q (line %d)%s; rename one so that readers can tell them apart",
					ch.Name, prev.Name, prev.Line, lookAlikeNote(ch.Name, prev.Name))
			}
		}
		return true
	})
	return ds
}

// lookAlikeNote names the characters of a and b that are not ASCII, as
// code points, so the reader can see which letters differ.
func lookAlikeNote(a, b string) string {
	var parts []string
	for _, s := range []string{a, b} {
		for _, r := range s {
			if r >= 0x80 {
				parts = append(parts, fmt.Sprintf("%q is U+%04X", string(r), r))
			}
		}
	}
	if len(parts) == 0 {
		return ""
	}
	return ": " + strings.Join(dedupe(parts), ", ")
}

func dedupe(xs []string) []string {
	seen := map[string]bool{}
	out := xs[:0]
	for _, x := range xs {
		if !seen[x] {
			seen[x] = true
			out = append(out, x)
		}
	}
	return out
}
