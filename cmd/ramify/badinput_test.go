package main

import (
	"bytes"
	"io/fs"
	"os"
	"path/filepath"
	"testing"
)

// badInput is one broken repository: the demo with some files replaced.
type badInput struct {
	name  string
	files map[string]string // repository-relative path → new content
	// want is the first problem line check must print, exactly
	// "file:line:col: message" (a prefix is enough when the message ends
	// in a long quoted value).
	want string
}

// demoDir is the bundled demo, the base every case starts from.
var demoDir = filepath.Join("..", "..", "examples", "tool-library")

func copyTree(t testing.TB, src, dst string) {
	t.Helper()
	if err := copyDir(src, dst); err != nil {
		t.Fatal(err)
	}
}

// copyDir copies the folder src to dst, files and subfolders; every test
// and script that starts from the demo goes through it.
func copyDir(src, dst string) error {
	return filepath.WalkDir(src, func(path string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		rel, _ := filepath.Rel(src, path)
		target := filepath.Join(dst, rel)
		if d.IsDir() {
			return os.MkdirAll(target, 0o755)
		}
		data, err := os.ReadFile(path)
		if err != nil {
			return err
		}
		return os.WriteFile(target, data, 0o644)
	})
}

// snapshot records every file's bytes so a test can prove nothing changed.
func snapshot(t testing.TB, dir string) map[string]string {
	t.Helper()
	out := map[string]string{}
	err := filepath.WalkDir(dir, func(path string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if d.IsDir() {
			return nil
		}
		data, err := os.ReadFile(path)
		if err != nil {
			return err
		}
		rel, _ := filepath.Rel(dir, path)
		out[rel] = string(data)
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	return out
}

func readDemo(t testing.TB, rel string) string {
	t.Helper()
	data, err := os.ReadFile(filepath.Join(demoDir, rel))
	if err != nil {
		t.Fatal(err)
	}
	return string(data)
}

// runIn runs ramify with args and returns exit status, stdout and stderr.
func runIn(args ...string) (int, string, string) {
	var out, errOut bytes.Buffer
	code := run(args, &out, &errOut)
	return code, out.String(), errOut.String()
}
