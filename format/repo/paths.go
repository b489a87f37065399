// Package repo loads a whole taxonomy repository — settings, items,
// vectors, links, constraint files and the outline — checks every cross
// reference, and reports every problem with its file, line and column.
// It knows the document model only: regenerating the outline from what
// it loads is package solve/regen.
package repo

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"

	"github.com/ramify-tax/ramify/format"
)

// Resolve turns a repository-relative path into a path on disk, refusing
// anything that would leave the repository: an absolute path, "..", a
// symbolic link that points outside, or anything under .git. Inputs can
// come from an untrusted pull request, so every file ramify reads or
// writes in a repository goes through Resolve.
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
	for _, part := range strings.Split(clean, string(filepath.Separator)) {
		// git's own files are never ramify's to read or write (and a
		// case-insensitive file system folds ".GIT" into ".git").
		if strings.EqualFold(part, ".git") {
			return "", fmt.Errorf("path %q points into .git", rel)
		}
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

// ReadSettingsFile reads dir's ramify.toml through Resolve, so that a
// settings file linked to somewhere outside the repository is refused.
// A missing file is an error that wraps fs.ErrNotExist.
func ReadSettingsFile(dir string) ([]byte, error) {
	full, err := Resolve(dir, SettingsFile)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", SettingsFile, err)
	}
	return format.ReadFileLimited(full, SettingsFile, format.MaxSmallFileBytes)
}
