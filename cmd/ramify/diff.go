package main

import (
	"bufio"
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"slices"
	"strings"

	"github.com/ramify-tax/ramify/diff"
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/spf13/pflag"
)

func init() {
	register(&command{
		name:    "diff",
		summary: "show what changed between two versions of the taxonomy",
		usage:   "OLD [NEW]",
		help: `Compares two versions of the taxonomy by what happened to the items and
categories, matching categories across the versions by their members:
items added, removed and moved (old path -> new path), categories renamed
(same members, new name), split, merged, created and dissolved. Then it
measures how far apart the two trees are, on the items they share:
rooted triplet agreement (exact up to 5,000 items; above that estimated
from 50,000 sampled triples, with its 95% interval); triplet recall, the
share of the triples OLD resolves that NEW resolves alike (how much of the
old structure the new version keeps), and precision, the converse; the
Robinson-Foulds
cluster distance and its normalised form, and the cophenetic correlation
of the two trees (lca sizes).

OLD and NEW are each one of:
  REV           the repository's taxonomy outline (taxonomy.file in that
                revision's ramify.toml) at git revision REV
  REV:PATH      the file PATH, relative to the taxonomy repository, as it
                is at git revision REV (":PATH" is the staged version)
  a file        an outline (or review packet) file in the taxonomy
                repository (--dir), written as a path: ./NAME, DIR/NAME
                or a name ending in .outline; it may not lead outside
                the repository (no .., no link out, nothing in .git)
A bare name is always a revision, never a file of that name.
Without NEW, OLD is compared with the repository's outline as it is now.

The text report marks each change with one character:
  ` + diff.Legend + `

--format markdown writes the report for a pull request description;
--format json (or --json) the machine-readable report. --lines adds a
line-level view of the two files under the report.

A diff is a report, not a check: the exit status is 0 whether or not the
versions differ, and 2 when a version cannot be read.`,
		bind: withOptions(func(fs *pflag.FlagSet, o *diffOptions) {
			fs.StringVar(&o.format, "format", "text", "report `form`: text, markdown or json")
			fs.BoolVar(&o.lines, "lines", false, "add a line-level view of the two outline files")
		}, runDiff),
	})
}

type diffOptions struct {
	format string
	lines  bool
}

// diffJSON is diff's --json report: the diff's own fields (added,
// removed, moved, renamed, split, merged, created, dissolved, metrics)
// at the top, next to the names of the two versions.
type diffJSON struct {
	*diff.Report
	Lines *string `json:"lines,omitempty"` // with --lines
	New   string  `json:"new"`
	Old   string  `json:"old"`
}

// diffFormats are the forms of the report.
var diffFormats = []string{"text", "markdown", "json"}

// diffSide is one version of the taxonomy: the name it goes by in
// messages and the report, and its text.
type diffSide struct {
	name string
	data []byte
}

func runDiff(e *env, o *diffOptions, args []string) error {
	if len(args) == 0 || len(args) > 2 {
		return usagef("diff takes one or two versions (OLD [NEW]), got %d arguments", len(args))
	}
	form, err := diffFormat(e, o.format)
	if err != nil {
		return err
	}
	old, err := loadDiffSide(e.dir(), args[0])
	if err != nil {
		return err
	}
	var new *diffSide
	if len(args) == 2 {
		new, err = loadDiffSide(e.dir(), args[1])
	} else {
		new, err = currentOutline(e.dir())
	}
	if err != nil {
		return err
	}
	oldTree, oldErr := parseTreeText(old.name, old.data)
	newTree, newErr := parseTreeText(new.name, new.data)
	if ds := append(format.AsDiags(oldErr, old.name), format.AsDiags(newErr, new.name)...); len(ds) > 0 {
		return ds
	}
	rep := diff.Compare(oldTree, newTree)
	lines, withLines := "", o.lines
	result := &diffJSON{Report: rep, Old: old.name, New: new.name}
	if withLines {
		lines = diff.LineDiff(lineViewText(old.data), lineViewText(new.data))
		result.Lines = &lines
	}
	e.result = result
	if e.opt.json || e.opt.quiet {
		return nil
	}
	w := bufio.NewWriter(e.stdout)
	defer w.Flush()
	switch form {
	case "markdown":
		rep.Markdown(w)
		if withLines {
			writeMarkdownLines(w, lines)
		}
	default:
		w.WriteString(diffPaint(e.color, diffDim, format.Printable(old.name+" -> "+new.name)) + "\n")
		rep.Text(w, e.color)
		if withLines {
			writeTextLines(w, lines, e.color)
		}
	}
	return nil
}

