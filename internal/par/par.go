package par

import (
	"runtime"
	"sync/atomic"
	"time"
)

// Pool is a set of worker goroutines. The zero value is not usable; create
// one with New and release it with Close.
//
// A loop is published by advancing an epoch counter. Workers wait for the
// next epoch spinning for a while (spinWait) before they park, because
// the solvers run loops in quick succession and waking a parked goroutine
// costs about as much as a loop over a mid-sized grid.
type Pool struct {
	workers int
	workerState
	closed bool
}

// workerState is what the workers share with the calling goroutine.
type workerState struct {
	epoch     atomic.Uint64
	remaining atomic.Int64
	stop      atomic.Bool
	// sleeping[k] is set while worker k is parked on wake[k].
	sleeping []atomic.Bool
	wake     []chan struct{}

	// The loop in progress: its body, its length and the next index to
	// hand out.
	fn       func(lo, hi int)
	n, chunk int
	next     atomic.Int64
}

// spinWait is how long an idle worker polls for the next loop before it
// parks.
const spinWait = 50 * time.Microsecond

// New returns a pool of the given number of workers; workers ≤ 0 means
// runtime.GOMAXPROCS(0).
func New(workers int) *Pool {
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	p := &Pool{workers: workers}
	if workers > 1 {
		p.sleeping = make([]atomic.Bool, workers-1)
		p.wake = make([]chan struct{}, workers-1)
		for k := range p.wake {
			p.wake[k] = make(chan struct{}, 1)
			go p.run(k)
		}
	}
	return p
}

// run is worker k: it takes part in every loop until the pool closes.
func (s *workerState) run(k int) {
	var seen uint64
	for {
		e := s.await(k, seen)
		if s.stop.Load() {
			return
		}
		seen = e
		s.take()
		s.remaining.Add(-1)
	}
}

// await returns the first epoch after seen, spinning for spinWait and then
// parking until the caller wakes the worker.
func (s *workerState) await(k int, seen uint64) uint64 {
	start := time.Now()
	for i := 0; ; i++ {
		if e := s.epoch.Load(); e != seen {
			return e
		}
		if i&255 != 255 {
			continue
		}
		if time.Since(start) < spinWait {
			// Let the caller run if it shares this thread.
			runtime.Gosched()
			continue
		}
		// Park. The caller advances the epoch before it looks at
		// sleeping, and the worker sets sleeping before it looks at the
		// epoch again, so one of them sees the other.
		s.sleeping[k].Store(true)
		if e := s.epoch.Load(); e != seen {
			s.sleeping[k].Store(false)
			return e
		}
		<-s.wake[k]
		s.sleeping[k].Store(false)
		start = time.Now()
	}
}

// take runs the loop body on chunks of indices until none are left.
func (s *workerState) take() {
	c := int64(s.chunk)
	for {
		k := int(s.next.Add(c) - c)
		if k >= s.n {
			return
		}
		s.fn(k, min(k+s.chunk, s.n))
	}
}

// Workers returns the number of workers.
func (p *Pool) Workers() int { return p.workers }

// For calls fn on sub-ranges covering [0, n) and returns when all have
// finished. With one worker, or n < 2, it calls fn(0, n) once; otherwise
// the calling goroutine and the workers take the indices in chunks of
// about n/(4·workers), so that a worker held up by the operating system
// delays the loop by one chunk, not by a share of the range. fn must be
// safe to call concurrently on disjoint ranges, and must not call For on
// the same pool. For does not allocate when fn does not.
func (p *Pool) For(n int, fn func(lo, hi int)) {
	if p.workers <= 1 || n < 2 {
		if n > 0 {
			fn(0, n)
		}
		return
	}
	p.fn, p.n = fn, n
	p.chunk = max(1, n/(4*p.workers))
	p.next.Store(0)
	p.remaining.Store(int64(p.workers - 1))
	p.epoch.Add(1)
	p.wakeSleepers()
	p.take()
	for i := 0; p.remaining.Load() != 0; i++ {
		if i&1023 == 1023 {
			// A worker that was parked may be queued behind this
			// goroutine.
			runtime.Gosched()
		}
	}
	p.fn = nil
}

// wakeSleepers wakes the parked workers after the epoch has advanced.
func (p *Pool) wakeSleepers() {
	for k := range p.sleeping {
		if p.sleeping[k].Load() {
			select {
			case p.wake[k] <- struct{}{}:
			default:
			}
		}
	}
}

// Close stops the workers. The pool must not be used afterwards.
func (p *Pool) Close() {
	if p.closed {
		return
	}
	p.closed = true
	if p.workers > 1 {
		p.stop.Store(true)
		p.epoch.Add(1)
		p.wakeSleepers()
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
