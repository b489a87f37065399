package main

import (
	"bytes"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

// What `ramify init` runs: nothing outside a git repository, the whole
// setup inside one, and nothing the second time.
func TestGitSetupForInit(t *testing.T) {
	if _, err := exec.LookPath("git"); err != nil {
		t.Skip("git is not installed")
	}
	t.Setenv("GIT_CEILING_DIRECTORIES", t.TempDir())
	t.Setenv("GIT_CONFIG_NOSYSTEM", "1")
	newTestEnv := func() (*env, *bytes.Buffer) {
		var out bytes.Buffer
		return newEnv(&options{dir: "."}, nil, &out, &out), &out
	}

	plain := filepath.Join(os.Getenv("GIT_CEILING_DIRECTORIES"), "plain")
	if err := os.MkdirAll(plain, 0o755); err != nil {
		t.Fatal(err)
	}
	e, out := newTestEnv()
	if changes, err := gitSetupForInit(e, plain); err != nil || len(changes) > 0 || out.Len() > 0 {
		t.Errorf("gitSetupForInit(not a repository) = %q, %v, printed %q; want nil and nothing", changes, err, out)
	}
	if _, err := os.Stat(filepath.Join(plain, ".gitattributes")); !os.IsNotExist(err) {
		t.Errorf("gitSetupForInit(not a repository) wrote .gitattributes")
	}

	repo := filepath.Join(os.Getenv("GIT_CEILING_DIRECTORIES"), "repo")
	if out, err := exec.Command("git", "init", "-q", repo).CombinedOutput(); err != nil {
		t.Fatalf("git init: %v\n%s", err, out)
	}
	e, _ = newTestEnv()
	changes, err := gitSetupForInit(e, repo)
	if err != nil {
		t.Fatalf("gitSetupForInit(repository) = %v", err)
	}
	said := strings.Join(changes, "\n")
	for _, want := range []string{"wrote .gitattributes", "set git config merge.ramify.driver = "} {
		if !strings.Contains(said, want) {
			t.Errorf("gitSetupForInit(repository) = %q; want it to say %q", said, want)
		}
	}
	e, out = newTestEnv()
	if changes, err := gitSetupForInit(e, repo); err != nil || len(changes) > 0 || out.Len() > 0 {
		t.Errorf("gitSetupForInit again = %q, %v, printed %q; want nil and nothing", changes, err, out)
	}
}
