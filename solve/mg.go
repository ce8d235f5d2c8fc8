package solve

import (
	"context"
	"fmt"
	"math"
	"time"
)

// Smoother names the relaxation a multigrid level uses.
type Smoother int

const (
	// PointGS is point Gauss–Seidel: red-black on the five-point finest
	// level, four-colour on the nine-point coarse levels.
	PointGS Smoother = iota
	// LineX is zebra line Gauss–Seidel along X: every other grid row is
	// solved exactly as a tridiagonal system, then the rows in between.
	// It is chosen where the X couplings dominate.
	LineX
	// LineY is zebra line Gauss–Seidel along Y, for dominant Y couplings.
	LineY
	// LineXY alternates LineX and LineY, for levels where both directions
	// dominate somewhere.
	LineXY
)

var smootherNames = [...]string{PointGS: "point", LineX: "line-x", LineY: "line-y", LineXY: "line-xy"}

// String returns the smoother's name.
func (s Smoother) String() string {
	if int(s) >= 0 && int(s) < len(smootherNames) {
		return smootherNames[s]
	}
	return fmt.Sprintf("Smoother(%d)", int(s))
}

// Level describes one level of a multigrid hierarchy.
type Level struct {
	Nx, Ny   int
	Smoother Smoother
}

// Multigrid is a multigrid hierarchy for one System: the finest level is
// the System itself, every coarser level a nine-point Galerkin operator
// Pᵀ·A·P on the even nodes of the level above, down to a level at most
// three nodes across, which is solved exactly by a banded Cholesky
// factorisation.
//
// The interpolation P follows the operator (black-box multigrid): an edge
// point takes its coarse neighbours' values with the weights of its own
// row collapsed across the edge, and a cell centre solves its own
// homogeneous equation. Coefficient jumps, the r-weighting of axisymmetric
// problems and fixed nodes inside the domain thus shape the coarse
// operators instead of spoiling them; fixed nodes receive no correction.
//
// Each level relaxes by Gauss–Seidel: point-wise (red-black on the
// finest, four-colour on the nine-point levels) where the operator is
// close to isotropic, zebra line relaxation along the dominant direction
// where the couplings differ by more than LineRatio (graded grids with
// long thin cells, cells cut by a dielectric interface). Lines are solved
// by the Thomas algorithm; the pivots of X lines are computed once at
// set-up, so that their sweeps carry no division. A V-cycle relaxes
// forward on the way down and in the reverse order on the way up, so one
// V-cycle from zero is a symmetric positive definite preconditioner for
// conjugate gradients.
//
// Storage: the finest level is read in place and its interpolation
// weights are recomputed from the operator (only the lumped diagonals of
// the edge points are kept); every coarser level keeps five of its nine
// stencil entries per node in float64 (the others follow by symmetry),
// with a halo of zeros, and its interpolation weights; levels that relax
// X lines keep their pivots too. The whole hierarchy takes about a third
// of the finest level's nodes; see EstimateMemory.
//
// Every kernel runs over fixed row blocks on the worker pool, and no value
// depends on how the blocks are shared out, so results are identical,
// bit for bit, for any number of workers. Nothing allocates after set-up.
//
// A Multigrid is set up once and reused for any number of right-hand
// sides. It implements Solver by stand-alone V-cycles; the default solver
// uses it as the preconditioner of conjugate gradients. It is not safe for
// concurrent use.
type Multigrid struct {
	sys   *System
	set   Settings
	k     *kernels
	ownK  bool
	fine  *fineLevel
	cs    []*coarseLevel
	lv    []mgLevel
	bot   *bandCholesky
	setup time.Duration
	// nu is the number of relaxation steps before and after the coarse
	// correction.
	nu int
}

var _ Solver = (*Multigrid)(nil)

// LineRatio decides when a level relaxes by lines: when at some free node
// the couplings along one axis exceed those along the other by more than
// this factor (cells about three times as long as they are wide).
const LineRatio = 8

// serialNodes is the level size below which kernels run on the calling
// goroutine: waking the workers would cost more than the work.
const serialNodes = 8192

// NewMultigrid sets up the multigrid hierarchy of sys. The Settings'
// Tol, MaxIter (zero means 500), Workers, Progress and KeepHistory apply
// to Multigrid.Solve; a nil set means the defaults.
func NewMultigrid(sys *System, set *Settings) (*Multigrid, error) {
	o := set.withDefaults()
	if !(o.Tol > 0 && o.Tol < 1) {
		return nil, fmt.Errorf("solve: tolerance must lie in (0, 1), got %g", o.Tol)
	}
	if o.MaxIter < 0 {
		return nil, fmt.Errorf("solve: iteration limit must be ≥ 0, got %d", o.MaxIter)
	}
	if o.MaxIter == 0 {
		o.MaxIter = 500
	}
	m := newMultigrid(sys, newKernels(sys, o.Workers), o)
	m.ownK = true
	m.fine.needR()
	return m, nil
}

