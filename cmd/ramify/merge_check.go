package main

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path"
	"path/filepath"
	"slices"
	"strings"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/solve"
	"github.com/ramify-tax/ramify/solve/regen"
)

func init() {
	register(&command{
		name:    "git-merge-check",
		summary: "for git: stops a merge whose constraint records contradict each other (pre-merge-commit hook)",
		help: `git runs this as its pre-merge-commit hook (see "ramify git-setup") when a
merge has gone through without conflicts, just before the merge commit is
made, from the top of the work tree.

The merge driver regenerates the outline only when both branches changed
it. When only one did (or neither), git merges the constraint files on
its own and the merged records can contradict each other. For every
ramify repository the merge touches, this loads the merged files and
decides whether the constraint records can all hold. When they cannot,
it names the smallest conflicting set (file, line, author, reason) and
exits 1: git then stops before the merge commit, with the merge in
progress ("git merge --abort" undoes it). Change or remove a record, run
"ramify solve", "git add" the files and "git commit".

When the records agree but the merged outline no longer honours them,
it says so and lets the merge commit go ahead: run "ramify solve" and
commit.

git skips the hook for "git merge --no-commit" and "--no-verify"; "ramify
check" then finds the same problems.`,
		run: runGitMergeCheck,
	})
}

// mergeHookMarker is the line that marks the pre-merge-commit hook as
// ramify's own, so git-setup rewrites it but never another hook.
const mergeHookMarker = "# ramify: check the merged constraint records (ramify git-setup)"

func runGitMergeCheck(e *env, args []string) error {
	if err := noArguments("git-merge-check", args, ""); err != nil {
		return err
	}
	top, err := gitTopLevel(".")
	if err != nil {
		return err
	}
	out, err := runGit(top, gitOutputLimit, "diff", "--cached", "--name-only", "-z", "HEAD")
	if err != nil {
		return err
	}
	var changed []string
	for _, p := range strings.Split(string(out), "\x00") {
		if p != "" && format.CheckRepoPath(p) == "" {
			changed = append(changed, p)
		}
	}
	repos, err := touchedRepos(top, changed)
	if err != nil {
		return err
	}
	var lines []string
	for _, repo := range repos {
		lines = append(lines, checkMergedRepo(e, top, repo)...)
	}
	if len(lines) == 0 {
		return nil
	}
	lines = append(lines,
		"The merge is stopped before its commit (`git merge --abort` undoes it).",
		"Change or remove one of the records, run `ramify solve`, `git add` the files, then `git commit`.")
	return &failure{lines: lines}
}

// touchedRepos lists the ramify repositories (folders with a ramify.toml,
// relative to top, "." for top) that hold one of the changed paths,
// sorted.
func touchedRepos(top string, changed []string) ([]string, error) {
	found := map[string]bool{}
	checked := map[string]bool{}
	for _, p := range changed {
		for dir := path.Dir(p); ; dir = path.Dir(dir) {
			if checked[dir] {
				break
			}
			checked[dir] = true
			_, err := os.Lstat(filepath.Join(top, filepath.FromSlash(path.Join(dir, repo.SettingsFile))))
			if err == nil {
				found[dir] = true
				break
			}
			if !errors.Is(err, fs.ErrNotExist) {
				return nil, err
			}
			if dir == "." {
				break
			}
		}
	}
	var out []string
	for d := range found {
		out = append(out, d)
	}
	slices.Sort(out)
	return out, nil
}

// checkMergedRepo returns the lines that stop the merge for one
// repository, or none; a merged outline that is merely out of date gets a
// notice.
func checkMergedRepo(e *env, top, dir string) []string {
	name := func(rel string) string { return fromTop(dir, rel) }
	p, ds := repo.Load(filepath.Join(top, filepath.FromSlash(dir)))
	if len(ds) > 0 {
		lines := []string{"ramify: the merged taxonomy repository " + name("") + " does not load:"}
		for _, d := range ds {
			lines = append(lines, "  "+name(d.String()))
		}
		return lines
	}
	compiled := regen.Compile(p)
	var ce *regen.ConflictError
	if errors.As(compiled.Consistent(len(p.Items)), &ce) {
		lines := []string{fmt.Sprintf("ramify: the merge makes %d constraint records contradict each other:", len(ce.Records))}
		for _, r := range ce.Records {
			lines = append(lines, "  "+name(describeRecord(r)))
		}
		return lines
	}
	if p.Outline != nil && !p.Outline.Edited() && len(p.OutlineMembership()) == 0 {
		tree := regen.FromCategory(p.Outline.Root, p.Index, len(p.Items))
		if broken := solve.Satisfies(tree, compiled.Constraints); len(broken) > 0 {
			e.notice("ramify: the merged %s breaks %s; run `ramify solve` and commit the result",
				name(p.Settings.Taxonomy.File), plural(len(broken), "constraint record", "constraint records"))
		}
	}
	return nil
}

// installMergeHook writes git's pre-merge-commit hook to run
// git-merge-check with prog, unless a hook that is not ramify's is
// there. It returns what it changed.
func installMergeHook(e *env, dir, prog string) ([]string, error) {
	// ramify runs git with hooks off (gitSafety), so git is asked for the
	// repository's folder, not for its hooks path.
	out, err := runGit(dir, gitOutputLimit, "rev-parse", "--git-common-dir")
	if err != nil {
		return nil, err
	}
	common := strings.TrimSuffix(string(out), "\n")
	if !filepath.IsAbs(common) {
		common = filepath.Join(dir, common)
	}
	hook := filepath.Join(common, "hooks", "pre-merge-commit")
	for _, scope := range []string{"--local", "--global"} {
		if v, err := runGit(dir, gitOutputLimit, "config", scope, "--get", "core.hooksPath"); err == nil && strings.TrimSpace(string(v)) != "" {
			e.notice("note: git's core.hooksPath is set (%s), so git does not run the hooks in .git/hooks; add `%s git-merge-check` to a pre-merge-commit hook there", strings.TrimSpace(string(v)), prog)
		}
	}
	text := "#!/bin/sh\n" + mergeHookMarker + "\nexec " + prog + " git-merge-check\n"
	old, err := format.ReadFileLimited(hook, "pre-merge-commit", format.MaxSmallFileBytes)
	switch {
	case err == nil && string(old) == text:
		return nil, nil
	case err == nil && !strings.Contains(string(old), mergeHookMarker):
		e.notice("note: left the pre-merge-commit hook alone (it is not ramify's); add `%s git-merge-check` to it so that a merge whose records contradict each other stops", prog)
		return nil, nil
	case err != nil && !errors.Is(err, fs.ErrNotExist):
		return nil, err
	}
	if err := os.MkdirAll(filepath.Dir(hook), 0o755); err != nil {
		return nil, err
	}
	if err := format.WriteFileAtomic(hook, []byte(text), 0o755); err != nil {
		return nil, err
	}
	return []string{"wrote git hook pre-merge-commit: " + prog + " git-merge-check"}, nil
}
