package repo

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestResolveStaysInside: configured paths come from files an untrusted
// pull request can change, so none may lead out of the repository — not
// by an absolute path, not by "..", not through a symbolic link.
func TestResolveStaysInside(t *testing.T) {
	root := t.TempDir()
	outside := t.TempDir()
	if err := os.MkdirAll(filepath.Join(root, "data"), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.Symlink(outside, filepath.Join(root, "escape")); err != nil {
		t.Fatal(err)
	}
	if err := os.Symlink(filepath.Join(root, "data"), filepath.Join(root, "alias")); err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		rel  string
		ok   bool
		want string // part of the error
	}{
		{"items.toml", true, ""},
		{"data/items.tsv", true, ""},
		{"data/new/out.csv", true, ""}, // not there yet: an output
		{"alias/items.tsv", true, ""},  // a link that stays inside
		{"/etc/passwd", false, "must be relative"},
		{"../x.toml", false, "leaves the repository"},
		{"data/../../x.toml", false, "leaves the repository"},
		{"escape/items.toml", false, "leads outside the repository"},
		{`data\items.tsv`, false, "must be relative"},
		{"", false, "empty path"},
		{".git/config", false, "points into .git"},
		{"data/.GIT/hooks/x", false, "points into .git"},
	}
	for _, c := range cases {
		got, err := Resolve(root, c.rel)
		if c.ok {
			if err != nil {
				t.Errorf("%q: %v", c.rel, err)
			} else if !strings.HasPrefix(got, root) {
				t.Errorf("%q resolved to %q, outside %q", c.rel, got, root)
			}
			continue
		}
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%q: error %v, want one saying %q", c.rel, err, c.want)
		}
	}
}
