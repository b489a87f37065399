// Package browsertest starts Debian's chromium, headless, for tests that
// check pages in a real browser through the DevTools protocol
// (github.com/chromedp/chromedp). Without chromium a test is skipped,
// except under CI=true, where .ci/run installs it and its absence is a
// failure.
package browsertest

import (
	"context"
	"os"
	"os/exec"
	"testing"
	"time"

	"github.com/chromedp/chromedp"
)

// Path finds the chromium binary, or "".
func Path() string {
	for _, name := range []string{"chromium", "chromium-browser"} {
		if p, err := exec.LookPath(name); err == nil {
			return p
		}
	}
	return ""
}

// Start launches a headless chromium with a fixed window size and returns
// a browser context for chromedp.Run; it is closed when the test ends.
func Start(tb testing.TB, timeout time.Duration) context.Context {
	tb.Helper()
	path := Path()
	if path == "" {
		if os.Getenv("CI") == "true" {
			tb.Fatal("chromium is not installed; .ci/run installs it with apt-get")
		}
		tb.Skip("chromium is not installed (apt-get install chromium)")
	}
	opts := append(append([]chromedp.ExecAllocatorOption(nil), chromedp.DefaultExecAllocatorOptions[:]...),
		chromedp.ExecPath(path),
		chromedp.Flag("headless", true),
		// Tests may run as root in a container, where chromium's sandbox
		// cannot start.
		chromedp.NoSandbox,
		chromedp.Flag("disable-gpu", true),
		chromedp.Flag("allow-file-access-from-files", true),
		chromedp.WindowSize(1280, 900),
		chromedp.UserDataDir(tb.TempDir()),
	)
	actx, cancelAlloc := chromedp.NewExecAllocator(context.Background(), opts...)
	ctx, cancelCtx := chromedp.NewContext(actx)
	ctx, cancelTimeout := context.WithTimeout(ctx, timeout)
	tb.Cleanup(func() {
		cancelTimeout()
		cancelCtx()
		cancelAlloc()
	})
	// Start the browser now, so a broken install fails here and clearly.
	if err := chromedp.Do(ctx); err != nil {
		tb.Fatalf("starting chromium: %v", err)
	}
	return ctx
}
