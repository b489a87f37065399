package main

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path"
	"path/filepath"
	"strconv"
	"strings"
	"syscall"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/review"
)

// absorb writes several files (shapes, the audit log, the edit records,
// the outline) and removes the answered packets. They change together or
// not at all:
//
//  1. every new file is staged as a synced temporary file beside its
//     target (a crash here leaves only temporary files, which the next
//     run removes: the repository is as before);
//  2. a journal listing every rename and removal is written atomically to
//     the repository (format.JournalName);
//  3. the renames and removals are made, then the journal is removed.
//
// A crash after step 2 leaves the journal; every ramify command run in the
// repository replays it first (recoverInterrupted), which finishes the
// change: the repository is as after.

const journalHeader = "# ramify journal 1"

// journalStep is one line of the journal: rename a staged file over its
// target, or remove a file.
type journalStep struct {
	remove bool
	tmp    string // slash path in the repository (rename only)
	target string
}

// commitWrites applies writes to the repository at dir as one change.
func commitWrites(dir string, writes []absorbWrite) error {
	full := make([]string, len(writes))
	for i, w := range writes {
		f, err := repo.Resolve(dir, w.rel)
		if err != nil {
			return err
		}
		full[i] = f
	}
	var steps []journalStep
	var staged []string
	cleanup := func() {
		for _, t := range staged {
			os.Remove(t)
		}
	}
	for i, w := range writes {
		if w.remove {
			continue
		}
		if err := os.MkdirAll(filepath.Dir(full[i]), 0o755); err != nil {
			cleanup()
			return err
		}
		tmp, err := format.StageFile(full[i], w.data, 0o644)
		if err != nil {
			cleanup()
			return err
		}
		staged = append(staged, tmp)
		steps = append(steps, journalStep{tmp: path.Join(path.Dir(w.rel), filepath.Base(tmp)), target: w.rel})
		crashPoint()
	}
	for _, w := range writes {
		if w.remove {
			steps = append(steps, journalStep{remove: true, target: w.rel})
		}
	}
	journal := filepath.Join(dir, format.JournalName)
	if err := format.WriteFileAtomic(journal, formatJournal(steps), 0o644); err != nil {
		cleanup()
		return err
	}
	crashPoint()
	return applyJournal(dir, steps)
}

// applyJournal makes the journal's renames and removals, each only if it
// is not made yet, and then removes the journal.
func applyJournal(dir string, steps []journalStep) error {
	synced := map[string]bool{}
	for _, s := range steps {
		target, err := repo.Resolve(dir, s.target)
		if err != nil {
			return err
		}
		if s.remove {
			if err := os.Remove(target); err != nil && !errors.Is(err, fs.ErrNotExist) {
				return err
			}
		} else {
			tmp, err := repo.Resolve(dir, s.tmp)
			if err != nil {
				return err
			}
			if err := os.Rename(tmp, target); err != nil && !errors.Is(err, fs.ErrNotExist) {
				return err
			}
		}
		synced[filepath.Dir(target)] = false
		crashPoint()
	}
	for d := range synced {
		format.SyncDir(d)
	}
	if err := os.Remove(filepath.Join(dir, format.JournalName)); err != nil && !errors.Is(err, fs.ErrNotExist) {
		return err
	}
	format.SyncDir(dir)
	crashPoint()
	return nil
}

func formatJournal(steps []journalStep) []byte {
	var b bytes.Buffer
	b.WriteString(journalHeader + "\n")
	for _, s := range steps {
		if s.remove {
			fmt.Fprintf(&b, "remove %s\n", strconv.Quote(s.target))
		} else {
			fmt.Fprintf(&b, "rename %s %s\n", strconv.Quote(s.tmp), strconv.Quote(s.target))
		}
	}
	return b.Bytes()
}

