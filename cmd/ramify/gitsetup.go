package main

import (
	"errors"
	"io/fs"
	"strings"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
)

func init() {
	register(&command{
		name:    "git-setup",
		summary: "wire git's diff and merge of outlines to ramify",
		help: `Makes git understand taxonomy outlines, in the repository of --dir:

  .gitattributes   *.outline files get diff=ramify merge=ramify (other
                   attributes on that line are kept; the line is added
                   when there is none)
  .gitignore       ramify's temporary files (.NAME.tmp-*) and the journal of
                   an interrupted absorb, so that a crash never shows in
                   "git status" (the next ramify command removes or
                   finishes them)
  .git/config      the local config of the drivers (git config --local)
  .git/hooks/pre-merge-commit
                   runs "ramify git-merge-check" before a merge commit: a
                   merge whose constraint records contradict each other
                   stops there, even when only one branch changed the
                   outline (and git ran no merge driver); a hook that is
                   not ramify's is left alone

Afterwards "git diff" shows what changed in an outline as ramify diff
does, and "git log -p" (which runs no external diff unless given
--ext-diff) lists each item with its category, so that a move reads as
one line out and one line in. "git diff --no-ext-diff --no-textconv"
shows the file's own lines, as a patch to apply needs. When a merge finds that
both branches changed the taxonomy outline, git asks ramify, which
regenerates it from the merged items and constraints: no conflict markers.
When the merged constraints contradict each other, the merge stops with
the outline unresolved (as on your branch) and the conflicting records
named; fix them, run "ramify solve", then "git add" the outline.

The config names the running ramify: plain "ramify" when that is what
PATH finds, else its absolute path (run git-setup again after moving it).
The merge driver learns which commit is merged from "git merge" (and so
"git pull"); in a rebase or cherry-pick it leaves the outline unresolved
and asks for "ramify solve".

Running git-setup again changes nothing and says so. "ramify init" runs it
too when the folder is in a git repository.`,
		run: runGitSetup,
	})
}

func runGitSetup(e *env, args []string) error {
	if err := noArguments("git-setup", args, "use --dir to choose the repository"); err != nil {
		return err
	}
	changes, err := gitSetup(e, e.dir())
	if errors.Is(err, errNotGitRepo) {
		return usagef("%s is not in a git repository; run `git init` there first", e.dir())
	}
	if err != nil {
		return err
	}
	e.result = &struct {
		Changed []string `json:"changed"`
	}{nonNil(changes)}
	if len(changes) == 0 {
		e.say("git is already set up for ramify: nothing changed")
		return nil
	}
	for _, c := range changes {
		e.say("%s", c)
	}
	return nil
}

// gitSetup wires the outline files of the taxonomy repository at dir to
// ramify's git drivers: the .gitattributes line and the local git config.
// It returns what it changed, one line each, nothing when all was set up
// already, and errNotGitRepo when dir is not in a git work tree. It writes
// nothing there. Notices (a temporary build) go to e's stderr.
func gitSetup(e *env, dir string) ([]string, error) {
	if _, err := gitTopLevel(dir); err != nil {
		return nil, err
	}
	var changes []string
	path, old, existed, err := readSetupFile(dir, ".gitattributes")
	if err != nil {
		return nil, err
	}
	text, changed := withDriverAttributes(string(old))
	if changed {
		if err := format.WriteFileAtomic(path, []byte(text), 0o644); err != nil {
			return nil, err
		}
		verb := "updated"
		if !existed {
			verb = "wrote"
		}
		changes = append(changes, verb+" .gitattributes: "+outlinePattern+" "+strings.Join(driverAttributes, " "))
	}
	ignored, err := ignoreTempFiles(dir)
	if err != nil {
		return changes, err
	}
	changes = append(changes, ignored...)
	prog, temporary := driverProgram()
	if temporary {
		e.notice("note: this ramify is a temporary build (go run); the git config will stop working when it is gone. Install ramify (go install ./cmd/ramify) and run `ramify git-setup` again.")
	}
	for _, c := range driverConfig(prog) {
		// --get exits 1 when the key is unset: that is "differs" too.
		cur, err := runGit(dir, gitOutputLimit, "config", "--local", "--get", c.key)
		if err == nil && strings.TrimSuffix(string(cur), "\n") == c.value {
			continue
		}
		var ge *gitError
		if err != nil && (!errors.As(err, &ge) || ge.exitCode() != 1) {
			return changes, err
		}
		if _, err := runGit(dir, gitOutputLimit, "config", "--local", c.key, c.value); err != nil {
			return changes, err
		}
		changes = append(changes, "set git config "+c.key+" = "+c.value)
	}
	hook, err := installMergeHook(e, dir, prog)
	return append(changes, hook...), err
}

// readSetupFile reads the git file name (.gitattributes, .gitignore) at
// the top of the repository dir, which git-setup edits: its path, its text
// and whether it exists (a missing one reads as empty).
func readSetupFile(dir, name string) (path string, text []byte, existed bool, err error) {
	path, err = repo.Resolve(dir, name)
	if err != nil {
		return "", nil, false, err
	}
	text, err = format.ReadFileLimited(path, name, format.MaxSmallFileBytes)
	if err != nil && !errors.Is(err, fs.ErrNotExist) {
		return "", nil, false, err
	}
	return path, text, err == nil, nil
}

// gitSetupForInit is what `ramify init` runs: gitSetup when dir is in a
// git repository, nothing when it is not or git is not installed. It
// returns what changed, for init to say.
func gitSetupForInit(e *env, dir string) ([]string, error) {
	changes, err := gitSetup(e, dir)
	if errors.Is(err, errNotGitRepo) || errors.Is(err, errNoGit) {
		return nil, nil
	}
	return changes, err
}

// ignoreTempFiles adds the patterns of ramify's temporary files and
// journal to the .gitignore of dir, each when no line has it yet, and says
// what it changed.
func ignoreTempFiles(dir string) ([]string, error) {
	path, old, _, err := readSetupFile(dir, ".gitignore")
	if err != nil {
		return nil, err
	}
	have := map[string]bool{}
	for _, l := range strings.Split(string(old), "\n") {
		have[strings.TrimSpace(l)] = true
	}
	var missing []string
	for _, p := range format.TempIgnorePatterns {
		if !have[p] {
			missing = append(missing, p)
		}
	}
	if len(missing) == 0 {
		return nil, nil
	}
	text := string(old)
	if text != "" && !strings.HasSuffix(text, "\n") {
		text += "\n"
	}
	text += "# Left by an interrupted ramify run; the next ramify command cleans up (ramify git-setup).\n"
	text += strings.Join(missing, "\n") + "\n"
	if err := format.WriteFileAtomic(path, []byte(text), 0o644); err != nil {
		return nil, err
	}
	return []string{"updated .gitignore: " + strings.Join(missing, " ")}, nil
}
