package main

import (
	"encoding/json"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"
	"github.com/chromedp/chromedp/kb"
	"github.com/ramify-tax/ramify/internal/browsertest"
)

// reportRepo copies the demo into a git repository, commits it, records a
// decision that moves a few tools, and solves again: the outline in the
// folder then differs from the committed one, which is the report's
// default base.
func reportRepo(t *testing.T) string {
	t.Helper()
	dir := filepath.Join(t.TempDir(), "tool-library")
	copyDemoInto(t, dir)
	git := func(args ...string) {
		t.Helper()
		cmd := exec.Command("git", args...)
		cmd.Dir = dir
		cmd.Env = append(os.Environ(), "GIT_AUTHOR_DATE=2026-12-01T10:00:00Z", "GIT_COMMITTER_DATE=2026-12-01T10:00:00Z")
		if out, err := cmd.CombinedOutput(); err != nil {
			t.Fatalf("git %s: %v\n%s", strings.Join(args, " "), err, out)
		}
	}
	git("init", "-q")
	git("-c", "user.name=test", "-c", "user.email=test@example.invalid", "add", ".")
	git("-c", "user.name=test", "-c", "user.email=test@example.invalid", "commit", "-q", "-m", "demo")
	record := `[[triplet]]
pair = ["tyre-inflator-battery", "jump-starter-battery"]
out = "bike-track-pump"
by = "Test Editor"
date = 2026-12-01
note = "battery car kit goes out together"
`
	if err := os.WriteFile(filepath.Join(dir, "constraints", "test-editor.toml"), []byte(record), 0o644); err != nil {
		t.Fatal(err)
	}
	ramify(t, "solve", "--dir", dir, "--quiet")
	return dir
}

