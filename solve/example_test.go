package solve_test

import (
	"context"
	"fmt"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
	"github.com/phigrid/phigrid/solve"
)

// Assemble a square box with its top at 1 V and solve it with two methods.
func Example() {
	p := &bc.Problem{Domain: bc.Rect{X1: 0.01, Y1: 0.01}}
	p.Sides[bc.Top] = bc.Side{Kind: bc.Fixed, Potential: 1}
	for _, s := range []int{bc.Left, bc.Right, bc.Bottom} {
		p.Sides[s] = bc.Side{Kind: bc.Fixed}
	}
	x, _ := grid.Uniform(0, 0.01, 65)
	g, _ := grid.New(x, x, grid.Planar)
	m, _ := bc.Rasterize(p, g, nil)
	sys, _ := solve.Assemble(m)
	b := sys.RHS(nil, nil, true, true)
	for _, method := range []solve.Method{solve.CG, solve.SOR} {
		phi := make([]float64, sys.Len())
		r, err := solve.Solve(context.Background(), sys, b, phi, &solve.Settings{Method: method, Tol: 1e-10})
		if err != nil {
			fmt.Println(err)
			return
		}
		// By symmetry the centre is at exactly a quarter of the lid potential.
		fmt.Printf("%s: %v, φ(centre) = %.6f V\n", method, r.Status, phi[g.Index(32, 32)])
	}
	// Output:
	// cg: converged, φ(centre) = 0.250000 V
	// sor: converged, φ(centre) = 0.250000 V
}
