package format

import (
	"fmt"
	"path"
	"strings"
)

// ConstraintsDir is the repository folder that holds the constraint
// files, read in sorted order.
const ConstraintsDir = "constraints"

// CheckRepoPath says what is wrong with a path a repository file names,
// or "" if it is fine. Paths are relative to the repository, written with
// forward slashes, already clean, and cannot leave the repository or reach
// into .git: a settings file from a pull request must not make ramify read
// or write elsewhere.
func CheckRepoPath(p string) string {
	switch {
	case p == "":
		return "path is empty"
	case p == ".":
		return "path \".\" names the repository itself, not a file"
	case strings.Contains(p, `\`):
		return fmt.Sprintf("path %q contains a backslash; write paths with forward slashes", clip(p))
	case strings.HasPrefix(p, "/"):
		return fmt.Sprintf("path %q is absolute; write it relative to the repository", clip(p))
	case strings.HasPrefix(p, "-"):
		return fmt.Sprintf("path %q starts with \"-\"", clip(p))
	case hasControl(p, ""):
		return fmt.Sprintf("path %q contains a control character", clip(p))
	case len(p) >= 2 && p[1] == ':':
		return fmt.Sprintf("path %q looks like a drive letter; write it relative to the repository", clip(p))
	}
	for _, part := range strings.Split(p, "/") {
		if part == ".." {
			return fmt.Sprintf("path %q leaves the repository (\"..\")", clip(p))
		}
	}
	if path.Clean(p) != p {
		return fmt.Sprintf("path %q is not clean; write it as %q", clip(p), clip(path.Clean(p)))
	}
	if first, _, _ := strings.Cut(p, "/"); first == ".git" {
		return fmt.Sprintf("path %q points into .git", clip(p))
	}
	return ""
}
