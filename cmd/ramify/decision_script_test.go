package main

import (
	"errors"
	"fmt"
	"io/fs"
	"maps"
	"math/rand/v2"
	"os"
	"os/exec"
	"path"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"syscall"
	"time"

	"github.com/ramify-tax/ramify/format"
	"github.com/rogpeppe/go-internal/testscript"
)

// cmdMoveCategory cuts a category's block out of an outline and pastes it
// at the top level, as an editor would: movecategory FILE NAME.
func cmdMoveCategory(ts *testscript.TestScript, neg bool, args []string) {
	if neg || len(args) != 2 {
		ts.Fatalf("usage: movecategory FILE NAME")
	}
	f := ts.MkAbs(args[0])
	data, err := os.ReadFile(f)
	ts.Check(err)
	out, ok := moveBlockToTop(string(data), args[1])
	if !ok {
		ts.Fatalf("%s: no category %q", args[0], args[1])
	}
	ts.Check(os.WriteFile(f, []byte(out), 0o644))
}

func moveBlockToTop(text, name string) (string, bool) {
	lines := strings.Split(text, "\n")
	indent := func(l string) int { return len(l) - len(strings.TrimLeft(l, " ")) }
	start := -1
	for i, l := range lines {
		if strings.TrimSpace(l) == name+"/" {
			start = i
			break
		}
	}
	if start < 0 {
		return "", false
	}
	end := start + 1
	for end < len(lines) && strings.TrimSpace(lines[end]) != "" && indent(lines[end]) > indent(lines[start]) {
		end++
	}
	var block []string
	for _, l := range lines[start:end] {
		block = append(block, l[indent(lines[start]):])
	}
	rest := append(append([]string(nil), lines[:start]...), lines[end:]...)
	head := 0
	for head < len(rest) && strings.HasPrefix(rest[head], "#") {
		head++
	}
	out := append(append(append([]string(nil), rest[:head]...), block...), rest[head:]...)
	return strings.Join(out, "\n"), true
}

// cmdUniqueRecords fails when a constraint file matching one of the
// patterns holds the same triplet twice (the pair in either order):
// uniquerecords GLOB...
func cmdUniqueRecords(ts *testscript.TestScript, neg bool, args []string) {
	if len(args) == 0 {
		ts.Fatalf("usage: uniquerecords GLOB...")
	}
	var dups []string
	for _, pat := range args {
		files, err := filepath.Glob(ts.MkAbs(pat))
		ts.Check(err)
		if len(files) == 0 {
			ts.Fatalf("no file matches %s", pat)
		}
		for _, f := range files {
			data, err := os.ReadFile(f)
			ts.Check(err)
			cf, err := format.ParseConstraints(filepath.Base(f), data)
			ts.Check(err)
			seen := map[[3]string]bool{}
			for _, t := range cf.Triplets {
				k := [3]string{min(t.Pair[0], t.Pair[1]), max(t.Pair[0], t.Pair[1]), t.Out}
				if seen[k] {
					dups = append(dups, filepath.Base(f)+": "+k[0]+" "+k[1]+" | "+k[2])
				}
				seen[k] = true
			}
		}
	}
	if neg != (len(dups) == 0) {
		return
	}
	if neg {
		ts.Fatalf("no triplet is written twice")
	}
	ts.Fatalf("triplets written twice:\n%s", strings.Join(dups, "\n"))
}

