package grid_test

import (
	"fmt"

	"github.com/phigrid/phigrid/grid"
)

func Example() {
	r, _ := grid.Uniform(0, 0.01, 11) // radius 0 to 10 mm
	z, _ := grid.Uniform(0, 0.02, 21) // height 20 mm
	g, _ := grid.New(r, z, grid.Axisymmetric)
	lo, hi := g.MinMaxStep()
	fmt.Println(g.Nx(), g.Ny(), g.Len(), g.Metric())
	fmt.Printf("steps %.3g..%.3g m\n", lo, hi)
	// Output:
	// 11 21 231 axisymmetric
	// steps 0.001..0.001 m
}
