// Package project loads a whole taxonomy repository — settings, items,
// vectors, links, constraint files and the outline — checks every cross
// reference, and reports every problem with its file, line and column.
package project

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"
)

// Resolve turns a repository-relative path from a settings file into a
// path on disk, refusing anything that would leave the repository: an
// absolute path, "..", or a symbolic link that points outside. Inputs can
// come from an untrusted pull request, so this is the only way project
// code turns a configured name into a file to open.
func Resolve(root, rel string) (string, error) {
	if rel == "" {
		return "", errors.New("empty path")
	}
	if filepath.IsAbs(rel) || strings.HasPrefix(rel, "/") || strings.Contains(rel, "\\") {
		return "", fmt.Errorf("path %q must be relative to the repository", rel)
	}
	clean := filepath.Clean(filepath.FromSlash(rel))
	if clean == ".." || strings.HasPrefix(clean, ".."+string(filepath.Separator)) {
		return "", fmt.Errorf("path %q leaves the repository", rel)
	}
	full := filepath.Join(root, clean)
	rootReal, err := filepath.EvalSymlinks(root)
	if err != nil {
		return "", err
	}
	// Resolve links on the longest existing prefix: the file itself may
	// not exist yet (an output), but its folder must stay inside.
	probe := full
	for {
		if _, err := os.Lstat(probe); err == nil {
			break
		}
		parent := filepath.Dir(probe)
		if parent == probe {
			break
		}
		probe = parent
	}
	real, err := filepath.EvalSymlinks(probe)
	if err != nil {
		return "", err
	}
	inside, err := filepath.Rel(rootReal, real)
	if err != nil || inside == ".." || strings.HasPrefix(inside, ".."+string(filepath.Separator)) {
		return "", fmt.Errorf("path %q leads outside the repository", rel)
	}
	return full, nil
}
