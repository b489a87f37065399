package main

import (
	"bytes"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"github.com/creack/pty"
)

// TestProgressOnTerminal runs `ramify solve` with stderr on a
// pseudo-terminal: the stages show there, each with its elapsed time.
// With stderr on a pipe, or with --json, none show.
func TestProgressOnTerminal(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the binary")
	}
	bin := filepath.Join(t.TempDir(), "ramify")
	if out, err := exec.Command("go", "build", "-o", bin, ".").CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	dir := filepath.Join(t.TempDir(), "demo")
	copyDemoInto(t, dir)
	env := append(os.Environ(), progressAfterEnv+"=0s")

	ptmx, tty, err := pty.Open()
	if err != nil {
		t.Skipf("no pseudo-terminal here: %v", err)
	}
	defer ptmx.Close()
	cmd := exec.Command(bin, "solve", "--dir", dir, "--dry-run")
	cmd.Env = env
	var stdout bytes.Buffer
	cmd.Stdout, cmd.Stderr = &stdout, tty
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	tty.Close()
	var term bytes.Buffer
	done := make(chan struct{})
	go func() { io.Copy(&term, ptmx); close(done) }()
	if err := cmd.Wait(); err != nil {
		t.Fatalf("solve: %v\n%s", err, term.String())
	}
	ptmx.Close()
	<-done
	if !strings.Contains(term.String(), "similarity graph") || !strings.Contains(term.String(), "s\r") && !strings.Contains(term.String(), "s\x1b") {
		t.Errorf("no progress line with elapsed time on the terminal; it showed %q", term.String())
	}
	t.Logf("terminal showed %q", term.String())
	if strings.Contains(stdout.String(), "\r") {
		t.Errorf("progress reached stdout: %q", stdout.String())
	}

	for _, args := range [][]string{{"solve", "--dir", dir, "--dry-run"}, {"solve", "--dir", dir, "--dry-run", "--json"}} {
		cmd := exec.Command(bin, args...)
		cmd.Env = env
		var out, errOut bytes.Buffer
		cmd.Stdout, cmd.Stderr = &out, &errOut
		if err := cmd.Run(); err != nil {
			t.Fatalf("%v: %v\n%s", args, err, errOut.String())
		}
		if strings.Contains(errOut.String(), "\r") || strings.Contains(out.String(), "\r") {
			t.Errorf("%v piped: progress shown: %q", args, errOut.String())
		}
	}
}