// cmdKillTrials kills a ramify command at points of its multi-file write
// and checks that the repository is then, once any ramify command has run
// in it, exactly as before the command or exactly as after it, with no
// temporary file or journal left: killtrials N DIR ARGS... runs
// `ramify ARGS... --dir COPY` on copies of DIR. It first kills the command
// at every point in turn (RAMIFY_TEST_KILL_AT, which sends SIGKILL there),
// then N times at a random point, then N times after a random delay.
func cmdKillTrials(ts *testscript.TestScript, neg bool, args []string) {
	if neg || len(args) < 3 {
		ts.Fatalf("usage: killtrials N DIR ARGS...")
	}
	n, err := strconv.Atoi(args[0])
	ts.Check(err)
	src, cmdArgs := ts.MkAbs(args[1]), args[2:]
	ramify := ""
	for _, d := range filepath.SplitList(ts.Getenv("PATH")) {
		if p := filepath.Join(d, "ramify"); fileExists(p) {
			ramify = p
			break
		}
	}
	if ramify == "" {
		ts.Fatalf("no ramify on PATH")
	}
	before := repoFiles(ts, src)
	trial := 0
	fresh := func() string {
		trial++
		dst := ts.MkAbs(fmt.Sprintf("trial-%d", trial))
		ts.Check(copyDir(src, dst))
		return dst
	}
	start := func(dir string, killAt int) *exec.Cmd {
		cmd := exec.Command(ramify, append(slices.Clone(cmdArgs), "--dir", dir)...)
		cmd.Env = append(os.Environ(), "HOME="+ts.Getenv("HOME"))
		if killAt > 0 {
			cmd.Env = append(cmd.Env, "RAMIFY_TEST_KILL_AT="+strconv.Itoa(killAt))
		}
		ts.Check(cmd.Start())
		return cmd
	}
	killed := func(err error) bool {
		var ee *exec.ExitError
		if errors.As(err, &ee) {
			if ws, ok := ee.Sys().(syscall.WaitStatus); ok && ws.Signaled() {
				return true
			}
			ts.Fatalf("ramify %s: %v", strings.Join(cmdArgs, " "), err)
		}
		return false
	}
	afterDir := fresh()
	ts.Check(start(afterDir, 0).Wait())
	after := repoFiles(ts, afterDir)
	if maps.Equal(before, after) {
		ts.Fatalf("ramify %s changed nothing", strings.Join(cmdArgs, " "))
	}
	// verify recovers a killed run with a read-only command and compares.
	verify := func(dir, how string) string {
		out, err := exec.Command(ramify, "review", "status", "--dir", dir).CombinedOutput()
		if err != nil {
			ts.Fatalf("%s: ramify review status after the kill: %v\n%s", how, err, out)
		}
		got := repoFiles(ts, dir)
		for name := range got {
			if strings.Contains(path.Base(name), format.TempMarker) || path.Base(name) == format.JournalName {
				ts.Fatalf("%s: %s is left behind", how, name)
			}
		}
		switch {
		case maps.Equal(got, before):
			return "before"
		case maps.Equal(got, after):
			return "after"
		}
		var differ []string
		for name := range after {
			if got[name] != after[name] {
				differ = append(differ, name)
			}
		}
		for name := range got {
			if _, ok := after[name]; !ok {
				differ = append(differ, name)
			}
		}
		slices.Sort(differ)
		ts.Fatalf("%s: the repository is neither as before nor as after; against after, these differ: %s", how, strings.Join(differ, ", "))
		return ""
	}
	// Every point in turn, until the command runs to its end.
	points := 0
	for at := 1; ; at++ {
		dir := fresh()
		if !killed(start(dir, at).Wait()) {
			break
		}
		points = at
		verify(dir, fmt.Sprintf("killed at point %d", at))
	}
	if points == 0 {
		ts.Fatalf("the command has no kill points")
	}
	rng := rand.New(rand.NewPCG(uint64(n), uint64(points)))
	seen := map[string]int{}
	for range n {
		at := 1 + rng.IntN(points)
		dir := fresh()
		if !killed(start(dir, at).Wait()) {
			ts.Fatalf("not killed at point %d of %d", at, points)
		}
		seen[verify(dir, fmt.Sprintf("killed at point %d", at))]++
	}
	// A real kill -9 after a random delay, up to the time a whole run
	// takes, lands anywhere: loading, planning or writing.
	t0 := time.Now()
	ts.Check(start(fresh(), 0).Wait())
	whole := time.Since(t0)
	for range n {
		dir := fresh()
		cmd := start(dir, 0)
		time.Sleep(time.Duration(rng.Int64N(int64(whole) + 1)))
		cmd.Process.Signal(syscall.SIGKILL)
		cmd.Wait()
		seen[verify(dir, "killed after a random delay")]++
	}
	ts.Logf("%d kill points; outcomes of the random kills: %v", points, seen)
}

// repoFiles maps every regular file below dir (outside .git) to its
// contents.
func repoFiles(ts *testscript.TestScript, dir string) map[string]string {
	out := map[string]string{}
	ts.Check(filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if d.IsDir() && d.Name() == ".git" {
			return filepath.SkipDir
		}
		if !d.Type().IsRegular() {
			return nil
		}
		data, err := os.ReadFile(p)
		if err != nil {
			return err
		}
		rel, _ := filepath.Rel(dir, p)
		out[filepath.ToSlash(rel)] = string(data)
		return nil
	}))
	return out
}

// cmdTypeName answers the first of the packets that shows a provisional
// category: typename NAME REVIEWER GLOB... renames that category to NAME,
// as a reviewer would type it, and sets the verdict to fixed.
func cmdTypeName(ts *testscript.TestScript, neg bool, args []string) {
	if neg || len(args) < 3 {
		ts.Fatalf("usage: typename NAME REVIEWER GLOB...")
	}
	var files []string
	for _, pat := range args[2:] {
		m, err := filepath.Glob(ts.MkAbs(pat))
		ts.Check(err)
		files = append(files, m...)
	}
	slices.Sort(files)
	for _, f := range files {
		data, err := os.ReadFile(f)
		ts.Check(err)
		lines := strings.Split(string(data), "\n")
		renamed := false
		for i, l := range lines {
			t := strings.TrimLeft(l, " ")
			switch {
			case strings.HasPrefix(l, "verdict:"):
				lines[i] = "verdict: fixed"
			case strings.HasPrefix(l, "reviewer:"):
				lines[i] = "reviewer: " + args[1]
			case !renamed && !strings.HasPrefix(l, "#") && strings.HasPrefix(t, "~ ") && strings.HasSuffix(t, "/"):
				lines[i] = l[:len(l)-len(t)] + args[0] + "/"
				renamed = true
			}
		}
		if renamed {
			ts.Check(os.WriteFile(f, []byte(strings.Join(lines, "\n")), 0o644))
			ts.Logf("typed %q in %s", args[0], filepath.Base(f))
			return
		}
	}
	ts.Fatalf("no packet shows a provisional category")
}