// diffFormat is the form chosen by --format and --json.
func diffFormat(e *env, form string) (string, error) {
	if !contains(diffFormats, form) {
		return "", usagef("--format must be text, markdown or json, not %q", form)
	}
	if e.opt.json {
		if e.flags.Changed("format") && form != "json" {
			return "", usagef("--json and --format %s ask for two different reports; give one", form)
		}
		return "json", nil
	}
	if form == "json" {
		e.opt.json = true
	}
	return form, nil
}

// contains reports whether list holds s (other commands use it too).
func contains(list []string, s string) bool {
	return slices.Contains(list, s)
}

// loadDiffSide reads one version named on the command line: a file, a
// file at a revision (REV:PATH), or the repository's outline at a
// revision. dir is the taxonomy repository.
//
// A revision is always a revision: a pull request that commits files
// named "main" or "HEAD" must not change what `ramify diff main HEAD`
// compares. An argument is a file only when it is written as one (see
// isFileArg), or when it holds a "/" and git knows no such revision.
func loadDiffSide(dir, arg string) (*diffSide, error) {
	if isFileArg(arg) {
		return readDiffFile(dir, arg)
	}
	rev, rel, hasPath := strings.Cut(arg, ":")
	if rev != "" || !hasPath {
		if msg := checkRevision(rev); msg != "" {
			return nil, usagef("%s is not a revision: %s (write a file as a path: ./NAME or a name ending in .outline)", arg, msg)
		}
	}
	if hasPath {
		if msg := format.CheckRepoPath(rel); msg != "" {
			return nil, usagef("%s: %s", arg, msg)
		}
	}
	if _, err := gitTopLevel(dir); err != nil {
		if errors.Is(err, errNotGitRepo) {
			if !hasPath && strings.Contains(arg, "/") {
				return readDiffFile(dir, arg)
			}
			return nil, usagef("%s is not a revision: %s is not in a git repository (write a file as a path: ./%s)", arg, dir, arg)
		}
		return nil, err
	}
	if !hasPath {
		if !revisionExists(dir, rev) {
			if strings.Contains(arg, "/") {
				return readDiffFile(dir, arg)
			}
			return nil, usagef("%s is not a revision git knows (write a file as a path: ./%s)", arg, arg)
		}
		var err error
		if rel, err = outlineFileAt(dir, rev); err != nil {
			return nil, err
		}
	}
	data, err := readAtRevision(dir, rev, rel, format.MaxOutlineBytes)
	if errors.Is(err, errNoSuchRevision) {
		return nil, usagef("%s: %v", arg, err)
	}
	if err != nil {
		return nil, err
	}
	return &diffSide{name: rev + ":" + rel, data: data}, nil
}

// isFileArg reports whether a diff argument is written as a file: it
// starts with "./", "../" or "/", or (holding no ":") ends in ".outline".
func isFileArg(arg string) bool {
	switch {
	case strings.HasPrefix(arg, "./"), strings.HasPrefix(arg, "../"), strings.HasPrefix(arg, "/"), filepath.IsAbs(arg):
		return true
	case strings.Contains(arg, ":"):
		return false
	}
	return strings.HasSuffix(arg, ".outline")
}

// readDiffFile reads a file argument of diff. It is looked up under the
// repository dir and must stay inside it: no absolute path, no "..", no
// symbolic link that leads out, nothing under .git.
func readDiffFile(dir, arg string) (*diffSide, error) {
	rel := arg
	if filepath.IsAbs(rel) {
		// An absolute name is accepted when it lies in the repository.
		root, err1 := filepath.Abs(dir)
		inside, err2 := filepath.Rel(root, rel)
		if err1 != nil || err2 != nil || inside == ".." || strings.HasPrefix(inside, ".."+string(filepath.Separator)) {
			return nil, usagef("%s lies outside the repository %s", arg, dir)
		}
		rel = filepath.ToSlash(inside)
	}
	for strings.HasPrefix(rel, "./") {
		rel = strings.TrimLeft(strings.TrimPrefix(rel, "./"), "/")
	}
	full, err := repo.Resolve(dir, rel)
	if err != nil {
		return nil, usagef("%s: %v", arg, err)
	}
	info, err := os.Stat(full)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return nil, usagef("%s: no such file in %s", arg, dir)
	case err != nil:
		return nil, err
	case info.IsDir():
		return nil, usagef("%s is a folder; name an outline file or a git revision", arg)
	}
	data, err := format.ReadFileLimited(full, arg, format.MaxOutlineBytes)
	if err != nil {
		return nil, err
	}
	return &diffSide{name: arg, data: data}, nil
}

