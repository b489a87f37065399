package solve

import (
	"runtime"
	"sync"
	"sync/atomic"
)

// parallelMinWork is the least work (in element operations) a kernel call
// must have before it is split across goroutines: below it the goroutines
// cost more than they save.
const parallelMinWork = 1 << 16

// helpers says how many goroutines beside the caller a large kernel call
// may use. In the construction it is the number of workers waiting for a
// set (the largest sets come first and leave the others idle); nil means
// every CPU. The kernels split only work whose results do not depend on
// the split (rows of a matrix–vector product or of a projection), so every
// result is the same however many take part.
type helpers struct {
	idle *atomic.Int32
}

// parts is how many parts a kernel call of the given work is split into.
func (hp helpers) parts(work int) int {
	if work < parallelMinWork {
		return 1
	}
	limit := min(runtime.GOMAXPROCS(0), maxConstructWorkers)
	if hp.idle == nil {
		return max(1, limit)
	}
	return max(1, min(limit, 1+int(hp.idle.Load())))
}

// parallelSpans runs f(lo, hi) over [0, n) cut into parts contiguous
// spans, concurrently when parts > 1, and returns when all are done.
func parallelSpans(n, parts int, f func(lo, hi int)) {
	parts = max(1, min(parts, n))
	if parts == 1 {
		f(0, n)
		return
	}
	var wg sync.WaitGroup
	for p := 1; p < parts; p++ {
		wg.Add(1)
		go func(lo, hi int) {
			defer wg.Done()
			f(lo, hi)
		}(p*n/parts, (p+1)*n/parts)
	}
	f(0, n/parts)
	wg.Wait()
}
