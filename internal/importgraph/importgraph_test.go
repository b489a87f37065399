package importgraph

import (
	"bufio"
	"bytes"
	"io/fs"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"testing"
)

// TestModuleFollowsLayers reads the module's import graph with `go list`
// and checks it against Layers.
func TestModuleFollowsLayers(t *testing.T) {
	goTool, err := exec.LookPath("go")
	if err != nil {
		t.Fatalf("the go command is needed to list the packages: %v", err)
	}
	cmd := exec.Command(goTool, "list", "-f", "{{.ImportPath}}{{range .Imports}} {{.}}{{end}}", Module+"/...")
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("go list: %v\n%s", err, stderr.String())
	}
	graph := map[string][]string{}
	sc := bufio.NewScanner(bytes.NewReader(out))
	for sc.Scan() {
		f := strings.Fields(sc.Text())
		if len(f) > 0 {
			graph[f[0]] = f[1:]
		}
	}
	if len(graph) < 10 {
		t.Fatalf("go list named only %d packages", len(graph))
	}
	watchSources(t)
	for _, v := range Violations(graph) {
		t.Error(v)
	}
	// Every package the table names exists, so the table does not go stale.
	for _, layer := range Layers {
		for _, p := range layer {
			path := Module + "/" + p
			if p == "." {
				path = Module // the root package
			}
			if _, ok := graph[path]; !ok {
				t.Errorf("Layers names %s, which the module does not have", p)
			}
		}
	}
}

// watchSources looks at every folder and Go file of the module from this
// process, so that go test's result cache, which does not see what the go
// list child reads, is dropped when a package or an import changes.
func watchSources(t *testing.T) {
	out, err := exec.Command("go", "list", "-m", "-f", "{{.Dir}}").Output()
	if err != nil {
		t.Fatalf("go list -m: %v", err)
	}
	root := strings.TrimSpace(string(out))
	err = filepath.WalkDir(root, func(path string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if d.IsDir() && (d.Name() == ".git" || d.Name() == "testdata") {
			return filepath.SkipDir
		}
		if !d.IsDir() && strings.HasSuffix(path, ".go") {
			_, err = os.Stat(path)
		}
		return err
	})
	if err != nil {
		t.Fatal(err)
	}
}

func TestViolations(t *testing.T) {
	m := func(p string) string { return Module + "/" + p }
	tests := []struct {
		name  string
		graph map[string][]string
		want  []string
	}{
		{"downhill", map[string][]string{m("review"): {m("solve"), m("diff"), m("solve/hier"), "fmt"}}, nil},
		{"uphill", map[string][]string{m("solve/regen"): {m("review/committee")}}, []string{"solve/regen (layer 4) imports review/committee (layer 5)"}},
		{"same layer", map[string][]string{m("solve/naming"): {m("diff")}}, []string{"solve/naming (layer 2) imports diff (layer 2)"}},
		{"leaf importing format", map[string][]string{m("solve/hier"): {m("format")}}, []string{"solve/hier (layer 0) imports format (layer 1)"}},
		{"diff importing solve", map[string][]string{m("diff"): {m("solve")}}, []string{"diff (layer 2) imports solve (layer 3)"}},
		{"format importing a solve leaf", map[string][]string{m("format/repo"): {m("solve/hier"), m("format/shape")}}, []string{"format/repo imports solve/hier: nothing under format/ may import a package under solve/"}},
		{"format importing review", map[string][]string{m("format/skos"): {m("review/bounds")}}, []string{"format/skos imports review/bounds: nothing under format/ may import a package under review/"}},
		{"a folder's prefix is not the folder", map[string][]string{m("format/repo"): {m("solvers")}}, nil},
		{"unplaced", map[string][]string{m("newpkg"): nil}, []string{"newpkg is in no layer; add it to importgraph.Layers and DEVELOPERS.md"}},
		{"outside the module", map[string][]string{"example.com/x": {m("cmd/ramify")}}, nil},
	}
	for _, tc := range tests {
		if got := Violations(tc.graph); !slices.Equal(got, tc.want) {
			t.Errorf("%s: Violations = %q, want %q", tc.name, got, tc.want)
		}
	}
}