// TestReportInBrowser opens the demo's report in chromium: the top level
// is there, a path opens, the search finds an item and opens the path to
// it, and the moved marks are exactly the moves `ramify diff --json`
// reports against the same base. The screenshot is saved in the test's
// temporary folder (and in $RAMIFY_SCREENSHOTS when set, to look at).
func TestReportInBrowser(t *testing.T) {
	ctx := browsertest.Start(t, 90*time.Second)
	dir := reportRepo(t)
	out := filepath.Join(dir, "report.html")
	var rep struct {
		Since string `json:"since"`
		Moved int    `json:"moved"`
	}
	if err := json.Unmarshal([]byte(ramify(t, "report", "--dir", dir, "--support", "--json")), &rep); err != nil {
		t.Fatal(err)
	}
	if rep.Since == "" || rep.Moved == 0 {
		t.Fatalf("report --json = %+v, want a base and moved items", rep)
	}
	base, _, _ := strings.Cut(rep.Since, ":")
	var d struct {
		Moved []struct {
			Item string   `json:"item"`
			From []string `json:"from"`
		} `json:"moved"`
	}
	if err := json.Unmarshal([]byte(ramify(t, "diff", "--dir", dir, "--json", base)), &d); err != nil {
		t.Fatal(err)
	}
	if len(d.Moved) != rep.Moved {
		t.Fatalf("report counts %d moves, diff --json %d", rep.Moved, len(d.Moved))
	}

	if err := chromedp.Do(ctx, chromedp.Navigate("file://"+out), chromedp.WaitVisible(chromedp.CSS(`body[data-items="true"]`))); err != nil {
		t.Fatal(err)
	}
	eval := func(expr string) string {
		t.Helper()
		v, err := chromedp.Run(ctx, chromedp.Evaluate[string](expr))
		if err != nil {
			t.Fatalf("evaluate %s: %v", expr, err)
		}
		return v
	}

	// The top level: one row per top-level category of the outline.
	top := eval(`Array.from(document.querySelectorAll("#tree > li.cat > .row .name")).map(e => e.textContent).join("|")`)
	want := topLevelNames(t, filepath.Join(dir, "taxonomy.outline"))
	if top != strings.Join(want, "|") {
		t.Fatalf("top-level rows = %q, want %q", top, strings.Join(want, "|"))
	}
	// Only the top level is built until a row is opened.
	if n := eval(`String(document.querySelectorAll("li.item").length)`); n != "0" {
		t.Errorf("%s item rows before anything was opened, want 0", n)
	}

	// Open a path with the keyboard: focus the first row, ArrowRight
	// opens it, ArrowRight again goes to its first child.
	if err := chromedp.Do(ctx,
		chromedp.Focus(chromedp.CSS(`#tree > li.cat`)),
		chromedp.KeyEvent(kb.ArrowRight),
		chromedp.KeyEvent(kb.ArrowRight),
	); err != nil {
		t.Fatal(err)
	}
	if got := eval(`document.querySelector("#tree > li.cat").getAttribute("aria-expanded")`); got != "true" {
		t.Errorf("first category after ArrowRight: aria-expanded = %s", got)
	}
	if got := eval(`document.activeElement.parentElement.parentElement.dataset.cat || ""`); got != "1" {
		t.Errorf("focus after the second ArrowRight is not inside the first category (parent cat %q)", got)
	}

	// Search for an item by label and open the path to it.
	if err := chromedp.Do(ctx,
		chromedp.SendKeys(chromedp.ID("search"), "chain tool"),
		chromedp.WaitVisible(chromedp.CSS(`#results button`)),
		chromedp.KeyEvent(kb.Enter),
	); err != nil {
		t.Fatal(err)
	}
	if got := eval(`document.activeElement.querySelector(".id") ? document.activeElement.querySelector(".id").textContent : ""`); got != "bike-chain-tool" {
		t.Errorf("after searching for \"chain tool\", the focused row is %q, want bike-chain-tool", got)
	}

	// The moved marks: the side panel's list and each row's mark.
	listed := eval(`Array.from(document.querySelectorAll("#changes .moved-list li")).map(li => li.dataset.item).join("|")`)
	var moved []string
	for _, m := range d.Moved {
		moved = append(moved, m.Item)
	}
	slices.Sort(moved)
	gotList := strings.Split(listed, "|")
	slices.Sort(gotList)
	if !slices.Equal(gotList, moved) {
		t.Errorf("moved items on the page = %v\ndiff --json moved = %v", gotList, moved)
	}
	for _, m := range d.Moved {
		expr := `(() => { const li = Array.from(document.querySelectorAll("#changes .moved-list li")).find(l => l.dataset.item === ` + jsString(m.Item) + `);
			li.querySelector("button").click();
			const row = document.activeElement;
			const mk = row.querySelector(".mark.m-moved");
			return mk ? mk.title : "no mark"; })()`
		if got, want := eval(expr), "from "+strings.Join(m.From, " / "); got != want {
			t.Errorf("moved mark of %s = %q, want %q", m.Item, got, want)
		}
	}
	// Support is shown: the side panel lists categories with a share.
	if n := eval(`String(document.querySelectorAll("#weak li").length)`); n == "0" {
		t.Errorf("no least-supported categories listed with --support")
	}

	shot, err := chromedp.Run(ctx, chromedp.FullScreenshot(100))
	if err != nil {
		t.Fatal(err)
	}
	saveScreenshot(t, "report-demo.png", shot)
}

func saveScreenshot(t *testing.T, name string, data []byte) {
	t.Helper()
	path := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(path, data, 0o644); err != nil {
		t.Fatal(err)
	}
	t.Logf("screenshot: %s", path)
	if dir := os.Getenv("RAMIFY_SCREENSHOTS"); dir != "" {
		if err := os.WriteFile(filepath.Join(dir, name), data, 0o644); err != nil {
			t.Fatal(err)
		}
	}
}

func jsString(s string) string {
	b, _ := json.Marshal(s)
	return string(b)
}

// topLevelNames lists the names of the outline's top-level categories, in
// file order, as the report's rows show them (without the provisional
// marker, which the page shows as a mark of its own).
func topLevelNames(t *testing.T, path string) []string {
	t.Helper()
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var out []string
	for _, line := range strings.Split(string(data), "\n") {
		if strings.HasSuffix(line, "/") && !strings.HasPrefix(line, " ") {
			out = append(out, strings.TrimPrefix(strings.TrimSuffix(line, "/"), "~ "))
		}
	}
	return out
}
