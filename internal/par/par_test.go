package par

import (
	"sync/atomic"
	"testing"
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