// currentOutline reads the repository's taxonomy outline as it is in the
// folder now; it goes by its repository-relative name.
func currentOutline(dir string) (*diffSide, error) {
	settings := format.DefaultSettings()
	data, err := repo.ReadSettingsFile(dir)
	switch {
	case err == nil:
		if settings, err = format.ParseSettings(repo.SettingsFile, data); err != nil {
			return nil, format.AsDiags(err, repo.SettingsFile)
		}
	case !errors.Is(err, fs.ErrNotExist):
		return nil, err
	}
	rel := settings.Taxonomy.File
	full, err := repo.Resolve(dir, rel)
	if err != nil {
		return nil, err
	}
	data, err = format.ReadFileLimited(full, rel, format.MaxOutlineBytes)
	if errors.Is(err, fs.ErrNotExist) {
		return nil, usagef("%s does not exist in %s; name the NEW version too", rel, dir)
	}
	if err != nil {
		return nil, err
	}
	return &diffSide{name: rel, data: data}, nil
}

// parseTreeText reads a tree from an outline or a review packet (the
// packet's tree), telling them apart by the first line.
func parseTreeText(name string, data []byte) (*format.Category, error) {
	if format.IsPacketText(data) {
		p, err := format.ParsePacket(name, data)
		if err != nil {
			return nil, err
		}
		return p.Tree, nil
	}
	o, err := format.ParseOutline(name, data)
	if err != nil {
		return nil, err
	}
	return o.Root, nil
}

// lineViewText is a file's text for the line view: with CRLF line endings
// made LF when it is clean text, else as it is.
func lineViewText(data []byte) string {
	clean, ds := format.CleanText("", data)
	if len(ds) > 0 {
		return string(data)
	}
	return string(clean)
}

// Colours of the text report's line view, in the palette of the diff
// package's report: losses red, gains green, places dim.
const (
	diffReset = "\x1b[0m"
	diffBold  = "\x1b[1m"
	diffDim   = "\x1b[2m"
	diffLoss  = "\x1b[31m"
	diffGain  = "\x1b[32m"
)

// diffPaint wraps s in style when color is on.
func diffPaint(color bool, style, s string) string {
	if !color {
		return s
	}
	return style + s + diffReset
}

// writeTextLines writes the line view under the text report.
func writeTextLines(w *bufio.Writer, lines string, color bool) {
	w.WriteString("\n")
	if lines == "" {
		w.WriteString(diffPaint(color, diffBold, "outline lines") + ": the two files are identical\n")
		return
	}
	w.WriteString(diffPaint(color, diffBold, "outline lines") + "\n")
	writeLineView(w, lines, color)
}

// writeLineView writes the lines of a LineDiff, coloured by kind when
// color is set.
func writeLineView(w *bufio.Writer, lines string, color bool) {
	if lines == "" {
		return
	}
	for _, l := range strings.SplitAfter(strings.TrimSuffix(lines, "\n"), "\n") {
		l = format.Printable(strings.TrimSuffix(l, "\n"))
		switch {
		case strings.HasPrefix(l, "@@"):
			l = diffPaint(color, diffDim, l)
		case strings.HasPrefix(l, "-"):
			l = diffPaint(color, diffLoss, l)
		case strings.HasPrefix(l, "+"):
			l = diffPaint(color, diffGain, l)
		}
		w.WriteString(l + "\n")
	}
}

// writeMarkdownLines writes the line view under the Markdown report, as a
// folded "diff" code block (which pull request pages colour by line).
func writeMarkdownLines(w *bufio.Writer, lines string) {
	w.WriteString("\n#### Outline lines\n\n")
	if lines == "" {
		w.WriteString("The two files are identical line for line.\n")
		return
	}
	fence := codeFence(lines)
	w.WriteString("<details><summary>line-level view of the outline files</summary>\n\n")
	w.WriteString(fence + "diff\n" + format.PrintableLines(lines) + fence + "\n\n</details>\n")
}

// codeFence is a run of backticks longer than any in text (at least
// three), so that no line of text can close the code block early: a
// category name may hold backticks.
func codeFence(text string) string {
	longest, run := 0, 0
	for i := 0; i < len(text); i++ {
		if text[i] == '`' {
			run++
			longest = max(longest, run)
		} else {
			run = 0
		}
	}
	return strings.Repeat("`", max(3, longest+1))
}
