package plot_test

import (
	"bytes"
	"context"
	"fmt"
	"strings"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/field"
	"github.com/phigrid/phigrid/grid"
	"github.com/phigrid/phigrid/io/plot"
)

// A potential map of a rod at 10 kV between two grounded plates, drawn
// as SVG.
func Example() {
	p := &bc.Problem{
		Domain:     bc.Rect{X0: 0, Y0: 0, X1: 0.04, Y1: 0.02},
		Conductors: []bc.Conductor{{Name: "rod", Potential: 10e3}, {Name: "plates"}},
		Regions: []bc.Region{
			{Kind: bc.ConductorRegion, Conductor: "rod", Shape: bc.Circle{X: 0.02, Y: 0.01, R: 0.003}},
		},
	}
	p.Sides[bc.Bottom] = bc.Side{Kind: bc.Fixed, Conductor: "plates"}
	p.Sides[bc.Top] = bc.Side{Kind: bc.Fixed, Conductor: "plates"}
	x, _ := grid.Uniform(0, 0.04, 81)
	y, _ := grid.Uniform(0, 0.02, 41)
	g, _ := grid.New(x, y, grid.Planar)
	sol, err := field.Solve(context.Background(), p, g, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	var buf bytes.Buffer
	o := plot.Options{Kind: plot.Potential, Width: 600, Title: "Rod between plates", Unit: plot.Millimetre}
	if err := plot.Draw(&buf, "svg", sol, p, o); err != nil {
		fmt.Println(err)
		return
	}
	svg := buf.String()
	fmt.Println(strings.Contains(svg, "<svg"), strings.Contains(svg, "Rod between plates"), strings.Contains(svg, "equipotentials every 1 kV"))
	// Output:
	// true true true
}
