package bc_test

import (
	"fmt"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
)

// A wire over a ground plane, rasterised onto a uniform grid.
func Example() {
	p := &bc.Problem{
		Domain:     bc.Rect{X0: -0.01, Y0: 0, X1: 0.01, Y1: 0.01},
		Conductors: []bc.Conductor{{Name: "wire", Potential: 100}, {Name: "ground"}},
		Regions: []bc.Region{
			{Kind: bc.ConductorRegion, Conductor: "wire", Shape: bc.Circle{X: 0, Y: 0.005, R: 0.001}},
		},
	}
	p.Sides[bc.Bottom] = bc.Side{Kind: bc.Fixed, Conductor: "ground"}
	x, _ := grid.Uniform(-0.01, 0.01, 41)
	y, _ := grid.Uniform(0, 0.01, 21)
	g, _ := grid.New(x, y, grid.Planar)
	m, err := bc.Rasterize(p, g, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("nodes:", g.Len(), "free:", m.FreeNodes())
	fmt.Println("wire nodes:", len(m.ConductorNodes(0)), "ground nodes:", len(m.ConductorNodes(1)))
	// Output:
	// nodes: 861 free: 807
	// wire nodes: 13 ground nodes: 41
}
