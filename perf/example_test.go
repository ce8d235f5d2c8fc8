package perf_test

import (
	"context"
	"fmt"

	"github.com/phigrid/phigrid/perf"
	"github.com/phigrid/phigrid/solve"
)

// Run a short ladder: the unit square at 129² nodes with the default
// solver, and print what does not depend on the machine.
func Example() {
	rep, err := perf.Run(context.Background(), perf.Options{
		Sizes:   []int{129},
		Solvers: []solve.Method{solve.MGCG},
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, r := range rep.Rows {
		fmt.Printf("%s: %d nodes, %s, %d iterations, converged %v\n", r.Case, r.Nodes, r.Solver, r.Iterations, r.Residual <= rep.Tol)
	}
	// Output:
	// unit-square 129²: 16641 nodes, mg-pcg, 5 iterations, converged true
}
