package main

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path"
	"path/filepath"
	"strings"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/solve/regen"
)

func init() {
	register(&command{
		name:    "git-merge-driver",
		summary: "for git: merges the taxonomy outline by regenerating it (merge.ramify.driver)",
		usage:   "-- ANCESTOR OURS THEIRS PATH",
		help: `git runs this when both sides of a merge changed a file marked
merge=ramify in .gitattributes (see "ramify git-setup"), from the top of
the work tree, with the files git's gitattributes documentation names %O
(the common ancestor), %A (our version, where the result goes), %B (their
version) and %P (the path).

For the taxonomy outline of a ramify repository it works out the merged
items and constraints (git merge-tree, in memory: git updates the work
tree only after every file is merged), regenerates the outline from them
with ours as the previous version, writes it to %A and exits 0: the merge
goes on without conflict markers.

It exits 1, leaving %A as ours so the merge stops with the outline
unresolved, when the merged constraint records contradict each other
(naming them, with file, line, author and reason), when another input file
of the repository conflicts, when the merged inputs do not load, or when it
cannot tell which commit is merged (rebase, cherry-pick). Then fix what it
names, run "ramify solve" and "git add" the outline.

Any other outline (a review packet) gets git's ordinary line merge.`,
		run: runGitMergeDriver,
	})
}

func runGitMergeDriver(e *env, args []string) error {
	if len(args) != 4 {
		return usagef("git-merge-driver takes the 4 files git names %%O %%A %%B %%P, got %d arguments", len(args))
	}
	ancestor, ours, theirs, rel := args[0], args[1], args[2], args[3]
	for _, f := range []string{ancestor, ours, theirs} {
		if f == "" || strings.HasPrefix(f, "-") {
			return usagef("git named a merge file %q; expected a temporary file", f)
		}
	}
	if msg := format.CheckRepoPath(rel); msg != "" {
		return usagef("%s", msg)
	}
	// The files are named relative to the folder git runs the driver in.
	for _, f := range []*string{&ancestor, &ours, &theirs} {
		abs, err := filepath.Abs(*f)
		if err != nil {
			return err
		}
		*f = abs
	}
	// git runs merge drivers from the top of the work tree; ask git where
	// that is rather than trust the folder.
	top, err := gitTopLevel(".")
	if err != nil {
		return err
	}
	repo, err := findTaxonomyRepo(top, rel)
	if err != nil {
		return err
	}
	if repo == "" {
		return lineMerge(top, ancestor, ours, theirs, rel)
	}
	m := &outlineMerge{top: top, repo: repo, rel: rel, ours: ours, theirs: theirs}
	return m.run(e)
}

// findTaxonomyRepo is the folder (relative to top, "." for top itself)
// of the ramify repository whose taxonomy file is rel, looking in rel's
// folder and each folder above it for a ramify.toml, or "" when rel is not
// a taxonomy file (a review packet, say).
func findTaxonomyRepo(top, rel string) (string, error) {
	for dir := path.Dir(rel); ; dir = path.Dir(dir) {
		file := path.Join(dir, repo.SettingsFile)
		data, err := format.ReadFileLimited(filepath.Join(top, filepath.FromSlash(file)), file, format.MaxSmallFileBytes)
		if err == nil {
			settings, err := format.ParseSettings(file, data)
			if err != nil {
				return "", format.AsDiags(err, file)
			}
			if path.Join(dir, settings.Taxonomy.File) == rel {
				return dir, nil
			}
		} else if !errors.Is(err, fs.ErrNotExist) {
			return "", err
		}
		if dir == "." {
			return "", nil
		}
	}
}

// lineMerge merges a file that is not a taxonomy outline the way git
// would without a driver: a three-way line merge into ours, with conflict
// markers where both sides changed the same lines.
func lineMerge(top, ancestor, ours, theirs, rel string) error {
	_, err := runGit(top, gitOutputLimit, "merge-file", "-L", rel+" (ours)", "-L", rel+" (base)", "-L", rel+" (theirs)", ours, ancestor, theirs)
	var ge *gitError
	if errors.As(err, &ge) && ge.exitCode() > 0 && ge.exitCode() < 128 {
		// git merge-file exits with the number of conflicts.
		return failf("%s: both sides changed the same lines; resolve the conflict markers, then `git add %s`", rel, rel)
	}
	return err
}

// outlineMerge is one run of the merge driver on a taxonomy outline.
type outlineMerge struct {
	top    string // the work tree
	repo   string // the taxonomy repository, relative to top
	rel    string // the outline, relative to top
	ours   string // %A: our version in, the merged version out (absolute)
	theirs string // %B (absolute)
}

