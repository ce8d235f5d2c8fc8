// Package par runs loops over index ranges on a fixed set of goroutines
// without allocating per call, and sums partial results in a fixed order so
// that reductions do not depend on the number of workers.
package par

import (
	"runtime"
	"sync"
)

// Pool is a set of worker goroutines. The zero value is not usable; create
// one with New and release it with Close.
type Pool struct {
	workers int
	tasks   chan task
	wg      sync.WaitGroup
	closed  bool
}

type task struct {
	fn     func(lo, hi int)
	lo, hi int
}

// New returns a pool of the given number of workers; workers ≤ 0 means
// runtime.GOMAXPROCS(0).
func New(workers int) *Pool {
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	p := &Pool{workers: workers}
	if workers > 1 {
		p.tasks = make(chan task, workers)
		for w := 1; w < workers; w++ {
			go p.run()
		}
	}
	return p
}

func (p *Pool) run() {
	for t := range p.tasks {
		t.fn(t.lo, t.hi)
		p.wg.Done()
	}
}

// Workers returns the number of workers.
func (p *Pool) Workers() int { return p.workers }

// For calls fn on contiguous sub-ranges covering [0, n), one per worker,
// and returns when all have finished. fn must be safe to call
// concurrently on disjoint ranges. For does not allocate when fn does not.
func (p *Pool) For(n int, fn func(lo, hi int)) {
	w := p.workers
	if w > n {
		w = n
	}
	if w <= 1 {
		if n > 0 {
			fn(0, n)
		}
		return
	}
	p.wg.Add(w - 1)
	for k := 1; k < w; k++ {
		p.tasks <- task{fn, k * n / w, (k + 1) * n / w}
	}
	fn(0, n/w)
	p.wg.Wait()
}

// Close stops the workers. The pool must not be used afterwards.
func (p *Pool) Close() {
	if p.closed {
		return
	}
	p.closed = true
	if p.tasks != nil {
		close(p.tasks)
	}
}

// Blocks is the number of fixed blocks a reduction is split into,
// independent of the worker count, so that partial sums are added in the
// same order whatever the number of workers.
const Blocks = 64

// Split returns the bounds [lo, hi) of block b of Blocks over n items.
func Split(n, b, blocks int) (lo, hi int) {
	return b * n / blocks, (b + 1) * n / blocks
}

// Sum returns the sum of s in index order.
func Sum(s []float64) float64 {
	var t float64
	for _, v := range s {
		t += v
	}
	return t
}
