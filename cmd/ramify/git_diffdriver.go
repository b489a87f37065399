package main

import (
	"bufio"
	"errors"
	"io/fs"

	"github.com/ramify-tax/ramify/diff"
	"github.com/ramify-tax/ramify/format"
)

func init() {
	register(&command{
		name:    "git-diff-driver",
		summary: "for git: shows an outline's change as ramify diff does (diff.ramify.command)",
		usage:   "-- PATH OLD-FILE OLD-HEX OLD-MODE NEW-FILE NEW-HEX NEW-MODE [NEW-PATH INFO]",
		help: `git runs this for "git diff" on files marked diff=ramify in
.gitattributes (see "ramify git-setup"), with the arguments git's
gitattributes documentation gives an external diff command: the path, then
the old and the new version as file, object id and mode, then for a
rename the new path and a note. A side that does not exist is /dev/null.

It prints the semantic report of "ramify diff" under a line naming the
file. A review packet, or an outline it cannot read (one with conflict
markers, say), is shown line by line instead. It exits 0 unless called
with the wrong number of arguments, so git never stops halfway through a
diff.`,
		run: runGitDiffDriver,
	})
}

// devNull is how git names the missing side of an added or deleted file.
const devNull = "/dev/null"

func runGitDiffDriver(e *env, args []string) error {
	// path old-file old-hex old-mode new-file new-hex new-mode, and for a
	// rename new-path and a note (git's gitattributes documentation,
	// "Defining an external diff driver", and git's GIT_EXTERNAL_DIFF).
	if len(args) != 7 && len(args) != 9 {
		return usagef("git-diff-driver takes the 7 (or 9) arguments git gives an external diff command, got %d", len(args))
	}
	path, newPath := args[0], args[0]
	if len(args) == 9 {
		newPath = args[7]
	}
	old, err := readDriverSide(args[1], "a/"+path)
	if err != nil {
		return err
	}
	new, err := readDriverSide(args[4], "b/"+newPath)
	if err != nil {
		return err
	}
	w := bufio.NewWriter(e.stdout)
	defer w.Flush()
	title := "ramify diff " + path
	if newPath != path {
		title += " -> " + newPath
	}
	switch {
	case old.data == nil:
		title += " (new file)"
	case new.data == nil:
		title += " (deleted)"
	}
	w.WriteString(diffPaint(e.color, diffBold, format.Printable(title)) + "\n")
	oldTree, oldErr := driverTree(old)
	newTree, newErr := driverTree(new)
	if oldErr != nil || newErr != nil {
		// Not two outlines: show the lines, saying why when it is not
		// simply a review packet.
		for _, err := range []error{oldErr, newErr} {
			if err == nil || errors.Is(err, errPacket) {
				continue
			}
			if ds := format.AsDiags(err, ""); len(ds) > 0 {
				w.WriteString("not an outline ramify can read (" + format.Printable(ds[0].String()) + "); showing lines\n")
				break
			}
		}
		lines := diff.LineDiff(lineViewText(old.data), lineViewText(new.data))
		writeLineView(w, lines, e.color)
		w.WriteString("\n")
		return nil
	}
	diff.Compare(oldTree, newTree).Text(w, e.color)
	w.WriteString("\n")
	return nil
}

// readDriverSide reads one side git gives the driver: nil data for
// /dev/null.
func readDriverSide(file, name string) (*diffSide, error) {
	if file == devNull {
		return &diffSide{name: name}, nil
	}
	data, err := format.ReadFileLimited(file, name, format.MaxOutlineBytes)
	if errors.Is(err, fs.ErrNotExist) {
		return nil, errors.New(name + ": git named a file that does not exist")
	}
	if err != nil {
		return nil, err
	}
	return &diffSide{name: name, data: data}, nil
}

// errPacket says a side is a review packet, shown by lines.
var errPacket = errors.New("a review packet")

// driverTree is the tree of one side: empty when the side does not exist,
// errPacket for a review packet (small files read best line by line, with
// their verdict), or the parse error of anything else.
func driverTree(s *diffSide) (*format.Category, error) {
	if s.data == nil {
		return &format.Category{}, nil
	}
	if format.IsPacketText(s.data) {
		return nil, errPacket
	}
	o, err := format.ParseOutline(s.name, s.data)
	if err != nil {
		return nil, err
	}
	return o.Root, nil
}
