package main

import (
	"bufio"
	"fmt"
	"sort"

	"github.com/ramify-tax/ramify/diff"
	"github.com/ramify-tax/ramify/format"
)

func init() {
	register(&command{
		name:    "git-textconv",
		summary: "for git: an outline as one line per item and its category (diff.ramify.textconv)",
		usage:   "-- FILE",
		help: `git runs this for "git log -p", "git show" and other commands that do not
run external diff commands, on files marked diff=ramify in .gitattributes
(see "ramify git-setup"). It prints a count line, then each item, by id,
followed by its category path:

  claw-hammer-16oz    Hand tools / Hammers

so git's line diff of two versions shows a moved item as one line out and
one line in, and a renamed category as the lines of its items. A review
packet, or a file it cannot read as an outline, is printed as it is. It
exits 0 whenever it can read the file, so git never stops halfway.`,
		run: runGitTextconv,
	})
}

func runGitTextconv(e *env, args []string) error {
	// git's gitattributes documentation ("Performing text diffs of binary
	// files"): the textconv command gets one argument, a file holding the
	// version, and prints the text to compare on stdout.
	if len(args) != 1 {
		return usagef("git-textconv takes the one file git gives a textconv command, got %d arguments", len(args))
	}
	data, err := format.ReadFileLimited(args[0], args[0], format.MaxOutlineBytes)
	if err != nil {
		return err
	}
	w := bufio.NewWriter(e.stdout)
	defer w.Flush()
	o, err := format.ParseOutline(args[0], data)
	if format.IsPacketText(data) || err != nil {
		w.Write(data)
		return nil
	}
	writeItemLines(w, o.Root)
	return nil
}

// writeItemLines prints the items of a tree one a line, by id, each
// followed by its category path, under a line counting them. The ids are
// padded to a common width (up to a bound) so the paths line up.
func writeItemLines(w *bufio.Writer, root *format.Category) {
	paths := format.Paths(root)
	ids := make([]string, 0, len(paths))
	width := 0
	for id := range paths {
		ids = append(ids, id)
		width = max(width, len(id))
	}
	sort.Strings(ids)
	width = min(width, 40)
	fmt.Fprintf(w, "# %s in %s\n", plural(len(ids), "item", "items"), plural(root.CountCategories(), "category", "categories"))
	for _, id := range ids {
		fmt.Fprintf(w, "%-*s  %s\n", width, id, diff.Path(paths[id]).String())
	}
}
