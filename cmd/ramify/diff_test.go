package main

import (
	"bufio"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/ramify-tax/ramify/format"
)

const smallOutline = "# ramify outline 1\nHand/\n  claw-hammer\n  mallet\ndrill\n"

// Bad input to ramify diff exits 2 and names the problem with the name
// the user gave; a successful diff exits 0 whether or not anything changed.
func TestDiffExitStatus(t *testing.T) {
	dir := t.TempDir()
	write := func(name, text string) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	good := write("good.outline", smallOutline)
	moved := write("moved.outline", "# ramify outline 1\nHand/\n  claw-hammer\nmallet\ndrill\n")
	tab := write("tab.outline", "# ramify outline 1\nHand/\n\tclaw-hammer\n")
	nul := write("nul.outline", "# ramify outline 1\nHand/\n  claw\x00\n")
	for _, tc := range []struct {
		name   string
		args   []string
		code   int
		stderr string // a part of what stderr must hold
	}{
		{"same", []string{"diff", good, good, "--dir", dir}, 0, ""},
		{"changed", []string{"diff", good, moved, "--dir", dir}, 0, ""},
		{"tab", []string{"diff", good, tab, "--dir", dir}, 2, tab + ":3:1: tab in the indentation"},
		{"NUL byte", []string{"diff", nul, good, "--dir", dir}, 2, nul + ":3:7: NUL byte"},
		{"outside --dir", []string{"diff", good, good}, 2, "lies outside the repository"},
		{"not in git", []string{"diff", good, "HEAD", "--dir", dir}, 2, "HEAD is not a revision: " + dir + " is not in a git repository"},
		{"bad format", []string{"diff", good, good, "--format", "yaml"}, 2, "--format must be"},
		{"no versions", []string{"diff"}, 2, "diff takes one or two versions"},
		{"no outline here", []string{"diff", good, "--dir", dir}, 2, "taxonomy.outline does not exist in " + dir},
	} {
		t.Run(tc.name, func(t *testing.T) {
			code, _, stderr := runIn(tc.args...)
			if code != tc.code || !strings.Contains(stderr, tc.stderr) {
				t.Errorf("ramify %s: exit %d, stderr %q; want exit %d and %q", strings.Join(tc.args, " "), code, stderr, tc.code, tc.stderr)
			}
		})
	}
}

func TestCodeFence(t *testing.T) {
	for _, tc := range []struct{ text, want string }{
		{"plain\n", "```"},
		{" a `b` c\n", "```"},
		{" ```x/\n", "````"},
		{"+ `````\n", "``````"},
	} {
		if got := codeFence(tc.text); got != tc.want {
			t.Errorf("codeFence(%q) = %q, want %q", tc.text, got, tc.want)
		}
	}
}

func TestWriteItemLines(t *testing.T) {
	o, err := format.ParseOutline("t.outline", []byte(smallOutline))
	if err != nil {
		t.Fatal(err)
	}
	var b strings.Builder
	w := bufio.NewWriter(&b)
	writeItemLines(w, o.Root)
	w.Flush()
	want := "# 3 items in 1 category\n" +
		"claw-hammer  Hand\n" +
		"drill        (top level)\n" +
		"mallet       Hand\n"
	if b.String() != want {
		t.Errorf("writeItemLines =\n%s\nwant\n%s", b.String(), want)
	}
}
