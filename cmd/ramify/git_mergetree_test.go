package main

import (
	"errors"
	"strings"
	"testing"
)

func TestTheirsCommit(t *testing.T) {
	head := strings.Repeat("a", 40)
	other := strings.Repeat("b", 40)
	third := strings.Repeat("c", 64)
	for _, tc := range []struct {
		name    string
		environ []string
		want    string
	}{
		{"git merge of one branch", []string{"PATH=/bin", "GITHEAD_" + other + "=feature"}, other},
		{"HEAD named too", []string{"GITHEAD_" + head + "=HEAD", "GITHEAD_" + other + "=feature"}, other},
		{"a SHA-256 repository", []string{"GITHEAD_" + third + "=x"}, third},
		{"rebase or cherry-pick: none", []string{"PATH=/bin"}, ""},
		{"an octopus merge", []string{"GITHEAD_" + other + "=a", "GITHEAD_" + third + "=b"}, ""},
		{"not an object id", []string{"GITHEAD_main=main", "GITHEAD_" + strings.ToUpper(other) + "=x"}, ""},
	} {
		got, err := theirsCommit(head, tc.environ)
		if tc.want == "" {
			if !errors.Is(err, errUnknownTheirs) {
				t.Errorf("%s: theirsCommit = %q, %v; want errUnknownTheirs", tc.name, got, err)
			}
			continue
		}
		if got != tc.want || err != nil {
			t.Errorf("%s: theirsCommit = %q, %v; want %q", tc.name, got, err, tc.want)
		}
	}
}