// newMultigrid builds the hierarchy on the kernels (worker pool and
// inverse diagonal) k.
func newMultigrid(sys *System, k *kernels, set Settings) *Multigrid {
	start := time.Now()
	m := &Multigrid{sys: sys, set: set, k: k, nu: 1}
	m.fine = newFineLevel(sys, k)
	m.fine.run = m.runner(sys.Len())
	m.lv = []mgLevel{m.fine}
	var cur mgLevel = m.fine
	m.fine.smoother = m.fine.chooseSmoother()
	if m.fine.smoother != PointGS {
		m.fine.needR()
		m.fine.factorLines()
	}
	for {
		nx, ny := cur.dims()
		if min(nx, ny) <= 3 {
			break
		}
		ncx, ncy := (nx+1)/2, (ny+1)/2
		c := newCoarseLevel(ncx, ncy)
		c.run = m.runner(ncx * ncy)
		prefault(c.run, c.c, c.w, c.s, c.sw, c.se, c.x, c.b, c.r)
		switch l := cur.(type) {
		case *fineLevel:
			l.ncx, l.ncy = ncx, ncy
			l.prepare()
		case *coarseLevel:
			l.ncx, l.ncy = ncx, ncy
			l.p = make([]float64, pLen*ncx*ncy)
			prefault(l.run, l.p)
			l.computeWeights()
		}
		switch l := cur.(type) {
		case *fineLevel:
			galerkinFine(l, c, m.runner(ncx*ncy))
		case *coarseLevel:
			galerkinCoarse(l, c, m.runner(ncx*ncy))
		}
		c.smoother = c.chooseSmoother()
		c.factorLines()
		m.cs = append(m.cs, c)
		m.lv = append(m.lv, c)
		cur = c
	}
	m.bot = newBandCholesky(cur)
	m.setup = time.Since(start)
	return m
}

// runner returns the function that runs a kernel over n row blocks of a
// level with the given number of nodes.
func (m *Multigrid) runner(nodes int) func(n int, fn func(lo, hi int)) {
	if nodes < serialNodes || m.k.pool.Workers() == 1 {
		return func(n int, fn func(lo, hi int)) {
			if n > 0 {
				fn(0, n)
			}
		}
	}
	return m.k.pool.For
}

// Levels describes the hierarchy from the finest level down.
func (m *Multigrid) Levels() []Level {
	out := make([]Level, len(m.lv))
	out[0] = Level{Nx: m.fine.nx, Ny: m.fine.ny, Smoother: m.fine.smoother}
	for i, c := range m.cs {
		out[i+1] = Level{Nx: c.nx, Ny: c.ny, Smoother: c.smoother}
	}
	return out
}

// SetupTime returns the time the hierarchy took to build.
func (m *Multigrid) SetupTime() time.Duration { return m.setup }

// vectors returns the correction, right-hand side and residual vectors of
// level l ≥ 1.
func (m *Multigrid) vectors(l int) (x, b, r []float64) {
	c := m.cs[l-1]
	return c.x, c.b, c.r
}

// vcycle runs one V-cycle on level l for A·x = b; with zero set x is taken
// as zero on entry.
func (m *Multigrid) vcycle(l int, x, b []float64, zero bool) {
	if l == len(m.lv)-1 {
		m.bot.solve(x, b)
		return
	}
	lv := m.lv[l]
	r := m.fine.r
	if l > 0 {
		_, _, r = m.vectors(l)
	}
	cx, cb, _ := m.vectors(l + 1)
	point := l == 0 && m.fine.smoother == PointGS
	if point && zero && m.nu == 1 {
		// Relaxation from zero and restriction in one pass.
		m.fine.restrictZero(cb, x, b)
	} else {
		for s := 0; s < m.nu; s++ {
			lv.smooth(x, b, zero && s == 0, false)
		}
		if point {
			m.fine.restrictRed(cb, x, b)
		} else {
			lv.residual(r, x, b)
			lv.restrict(cb, r)
		}
	}
	m.vcycle(l+1, cx, cb, true)
	s := 0
	if l == 0 && m.fine.smoother == PointGS {
		m.fine.prolongSmooth(x, b, cx)
		s = 1
	} else {
		lv.prolong(x, cx)
	}
	for ; s < m.nu; s++ {
		lv.smooth(x, b, false, true)
	}
}

