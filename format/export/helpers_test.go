package export

import (
	"bytes"
	"os"
	"os/exec"
	"path/filepath"
	"testing"

	"github.com/ramify-tax/ramify/format"
)

// demoOutline names the bundled demo's outline for fixture.
var demoOutline = filepath.Join("..", "..", "examples", "tool-library", "taxonomy.outline")

// fixture parses an outline and an items file from testdata (or the demo
// outline, given as demoOutline).
func fixture(t *testing.T, outline, items string) (*format.Category, []format.Item) {
	t.Helper()
	path := filepath.Join("testdata", outline)
	if outline == demoOutline {
		path = demoOutline
	}
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	o, err := format.ParseOutline(outline, data)
	if err != nil {
		t.Fatalf("fixture %s: %v", outline, err)
	}
	if items == "" {
		return o.Root, nil
	}
	data, err = os.ReadFile(filepath.Join("testdata", items))
	if err != nil {
		t.Fatal(err)
	}
	its, err := format.ParseItems(items, data)
	if err != nil {
		t.Fatalf("fixture %s: %v", items, err)
	}
	return o.Root, its
}

// golden compares got with testdata/name; RAMIFY_UPDATE=1 rewrites it.
func golden(t *testing.T, name string, got []byte) {
	t.Helper()
	path := filepath.Join("testdata", name)
	if os.Getenv("RAMIFY_UPDATE") == "1" {
		if err := os.WriteFile(path, got, 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run with RAMIFY_UPDATE=1 to create it)", err)
	}
	if !bytes.Equal(got, want) {
		t.Errorf("output differs from %s (RAMIFY_UPDATE=1 rewrites it)\n--- got ---\n%s\n--- want ---\n%s", path, got, want)
	}
}

// needTool finds an outside reader the test compares with. Without it the
// test is skipped on a developer's machine, but fails under CI=true,
// where .ci/run installs every such tool: a check that silently never
// runs in CI is no check.
func needTool(t *testing.T, path, pkg string, probe ...string) string {
	t.Helper()
	full, err := exec.LookPath(path)
	if err == nil && len(probe) > 0 {
		err = exec.Command(full, probe...).Run()
	}
	if err != nil {
		if os.Getenv("CI") == "true" {
			t.Fatalf("%s is needed (Debian package %s): %v", path, pkg, err)
		}
		t.Skipf("%s not available (Debian package %s): %v", path, pkg, err)
	}
	return full
}
