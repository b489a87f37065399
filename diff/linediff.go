package diff

import (
	"fmt"
	"strings"

	"github.com/sergi/go-diff/diffmatchpatch"
)

// lineContext is the number of unchanged lines shown around a change.
const lineContext = 3

type diffLine struct {
	op   diffmatchpatch.Operation
	text string // without its newline
}

// LineDiff is a line-level view of two outline texts in unified form:
// hunks headed "@@ -a,b +c,d @@" with lines marked " ", "-" or "+" and
// lineContext lines of context. It is "" when the texts are equal. The
// line alignment comes from github.com/sergi/go-diff (Myers' algorithm on
// lines); its time limit is switched off so that the result does not
// depend on the machine's speed.
func LineDiff(oldText, newText string) string {
	if oldText == newText {
		return ""
	}
	dmp := diffmatchpatch.New()
	dmp.DiffTimeout = 0
	a, b, lines := dmp.DiffLinesToChars(oldText, newText)
	diffs := dmp.DiffCharsToLines(dmp.DiffMain(a, b, false), lines)
	var all []diffLine
	for _, d := range diffs {
		text := strings.TrimSuffix(d.Text, "\n")
		for _, l := range strings.Split(text, "\n") {
			all = append(all, diffLine{d.Type, l})
		}
	}
	var out strings.Builder
	// Walk the lines, opening a hunk at the first change and closing it once
	// more than 2·lineContext unchanged lines follow.
	oldLine, newLine := 1, 1
	for i := 0; i < len(all); {
		if all[i].op == diffmatchpatch.DiffEqual {
			oldLine++
			newLine++
			i++
			continue
		}
		start := max(0, i-lineContext)
		oldStart, newStart := oldLine-(i-start), newLine-(i-start)
		end := i
		for j := i; j < len(all); j++ {
			if all[j].op != diffmatchpatch.DiffEqual {
				end = j + 1
				continue
			}
			if j-end >= 2*lineContext {
				break
			}
		}
		stop := min(len(all), end+lineContext)
		var body strings.Builder
		oldCount, newCount := 0, 0
		for _, l := range all[start:stop] {
			switch l.op {
			case diffmatchpatch.DiffEqual:
				body.WriteString(" " + l.text + "\n")
				oldCount++
				newCount++
			case diffmatchpatch.DiffDelete:
				body.WriteString("-" + l.text + "\n")
				oldCount++
			case diffmatchpatch.DiffInsert:
				body.WriteString("+" + l.text + "\n")
				newCount++
			}
		}
		fmt.Fprintf(&out, "@@ -%s +%s @@\n", hunkRange(oldStart, oldCount), hunkRange(newStart, newCount))
		out.WriteString(body.String())
		// Advance the line numbers over what the hunk consumed past i.
		for _, l := range all[i:stop] {
			if l.op != diffmatchpatch.DiffInsert {
				oldLine++
			}
			if l.op != diffmatchpatch.DiffDelete {
				newLine++
			}
		}
		i = stop
	}
	return out.String()
}

// hunkRange is "start,count", with the start of an empty range being the
// line before it, as unified diffs write it.
func hunkRange(start, count int) string {
	if count == 0 {
		start--
	}
	return fmt.Sprintf("%d,%d", start, count)
}
