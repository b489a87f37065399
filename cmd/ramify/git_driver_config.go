package main

import (
	"os"
	"os/exec"
	"path/filepath"
	"strings"
)

// gitDriverName is the name .gitattributes and git's config give ramify's
// diff and merge drivers.
const gitDriverName = "ramify"

// configEntry is one key of the local git config that git-setup sets.
type configEntry struct {
	key, value string
}

// driverConfig is the local git config that wires the drivers to prog,
// the command that runs this ramify (see driverProgram). The forms follow
// git's gitattributes documentation: diff.<name>.command is run with the
// file's path and the old and new versions appended (7 arguments, 9 for a
// rename); diff.<name>.textconv with one file appended; merge.<name>.driver
// is a shell command in which git replaces %O (ancestor), %A (ours, where
// the result goes), %B (theirs) and %P (the path). "--" ends ramify's
// options, so no file name can be read as one; git expands "%%" in the
// merge driver's line to "%", so a "%" in prog is doubled there. merge.<name>.recursive
// names the driver for git's inner merges of several merge bases, where
// regenerating would be wasted work: "binary" keeps one side.
func driverConfig(prog string) []configEntry {
	return []configEntry{
		{"diff." + gitDriverName + ".command", prog + " git-diff-driver --"},
		{"diff." + gitDriverName + ".textconv", prog + " git-textconv --"},
		{"merge." + gitDriverName + ".name", "ramify: regenerate the taxonomy from the merged items and constraints"},
		{"merge." + gitDriverName + ".driver", strings.ReplaceAll(prog, "%", "%%") + " git-merge-driver -- %O %A %B %P"},
		{"merge." + gitDriverName + ".recursive", "binary"},
	}
}

// driverProgram is how git's config names this ramify: plain "ramify"
// when that is what a PATH lookup finds (the config then survives an
// upgrade in place, and reads well), and otherwise the absolute path of
// the running executable, quoted for the shell git runs drivers with.
// .git/config is never committed, so a machine's path in it is fine.
// temporary is true when the executable looks like a `go run` build,
// which disappears when it exits.
func driverProgram() (prog string, temporary bool) {
	exe, err := os.Executable()
	if err != nil {
		return gitDriverName, false
	}
	if found, err := exec.LookPath(gitDriverName); err == nil && sameExecutable(found, exe) {
		return gitDriverName, false
	}
	temporary = strings.Contains(exe, string(filepath.Separator)+"go-build")
	return shellQuote(exe), temporary
}

func sameExecutable(a, b string) bool {
	ia, err := os.Stat(a)
	if err != nil {
		return false
	}
	ib, err := os.Stat(b)
	return err == nil && os.SameFile(ia, ib)
}

// shellQuote quotes s for a POSIX shell: as it is when it holds only
// characters no shell treats specially, else in single quotes.
func shellQuote(s string) string {
	if s != "" && strings.Trim(s, "abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ0123456789_./-+:@=,") == "" {
		return s
	}
	return "'" + strings.ReplaceAll(s, "'", `'\''`) + "'"
}
