package main

import (
	"strings"
	"testing"
)

func TestCheckRevision(t *testing.T) {
	for _, tc := range []struct {
		rev  string
		want string // "" for accepted, else a part of the message
	}{
		{"HEAD", ""},
		{"HEAD~2", ""},
		{"main^", ""},
		{"origin/main", ""},
		{"v1.2.0", ""},
		{"HEAD@{1}", ""},
		{"@{u}", ""},
		{"@", ""},
		{"0123abcd", ""},
		{"feature/a-b_c", ""},
		{"", "empty"},
		{"-x", `starts with "-"`},
		{"--output=x.txt", `starts with "-"`},
		{"HEAD;rm", "not a revision ramify accepts"},
		{"a b", "not a revision ramify accepts"},
		{"$(x)", "not a revision ramify accepts"},
		{"HEAD:x", "not a revision ramify accepts"},
		{"main..dev", "is a range"},
		{strings.Repeat("a", 300), "longer than"},
	} {
		got := checkRevision(tc.rev)
		if tc.want == "" && got != "" || tc.want != "" && !strings.Contains(got, tc.want) {
			t.Errorf("checkRevision(%q) = %q, want %q", tc.rev, got, tc.want)
		}
	}
}

func TestCappedBuffer(t *testing.T) {
	b := &cappedBuffer{limit: 5}
	for _, s := range []string{"ab", "cde", "fg"} {
		if n, err := b.Write([]byte(s)); n != len(s) || err != nil {
			t.Fatalf("Write(%q) = %d, %v; want %d, nil", s, n, err, len(s))
		}
	}
	if b.String() != "abcde" || !b.over {
		t.Errorf("after writing 7 bytes into 5: %q, over=%v; want \"abcde\", true", b.String(), b.over)
	}
}
