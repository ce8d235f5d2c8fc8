package solve

import (
	"context"
	"time"
)

// mgcgSolver is conjugate gradients preconditioned by one multigrid
// V-cycle: the default solver.
type mgcgSolver struct {
	*cgSolver
	mg *Multigrid
}

// newDefault sets up the default solver: conjugate gradients preconditioned
// by a symmetric multigrid V-cycle (see Multigrid), sharing the worker pool
// of the Krylov kernels. Zero MaxIter means 500.
func newDefault(sys *System, set Settings) (Solver, error) {
	start := time.Now()
	if set.MaxIter == 0 {
		set.MaxIter = 500
	}
	c := newCG(sys, set)
	c.method = MGCG
	mg := newMultigrid(sys, c.k, set)
	prefault(mg.runner(sys.Len()), c.r, c.z, c.p, c.q)
	c.precond = mg.Precondition
	c.setup = time.Since(start)
	return &mgcgSolver{cgSolver: c, mg: mg}, nil
}

// Solve implements Solver. A start vector that is zero on every free node
// is replaced by a full-multigrid approximation first (Multigrid.FMG),
// which costs about one and a half V-cycles and saves two to three
// iterations; the result's Elapsed includes it.
func (s *mgcgSolver) Solve(ctx context.Context, b, x []float64) (*Result, error) {
	if len(b) != s.sys.Len() || len(x) != s.sys.Len() {
		panic("solve: right-hand side or start vector has the wrong length")
	}
	start := time.Now()
	if ctx.Err() == nil && s.mg.fine.startFrom(x, b, startCheck) {
		s.mg.FMG(b, x)
	}
	res, err := s.cgSolver.Solve(ctx, b, x)
	if res != nil {
		res.Elapsed = time.Since(start)
	}
	return res, err
}

// Close implements Solver.
func (s *mgcgSolver) Close() { s.cgSolver.Close() }
