package main

import (
	"bytes"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"regexp"
	"strings"
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
// option. git is never run through a shell.
func runGit(dir string, limit int64, args ...string) ([]byte, error) {
	return runGitInput(dir, limit, nil, args...)
}

// runGitInput is runGit with bytes fed to git's standard input.
func runGitInput(dir string, limit int64, stdin []byte, args ...string) ([]byte, error) {
	cmd := exec.Command("git", args...)
	cmd.Dir = dir
	// Never stop to ask for a password, and keep git's messages in one
	// language so ramify can quote them.
	cmd.Env = append(os.Environ(), "GIT_TERMINAL_PROMPT=0", "LC_ALL=C")
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
	out, err := runGit(dir, gitOutputLimit, "rev-parse", "--is-inside-work-tree", "--show-toplevel")
	if err != nil {
		var ge *gitError
		if errors.As(err, &ge) {
			return "", errNotGitRepo
		}
		return "", err
	}
	lines := strings.Split(strings.TrimRight(string(out), "\n"), "\n")
	if len(lines) != 2 || lines[0] != "true" {
		return "", errNotGitRepo
	}
	return lines[1], nil
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
