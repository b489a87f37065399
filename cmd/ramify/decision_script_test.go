package main

import (
	"os"
	"path/filepath"
	"strings"

	"github.com/ramify-tax/ramify/format"
	"github.com/rogpeppe/go-internal/testscript"
)

// cmdMoveCategory cuts a category's block out of an outline and pastes it
// at the top level, as an editor would: movecategory FILE NAME.
func cmdMoveCategory(ts *testscript.TestScript, neg bool, args []string) {
	if neg || len(args) != 2 {
		ts.Fatalf("usage: movecategory FILE NAME")
	}
	f := ts.MkAbs(args[0])
	data, err := os.ReadFile(f)
	ts.Check(err)
	out, ok := moveBlockToTop(string(data), args[1])
	if !ok {
		ts.Fatalf("%s: no category %q", args[0], args[1])
	}
	ts.Check(os.WriteFile(f, []byte(out), 0o644))
}

func moveBlockToTop(text, name string) (string, bool) {
	lines := strings.Split(text, "\n")
	indent := func(l string) int { return len(l) - len(strings.TrimLeft(l, " ")) }
	start := -1
	for i, l := range lines {
		if strings.TrimSpace(l) == name+"/" {
			start = i
			break
		}
	}
	if start < 0 {
		return "", false
	}
	end := start + 1
	for end < len(lines) && strings.TrimSpace(lines[end]) != "" && indent(lines[end]) > indent(lines[start]) {
		end++
	}
	var block []string
	for _, l := range lines[start:end] {
		block = append(block, l[indent(lines[start]):])
	}
	rest := append(append([]string(nil), lines[:start]...), lines[end:]...)
	head := 0
	for head < len(rest) && strings.HasPrefix(rest[head], "#") {
		head++
	}
	out := append(append(append([]string(nil), rest[:head]...), block...), rest[head:]...)
	return strings.Join(out, "\n"), true
}

// cmdUniqueRecords fails when a constraint file matching one of the
// patterns holds the same triplet twice (the pair in either order):
// uniquerecords GLOB...
func cmdUniqueRecords(ts *testscript.TestScript, neg bool, args []string) {
	if len(args) == 0 {
		ts.Fatalf("usage: uniquerecords GLOB...")
	}
	var dups []string
	for _, pat := range args {
		files, err := filepath.Glob(ts.MkAbs(pat))
		ts.Check(err)
		if len(files) == 0 {
			ts.Fatalf("no file matches %s", pat)
		}
		for _, f := range files {
			data, err := os.ReadFile(f)
			ts.Check(err)
			cf, err := format.ParseConstraints(filepath.Base(f), data)
			ts.Check(err)
			seen := map[[3]string]bool{}
			for _, t := range cf.Triplets {
				k := [3]string{min(t.Pair[0], t.Pair[1]), max(t.Pair[0], t.Pair[1]), t.Out}
				if seen[k] {
					dups = append(dups, filepath.Base(f)+": "+k[0]+" "+k[1]+" | "+k[2])
				}
				seen[k] = true
			}
		}
	}
	if neg != (len(dups) == 0) {
		return
	}
	if neg {
		ts.Fatalf("no triplet is written twice")
	}
	ts.Fatalf("triplets written twice:\n%s", strings.Join(dups, "\n"))
}
