package repo

import (
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/ramify-tax/ramify/format"
)

// copyDemo copies the demo repository's settings, items and outline into
// a fresh folder, settings changed by edit.
func copyDemo(t *testing.T, edit func(string) string) string {
	t.Helper()
	dir := t.TempDir()
	for _, name := range []string{SettingsFile, "items.toml", "taxonomy.outline"} {
		data, err := os.ReadFile(filepath.Join("..", "..", "examples", "tool-library", name))
		if err != nil {
			t.Fatal(err)
		}
		if name == SettingsFile {
			data = []byte(edit(string(data)))
		}
		if err := os.WriteFile(filepath.Join(dir, name), data, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return dir
}

// The outline parsed ahead of its turn is the one parsed at its turn.
func TestLoadParsesTheOutlineAsAtItsTurn(t *testing.T) {
	dir := copyDemo(t, func(s string) string { return s })
	p, ds := Load(dir)
	if len(ds) > 0 {
		t.Fatal(ds)
	}
	data, err := os.ReadFile(filepath.Join(dir, "taxonomy.outline"))
	if err != nil {
		t.Fatal(err)
	}
	want, err := format.ParseOutline("taxonomy.outline", data)
	if err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff(want, p.Outline); diff != "" {
		t.Errorf("(-parsed at its turn +loaded):\n%s", diff)
	}
	if string(p.OutlineText) != string(data) {
		t.Errorf("outline text differs from the file")
	}

	// An early parse of other bytes (the file changed since) is not used.
	other := &earlyOutline{done: make(chan struct{}), data: []byte("# ramify outline 1\nstale\n"), outline: &format.Outline{}}
	close(other.done)
	p.Outline, p.OutlineText, p.bytesRead = nil, nil, 0
	if ds := p.loadOutline(other); len(ds) > 0 {
		t.Fatal(ds)
	}
	if diff := cmp.Diff(want, p.Outline); diff != "" {
		t.Errorf("stale early parse used (-file +loaded):\n%s", diff)
	}
}

// The early parse reads outside the byte budget; the outline still counts
// against it at its turn.
func TestLoadKeepsTheOutlineInTheByteBudget(t *testing.T) {
	items, err := os.Stat(filepath.Join("..", "..", "examples", "tool-library", "items.toml"))
	if err != nil {
		t.Fatal(err)
	}
	dir := copyDemo(t, func(s string) string {
		return s + "\n[limits]\nbytes = " + strconv.FormatInt(items.Size()+10, 10) + "\n"
	})
	p, ds := Load(dir)
	if len(ds) != 1 || ds[0].File != "taxonomy.outline" || !strings.Contains(ds[0].Msg, "limits.bytes") {
		t.Fatalf("Load = %v; want the outline refused over limits.bytes", ds)
	}
	if p.Outline != nil {
		t.Errorf("an outline over the budget was kept")
	}
}
