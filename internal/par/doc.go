// Package par runs loops over index ranges on a fixed set of goroutines
// without allocating per call, and sums partial results in a fixed order so
// that reductions do not depend on the number of workers.
//
// The solvers cut every vector into a fixed number of row blocks (Blocks,
// or fewer on small grids), keep one partial sum per block and add the
// partials in block order (Sum). Which goroutine runs a block never
// changes a result, so a solve gives the same bits on one core or many.
// Pool.For hands the blocks out in small chunks, so a worker that the
// operating system holds up delays a loop by one chunk only, and its
// workers poll for the next loop for a short while before they park:
// waking a parked goroutine costs tens of microseconds, as much as a loop
// over a grid of a few hundred thousand nodes.
package par
