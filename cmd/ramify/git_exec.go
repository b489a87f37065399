package main

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"sync"
)

// errNotGitRepo says that a folder is not inside a git work tree.
var errNotGitRepo = errors.New("not a git repository")

// errNoGit says that git is not installed.
var errNoGit = errors.New("git is not installed (or not on PATH)")

// gitError is a git command that failed: its arguments and what it said.
type gitError struct {
	args   []string
	stderr string
	err    error
}

func (g *gitError) Error() string {
	msg := strings.TrimSpace(g.stderr)
	if msg == "" {
		msg = g.err.Error()
	}
	msg = strings.TrimPrefix(msg, "fatal: ")
	return "git " + strings.Join(g.args, " ") + ": " + firstLineOf(msg)
}

// exitCode is git's exit status, or -1 when git did not run or was killed.
func (g *gitError) exitCode() int {
	var ee *exec.ExitError
	if errors.As(g.err, &ee) {
		return ee.ExitCode()
	}
	return -1
}

func firstLineOf(s string) string {
	line, _, _ := strings.Cut(s, "\n")
	return line
}

// gitOutputLimit bounds what ramify reads from a git command that prints
// a few lines; commands that print a file pass their own bound.
const gitOutputLimit = 1 << 20

// runGit runs git in dir with the given arguments and returns what it
// printed on stdout, at most limit bytes (more is an error). Arguments are
// fixed by the caller; any part that came from the user has passed
// checkRevision or format.CheckRepoPath first, so none can be read as an
// option. git is never run through a shell, and always through gitCommand.
func runGit(dir string, limit int64, args ...string) ([]byte, error) {
	return runGitInput(dir, limit, nil, args...)
}

// runGitInput is runGit with bytes fed to git's standard input.
func runGitInput(dir string, limit int64, stdin []byte, args ...string) ([]byte, error) {
	cmd, err := gitCommand(dir, args...)
	if err != nil {
		return nil, err
	}
	if stdin != nil {
		cmd.Stdin = bytes.NewReader(stdin)
	}
	out := &cappedBuffer{limit: limit}
	errOut := &cappedBuffer{limit: 64 << 10}
	cmd.Stdout, cmd.Stderr = out, errOut
	if err := cmd.Run(); err != nil {
		if errors.Is(err, exec.ErrNotFound) {
			return nil, errNoGit
		}
		return out.Bytes(), &gitError{args: args, stderr: errOut.String(), err: err}
	}
	if out.over {
		return nil, fmt.Errorf("git %s: printed more than the limit of %d bytes", strings.Join(args, " "), limit)
	}
	return out.Bytes(), nil
}

// gitSafety is passed before every git subcommand. A folder committed by a
// pull request may pose as a repository (HEAD, objects/, refs/ and a config
// naming commands); git must never discover and use one, and must run no
// command that a repository's configuration or a work tree could name:
// bare repositories are used only when named explicitly, fsmonitor and
// hooks are off.
var gitSafety = []string{
	"-c", "safe.bareRepository=explicit",
	"-c", "core.fsmonitor=false",
	"-c", "core.hooksPath=" + os.DevNull,
}

// gitCommand is the one place that builds a git command line: git, the
// repository holding dir pinned with --git-dir and --work-tree (found once,
// by findRepo), --literal-pathspecs (a file named ":(glob)x" is that file,
// not a pattern), gitSafety, then args. It runs in dir, so paths written
// "./rel" (see gitPaths) are relative to dir.
func gitCommand(dir string, args ...string) (*exec.Cmd, error) {
	repo, err := findRepo(dir)
	if err != nil {
		return nil, err
	}
	full := append([]string{"--git-dir=" + repo.gitDir, "--work-tree=" + repo.top, "--literal-pathspecs"}, gitSafety...)
	return newGitCmd(repo.dirIn(dir), append(full, args...)), nil
}

// gitPaths writes repository paths (relative to the folder git runs in) as
// git should get them after "--": each prefixed "./", so none can be read
// as an option or as pathspec magic.
func gitPaths(rels []string) []string {
	out := make([]string, len(rels))
	for i, r := range rels {
		out[i] = "./" + r
	}
	return out
}

// newGitCmd is exec.Command for git with ramify's fixed environment.
func newGitCmd(dir string, args []string) *exec.Cmd {
	cmd := exec.Command("git", args...)
	cmd.Dir = dir
	// Never stop to ask for a password, keep git's messages in one
	// language so ramify can quote them, take no lock a reader does not
	// need, and let no repository from the environment override the one
	// named on the command line.
	env := make([]string, 0, len(os.Environ())+3)
	for _, kv := range os.Environ() {
		name, _, _ := strings.Cut(kv, "=")
		switch name {
		case "GIT_DIR", "GIT_WORK_TREE", "GIT_COMMON_DIR", "GIT_CEILING_DIRECTORIES", "GIT_DISCOVERY_ACROSS_FILESYSTEM":
			continue
		}
		env = append(env, kv)
	}
	cmd.Env = append(env, "GIT_TERMINAL_PROMPT=0", "LC_ALL=C", "GIT_OPTIONAL_LOCKS=0")
	return cmd
}

