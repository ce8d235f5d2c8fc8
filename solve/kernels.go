package solve

import (
	"math"

	"github.com/phigrid/phigrid/internal/par"
)

// Apply writes A·x into dst on one goroutine. It is the reference the
// parallel kernels are tested against.
func (s *System) Apply(dst, x []float64) {
	if len(dst) != s.Len() || len(x) != s.Len() {
		panic("solve: Apply length mismatch")
	}
	for j := 0; j < s.Ny; j++ {
		s.applyRow(dst, x, j)
	}
}

// applyRow writes row j of A·x into y and returns Σ x·y over the row.
func (s *System) applyRow(y, x []float64, j int) float64 {
	nx := s.Nx
	o := j * nx
	d := s.Diag[o : o+nx]
	ax := s.AX[o : o+nx]
	xc := x[o : o+nx]
	yc := y[o : o+nx]
	var as, xs, an, xn []float64
	if j > 0 {
		as = s.AY[o-nx : o]
		xs = x[o-nx : o]
	}
	if j+1 < s.Ny {
		an = s.AY[o : o+nx]
		xn = x[o+nx : o+2*nx]
	}
	var dot float64
	switch {
	case as != nil && an != nil:
		as, xs, an, xn = as[:nx], xs[:nx], an[:nx], xn[:nx]
		v := d[0]*xc[0] - as[0]*xs[0] - an[0]*xn[0]
		if nx > 1 {
			v -= ax[0] * xc[1]
		}
		yc[0] = v
		dot += v * xc[0]
		for i := 1; i < nx-1; i++ {
			v := d[i]*xc[i] - ax[i-1]*xc[i-1] - ax[i]*xc[i+1] - as[i]*xs[i] - an[i]*xn[i]
			yc[i] = v
			dot += v * xc[i]
		}
		if nx > 1 {
			i := nx - 1
			v := d[i]*xc[i] - ax[i-1]*xc[i-1] - as[i]*xs[i] - an[i]*xn[i]
			yc[i] = v
			dot += v * xc[i]
		}
	default:
		for i := 0; i < nx; i++ {
			v := d[i] * xc[i]
			if i > 0 {
				v -= ax[i-1] * xc[i-1]
			}
			if i+1 < nx {
				v -= ax[i] * xc[i+1]
			}
			if as != nil {
				v -= as[i] * xs[i]
			}
			if an != nil {
				v -= an[i] * xn[i]
			}
			yc[i] = v
			dot += v * xc[i]
		}
	}
	return dot
}

// kernels runs the vector operations of the Krylov and relaxation solvers
// on a worker pool, row-blocked, with reductions summed in a fixed block
// order so that results do not depend on the worker count. Its closures
// are built once, so no operation allocates.
type kernels struct {
	sys     *System
	pool    *par.Pool
	blocks  int
	partA   []float64
	partB   []float64
	invDiag []float64

	// Operands of the current operation.
	x, y, z, r, b, p []float64
	alpha            float64

	applyFn, updateFn, directionFn, residualFn, sorFn func(lo, hi int)
	stepFn, dotFn                                     func(lo, hi int)
	color                                             int
	omega                                             float64
}

func newKernels(sys *System, workers int) *kernels {
	k := &kernels{sys: sys, pool: par.New(workers)}
	k.blocks = min(par.Blocks, sys.Ny)
	k.partA = make([]float64, k.blocks)
	k.partB = make([]float64, k.blocks)
	k.invDiag = make([]float64, sys.Len())
	for i, d := range sys.Diag {
		k.invDiag[i] = 1 / d
	}
	k.applyFn = k.applyBlocks
	k.updateFn = k.updateBlocks
	k.directionFn = k.directionBlocks
	k.residualFn = k.residualBlocks
	k.sorFn = k.sorBlocks
	k.stepFn = k.stepBlocks
	k.dotFn = k.dotBlocks
	return k
}

func (k *kernels) close() { k.pool.Close() }

func (k *kernels) rows(b int) (int, int) { return par.Split(k.sys.Ny, b, k.blocks) }

// apply computes y = A·x and returns x·y.
func (k *kernels) apply(y, x []float64) float64 {
	k.x, k.y = x, y
	k.pool.For(k.blocks, k.applyFn)
	return par.Sum(k.partA)
}

func (k *kernels) applyBlocks(lo, hi int) {
	for b := lo; b < hi; b++ {
		j0, j1 := k.rows(b)
		var s float64
		for j := j0; j < j1; j++ {
			s += k.sys.applyRow(k.y, k.x, j)
		}
		k.partA[b] = s
	}
}

// update performs x += α·p, r −= α·y, z = D⁻¹r and returns r·z and r·r.
func (k *kernels) update(alpha float64, x, p, r, y, z []float64) (rz, rr float64) {
	k.alpha, k.x, k.p, k.r, k.y, k.z = alpha, x, p, r, y, z
	k.pool.For(k.blocks, k.updateFn)
	return par.Sum(k.partA), par.Sum(k.partB)
}

