package graph

import (
	"runtime"
	"sync"
	"sync/atomic"
)

// blockRows is the number of rows one unit of parallel work covers. It is
// a constant, not derived from the number of cores, so the split of the
// work, and therefore every result, is the same on any GOMAXPROCS.
const blockRows = 256

// numBlocks is the number of blocks of blockRows rows that cover n rows.
func numBlocks(n int) int { return (n + blockRows - 1) / blockRows }

// blockRange is the half-open row range of block b out of n rows.
func blockRange(b, n int) (lo, hi int) {
	lo = b * blockRows
	return lo, min(lo+blockRows, n)
}

// parallelBlocks runs work(state, b) for every block b in 0..nBlocks-1 on
// at most GOMAXPROCS goroutines. Each goroutine owns one state made by
// newState (scratch buffers), so work needs no locks as long as it writes
// only to memory that belongs to its block. Which goroutine runs which
// block varies; callers make results depend on the block alone.
func parallelBlocks[S any](nBlocks int, newState func() S, work func(state S, b int)) {
	workers := min(runtime.GOMAXPROCS(0), nBlocks)
	states := make([]S, workers)
	for w := range states {
		states[w] = newState()
	}
	runBlocks(states, nBlocks, work)
}

// runBlocks is parallelBlocks with states made in advance, one goroutine
// per state, so that scratch memory can be reused across calls.
func runBlocks[S any](states []S, nBlocks int, work func(state S, b int)) {
	workers := min(len(states), nBlocks)
	if workers <= 1 {
		for b := 0; b < nBlocks; b++ {
			work(states[0], b)
		}
		return
	}
	var next atomic.Int64
	var wg sync.WaitGroup
	for w := 0; w < workers; w++ {
		wg.Add(1)
		go func(s S) {
			defer wg.Done()
			for {
				b := int(next.Add(1) - 1)
				if b >= nBlocks {
					return
				}
				work(s, b)
			}
		}(states[w])
	}
	wg.Wait()
}
