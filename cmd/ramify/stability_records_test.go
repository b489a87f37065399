package main

import (
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"sort"
	"strings"
	"testing"

	"github.com/ramify-tax/ramify/format"
)

// categoryPaths maps every item of the outline to the names of the
// categories above it, from the top.
func categoryPaths(root *format.Category) map[string]string {
	out := map[string]string{}
	var walk func(c *format.Category, path string)
	walk = func(c *format.Category, path string) {
		for _, it := range c.Items {
			out[it] = path
		}
		for _, ch := range c.Children {
			walk(ch, path+"/"+ch.DisplayName())
		}
	}
	walk(root, "")
	return out
}

// TestStabilityOfOneRecord adds one editor record at a time to the demo —
// a triplet, a group, a fixed review packet — solves, and counts the
// items whose category changed beyond those the record names, and the
// top-level categories that vanished without any of their items being
// named. It logs the table (the stability benchmark of the review loop)
// and fails only if a record does not hold or check fails after solve.
func TestStabilityOfOneRecord(t *testing.T) {
	base := solvedDemo(t)
	p := loadProject(t, base)
	before := categoryPaths(p.Outline.Root)
	top := p.Outline.Root.Children
	type change struct {
		name  string
		named []string
		apply func(dir string)
	}
	var changes []change
	for k := 0; k+1 < len(top) && k < 3; k++ {
		a, b := top[k].AllItems(), top[k+1].AllItems()
		if len(a) < 2 || len(b) < 2 {
			continue
		}
		named := []string{a[0], b[0], a[1]}
		changes = append(changes, change{fmt.Sprintf("triplet %d", k), named, func(dir string) {
			writeRecord(t, dir, fmt.Sprintf("[[triplet]]\npair = [%q, %q]\nout = %q\nby = \"Test Editor\"\ndate = 2026-12-02\n", named[0], named[1], named[2]))
		}})
		group := []string{a[0], a[1], b[0], b[1]}
		changes = append(changes, change{fmt.Sprintf("group %d", k), group, func(dir string) {
			writeRecord(t, dir, fmt.Sprintf("[[group]]\nitems = [%q, %q, %q, %q]\nby = \"Test Editor\"\ndate = 2026-12-02\n", group[0], group[1], group[2], group[3]))
		}})
	}
	// A fixed packet: the first packet drawn, answered with its first item
	// moved to the other side of the packet's top split.
	changes = append(changes, change{"fixed packet", nil, nil})
	type row struct {
		name           string
		named, changed int
		dissolved      []string
	}
	var rows []row
	for _, ch := range changes {
		dir := t.TempDir()
		copyTree(t, base, dir)
		named := ch.named
		if ch.apply != nil {
			ch.apply(dir)
		} else {
			ramify(t, "review", "draw", "--dir", dir, "--count", "1", "--date", "2026-12-02")
			files, _ := filepath.Glob(filepath.Join(dir, "reviews", "open", "*.outline"))
			if len(files) == 0 {
				t.Fatal("no packet drawn")
			}
			pk := readPacketFile(t, files[0])
			named = pk.Tree.AllItems()
			tr := pk.Tree
			if len(tr.Children) >= 2 && len(tr.Children[0].Items) > 0 {
				x := tr.Children[0].Items[0]
				tr.Children[0].Items = tr.Children[0].Items[1:]
				tr.Children[0].ItemLines = nil
				tr.Children[1].Items = append(tr.Children[1].Items, x)
				tr.Children[1].ItemLines = nil
			} else if len(tr.Children) >= 1 && len(tr.Items) > 0 {
				x := tr.Items[0]
				tr.Items = tr.Items[1:]
				tr.ItemLines = nil
				tr.Children[0].Items = append(tr.Children[0].Items, x)
				tr.Children[0].ItemLines = nil
			}
			tr.Sort()
			pk.Verdict, pk.Reviewer = format.VerdictFixed, "Test Reviewer"
			if err := os.WriteFile(files[0], format.FormatPacket(pk), 0o644); err != nil {
				t.Fatal(err)
			}
			ramify(t, "absorb", "--dir", dir, "--date", "2026-12-02")
		}
		ramify(t, "solve", "--dir", dir)
		ramify(t, "check", "--dir", dir)
		after := categoryPaths(loadProject(t, dir).Outline.Root)
		r := row{name: ch.name, named: len(named)}
		for it, path := range before {
			if after[it] != path && !slices.Contains(named, it) {
				r.changed++
			}
		}
		afterTop := map[string]bool{}
		for _, c := range loadProject(t, dir).Outline.Root.Children {
			afterTop[c.DisplayName()] = true
		}
		for _, c := range top {
			hit := false
			for _, it := range c.AllItems() {
				hit = hit || slices.Contains(named, it)
			}
			if !hit && !afterTop[c.DisplayName()] {
				r.dissolved = append(r.dissolved, c.DisplayName())
			}
		}
		rows = append(rows, r)
	}
	var b strings.Builder
	fmt.Fprintf(&b, "\n%-14s %6s %8s %8s  %s\n", "record", "named", "changed", "share", "top-level categories dissolved unnamed")
	var shares []float64
	for _, r := range rows {
		share := float64(r.changed) / float64(len(before))
		shares = append(shares, share)
		fmt.Fprintf(&b, "%-14s %6d %8d %7.1f%%  %s\n", r.name, r.named, r.changed, 100*share, strings.Join(r.dissolved, ", "))
	}
	sort.Float64s(shares)
	fmt.Fprintf(&b, "median share of items moved beyond those named: %.1f%% (target at most 1%%) of %d items\n", 100*shares[len(shares)/2], len(before))
	t.Log(b.String())
}

func writeRecord(t *testing.T, dir, text string) {
	t.Helper()
	if err := os.WriteFile(filepath.Join(dir, "constraints", "test-editor.toml"), []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
}