func (k *kernels) updateBlocks(lo, hi int) {
	nx := k.sys.Nx
	a := k.alpha
	for b := lo; b < hi; b++ {
		j0, j1 := k.rows(b)
		i0, i1 := j0*nx, j1*nx
		x, p, r, y, z, inv := k.x[i0:i1], k.p[i0:i1], k.r[i0:i1], k.y[i0:i1], k.z[i0:i1], k.invDiag[i0:i1]
		var rz, rr float64
		for i := range x {
			x[i] += a * p[i]
			ri := r[i] - a*y[i]
			r[i] = ri
			zi := ri * inv[i]
			z[i] = zi
			rz += ri * zi
			rr += ri * ri
		}
		k.partA[b], k.partB[b] = rz, rr
	}
}

// step performs x += α·p and r −= α·y and returns r·r: the update of a
// preconditioned iteration, whose z comes from the preconditioner.
func (k *kernels) step(alpha float64, x, p, r, y []float64) (rr float64) {
	k.alpha, k.x, k.p, k.r, k.y = alpha, x, p, r, y
	k.pool.For(k.blocks, k.stepFn)
	return par.Sum(k.partB)
}

func (k *kernels) stepBlocks(lo, hi int) {
	nx := k.sys.Nx
	a := k.alpha
	for b := lo; b < hi; b++ {
		j0, j1 := k.rows(b)
		i0, i1 := j0*nx, j1*nx
		x, p, r, y := k.x[i0:i1], k.p[i0:i1], k.r[i0:i1], k.y[i0:i1]
		p, r, y = p[:len(x)], r[:len(x)], y[:len(x)]
		var rr float64
		for i := range x {
			x[i] += a * p[i]
			ri := r[i] - a*y[i]
			r[i] = ri
			rr += ri * ri
		}
		k.partB[b] = rr
	}
}

// dot returns x·y summed over the fixed row blocks in order.
func (k *kernels) dot(x, y []float64) float64 {
	k.x, k.y = x, y
	k.pool.For(k.blocks, k.dotFn)
	return par.Sum(k.partA)
}

func (k *kernels) dotBlocks(lo, hi int) {
	nx := k.sys.Nx
	for b := lo; b < hi; b++ {
		j0, j1 := k.rows(b)
		x, y := k.x[j0*nx:j1*nx], k.y[j0*nx:j1*nx]
		y = y[:len(x)]
		var s float64
		for i := range x {
			s += x[i] * y[i]
		}
		k.partA[b] = s
	}
}

// direction performs p = z + β·p.
func (k *kernels) direction(beta float64, p, z []float64) {
	k.alpha, k.p, k.z = beta, p, z
	k.pool.For(k.blocks, k.directionFn)
}

func (k *kernels) directionBlocks(lo, hi int) {
	nx := k.sys.Nx
	beta := k.alpha
	for b := lo; b < hi; b++ {
		j0, j1 := k.rows(b)
		p, z := k.p[j0*nx:j1*nx], k.z[j0*nx:j1*nx]
		for i := range p {
			p[i] = z[i] + beta*p[i]
		}
	}
}

// residual computes r = b − A·x, z = D⁻¹r when z is not nil, and returns
// r·z (zero without z) and r·r.
func (k *kernels) residual(r, b, x, z []float64) (rz, rr float64) {
	k.r, k.b, k.x, k.z = r, b, x, z
	k.pool.For(k.blocks, k.residualFn)
	return par.Sum(k.partA), par.Sum(k.partB)
}

func (k *kernels) residualBlocks(lo, hi int) {
	nx := k.sys.Nx
	for b := lo; b < hi; b++ {
		j0, j1 := k.rows(b)
		var rz, rr float64
		for j := j0; j < j1; j++ {
			k.sys.applyRow(k.r, k.x, j)
			o := j * nx
			r, bb := k.r[o:o+nx], k.b[o:o+nx]
			for i := range r {
				ri := bb[i] - r[i]
				r[i] = ri
				rr += ri * ri
			}
			if k.z != nil {
				z, inv := k.z[o:o+nx], k.invDiag[o:o+nx]
				for i := range r {
					z[i] = r[i] * inv[i]
					rz += r[i] * z[i]
				}
			}
		}
		k.partA[b], k.partB[b] = rz, rr
	}
}

// freeNorm returns ‖b‖₂ over the free rows.
func (s *System) freeNorm(b []float64) float64 {
	var t float64
	for i, v := range b {
		if !s.Fixed[i] {
			t += v * v
		}
	}
	return math.Sqrt(t)
}

// setFixed copies the fixed rows of b into x.
func (s *System) setFixed(x, b []float64) {
	for i, f := range s.Fixed {
		if f {
			x[i] = b[i] / s.Diag[i]
		}
	}
}
