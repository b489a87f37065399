package main

import (
	"fmt"
	"math"
	"strconv"
	"time"
)

// progressFunc returns a callback that shows the current stage on stderr
// when stderr is a terminal, at most a few times a second, and only once a
// run has taken longer than a moment. Elsewhere it returns nil.
func (e *env) progressFunc() func(stage string, done, total int) {
	if !e.progress {
		return nil
	}
	start := time.Now()
	var last time.Time
	return func(stage string, done, total int) {
		now := time.Now()
		if now.Sub(start) < 500*time.Millisecond || now.Sub(last) < 200*time.Millisecond {
			return
		}
		last = now
		e.shownProgress = true
		if total > 1 {
			fmt.Fprintf(e.stderr, "\r\033[K%s %d/%d", stage, done, total)
		} else {
			fmt.Fprintf(e.stderr, "\r\033[K%s…", stage)
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
func roundSig(x float64, n int) float64 {
	if x == 0 || math.IsNaN(x) || math.IsInf(x, 0) {
		return x
	}
	v, _ := strconv.ParseFloat(strconv.FormatFloat(x, 'g', n, 64), 64)
	return v
}
