package solve

// newDefault sets up the default solver. Until the multigrid
// preconditioner lands, the default is Jacobi-preconditioned CG.
func newDefault(sys *System, set Settings) (Solver, error) {
	return newCG(sys, set), nil
}
