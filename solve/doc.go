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
// Settings: red-black SOR with an estimated optimal relaxation factor,
// Jacobi-preconditioned conjugate gradients, and the default. A solve
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
