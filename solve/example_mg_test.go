package solve_test

import (
	"context"
	"fmt"
	"math"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
	"github.com/phigrid/phigrid/solve"
)

// Set up the multigrid hierarchy of a pin over a dielectric block (1000:1)
// and solve by stand-alone V-cycles, which start from full multigrid. The
// same hierarchy would serve any further right-hand side.
func ExampleMultigrid() {
	p := &bc.Problem{
		Domain:     bc.Rect{X1: 0.1, Y1: 0.1},
		Conductors: []bc.Conductor{{Name: "pin", Potential: 1}},
		Regions: []bc.Region{
			{Kind: bc.ConductorRegion, Conductor: "pin", Shape: bc.Circle{X: 0.05, Y: 0.05, R: 0.01}},
			{Kind: bc.Dielectric, Shape: bc.Rect{X0: 0.02, Y0: 0.02, X1: 0.07, Y1: 0.04}, EpsR: 1000},
		},
	}
	for s := range p.Sides {
		p.Sides[s] = bc.Side{Kind: bc.Fixed}
	}
	x, _ := grid.Uniform(0, 0.1, 257)
	g, _ := grid.New(x, x, grid.Planar)
	m, _ := bc.Rasterize(p, g, nil)
	sys, _ := solve.Assemble(m)

	mg, err := solve.NewMultigrid(sys, &solve.Settings{Tol: 1e-9})
	if err != nil {
		fmt.Println(err)
		return
	}
	defer mg.Close()
	fmt.Println("levels:", len(mg.Levels()), "finest:", mg.Levels()[0].Nx, "×", mg.Levels()[0].Ny)

	b := sys.RHS(nil, []float64{1}, true, true)
	phi := make([]float64, sys.Len())
	res, err := mg.Solve(context.Background(), b, phi)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%v after a few V-cycles: %v\n", res.Status, res.Iterations <= 12)
	// Conjugate gradients with the Jacobi preconditioner on the same system.
	ref := make([]float64, sys.Len())
	if _, err := solve.Solve(context.Background(), sys, b, ref, &solve.Settings{Method: solve.CG, Tol: 1e-11}); err != nil {
		fmt.Println(err)
		return
	}
	n := g.Index(64, 128) // (0.025, 0.05), between the pin and the left wall
	fmt.Printf("φ(0.025, 0.05) = %.3f V, CG agrees to 1e-6 V: %v\n", phi[n], math.Abs(phi[n]-ref[n]) < 1e-6)
	// Output:
	// levels: 8 finest: 257 × 257
	// converged after a few V-cycles: true
	// φ(0.025, 0.05) = 0.717 V, CG agrees to 1e-6 V: true
}
