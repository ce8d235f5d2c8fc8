package solve

import (
	"context"
	"math"
	"time"
)

// sorSolver is red-black successive over-relaxation.
type sorSolver struct {
	sys   *System
	set   Settings
	k     *kernels
	omega float64
	setup time.Duration
	r     []float64
}

var _ Solver = (*sorSolver)(nil)

func newSOR(sys *System, set Settings) *sorSolver {
	if set.MaxIter == 0 {
		set.MaxIter = 20000
	}
	start := time.Now()
	s := &sorSolver{sys: sys, set: set, k: newKernels(sys, set.Workers), r: make([]float64, sys.Len())}
	s.omega = set.Omega
	if s.omega == 0 {
		s.omega = EstimateOmega(sys)
	}
	s.setup = time.Since(start)
	return s
}

func (s *sorSolver) Close() { s.k.close() }

// Omega returns the relaxation factor in use.
func (s *sorSolver) Omega() float64 { return s.omega }

// Solve implements Solver.
func (s *sorSolver) Solve(ctx context.Context, b, x []float64) (*Result, error) {
	sys, k := s.sys, s.k
	if len(b) != sys.Len() || len(x) != sys.Len() {
		panic("solve: right-hand side or start vector has the wrong length")
	}
	start := time.Now()
	res := &Result{Method: SOR, Setup: s.setup}
	sys.setFixed(x, b)
	bnorm := sys.freeNorm(b)
	if bnorm == 0 {
		for i, f := range sys.Fixed {
			if !f {
				x[i] = 0
			}
		}
		return res, nil
	}
	k.x, k.b, k.omega = x, b, s.omega
	// The residual costs about one sweep, so it is checked every few
	// sweeps, more often once the iteration nears the tolerance.
	check := 1
	prev := math.Inf(1)
	for it := 0; it < s.set.MaxIter; {
		if err := ctx.Err(); err != nil {
			res.Status = Canceled
			res.Elapsed = time.Since(start)
			return res, finish(res, err)
		}
		for c := 0; c < check && it < s.set.MaxIter; c++ {
			for color := 0; color < 2; color++ {
				k.color = color
				k.pool.For(k.blocks, k.sorFn)
			}
			it++
		}
		res.Iterations = it
		_, rr := k.residual(s.r, b, x, nil)
		res.Residual = math.Sqrt(rr) / bnorm
		if badNumber(res.Residual) {
			res.Status = Breakdown
			res.Elapsed = time.Since(start)
			return res, finish(res, nil)
		}
		if s.set.KeepHistory {
			res.History = append(res.History, res.Residual)
		}
		if s.set.Progress != nil {
			s.set.Progress(Progress{Iteration: it, Residual: res.Residual, Elapsed: time.Since(start)})
		}
		if res.Residual <= s.set.Tol {
			res.Elapsed = time.Since(start)
			return res, nil
		}
		// Predict the sweeps left from the observed rate and check again
		// at about a quarter of them, at most every 50 sweeps.
		if rate := res.Residual / prev; rate < 1 && rate > 0 && check > 0 {
			perSweep := math.Pow(rate, 1/float64(check))
			left := math.Log(s.set.Tol/res.Residual) / math.Log(perSweep)
			check = int(math.Max(1, math.Min(50, left/4)))
		} else {
			check = min(2*check, 50)
		}
		prev = res.Residual
	}
	res.Status = IterationLimit
	res.Elapsed = time.Since(start)
	return res, finish(res, nil)
}

// sorBlocks relaxes the nodes of the current colour in its row blocks.
// Nodes of one colour couple only to the other, so blocks are independent.
func (k *kernels) sorBlocks(lo, hi int) {
	sys := k.sys
	nx, ny := sys.Nx, sys.Ny
	x, b, w := k.x, k.b, k.omega
	for blk := lo; blk < hi; blk++ {
		j0, j1 := k.rows(blk)
		for j := j0; j < j1; j++ {
			o := j * nx
			for i := (j + k.color) & 1; i < nx; i += 2 {
				n := o + i
				if sys.Fixed[n] {
					continue
				}
				s := b[n]
				if i > 0 {
					s += sys.AX[n-1] * x[n-1]
				}
				if i+1 < nx {
					s += sys.AX[n] * x[n+1]
				}
				if j > 0 {
					s += sys.AY[n-nx] * x[n-nx]
				}
				if j+1 < ny {
					s += sys.AY[n] * x[n+nx]
				}
				x[n] += w * (s*k.invDiag[n] - x[n])
			}
		}
	}
}

