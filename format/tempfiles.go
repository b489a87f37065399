package format

import (
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"syscall"
	"time"
)

// TempMarker is the part of the name of every temporary file ramify
// writes: ".NAME.tmp-PID-RANDOM" next to NAME, where PID is the process
// that writes it. .gitignore patterns use it (see TempIgnorePatterns).
const TempMarker = ".tmp-"

// TempIgnorePatterns are the .gitignore patterns that keep ramify's
// temporary files and its unfinished-write journal out of `git status`.
var TempIgnorePatterns = []string{".*" + TempMarker + "*", JournalName}

// JournalName is the file a multi-file write leaves in the repository
// while it is being applied (see the absorb command).
const JournalName = ".ramify-journal"

// staleTempAge is how old a temporary file without a process id in its
// name (an older naming) must be before it counts as abandoned.
const staleTempAge = 10 * time.Minute

// tempPattern is the os.CreateTemp pattern for a temporary file beside
// path, carrying this process's id.
func tempPattern(path string) string {
	return "." + filepath.Base(path) + TempMarker + strconv.Itoa(os.Getpid()) + "-*"
}

// IsTempName reports whether a file name is one of ramify's temporary
// files for a file named target (any target when target is "").
func IsTempName(name, target string) bool {
	if target != "" {
		return strings.HasPrefix(name, "."+target+TempMarker)
	}
	return strings.HasPrefix(name, ".") && strings.Contains(name, TempMarker)
}

// CleanStaleTemps removes, from each of dirs, ramify's temporary files
// that no running process will finish: those whose writer's process id is
// not alive (it crashed or was killed), and those of the older naming
// without an id once they are older than staleTempAge. It returns the
// paths removed; folders that do not exist are skipped.
func CleanStaleTemps(dirs ...string) ([]string, error) {
	var removed []string
	for _, dir := range dirs {
		entries, err := os.ReadDir(dir)
		if errors.Is(err, fs.ErrNotExist) {
			continue
		}
		if err != nil {
			return removed, err
		}
		for _, e := range entries {
			if !e.Type().IsRegular() || !IsTempName(e.Name(), "") || !staleTemp(e) {
				continue
			}
			p := filepath.Join(dir, e.Name())
			if err := os.Remove(p); err != nil && !errors.Is(err, fs.ErrNotExist) {
				return removed, err
			}
			removed = append(removed, p)
		}
	}
	return removed, nil
}

// staleTemp reports whether a temporary file was abandoned by its writer.
func staleTemp(e fs.DirEntry) bool {
	name := e.Name()
	rest := name[strings.LastIndex(name, TempMarker)+len(TempMarker):]
	pidText, _, hasPid := strings.Cut(rest, "-")
	if pid, err := strconv.Atoi(pidText); hasPid && err == nil && pid > 0 {
		return !processAlive(pid)
	}
	info, err := e.Info()
	return err == nil && time.Since(info.ModTime()) > staleTempAge
}

// processAlive reports whether a process with this id exists (signal 0
// checks without sending anything; EPERM means it exists but is not ours).
func processAlive(pid int) bool {
	if pid == os.Getpid() {
		return true
	}
	err := syscall.Kill(pid, 0)
	return err == nil || errors.Is(err, syscall.EPERM)
}
