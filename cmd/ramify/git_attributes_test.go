package main

import "testing"

func TestWithDriverAttributes(t *testing.T) {
	for _, tc := range []struct {
		name, in, want string
		changed        bool
	}{
		{
			name:    "empty file",
			in:      "",
			want:    "# Taxonomy outlines: semantic diff and regenerating merge (ramify git-setup).\n*.outline diff=ramify merge=ramify\n",
			changed: true,
		},
		{
			name:    "the line ramify init writes",
			in:      "# plain text\n*.outline text eol=lf\n*.toml text eol=lf\n",
			want:    "# plain text\n*.outline text eol=lf diff=ramify merge=ramify\n*.toml text eol=lf\n",
			changed: true,
		},
		{
			name:    "already set, in another order and spacing",
			in:      "*.outline   merge=ramify text diff=ramify\n",
			want:    "*.outline   merge=ramify text diff=ramify\n",
			changed: false,
		},
		{
			name:    "other drivers, unset and unspecified forms replaced",
			in:      "*.outline -diff !merge eol=lf\n*.outline diff=other\n",
			want:    "*.outline eol=lf diff=ramify merge=ramify\n*.outline diff=ramify merge=ramify\n",
			changed: true,
		},
		{
			name:    "no line for outlines; no final newline",
			in:      "*.png binary",
			want:    "*.png binary\n# Taxonomy outlines: semantic diff and regenerating merge (ramify git-setup).\n*.outline diff=ramify merge=ramify\n",
			changed: true,
		},
		{
			name:    "a comment naming the pattern is not a line for it",
			in:      "# *.outline diff=x\n",
			want:    "# *.outline diff=x\n# Taxonomy outlines: semantic diff and regenerating merge (ramify git-setup).\n*.outline diff=ramify merge=ramify\n",
			changed: true,
		},
		{
			name:    "more specific patterns are left alone",
			in:      "reviews/*.outline -merge\n*.outline diff=ramify merge=ramify\n",
			want:    "reviews/*.outline -merge\n*.outline diff=ramify merge=ramify\n",
			changed: false,
		},
		{
			name:    "CRLF line endings are kept",
			in:      "*.outline text\r\n*.toml text\r\n",
			want:    "*.outline text diff=ramify merge=ramify\r\n*.toml text\r\n",
			changed: true,
		},
	} {
		t.Run(tc.name, func(t *testing.T) {
			got, changed := withDriverAttributes(tc.in)
			if got != tc.want || changed != tc.changed {
				t.Errorf("withDriverAttributes(%q) = %q, %v; want %q, %v", tc.in, got, changed, tc.want, tc.changed)
			}
			// Applying it again changes nothing.
			if again, changed := withDriverAttributes(got); again != got || changed {
				t.Errorf("withDriverAttributes(%q) = %q, %v; want it unchanged", got, again, changed)
			}
		})
	}
}
