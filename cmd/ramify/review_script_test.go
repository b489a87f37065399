package main

import (
	"os"
	"path/filepath"
	"sort"
	"strings"

	"github.com/rogpeppe/go-internal/testscript"
)

// cmdHand edits review packets and outlines in scripts the way a person
// would with a text editor:
//
//	hand verdict VERDICT REVIEWER FILE...   set the verdict and the reviewer
//	                                        ("-" keeps it, "none" clears it); with
//	                                        "fixed", also move one item line;
//	                                        "fixed-as-drawn" writes "fixed"
//	                                        and moves nothing; "fixed-pair"
//	                                        writes "fixed" and groups the
//	                                        first two top-level items in a
//	                                        new category
//	hand move FILE ITEM NEIGHBOUR           move ITEM's line next to
//	                                        NEIGHBOUR's, into its category
//
// FILE may be a glob. The packet's item names are never known in advance
// (the packets depend on the solver), so the rearrangement is a fixed
// rule: the first top-level item goes into the first top-level category,
// or, when there is none, the first item of the first category goes to the
// top level, or, when there is no category at all, the first two items
// go into a new one.
func cmdHand(ts *testscript.TestScript, neg bool, args []string) {
	if neg || len(args) < 1 {
		ts.Fatalf("usage: hand verdict VERDICT REVIEWER FILE... (VERDICT fixed, fixed-flat, fixed-as-drawn or as written) | hand move FILE ITEM NEIGHBOUR")
	}
	switch args[0] {
	case "verdict":
		if len(args) < 4 {
			ts.Fatalf("usage: hand verdict VERDICT REVIEWER FILE...")
		}
		var files []string
		for _, pat := range args[3:] {
			m, err := filepath.Glob(ts.MkAbs(pat))
			ts.Check(err)
			if len(m) == 0 {
				ts.Fatalf("no file matches %s", pat)
			}
			files = append(files, m...)
		}
		sort.Strings(files)
		for _, f := range files {
			data, err := os.ReadFile(f)
			ts.Check(err)
			ts.Check(os.WriteFile(f, []byte(answerPacket(string(data), args[1], args[2])), 0o644))
		}
	case "move":
		if len(args) != 4 {
			ts.Fatalf("usage: hand move FILE ITEM NEIGHBOUR")
		}
		f := ts.MkAbs(args[1])
		data, err := os.ReadFile(f)
		ts.Check(err)
		out, ok := moveLine(string(data), args[2], args[3])
		if !ok {
			ts.Fatalf("%s: no line %q or %q", args[1], args[2], args[3])
		}
		ts.Check(os.WriteFile(f, []byte(out), 0o644))
	default:
		ts.Fatalf("hand: unknown edit %q", args[0])
	}
}

func answerPacket(text, verdict, reviewer string) string {
	rearrange := verdict == "fixed"
	flatten := verdict == "fixed-flat"
	pair := verdict == "fixed-pair"
	if verdict == "fixed-as-drawn" || flatten || pair {
		verdict = "fixed"
	}
	lines := strings.Split(text, "\n")
	treeStart := -1
	for i, l := range lines {
		switch {
		case strings.HasPrefix(l, "verdict:"):
			lines[i] = "verdict: " + verdict
		case strings.HasPrefix(l, "reviewer:") && reviewer == "none":
			lines[i] = "reviewer:"
		case strings.HasPrefix(l, "reviewer:") && reviewer != "-":
			lines[i] = "reviewer: " + reviewer
		case strings.HasPrefix(l, "note:"):
			treeStart = i + 2 // after the blank line
		}
	}
	if !(rearrange || flatten || pair) || treeStart < 0 || treeStart >= len(lines) {
		return strings.Join(lines, "\n")
	}
	tree := lines[treeStart:]
	if len(tree) > 0 && tree[len(tree)-1] == "" {
		tree = tree[:len(tree)-1]
	}
	indent := func(l string) int { return len(l) - len(strings.TrimLeft(l, " ")) }
	isCat := func(l string) bool { return strings.HasSuffix(l, "/") }
	if flatten {
		// Every item side by side: category lines go, items lose their indent.
		var flat []string
		for _, l := range tree {
			if !isCat(l) {
				flat = append(flat, strings.TrimLeft(l, " "))
			}
		}
		return strings.Join(append(lines[:treeStart], flat...), "\n") + "\n"
	}
	firstCat, topItem := -1, -1
	for i, l := range tree {
		if indent(l) == 0 && isCat(l) && firstCat < 0 {
			firstCat = i
		}
		if indent(l) == 0 && !isCat(l) && topItem < 0 {
			topItem = i
		}
	}
	var out []string
	switch {
	case pair || firstCat < 0:
		out = pairTopItems(tree)
	case firstCat >= 0 && topItem >= 0:
		item := tree[topItem]
		for i, l := range tree {
			if i == topItem {
				continue
			}
			out = append(out, l)
			if i == firstCat {
				out = append(out, "  "+item)
			}
		}
	case firstCat >= 0:
		moved := -1
		for i := firstCat + 1; i < len(tree) && indent(tree[i]) > 0; i++ {
			if !isCat(tree[i]) {
				moved = i
				break
			}
		}
		for i, l := range tree {
			if i != moved {
				out = append(out, l)
			}
		}
		if moved >= 0 {
			out = append(out, strings.TrimLeft(tree[moved], " "))
		}
	default:
		out = tree
	}
	return strings.Join(append(lines[:treeStart], out...), "\n") + "\n"
}

// pairTopItems puts the first two top-level item lines of a packet's tree
// into a new category at the top, leaving the rest as it is: an answer
// that only groups items the packet showed apart.
func pairTopItems(tree []string) []string {
	var top []int
	for i, l := range tree {
		if !strings.HasPrefix(l, " ") && !strings.HasSuffix(l, "/") {
			top = append(top, i)
		}
	}
	if len(top) < 2 {
		return tree
	}
	out := []string{"Paired by hand/", "  " + tree[top[0]], "  " + tree[top[1]]}
	for i, l := range tree {
		if i != top[0] && i != top[1] {
			out = append(out, l)
		}
	}
	return out
}

// moveLine moves the line holding item to just after the line holding
// neighbour, with neighbour's indentation.
func moveLine(text, item, neighbour string) (string, bool) {
	lines := strings.Split(text, "\n")
	var out []string
	found := false
	for _, l := range lines {
		if strings.TrimSpace(l) == item {
			found = true
			continue
		}
		out = append(out, l)
	}
	if !found {
		return "", false
	}
	for i, l := range out {
		if strings.TrimSpace(l) == neighbour {
			pad := l[:len(l)-len(strings.TrimLeft(l, " "))]
			out = append(out[:i+1], append([]string{pad + item}, out[i+1:]...)...)
			return strings.Join(out, "\n"), true
		}
	}
	return "", false
}