func (m *outlineMerge) run(e *env) error {
	head, err := headCommit(m.top)
	if err != nil {
		return err
	}
	other, err := theirsCommit(head, os.Environ())
	if errors.Is(err, errUnknownTheirs) {
		return m.unresolved("cannot tell which commit is being merged (git says so in a merge or pull, not in a rebase or cherry-pick)")
	}
	if err != nil {
		return err
	}
	tree, conflicted, err := mergedTree(m.top, head, other)
	if err != nil {
		return err
	}
	if others := m.conflictedInputs(conflicted); len(others) > 0 {
		return m.unresolved(fmt.Sprintf("these files of the taxonomy repository conflict too: %s; resolve them first", strings.Join(others, ", ")))
	}
	scratch, err := os.MkdirTemp("", "ramify-merge-")
	if err != nil {
		return err
	}
	defer os.RemoveAll(scratch)
	if err := extractTree(m.top, tree, m.repo, scratch); err != nil {
		return err
	}
	p, err := m.loadMerged(scratch)
	if err != nil {
		return err
	}
	sol, err := regen.Regenerate(p, regen.MethodConstrained, nil)
	if err != nil {
		var ce *regen.ConflictError
		if !errors.As(err, &ce) {
			return m.unresolved(err.Error())
		}
		return m.conflict(e, err)
	}
	if err := format.WriteFileAtomic(m.ours, sol.Text, 0o644); err != nil {
		return err
	}
	e.notice("ramify: merged %s by regenerating it from the merged items and constraints (%d items in %d categories)",
		m.rel, len(p.Items), sol.Root.CountCategories())
	return nil
}

// conflict explains contradicting merged records in solve's words, with
// each record's file named from the top of the work tree.
func (m *outlineMerge) conflict(e *env, err error) error {
	var fl *failure
	if !errors.As(solveError(e, err), &fl) || len(fl.lines) < 2 {
		return err
	}
	lines := []string{"ramify: merging " + m.rel + ": " + fl.lines[0]}
	for _, l := range fl.lines[1 : len(fl.lines)-1] {
		lines = append(lines, "  "+fromTop(m.repo, strings.TrimPrefix(l, "  ")))
	}
	lines = append(lines, "change or remove one of them; dropping any one makes the rest agree.")
	return &failure{lines: append(lines, m.advice()...), detail: fl.detail}
}

// conflictedInputs are the conflicted paths inside the taxonomy
// repository other than the outline itself.
func (m *outlineMerge) conflictedInputs(conflicted []string) []string {
	var out []string
	for _, c := range conflicted {
		if c == m.rel {
			continue
		}
		if m.repo == "." || strings.HasPrefix(c, m.repo+"/") {
			out = append(out, c)
		}
	}
	return out
}

// loadMerged loads the merged repository copied to scratch, with our
// outline as the previous version. Both sides' outlines must be as ramify
// wrote them: a hand edit not yet absorbed would be lost by regenerating.
func (m *outlineMerge) loadMerged(scratch string) (*repo.Repo, error) {
	outlineRel := strings.TrimPrefix(m.rel, m.repo+"/")
	if m.repo == "." {
		outlineRel = m.rel
	}
	oursData, err := format.ReadFileLimited(m.ours, outlineRel, format.MaxOutlineBytes)
	if err != nil {
		return nil, err
	}
	// The scratch copy is private and removed afterwards: written plainly.
	outlinePath := filepath.Join(scratch, filepath.FromSlash(outlineRel))
	if err := os.MkdirAll(filepath.Dir(outlinePath), 0o755); err != nil {
		return nil, err
	}
	if err := os.WriteFile(outlinePath, oursData, 0o644); err != nil {
		return nil, err
	}
	var theirs *format.Category
	for _, side := range []struct{ file, who string }{{m.ours, "this branch"}, {m.theirs, "the merged branch"}} {
		data, err := format.ReadFileLimited(side.file, outlineRel, format.MaxOutlineBytes)
		if err != nil {
			return nil, err
		}
		o, err := format.ParseOutline(outlineRel+" ("+side.who+")", data)
		if err != nil {
			ds := format.AsDiags(err, outlineRel)
			return nil, m.unresolved(ds[0].String())
		}
		if o.Edited() {
			return nil, m.unresolved(fmt.Sprintf("%s on %s was reshaped by hand and the edit is not absorbed yet; regenerating would lose it (run `ramify absorb` there)", outlineRel, side.who))
		}
		theirs = o.Root
	}
	p, ds := repo.Load(scratch)
	if len(ds) > 0 {
		lines := []string{"ramify: the merged taxonomy repository does not load:"}
		for _, d := range ds {
			lines = append(lines, "  "+fromTop(m.repo, d.String()))
		}
		return nil, &failure{lines: append(lines, m.advice()...)}
	}
	// Ours is the previous version, whose names carry over; a name an
	// editor typed on the other branch (a provisional name confirmed or
	// replaced) counts as typed, so the merge keeps it too; so do concept identifiers
	// made on the other branch.
	p.NameSources = []*format.Category{theirs}
	return p, nil
}

// fromTop names the file rel of the taxonomy repository in folder dir
// (relative to the top of the work tree, "." for the top itself) as git
// does, from the top of the work tree.
func fromTop(dir, rel string) string {
	if dir == "." {
		return rel
	}
	return dir + "/" + rel
}

// unresolved is the failure that stops the merge with the outline left
// as ours.
func (m *outlineMerge) unresolved(why string) error {
	return &failure{lines: append([]string{"ramify: " + why + "."}, m.advice()...)}
}

// advice says what to do once the merge has stopped.
func (m *outlineMerge) advice() []string {
	return []string{
		m.rel + " is left as it is on this branch and marked unmerged.",
		"Once the inputs are right, run `ramify solve` and `git add " + m.rel + "`, then commit.",
	}
}
