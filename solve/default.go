package solve

import "time"

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

// Close implements Solver.
func (s *mgcgSolver) Close() { s.cgSolver.Close() }
