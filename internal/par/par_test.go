package par

import (
	"fmt"
	"sync/atomic"
	"testing"
	"time"
)

func TestForCoversRange(t *testing.T) {
	for _, workers := range []int{1, 2, 3, 8} {
		p := New(workers)
		for _, n := range []int{0, 1, 2, 7, 100} {
			var hits = make([]int32, n)
			p.For(n, func(lo, hi int) {
				for i := lo; i < hi; i++ {
					atomic.AddInt32(&hits[i], 1)
				}
			})
			for i, h := range hits {
				if h != 1 {
					t.Fatalf("workers %d n %d: index %d visited %d times", workers, n, i, h)
				}
			}
		}
		p.Close()
	}
}

func TestForDoesNotAllocate(t *testing.T) {
	p := New(2)
	defer p.Close()
	data := make([]float64, 1000)
	fn := func(lo, hi int) {
		for i := lo; i < hi; i++ {
			data[i]++
		}
	}
	if a := testing.AllocsPerRun(100, func() { p.For(len(data), fn) }); a != 0 {
		t.Errorf("For allocates %g times per call", a)
	}
}

// TestForAfterParking runs loops with pauses long enough for the workers
// to park between them, so that every loop after the first goes through
// the wake-up path.
func TestForAfterParking(t *testing.T) {
	p := New(3)
	defer p.Close()
	hits := make([]int32, 64)
	for round := 1; round <= 5; round++ {
		time.Sleep(2 * spinWait)
		p.For(len(hits), func(lo, hi int) {
			for i := lo; i < hi; i++ {
				atomic.AddInt32(&hits[i], 1)
			}
		})
		for i, h := range hits {
			if h != int32(round) {
				t.Fatalf("round %d: index %d visited %d times in all", round, i, h)
			}
		}
	}
}

// BenchmarkFor is a loop of 64 blocks over n values, the shape of the
// solvers' kernels, on one and two workers.
func BenchmarkFor(b *testing.B) {
	for _, size := range []int{2000, 20000, 200000, 2000000} {
		data := make([]float64, size)
		fn := func(lo, hi int) {
			for blk := lo; blk < hi; blk++ {
				i0, i1 := Split(len(data), blk, Blocks)
				for i := i0; i < i1; i++ {
					data[i] = data[i]*0.999 + 1
				}
			}
		}
		for _, w := range []int{1, 2} {
			b.Run(fmt.Sprintf("n=%d/workers=%d", size, w), func(b *testing.B) {
				p := New(w)
				defer p.Close()
				b.ReportAllocs()
				for i := 0; i < b.N; i++ {
					p.For(Blocks, fn)
				}
			})
		}
	}
}
