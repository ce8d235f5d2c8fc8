package archive_test

import (
	"bytes"
	"context"
	"fmt"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/field"
	"github.com/phigrid/phigrid/grid"
	"github.com/phigrid/phigrid/io/archive"
)

// Archive a solved coaxial quarter, read it back and evaluate it again
// without solving: the charges come out bit for bit the same.
func Example() {
	p := &bc.Problem{
		Domain:     bc.Rect{X0: 0, Y0: 0, X1: 3.15e-3, Y1: 3.15e-3},
		Conductors: []bc.Conductor{{Name: "inner", Potential: 1}, {Name: "outer"}},
		Regions: []bc.Region{
			{Name: "shield", Kind: bc.ConductorRegion, Conductor: "outer", Shape: bc.Annulus{R0: 3e-3, R1: 5e-3}},
			{Name: "centre", Kind: bc.ConductorRegion, Conductor: "inner", Shape: bc.Circle{R: 1e-3}},
		},
	}
	x, _ := grid.Uniform(0, 3.15e-3, 43)
	g, _ := grid.New(x, x, grid.Planar)
	sol, err := field.Solve(context.Background(), p, g, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	a := archive.FromSolution(sol)
	a.Problem = p
	a.ModelName = "coax.toml"
	a.Unit = archive.Unit{Name: "mm", Scale: 1e-3}

	var file bytes.Buffer // or archive.Save("coax.pga", a)
	if err := archive.Write(&file, a); err != nil {
		fmt.Println(err)
		return
	}
	b, err := archive.Read(&file) // or archive.Load("coax.pga")
	if err != nil {
		fmt.Println(err)
		return
	}
	again, err := b.Solution()
	if err != nil {
		fmt.Println(err)
		return
	}
	q0, q1 := sol.Charges(), again.Charges()
	fmt.Println("format", b.Version, "model", b.ModelName, "with", len(b.Problem.Regions), "regions")
	fmt.Println("same charges:", q0[0] == q1[0] && q0[1] == q1[1])
	fmt.Printf("C' = %.4g pF/m (a quarter of 2πε0/ln 3)\n", q1[0]*1e12)
	// Output:
	// format 1.0 model coax.toml with 2 regions
	// same charges: true
	// C' = 12.66 pF/m (a quarter of 2πε0/ln 3)
}
