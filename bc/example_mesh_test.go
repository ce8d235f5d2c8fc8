package bc_test

import (
	"fmt"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
)

// An isolated sphere in open space, in r–z: the open sides are moved ten
// times farther out and AutoGrid fills the far region with growing cells.
func ExampleExtendOpen() {
	p := &bc.Problem{
		Metric:     grid.Axisymmetric,
		Domain:     bc.Rect{X0: 0, Y0: -0.03, X1: 0.03, Y1: 0.03},
		Conductors: []bc.Conductor{{Name: "sphere", Potential: 1}},
		Regions:    []bc.Region{{Kind: bc.ConductorRegion, Conductor: "sphere", Shape: bc.Circle{R: 0.01}}},
	}
	for _, s := range []int{bc.Right, bc.Bottom, bc.Top} {
		p.Sides[s] = bc.Side{Kind: bc.Open}
	}
	far, err := bc.ExtendOpen(p, 10)
	if err != nil {
		fmt.Println(err)
		return
	}
	g, err := bc.AutoGrid(far, bc.Mesh{Cell: 1e-3})
	if err != nil {
		fmt.Println(err)
		return
	}
	_, hmax := g.MinMaxStep()
	fmt.Printf("domain r ≤ %.2f m, |z| ≤ %.2f m\n", far.Domain.X1, far.Domain.Y1)
	fmt.Printf("%d × %d nodes, largest cell %.0f mm\n", g.Nx(), g.Ny(), hmax*1e3)
	// Output:
	// domain r ≤ 0.30 m, |z| ≤ 0.30 m
	// 105 × 205 nodes, largest cell 4 mm
}
