package main

import (
	"fmt"
	"os"
	"time"

	"github.com/ramify-tax/ramify/internal/round"
)

// progressAfterEnv overrides how long a run goes before progress shows
// (a Go duration), so a test under a pseudo-terminal sees it at once.
const progressAfterEnv = "RAMIFY_PROGRESS_AFTER"

// progressFunc returns a callback that shows the current stage on stderr,
// with how far it has come and the time since the command started, when
// stderr is a terminal: at most a few times a second, and only once a run
// has taken longer than a moment. Elsewhere (a pipe, --quiet, --json) it
// returns nil, so stdout never holds progress.
func (e *env) progressFunc() func(stage string, done, total int) {
	if !e.progress {
		return nil
	}
	after := 500 * time.Millisecond
	if d, err := time.ParseDuration(os.Getenv(progressAfterEnv)); err == nil && d >= 0 {
		after = d
	}
	start := time.Now()
	var last time.Time
	return func(stage string, done, total int) {
		now := time.Now()
		if now.Sub(start) < after || now.Sub(last) < 200*time.Millisecond {
			return
		}
		last = now
		e.shownProgress = true
		elapsed := now.Sub(start).Round(100 * time.Millisecond)
		if total > 1 {
			fmt.Fprintf(e.stderr, "\r\033[K%s %d/%d  %s", stage, done, total, elapsed)
		} else {
			fmt.Fprintf(e.stderr, "\r\033[K%s…  %s", stage, elapsed)
		}
	}
}

// endProgress clears the progress line if one was shown.
func (e *env) endProgress() {
	if e.shownProgress {
		fmt.Fprint(e.stderr, "\r\033[K")
		e.shownProgress = false
	}
}

// roundSig rounds x to n significant digits, so reports do not change in
// the last bits of a float from one platform to another.
func roundSig(x float64, n int) float64 { return round.Sig(x, n) }
