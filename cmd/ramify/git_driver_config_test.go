package main

import (
	"os/exec"
	"strings"
	"testing"
)

func TestShellQuote(t *testing.T) {
	for _, tc := range []struct{ in, want string }{
		{"ramify", "ramify"},
		{"/usr/local/bin/ramify", "/usr/local/bin/ramify"},
		{"/home/ana/my tools/ramify", "'/home/ana/my tools/ramify'"},
		{"/opt/it's/ramify", `'/opt/it'\''s/ramify'`},
		{"/opt/$HOME/ramify", "'/opt/$HOME/ramify'"},
		{"/opt/100%/ramify", "'/opt/100%/ramify'"},
		{"", "''"},
	} {
		if got := shellQuote(tc.in); got != tc.want {
			t.Errorf("shellQuote(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
}

// A quoted path reaches the program as one argument, unchanged: checked
// against a real POSIX shell, as git runs drivers with one.
func TestShellQuoteThroughShell(t *testing.T) {
	sh, err := exec.LookPath("sh")
	if err != nil {
		t.Skip("no sh")
	}
	for _, in := range []string{"/a b/c", "it's", `"q"`, "$x `y` \\z", "a%b"} {
		out, err := exec.Command(sh, "-c", "printf '%s' "+shellQuote(in)).Output()
		if err != nil || string(out) != in {
			t.Errorf("sh -c printf %s = %q, %v; want %q", shellQuote(in), out, err, in)
		}
	}
}

// git expands %O, %A, %B, %P and %% in a merge driver's line (git's
// gitattributes documentation, "Defining a custom merge driver"), so a "%"
// in the program's path must be doubled there and only there.
func TestDriverConfigPercent(t *testing.T) {
	for _, c := range driverConfig("'/opt/100%/ramify'") {
		switch {
		case strings.HasPrefix(c.key, "merge.") && strings.HasSuffix(c.key, ".driver"):
			if want := "'/opt/100%%/ramify' git-merge-driver -- %O %A %B %P"; c.value != want {
				t.Errorf("%s = %q, want %q", c.key, c.value, want)
			}
		case strings.HasSuffix(c.key, ".command"):
			if want := "'/opt/100%/ramify' git-diff-driver --"; c.value != want {
				t.Errorf("%s = %q, want %q", c.key, c.value, want)
			}
		}
	}
}
