package par

import (
	"runtime"
	"sync"
	"sync/atomic"
)

// Pool is a set of worker goroutines. The zero value is not usable; create
// one with New and release it with Close.
type Pool struct {
	workers int
	wake    chan struct{}
	wg      sync.WaitGroup
	closed  bool

	// The loop in progress: its body, its length and the next index to
	// hand out.
	fn   func(lo, hi int)
	n    int
	next atomic.Int64
}

// New returns a pool of the given number of workers; workers ≤ 0 means
// runtime.GOMAXPROCS(0).
func New(workers int) *Pool {
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	p := &Pool{workers: workers}
	if workers > 1 {
		p.wake = make(chan struct{}, workers)
		for w := 1; w < workers; w++ {
			go p.run()
		}
	}
	return p
}

func (p *Pool) run() {
	for range p.wake {
		p.take()
		p.wg.Done()
	}
}

// take runs the loop body on indices handed out one at a time until none
// are left.
func (p *Pool) take() {
	for {
		k := int(p.next.Add(1) - 1)
		if k >= p.n {
			return
		}
		p.fn(k, k+1)
	}
}

// Workers returns the number of workers.
func (p *Pool) Workers() int { return p.workers }

// For calls fn on sub-ranges covering [0, n) and returns when all have
// finished. With one worker it calls fn(0, n) once; otherwise the calling
// goroutine and the workers take the indices one at a time, calling
// fn(k, k+1), so that a worker held up by the operating system delays the
// loop by one index, not by a share of the range. fn must be safe to call
// concurrently on disjoint ranges, and must not call For on the same pool.
// For does not allocate when fn does not.
func (p *Pool) For(n int, fn func(lo, hi int)) {
	w := min(p.workers, n)
	if w <= 1 {
		if n > 0 {
			fn(0, n)
		}
		return
	}
	p.fn, p.n = fn, n
	p.next.Store(0)
	p.wg.Add(w - 1)
	for k := 1; k < w; k++ {
		p.wake <- struct{}{}
	}
	p.take()
	p.wg.Wait()
	p.fn = nil
}

// Close stops the workers. The pool must not be used afterwards.
func (p *Pool) Close() {
	if p.closed {
		return
	}
	p.closed = true
	if p.wake != nil {
		close(p.wake)
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
