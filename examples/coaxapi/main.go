// Command coaxapi solves a coaxial line cross-section through the Go API
// and prints its capacitance per metre and its fields next to the
// closed-form values.
//
//	go run ./examples/coaxapi
package main

import (
	"context"
	"fmt"
	"io"
	"math"
	"os"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/field"
	"github.com/phigrid/phigrid/grid"
	"github.com/phigrid/phigrid/solve"
)

func main() {
	if err := run(os.Stdout, 161); err != nil {
		fmt.Fprintln(os.Stderr, "coaxapi:", err)
		os.Exit(1)
	}
}

// Coax returns the problem: inner conductor of radius a at v volts, outer
// conductor of inner radius b grounded, filled with a dielectric of
// relative permittivity epsR. Only the quarter x, y ≥ 0 is modelled; the
// planes x = 0 and y = 0 are symmetry planes (zero normal flux).
func Coax(a, b, v, epsR float64) *bc.Problem {
	L := 1.1 * b
	return &bc.Problem{
		Domain:     bc.Rect{X0: 0, Y0: 0, X1: L, Y1: L},
		Conductors: []bc.Conductor{{Name: "inner", Potential: v}, {Name: "outer"}},
		Regions: []bc.Region{
			{Name: "filler", Kind: bc.Dielectric, Shape: bc.Circle{R: b}, EpsR: epsR},
			{Kind: bc.ConductorRegion, Conductor: "outer", Shape: bc.Annulus{R0: b, R1: 2 * L}},
			{Kind: bc.ConductorRegion, Conductor: "inner", Shape: bc.Circle{R: a}},
		},
	}
}

// run solves the coax on an n × n grid and writes the comparison to w.
func run(w io.Writer, n int) error {
	const a, b, v, epsR = 1e-3, 3e-3, 1.0, 2.1 // metres, volts; PTFE filler
	p := Coax(a, b, v, epsR)
	x, err := grid.Uniform(0, p.Domain.X1, n)
	if err != nil {
		return err
	}
	g, err := grid.New(x, x, grid.Planar)
	if err != nil {
		return err
	}
	sol, err := field.Solve(context.Background(), p, g, &field.Settings{Solver: solve.Settings{Tol: 1e-12}})
	if err != nil {
		return err
	}
	lnba := math.Log(b / a)
	// Closed forms: C' = 2πε/ln(b/a), E(r) = V/(r ln(b/a)),
	// φ(r) = V ln(b/r)/ln(b/a) (Ramo, Whinnery & Van Duzer).
	cExact := 2 * math.Pi * solve.Eps0 * epsR / lnba
	c := 4 * sol.Charges()[0] / v // four quarters
	r := 2e-3
	phi, _ := sol.PotentialAt(r/math.Sqrt2, r/math.Sqrt2)
	ex, ey, _ := sol.FieldAt(r/math.Sqrt2, r/math.Sqrt2)
	e := math.Hypot(ex, ey)
	energy := 4 * sol.Energy()
	fmt.Fprintf(w, "coaxial line a = %g mm, b = %g mm, εr = %g, %d × %d nodes (quarter)\n", a*1e3, b*1e3, epsR, n, n)
	fmt.Fprintf(w, "%-22s %16s %16s %10s\n", "quantity", "phigrid", "closed form", "rel. err")
	row := func(name string, got, want float64) {
		fmt.Fprintf(w, "%-22s %16.8g %16.8g %10.2e\n", name, got, want, got/want-1)
	}
	row("C' (pF/m)", c*1e12, cExact*1e12)
	row("W' (pJ/m)", energy*1e12, 0.5*cExact*v*v*1e12)
	row("φ(2 mm) (V)", phi, v*math.Log(b/r)/lnba)
	row("|E|(2 mm) (V/m)", e, v/(r*lnba))
	row("E(a) from Q (V/m)", c*v/(2*math.Pi*solve.Eps0*epsR*a), v/(a*lnba))
	fmt.Fprintln(w, "Electrostatic estimate: not a substitute for testing, the applicable standards and qualified review.")
	return nil
}
