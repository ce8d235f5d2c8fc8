package solve

import (
	"context"
	"math"
	"time"
)

// cgSolver is conjugate gradients with a Jacobi preconditioner, or with any
// symmetric preconditioner supplied through precond.
type cgSolver struct {
	sys    *System
	set    Settings
	k      *kernels
	method Method
	setup  time.Duration
	// precond, when not nil, replaces the Jacobi step: z = M⁻¹·r.
	precond func(z, r []float64)

	r, z, p, q []float64
}

var _ Solver = (*cgSolver)(nil)

func newCG(sys *System, set Settings) *cgSolver {
	if set.MaxIter == 0 {
		set.MaxIter = 20000
	}
	n := sys.Len()
	return &cgSolver{
		sys: sys, set: set, k: newKernels(sys, set.Workers), method: CG,
		r: make([]float64, n), z: make([]float64, n), p: make([]float64, n), q: make([]float64, n),
	}
}

func (c *cgSolver) Close() { c.k.close() }

// Solve implements Solver.
func (c *cgSolver) Solve(ctx context.Context, b, x []float64) (*Result, error) {
	sys, k := c.sys, c.k
	if len(b) != sys.Len() || len(x) != sys.Len() {
		panic("solve: right-hand side or start vector has the wrong length")
	}
	start := time.Now()
	res := &Result{Method: c.method, Setup: c.setup}
	sys.setFixed(x, b)
	bnorm := sys.freeNorm(b)
	if bnorm == 0 {
		for i, f := range sys.Fixed {
			if !f {
				x[i] = 0
			}
		}
		res.Elapsed = time.Since(start)
		return res, nil
	}
	r, z, p, q := c.r, c.z, c.p, c.q
	var rz, rr float64
	if c.precond == nil {
		rz, rr = k.residual(r, b, x, z)
	} else {
		_, rr = k.residual(r, b, x, nil)
		c.precond(z, r)
		rz = k.dot(r, z)
	}
	res.Residual = math.Sqrt(rr) / bnorm
	if res.Residual <= c.set.Tol {
		res.Elapsed = time.Since(start)
		return res, nil
	}
	copy(p, z)
	if c.set.KeepHistory {
		res.History = make([]float64, 0, 64)
	}
	for it := 1; ; it++ {
		if err := ctx.Err(); err != nil {
			res.Status = Canceled
			res.Elapsed = time.Since(start)
			return res, finish(res, err)
		}
		pq := k.apply(q, p)
		if !(pq > 0) || badNumber(pq) {
			res.Status = Breakdown
			res.Iterations = it
			res.Elapsed = time.Since(start)
			return res, finish(res, nil)
		}
		alpha := rz / pq
		var rzNew float64
		if c.precond == nil {
			rzNew, rr = k.update(alpha, x, p, r, q, z)
		} else {
			rr = k.step(alpha, x, p, r, q)
			c.precond(z, r)
			rzNew = k.dot(r, z)
		}
		res.Iterations = it
		res.Residual = math.Sqrt(rr) / bnorm
		if c.set.KeepHistory {
			res.History = append(res.History, res.Residual)
		}
		if c.set.Progress != nil {
			c.set.Progress(Progress{Iteration: it, Residual: res.Residual, Elapsed: time.Since(start)})
		}
		if res.Residual <= c.set.Tol {
			// Confirm with the true residual; the recurrence can drift.
			_, rr = k.residual(r, b, x, nil)
			res.Residual = math.Sqrt(rr) / bnorm
			if res.Residual <= 2*c.set.Tol {
				break
			}
			if c.precond == nil {
				rzNew, _ = k.residual(r, b, x, z)
			} else {
				c.precond(z, r)
				rzNew = k.dot(r, z)
			}
			copy(p, z)
			rz = rzNew
			continue
		}
		if it >= c.set.MaxIter {
			res.Status = IterationLimit
			break
		}
		k.direction(rzNew/rz, p, z)
		rz = rzNew
	}
	res.Elapsed = time.Since(start)
	return res, finish(res, nil)
}

// dot returns x·y in index order.
func dot(x, y []float64) float64 {
	var s float64
	for i := range x {
		s += x[i] * y[i]
	}
	return s
}