// EstimateOmega returns an estimate of the optimal red-black SOR factor
// 2/(1+√(1−ρ²)), where ρ is the spectral radius of the Jacobi iteration,
// taken from the smallest eigenvalue of D⁻¹A that a Lanczos process (run
// through Jacobi-preconditioned CG on a fixed pseudo-random right-hand
// side) finds. Ritz values approach the smallest eigenvalue from above, so
// the estimate errs toward a slightly small ω.
func EstimateOmega(sys *System) float64 {
	n := sys.Len()
	steps := max(30, min(600, max(sys.Nx, sys.Ny)))
	k := newKernels(sys, 0)
	defer k.close()
	b := make([]float64, n)
	seed := uint64(0x9e3779b97f4a7c15)
	for i := range b {
		if sys.Fixed[i] {
			continue
		}
		seed ^= seed << 13
		seed ^= seed >> 7
		seed ^= seed << 17
		b[i] = float64(seed>>11)/float64(1<<53) - 0.5
	}
	x := make([]float64, n)
	r, z, p, q := make([]float64, n), make([]float64, n), make([]float64, n), make([]float64, n)
	rz, _ := k.residual(r, b, x, z)
	copy(p, z)
	var diag, off []float64
	var prevAlpha, prevBeta float64
	lam := 1.0
	for it := 0; it < steps && rz > 0; it++ {
		pq := k.apply(q, p)
		if !(pq > 0) {
			break
		}
		alpha := rz / pq
		rzNew, _ := k.update(alpha, x, p, r, q, z)
		beta := rzNew / rz
		d := 1 / alpha
		if it > 0 {
			d += prevBeta / prevAlpha
			off = append(off, math.Sqrt(prevBeta)/prevAlpha)
		}
		diag = append(diag, d)
		prevAlpha, prevBeta = alpha, beta
		if (it+1)%10 == 0 {
			l := smallestEigen(diag, off)
			if math.Abs(l-lam) < 1e-3*l {
				lam = l
				break
			}
			lam = l
		}
		k.direction(beta, p, z)
		rz = rzNew
	}
	if len(diag) > 0 {
		lam = smallestEigen(diag, off)
	}
	rho := 1 - lam
	if rho < 0 {
		rho = 0
	}
	if rho >= 1 {
		return 1.99
	}
	return 2 / (1 + math.Sqrt(1-rho*rho))
}

// smallestEigen returns the smallest eigenvalue of the symmetric
// tridiagonal matrix with diagonal d and off-diagonal e, by Sturm-sequence
// bisection.
func smallestEigen(d, e []float64) float64 {
	lo, hi := math.Inf(1), math.Inf(-1)
	for i := range d {
		r := 0.0
		if i > 0 {
			r += math.Abs(e[i-1])
		}
		if i < len(e) {
			r += math.Abs(e[i])
		}
		lo = math.Min(lo, d[i]-r)
		hi = math.Max(hi, d[i]+r)
	}
	// count returns the number of eigenvalues below x.
	count := func(x float64) int {
		c := 0
		q := 1.0
		for i := range d {
			off := 0.0
			if i > 0 {
				off = e[i-1] * e[i-1] / q
			}
			q = d[i] - x - off
			if q == 0 {
				q = 1e-300
			}
			if q < 0 {
				c++
			}
		}
		return c
	}
	for it := 0; it < 100 && hi-lo > 1e-14*math.Abs(hi); it++ {
		m := 0.5 * (lo + hi)
		if count(m) >= 1 {
			hi = m
		} else {
			lo = m
		}
	}
	return 0.5 * (lo + hi)
}
