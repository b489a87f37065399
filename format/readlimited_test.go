package format

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// ReadFileLimited reads a file whole, of any size up to the limit, and
// refuses one past it or one that is no regular file.
func TestReadFileLimited(t *testing.T) {
	dir := t.TempDir()
	for _, tc := range []struct {
		name  string
		size  int
		limit int64
		want  string // part of the problem, "" when the file is read
	}{
		{"empty", 0, 10, ""},
		{"one byte", 1, 10, ""},
		{"at the limit", 10, 10, ""},
		{"over the limit", 11, 10, "limit for this kind of file is 10"},
		{"large", 3<<20 + 7, 4 << 20, ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			data := bytes.Repeat([]byte("abcdefg\n"), tc.size/8+1)[:tc.size]
			path := filepath.Join(dir, strings.ReplaceAll(tc.name, " ", "-"))
			if err := os.WriteFile(path, data, 0o644); err != nil {
				t.Fatal(err)
			}
			got, err := ReadFileLimited(path, "f.txt", tc.limit)
			if tc.want != "" {
				if err == nil || !strings.Contains(err.Error(), tc.want) {
					t.Fatalf("err = %v; want a problem saying %q", err, tc.want)
				}
				return
			}
			if err != nil || !bytes.Equal(got, data) {
				t.Fatalf("read %d bytes, err %v; want the file's %d bytes", len(got), err, len(data))
			}
		})
	}
	if _, err := ReadFileLimited(dir, "d", 10); err == nil || !strings.Contains(err.Error(), "not a regular file") {
		t.Errorf("a folder: err = %v; want not a regular file", err)
	}
}
