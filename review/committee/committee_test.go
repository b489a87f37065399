package committee

import (
	"sync/atomic"
	"testing"
	"time"
)

// TestTicking: the stage is reported at once, never after stop returned,
// and a nil progress is fine.
func TestTicking(t *testing.T) {
	var calls atomic.Int32
	stop := ticking(func(stage string, done, total int) {
		if stage != "similarity graph" || done != 0 || total != 1 {
			t.Errorf("progress(%q, %d, %d)", stage, done, total)
		}
		calls.Add(1)
	}, "similarity graph")
	if calls.Load() != 1 {
		t.Fatalf("%d calls before the first tick, want 1", calls.Load())
	}
	time.Sleep(3 * tickEvery)
	stop()
	after := calls.Load()
	time.Sleep(2 * tickEvery)
	if calls.Load() != after {
		t.Errorf("progress called after stop returned")
	}
	ticking(nil, "similarity graph")()
}