// parseJournal reads a journal and checks that it asks for nothing but
// what absorb does: a staged temporary file renamed over the file it was
// staged for, in the same folder, and answered packets removed from
// reviews/open. The journal is not committed (git-setup ignores it), but
// a repository from elsewhere could carry one.
func parseJournal(data []byte) ([]journalStep, format.Diags) {
	var ds format.Diags
	var steps []journalStep
	sc := bufio.NewScanner(bytes.NewReader(data))
	line := 0
	for sc.Scan() {
		line++
		text := sc.Text()
		at := format.Pos{File: format.JournalName, Line: line, Col: 1}
		if line == 1 {
			if text != journalHeader {
				ds.Add(at, "not a ramify journal (the first line should be %q)", journalHeader)
				return nil, ds
			}
			continue
		}
		fields := strings.Fields(text)
		unquote := func(s string) string {
			u, err := strconv.Unquote(s)
			if err != nil || format.CheckRepoPath(u) != "" {
				ds.Add(at, "%s is not a path in the repository", s)
				return ""
			}
			return u
		}
		switch {
		case len(fields) == 2 && fields[0] == "remove":
			t := unquote(fields[1])
			if t != "" && (path.Dir(t) != review.OpenDir || !strings.HasSuffix(t, ".outline")) {
				ds.Add(at, "a journal removes only answered packets in %s, not %s", review.OpenDir, t)
				continue
			}
			steps = append(steps, journalStep{remove: true, target: t})
		case len(fields) == 3 && fields[0] == "rename":
			tmp, t := unquote(fields[1]), unquote(fields[2])
			if tmp != "" && t != "" && (path.Dir(tmp) != path.Dir(t) || !format.IsTempName(path.Base(tmp), path.Base(t))) {
				ds.Add(at, "a journal renames only a temporary file staged for its target, not %s to %s", tmp, t)
				continue
			}
			steps = append(steps, journalStep{tmp: tmp, target: t})
		default:
			ds.Add(at, "expected `rename \"TEMP\" \"FILE\"` or `remove \"FILE\"`")
		}
	}
	if line == 0 {
		ds.Add(format.Pos{File: format.JournalName, Line: 1, Col: 1}, "the journal is empty")
	}
	return steps, ds
}

// recoverInterrupted finishes a change an interrupted absorb left behind
// (its journal) and then removes ramify's abandoned temporary files from
// the repository's folders, saying so on stderr. It runs before every
// command that works in a repository.
func recoverInterrupted(e *env) error {
	dir := e.dir()
	journal := filepath.Join(dir, format.JournalName)
	data, err := format.ReadFileLimited(journal, format.JournalName, format.MaxSmallFileBytes)
	switch {
	case errors.Is(err, fs.ErrNotExist):
	case err != nil:
		return format.AsDiags(err, format.JournalName)
	default:
		steps, ds := parseJournal(data)
		if len(ds) > 0 {
			return ds
		}
		if err := applyJournal(dir, steps); err != nil {
			return err
		}
		e.notice("ramify: finished an absorb that was interrupted (%s)", plural(len(steps), "file", "files"))
	}
	var dirs []string
	for _, d := range []string{".", format.ConstraintsDir, review.OpenDir, review.DoneDir, "releases"} {
		dirs = append(dirs, filepath.Join(dir, filepath.FromSlash(d)))
	}
	removed, err := format.CleanStaleTemps(dirs...)
	if len(removed) > 0 {
		e.notice("ramify: removed %s left by an interrupted run", plural(len(removed), "temporary file", "temporary files"))
	}
	return err
}

// crashPoint is where tests kill absorb: with RAMIFY_TEST_KILL_AT=N in
// the environment, the process sends itself SIGKILL at the N-th point of
// its multi-file write (counting from 1), as a crash or kill -9 would stop
// it there. Without it, it does nothing.
func crashPoint() {
	at := os.Getenv("RAMIFY_TEST_KILL_AT")
	if at == "" {
		return
	}
	crashPoints++
	if n, err := strconv.Atoi(at); err == nil && n == crashPoints {
		syscall.Kill(os.Getpid(), syscall.SIGKILL)
		select {}
	}
}

var crashPoints int