// gitRepo is a work tree and its repository.
type gitRepo struct {
	top    string // the work tree's top folder, symbolic links resolved
	gitDir string // its repository, absolute
}

// dirIn is dir as git should run in it: with symbolic links resolved, so
// that git sees it inside top.
func (r *gitRepo) dirIn(dir string) string {
	if real, err := filepath.EvalSymlinks(dir); err == nil {
		return real
	}
	return dir
}

var (
	reposMu sync.Mutex
	repos   = map[string]*gitRepo{}
)

// findRepo returns the git work tree holding dir, or errNotGitRepo. The
// top level is the nearest folder at or above dir with a .git entry (git
// refuses to commit one, so no pull request can plant it); git confirms
// it with safe.bareRepository=explicit, and the answer is kept for dir.
// A folder that only looks like a bare repository is never used.
func findRepo(dir string) (*gitRepo, error) {
	abs, err := filepath.Abs(dir)
	if err != nil {
		return nil, err
	}
	if real, err := filepath.EvalSymlinks(abs); err == nil {
		abs = real
	}
	reposMu.Lock()
	defer reposMu.Unlock()
	if r, ok := repos[abs]; ok {
		return r, nil
	}
	top := ""
	for d := abs; ; {
		if fi, err := os.Lstat(filepath.Join(d, ".git")); err == nil && (fi.IsDir() || fi.Mode().IsRegular()) {
			top = d
			break
		}
		parent := filepath.Dir(d)
		if parent == d {
			return nil, errNotGitRepo
		}
		d = parent
	}
	cmd := newGitCmd(top, append(append([]string{}, gitSafety...), "rev-parse", "--is-inside-work-tree", "--show-toplevel", "--absolute-git-dir"))
	out := &cappedBuffer{limit: gitOutputLimit}
	cmd.Stdout, cmd.Stderr = out, io.Discard
	if err := cmd.Run(); err != nil {
		if errors.Is(err, exec.ErrNotFound) {
			return nil, errNoGit
		}
		return nil, errNotGitRepo
	}
	lines := strings.Split(strings.TrimRight(out.String(), "\n"), "\n")
	if len(lines) != 3 || lines[0] != "true" {
		return nil, errNotGitRepo
	}
	gotTop := lines[1]
	if real, err := filepath.EvalSymlinks(gotTop); err == nil {
		gotTop = real
	}
	if gotTop != top {
		return nil, errNotGitRepo
	}
	r := &gitRepo{top: top, gitDir: lines[2]}
	repos[abs] = r
	return r, nil
}

// cappedBuffer keeps the first limit bytes written to it and drops the
// rest, remembering that it did. It never returns a write error: git must
// be able to finish writing, or it would block on a full pipe.
type cappedBuffer struct {
	bytes.Buffer
	limit int64
	over  bool
}

func (c *cappedBuffer) Write(p []byte) (int, error) {
	room := c.limit - int64(c.Len())
	if int64(len(p)) > room {
		c.over = true
		if room > 0 {
			c.Buffer.Write(p[:room])
		}
		return len(p), nil
	}
	return c.Buffer.Write(p)
}

// gitTopLevel returns the top folder of the git work tree holding dir, or
// errNotGitRepo.
func gitTopLevel(dir string) (string, error) {
	r, err := findRepo(dir)
	if err != nil {
		return "", err
	}
	return r.top, nil
}

// revisionPattern is what ramify accepts as a git revision: names,
// hashes and the suffixes ~N, ^N, @{...}. Nothing that starts with "-"
// (an option to git), no spaces, no shell characters, no ":" (a path).
var revisionPattern = regexp.MustCompile(`^[A-Za-z0-9@][A-Za-z0-9._/@^~{}-]*$`)

// maxRevisionLen bounds a revision string.
const maxRevisionLen = 256

// checkRevision says what is wrong with rev as a git revision, or "".
func checkRevision(rev string) string {
	switch {
	case rev == "":
		return "the revision is empty"
	case len(rev) > maxRevisionLen:
		return fmt.Sprintf("the revision is longer than %d characters", maxRevisionLen)
	case strings.HasPrefix(rev, "-"):
		return fmt.Sprintf("revision %q starts with \"-\"", rev)
	case !revisionPattern.MatchString(rev):
		return fmt.Sprintf("%q is not a revision ramify accepts (letters, digits and . _ / @ ^ ~ { } -)", rev)
	case strings.Contains(rev, ".."):
		return fmt.Sprintf("%q is a range; name one revision", rev)
	}
	return ""
}
