package report_test

import (
	"bytes"
	"context"
	"fmt"
	"strings"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/field"
	"github.com/phigrid/phigrid/grid"
	"github.com/phigrid/phigrid/io/report"
	"github.com/phigrid/phigrid/solve"
)

// The report of a parallel-plate capacitor with an FR-4 layer: the figures
// per conductor and the header of the conductor table in CSV. A real
// program would print the whole report with WriteText or WriteJSON.
func Example() {
	p := &bc.Problem{
		Domain:     bc.Rect{X0: 0, Y0: 0, X1: 0.01, Y1: 0.001},
		Conductors: []bc.Conductor{{Name: "hv", Potential: 1}, {Name: "gnd"}},
		Regions: []bc.Region{
			{Name: "FR-4", Kind: bc.Dielectric, Shape: bc.Rect{X0: 0, Y0: 0, X1: 0.01, Y1: 0.0006}, EpsR: 4.4},
		},
	}
	p.Sides[bc.Top] = bc.Side{Kind: bc.Fixed, Conductor: "hv"}
	p.Sides[bc.Bottom] = bc.Side{Kind: bc.Fixed, Conductor: "gnd"}
	x, _ := grid.Uniform(0, 0.01, 11)
	y, _ := grid.Uniform(0, 0.001, 11)
	g, _ := grid.New(x, y, grid.Planar)
	set := solve.Settings{Tol: 1e-12}
	sol, err := field.Solve(context.Background(), p, g, &field.Settings{Solver: set})
	if err != nil {
		fmt.Println(err)
		return
	}
	c, _, err := field.CapacitanceMatrix(context.Background(), sol.Sys, &set)
	if err != nil {
		fmt.Println(err)
		return
	}
	r, err := report.Build(sol, c, report.BuildOptions{Title: "Plates", Unit: report.Unit{Name: "mm", Scale: 1e-3}})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, k := range r.Conductors {
		fmt.Printf("%s: Q' = %.5g pC/m, C' row = [%.5g %.5g] pF/m, peak |E| = %.5g V/m on y = %g %s\n",
			k.Name, k.Charge*1e12, k.Capacitance[0]*1e12, k.Capacitance[1]*1e12, k.PeakField.Field, k.PeakField.At.Y, r.Units.Length)
	}
	fmt.Printf("W' = %.5g pJ/m\n", r.Energy*1e12)
	fmt.Println("caution shown:", r.Caution == report.Caution)
	// The CSV table carries every number at full precision; its header:
	var buf bytes.Buffer
	if err := r.WriteConductorsCSV(&buf); err != nil {
		fmt.Println(err)
	}
	fmt.Print(strings.SplitAfter(buf.String(), "\n")[0])
	// Output:
	// hv: Q' = 165.08 pC/m, C' row = [165.08 -165.08] pF/m, peak |E| = 1864.4 V/m on y = 1 mm
	// gnd: Q' = -165.08 pC/m, C' row = [-165.08 165.08] pF/m, peak |E| = 423.73 V/m on y = 0 mm
	// W' = 82.539 pJ/m
	// caution shown: true
	// name,potential_V,floating,charge_C_per_m,C_hv_F_per_m,C_gnd_F_per_m,peak_field_V_per_m,x_mm,y_mm,x_m,y_m,sharp_edge
}
