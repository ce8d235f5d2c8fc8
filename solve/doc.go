// Package solve assembles the finite-volume equations of a rasterised
// problem and solves them.
//
// # Overview
//
// Assemble turns a bc.Map into a System: a symmetric positive-definite
// five-point operator on the full node grid, in which fixed nodes
// (conductors and prescribed boundary values) are identity rows, plus the
// parts of the right-hand side. The right-hand side is linear in the
// conductor potentials,
//
//	b = b_charge + b_prescribed + Σₖ Vₖ·bₖ,
//
// and System.RHS forms it for any set of potentials, so one assembly and
// one solver set-up serve every solve of a capacitance matrix.
//
// Solvers share one small interface, Solver, built by NewSolver from
// Settings:
//
//   - MGCG, the default: conjugate gradients preconditioned by one
//     symmetric V-cycle of a black-box multigrid hierarchy (see
//     Multigrid), started from a full-multigrid approximation when the
//     start vector is zero. Iterations to a fixed tolerance stay flat as
//     the grid grows, with interior electrodes, 1000:1 permittivity jumps,
//     the r-weighting of axisymmetric problems and strongly graded grids.
//   - MG: stand-alone V-cycles from the same hierarchy.
//   - CG: conjugate gradients with a Jacobi (diagonal) preconditioner.
//   - SOR: red-black successive over-relaxation with an estimated optimal
//     relaxation factor.
//
// CG and SOR are there because users expect them and because they check
// the fast path; all methods agree to their tolerance. Every method works
// on the box around the free nodes when that box is at most three quarters
// of the grid, so fixed margins at the domain's edges (the outside of a
// shield, say) cost no iterations' work. A solver is set up
// once (hierarchy, workspaces) and solves any number of right-hand sides
// without allocating. EstimateMemory tells the bytes a set-up needs before
// it is made; TimeResidual times one operator evaluation, the unit of
// work the benchmarks report. FreeIndex, Entries and FreeVector export the
// system over the free nodes, for external linear-algebra tools. A solve
// honours a context.Context, reports progress through an optional callback
// and returns a Result with iterations, residual history and timing. A solve
// that does not reach its tolerance leaves its best iterate in x and
// returns an error wrapping ErrNotConverged.
//
// # Invariants
//
// Couplings are non-negative and symmetric by construction (AX[n] couples n
// and n+1 in both rows); fixed rows have Diag = 1 and no couplings, so a
// solution vector holds every node's potential, fixed ones included.
// Reductions are summed over a fixed number of row blocks in a fixed order,
// so results are identical whatever Settings.Workers is.
//
// # Aliasing
//
// A System refers to the Map it came from and must not be modified while
// a solver uses it. Solve overwrites x; b must not alias x.
package solve
