package field_test

import (
	"context"
	"fmt"
	"math"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/field"
	"github.com/phigrid/phigrid/grid"
	"github.com/phigrid/phigrid/solve"
)

// A parallel-plate capacitor with a dielectric layer: capacitance per
// metre, stored energy and the field in each layer.
func Example() {
	p := &bc.Problem{
		Domain:     bc.Rect{X0: 0, Y0: 0, X1: 0.01, Y1: 0.001},
		Conductors: []bc.Conductor{{Name: "hv", Potential: 1}, {Name: "gnd"}},
		Regions: []bc.Region{
			{Kind: bc.Dielectric, Shape: bc.Rect{X0: 0, Y0: 0, X1: 0.01, Y1: 0.0006}, EpsR: 4.4},
		},
	}
	p.Sides[bc.Top] = bc.Side{Kind: bc.Fixed, Conductor: "hv"}
	p.Sides[bc.Bottom] = bc.Side{Kind: bc.Fixed, Conductor: "gnd"}
	x, _ := grid.Uniform(0, 0.01, 11)
	y, _ := grid.Uniform(0, 0.001, 11)
	g, _ := grid.New(x, y, grid.Planar)
	sol, err := field.Solve(context.Background(), p, g, &field.Settings{Solver: solve.Settings{Tol: 1e-12}})
	if err != nil {
		fmt.Println(err)
		return
	}
	q := sol.Charges()
	_, eAir, _ := sol.FieldAt(0.005, 0.0008)
	_, eDiel, _ := sol.FieldAt(0.005, 0.0003)
	fmt.Printf("C' = %.5f pF/m\n", q[0]*1e12)
	fmt.Printf("W' = %.5f pJ/m\n", sol.Energy()*1e12)
	fmt.Printf("E = %.1f V/m in air, %.1f V/m in the dielectric\n", math.Abs(eAir), math.Abs(eDiel))
	// Output:
	// C' = 165.07808 pF/m
	// W' = 82.53904 pJ/m
	// E = 1864.4 V/m in air, 423.7 V/m in the dielectric
}
