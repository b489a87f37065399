package diff

import (
	"fmt"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"
)

func TestLineDiff(t *testing.T) {
	tests := []struct {
		name, old, new, want string
	}{
		{"equal", "a\nb\n", "a\nb\n", ""},
		{"one changed line", "a\nb\nc\n", "a\nB\nc\n", "@@ -1,3 +1,3 @@\n a\n-b\n+B\n c\n"},
		{"from empty", "", "x\ny\n", "@@ -0,0 +1,2 @@\n+x\n+y\n"},
		{"to empty", "x\n", "", "@@ -1,1 +0,0 @@\n-x\n"},
		{
			"two hunks",
			"1\n2\n3\n4\n5\n6\n7\n8\n9\n10\n11\n12\n",
			"1\n2a\n3\n4\n5\n6\n7\n8\n9\n10\n11a\n12\n",
			"@@ -1,5 +1,5 @@\n 1\n-2\n+2a\n 3\n 4\n 5\n@@ -8,5 +8,5 @@\n 8\n 9\n 10\n-11\n+11a\n 12\n",
		},
		{
			"close changes share a hunk",
			"1\n2\n3\n4\n5\n6\n7\n8\n",
			"1\n2a\n3\n4\n5\n6\n7a\n8\n",
			"@@ -1,8 +1,8 @@\n 1\n-2\n+2a\n 3\n 4\n 5\n 6\n-7\n+7a\n 8\n",
		},
	}
	for _, tc := range tests {
		if got := LineDiff(tc.old, tc.new); got != tc.want {
			t.Errorf("%s: LineDiff(%q, %q) =\n%s\nwant\n%s", tc.name, tc.old, tc.new, got, tc.want)
		}
	}
}

// applyUnified applies LineDiff's hunks to old, checking that context and
// removed lines match.
func applyUnified(old, patch string) (string, error) {
	src := splitLines(old)
	var out []string
	next := 0 // next source line (0-based) not yet copied
	lines := splitLines(patch)
	for i := 0; i < len(lines); {
		h := lines[i]
		var os, oc, ns, nc int
		if _, err := fmt.Sscanf(h, "@@ -%d,%d +%d,%d @@", &os, &oc, &ns, &nc); err != nil {
			return "", fmt.Errorf("bad hunk header %q", h)
		}
		start := os - 1
		if oc == 0 {
			start = os
		}
		out = append(out, src[next:start]...)
		next = start
		i++
		for ; i < len(lines) && !strings.HasPrefix(lines[i], "@@"); i++ {
			l := lines[i]
			switch l[0] {
			case ' ', '-':
				if next >= len(src) || src[next] != l[1:] {
					return "", fmt.Errorf("line %d: want %q", next+1, l[1:])
				}
				if l[0] == ' ' {
					out = append(out, l[1:])
				}
				next++
			case '+':
				out = append(out, l[1:])
			}
		}
	}
	out = append(out, src[next:]...)
	if len(out) == 0 {
		return "", nil
	}
	return strings.Join(out, "\n") + "\n", nil
}

func splitLines(s string) []string {
	if s == "" {
		return nil
	}
	return strings.Split(strings.TrimSuffix(s, "\n"), "\n")
}

// Patching the old text with LineDiff's output gives the new text, for
// random line edits.
func TestLineDiffApplies(t *testing.T) {
	rng := rand.New(rand.NewPCG(31, 32))
	for trial := range 300 {
		var a []string
		for i := range rng.IntN(40) {
			a = append(a, "line "+strconv.Itoa(i%7))
		}
		var b []string
		for _, l := range a {
			switch rng.IntN(8) {
			case 0: // drop
			case 1:
				b = append(b, l, "new "+strconv.Itoa(rng.IntN(5)))
			case 2:
				b = append(b, "changed "+l)
			default:
				b = append(b, l)
			}
		}
		old, new := joinLines(a), joinLines(b)
		patch := LineDiff(old, new)
		got, err := applyUnified(old, patch)
		if err != nil || got != new {
			t.Fatalf("trial %d: applying\n%s\nto %q gives %q (%v), want %q", trial, patch, old, got, err, new)
		}
	}
}

func joinLines(ls []string) string {
	if len(ls) == 0 {
		return ""
	}
	return strings.Join(ls, "\n") + "\n"
}
