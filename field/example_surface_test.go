package field_test

import (
	"context"
	"fmt"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/field"
	"github.com/phigrid/phigrid/grid"
)

// A coaxial line solved on three grids, each with half the cell size of
// the one before: the capacitance with its observed order of convergence,
// the Richardson-extrapolated value and the error band.
func ExampleConverge() {
	const a, b = 1e-3, 3e-3
	p := &bc.Problem{
		Domain:     bc.Rect{X0: -3.2e-3, Y0: -3.2e-3, X1: 3.2e-3, Y1: 3.2e-3},
		Conductors: []bc.Conductor{{Name: "inner", Potential: 1}, {Name: "outer"}},
		Regions: []bc.Region{
			{Kind: bc.ConductorRegion, Conductor: "outer", Shape: bc.Annulus{R0: b, R1: 1}},
			{Kind: bc.ConductorRegion, Conductor: "inner", Shape: bc.Circle{R: a}},
		},
	}
	conv, err := field.Converge(context.Background(), p, bc.Mesh{Cell: 0.2e-3, Refine: 1}, 3, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	c, _ := conv.Find("C(inner,inner)")
	fmt.Printf("C' = %.3f pF/m ± %.2f %%, observed order %.1f\n", c.Finest()*1e12, 100*c.RelBand(), c.Observed)
	fmt.Printf("extrapolated C' = %.3f pF/m (closed form 50.639)\n", c.Extrapolated*1e12)
	e, _ := conv.Find("Esurf(inner)")
	fmt.Printf("peak field on the inner conductor %.1f V/m ± %.1f (closed form 910.2)\n", e.Finest(), e.Band)
	// Output:
	// C' = 50.635 pF/m ± 0.01 %, observed order 2.0
	// extrapolated C' = 50.639 pF/m (closed form 50.639)
	// peak field on the inner conductor 910.7 V/m ± 1.8 (closed form 910.2)
}

// The surface field of a grounded cylinder in a uniform field of 1 kV/m,
// with the exact potential prescribed on the box: the field peaks at 2 kV/m
// where the applied field meets the surface head on.
func ExampleSolution_SurfaceField() {
	const a, e0, L = 5e-3, 1000.0, 15e-3
	exact := func(x, y float64) float64 { return -e0 * x * (1 - a*a/(x*x+y*y)) }
	p := &bc.Problem{
		Domain:     bc.Rect{X0: -L, Y0: -L, X1: L, Y1: L},
		Conductors: []bc.Conductor{{Name: "cylinder"}},
		Regions:    []bc.Region{{Kind: bc.ConductorRegion, Conductor: "cylinder", Shape: bc.Circle{R: a}}},
	}
	for s := range p.Sides {
		p.Sides[s] = bc.Side{Kind: bc.Fixed, Func: exact}
	}
	x, _ := grid.Uniform(-L, L, 121)
	g, _ := grid.New(x, x, grid.Planar)
	sol, err := field.Solve(context.Background(), p, g, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	if err := sol.RefineSurface(context.Background(), nil); err != nil {
		fmt.Println(err)
		return
	}
	pts := sol.SurfaceField(0)
	var sigma float64
	for _, q := range pts {
		sigma = max(sigma, abs(q.Sigma))
	}
	pk := sol.PeakSurfaceField(0)
	fmt.Printf("%d surface points\n", len(pts))
	fmt.Printf("peak %.0f V/m at |x| = %.1f mm, y = %.1f mm on the %s\n", pk.Value, 1e3*abs(pk.X), 1e3*pk.Y, pk.Where)
	fmt.Printf("largest surface charge density %.1f nC/m²\n", 1e9*sigma)
	// Output:
	// 116 surface points
	// peak 2000 V/m at |x| = 5.0 mm, y = 0.0 mm on the cylinder
	// largest surface charge density 17.7 nC/m²
}

func abs(v float64) float64 {
	if v < 0 {
		return -v
	}
	return v
}