// Precondition sets z to one V-cycle from zero applied to r: z = M⁻¹·r
// with M symmetric positive definite. Fixed rows of r must be zero (as they
// are for a residual); z is zero there. It does not allocate.
func (m *Multigrid) Precondition(z, r []float64) {
	if len(z) != m.sys.Len() || len(r) != m.sys.Len() {
		panic("solve: Precondition length mismatch")
	}
	m.vcycle(0, z, r, true)
}

// Cycle improves x by one V-cycle for A·x = b.
func (m *Multigrid) Cycle(b, x []float64) {
	if len(b) != m.sys.Len() || len(x) != m.sys.Len() {
		panic("solve: Cycle length mismatch")
	}
	m.sys.setFixed(x, b)
	m.vcycle(0, x, b, false)
}

// FMG overwrites x with a full-multigrid approximation of A·x = b: b is
// restricted to every level, the coarsest is solved exactly, and each
// finer level starts from the interpolated coarser solution, relaxes once
// and takes one V-cycle. It costs about a third more than a V-cycle. On
// problems driven by charge it is accurate to about the discretisation
// error; where conductors drive the field it is worth two or three
// V-cycles from zero, because the interpolation (built for corrections) is
// zero next to fixed nodes and the conductors' potentials reach the fine
// grid only through relaxation.
func (m *Multigrid) FMG(b, x []float64) {
	if len(b) != m.sys.Len() || len(x) != m.sys.Len() {
		panic("solve: FMG length mismatch")
	}
	last := len(m.lv) - 1
	if last == 0 {
		m.bot.solve(x, b)
		return
	}
	// Right-hand sides down the hierarchy.
	cur := b
	for l := 0; l < last; l++ {
		_, cb, _ := m.vectors(l + 1)
		m.lv[l].restrict(cb, cur)
		cur = cb
	}
	cx, cb, _ := m.vectors(last)
	m.bot.solve(cx, cb)
	for l := last - 1; l >= 0; l-- {
		var xl, bl []float64
		if l == 0 {
			xl, bl = x, b
		} else {
			xl, bl, _ = m.vectors(l)
		}
		if l == 0 {
			m.fine.startFrom(xl, bl, startZero)
		} else {
			m.cs[l-1].clearRows(xl)
		}
		m.lv[l].prolong(xl, m.cs[l].x)
		if l == 0 {
			m.fine.startFrom(xl, bl, startFixed)
		} else {
			c := m.cs[l-1]
			for i, f := range c.fixed {
				if f {
					xl[i] = bl[i]
				}
			}
		}
		// The interpolation carries no boundary data: it is zero next to
		// fixed nodes. Relaxing the edge points and then the others
		// brings the conductors' potentials into the nodes beside them
		// before the V-cycle.
		m.lv[l].smooth(xl, bl, false, true)
		m.vcycle(l, xl, bl, false)
	}
}

// Solve implements Solver by V-cycles until the relative residual over
// free rows is at most Tol. When x is zero on every free row it starts from
// FMG. The Result reports Method MG.
func (m *Multigrid) Solve(ctx context.Context, b, x []float64) (*Result, error) {
	sys, k := m.sys, m.k
	if len(b) != sys.Len() || len(x) != sys.Len() {
		panic("solve: right-hand side or start vector has the wrong length")
	}
	start := time.Now()
	res := &Result{Method: MG, Setup: m.setup}
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
	if m.fine.startFrom(x, b, startCheck) {
		m.FMG(b, x)
	}
	r := m.fine.r
	_, rr := k.residual(r, b, x, nil)
	res.Residual = math.Sqrt(rr) / bnorm
	for it := 1; res.Residual > m.set.Tol; it++ {
		if err := ctx.Err(); err != nil {
			res.Status = Canceled
			res.Elapsed = time.Since(start)
			return res, finish(res, err)
		}
		if it > m.set.MaxIter {
			res.Status = IterationLimit
			break
		}
		m.vcycle(0, x, b, false)
		_, rr = k.residual(r, b, x, nil)
		res.Iterations = it
		res.Residual = math.Sqrt(rr) / bnorm
		if badNumber(res.Residual) {
			res.Status = Breakdown
			break
		}
		if m.set.KeepHistory {
			res.History = append(res.History, res.Residual)
		}
		if m.set.Progress != nil {
			m.set.Progress(Progress{Iteration: it, Residual: res.Residual, Elapsed: time.Since(start)})
		}
	}
	res.Elapsed = time.Since(start)
	return res, finish(res, nil)
}

// Close releases the workers when the Multigrid owns them.
func (m *Multigrid) Close() {
	if m.ownK {
		m.k.close()
	}
}
