package solve

import (
	"slices"
	"time"
)

// TimeResidual returns the median time of one residual evaluation
// r = b − A·x over the whole grid of sys, on the given number of workers
// (zero means all cores), from reps timed runs after one untimed one. It
// is the unit of the work counts that benchmarks report: a solve that
// takes w such units did the work of about w residual evaluations (one
// red-black relaxation sweep costs about as much).
func TimeResidual(sys *System, workers, reps int) time.Duration {
	k := newKernels(sys, workers)
	defer k.close()
	n := sys.Len()
	x, b, r := make([]float64, n), make([]float64, n), make([]float64, n)
	for i := range x {
		x[i] = float64(i%7) - 3
		b[i] = float64(i % 5)
	}
	k.residual(r, b, x, nil)
	reps = max(reps, 1)
	ts := make([]time.Duration, reps)
	for i := range ts {
		t0 := time.Now()
		k.residual(r, b, x, nil)
		ts[i] = time.Since(t0)
	}
	slices.Sort(ts)
	return ts[reps/2]
}
