// Package perf runs phigrid's benchmark ladder: a fixed set of problems,
// each solved by each solver, with the figures that compare solvers with
// one another and with external multigrid libraries run on the same
// machine.
//
// The ladder is the unit-square Poisson problem (−Δφ = 1, φ = 0 on every
// side, ρ constant) at 257², 513², 1 025², 2 049² and 4 097² nodes, then
// any model files given, each on its own grid and refined toward the same
// node counts, then any cases built by the caller. Options.MaxNodes bounds
// every case. For each case and solver Run reports the set-up and solve
// times, the iterations and the final relative residual, the peak memory
// per node and the work in units of one residual evaluation on the same
// grid, timed in the same run, so that figures from a noisy machine stay
// comparable.
//
// Run does not write files; Report.WriteText and Report.WriteJSON format
// the results for people and for programs.
package perf
