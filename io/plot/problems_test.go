package plot

import (
	"context"
	"flag"
	"testing"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/field"
	"github.com/phigrid/phigrid/grid"
	"github.com/phigrid/phigrid/solve"
)

// pictures, when set, names a directory where the tests leave every
// picture they draw, for a person to look at.
var pictures = flag.String("pictures", "", "write the test pictures to this directory")

func mustGrid(t testing.TB, x0, x1 float64, nx int, y0, y1 float64, ny int, m grid.Metric) *grid.Grid {
	t.Helper()
	x, err := grid.Uniform(x0, x1, nx)
	if err != nil {
		t.Fatal(err)
	}
	y, err := grid.Uniform(y0, y1, ny)
	if err != nil {
		t.Fatal(err)
	}
	g, err := grid.New(x, y, m)
	if err != nil {
		t.Fatal(err)
	}
	return g
}

func mustSolve(t testing.TB, p *bc.Problem, g *grid.Grid) *field.Solution {
	t.Helper()
	sol, err := field.Solve(context.Background(), p, g, &field.Settings{Solver: solve.Settings{Tol: 1e-10}})
	if err != nil {
		t.Fatal(err)
	}
	return sol
}

// coaxQuarter is a quarter of a coaxial line with symmetry planes x = 0
// and y = 0: inner radius a at v volts, outer radius b grounded.
func coaxQuarter(a, b, v float64) *bc.Problem {
	L := 1.05 * b
	return &bc.Problem{
		Domain:     bc.Rect{X0: 0, Y0: 0, X1: L, Y1: L},
		Conductors: []bc.Conductor{{Name: "inner", Potential: v}, {Name: "outer"}},
		Regions: []bc.Region{
			{Kind: bc.ConductorRegion, Conductor: "outer", Shape: bc.Annulus{R0: b, R1: 2 * L}},
			{Kind: bc.ConductorRegion, Conductor: "inner", Shape: bc.Circle{R: a}},
		},
	}
}

func solvedCoax(t testing.TB) (*field.Solution, *bc.Problem) {
	p := coaxQuarter(1e-3, 3e-3, 1000)
	L := p.Domain.X1
	return mustSolve(t, p, mustGrid(t, 0, L, 81, 0, L, 81, grid.Planar)), p
}

// sphere is a charged sphere of radius a at v volts inside a grounded
// spherical shell of radius b, in the r–z half-plane.
func sphere(a, b, v float64) *bc.Problem {
	L := 1.05 * b
	return &bc.Problem{
		Metric:     grid.Axisymmetric,
		Domain:     bc.Rect{X0: 0, Y0: -L, X1: L, Y1: L},
		Conductors: []bc.Conductor{{Name: "sphere", Potential: v}, {Name: "shell"}},
		Regions: []bc.Region{
			{Kind: bc.ConductorRegion, Conductor: "shell", Shape: bc.Annulus{R0: b, R1: 4 * L}},
			{Kind: bc.ConductorRegion, Conductor: "sphere", Shape: bc.Circle{R: a}},
		},
	}
}

func solvedSphere(t testing.TB) (*field.Solution, *bc.Problem) {
	p := sphere(0.01, 0.03, 20e3)
	L := p.Domain.X1
	return mustSolve(t, p, mustGrid(t, 0, L, 61, -L, L, 121, grid.Axisymmetric)), p
}

// plates is a parallel-plate gap: the top side is conductor "hv" at v
// volts, the bottom side "gnd", the other sides symmetry planes.
func plates(w, d, v float64) *bc.Problem {
	p := &bc.Problem{
		Domain:     bc.Rect{X0: 0, Y0: 0, X1: w, Y1: d},
		Conductors: []bc.Conductor{{Name: "hv", Potential: v}, {Name: "gnd"}},
	}
	p.Sides[bc.Top] = bc.Side{Kind: bc.Fixed, Conductor: "hv"}
	p.Sides[bc.Bottom] = bc.Side{Kind: bc.Fixed, Conductor: "gnd"}
	return p
}

// trace is a board trace on a substrate over a ground plane inside a
// grounded box, on a graded grid: a picture with a dielectric interface,
// a thin strip and sharp edges.
func trace(t testing.TB) (*field.Solution, *bc.Problem) {
	p := &bc.Problem{
		Domain:     bc.Rect{X0: -5e-3, Y0: 0, X1: 5e-3, Y1: 4e-3},
		Conductors: []bc.Conductor{{Name: "trace", Potential: 5}, {Name: "ground"}},
		Regions: []bc.Region{
			{Name: "FR-4", Kind: bc.Dielectric, Shape: bc.Rect{X0: -5e-3, Y0: 0, X1: 5e-3, Y1: 1.6e-3}, EpsR: 4.4},
			{Kind: bc.ConductorRegion, Conductor: "trace", Shape: bc.Rect{X0: -1.5e-3, Y0: 1.6e-3, X1: 1.5e-3, Y1: 1.635e-3}},
		},
	}
	p.Sides[bc.Bottom] = bc.Side{Kind: bc.Fixed, Conductor: "ground"}
	p.Sides[bc.Top] = bc.Side{Kind: bc.Fixed, Conductor: "ground"}
	p.Sides[bc.Left] = bc.Side{Kind: bc.Fixed, Conductor: "ground"}
	p.Sides[bc.Right] = bc.Side{Kind: bc.Fixed, Conductor: "ground"}
	g, err := bc.AutoGrid(p, bc.Mesh{Cell: 0.1e-3, Refine: 4})
	if err != nil {
		t.Fatal(err)
	}
	return mustSolve(t, p, g), p
}

// electrode is an axisymmetric high-voltage electrode: a rounded rod on
// the axis with a grading ring, in a grounded can.
func electrode(t testing.TB) (*field.Solution, *bc.Problem) {
	p := &bc.Problem{
		Metric:     grid.Axisymmetric,
		Domain:     bc.Rect{X0: 0, Y0: 0, X1: 0.15, Y1: 0.25},
		Conductors: []bc.Conductor{{Name: "HV", Potential: 100e3}, {Name: "can"}},
		Regions: []bc.Region{
			{Kind: bc.ConductorRegion, Conductor: "HV", Shape: bc.Rect{X0: 0, Y0: 0.12, X1: 0.02, Y1: 0.25}},
			{Kind: bc.ConductorRegion, Conductor: "HV", Shape: bc.Circle{X: 0, Y: 0.12, R: 0.02}},
			{Kind: bc.ConductorRegion, Conductor: "HV", Shape: bc.Circle{X: 0.06, Y: 0.14, R: 0.01}},
			{Name: "epoxy", Kind: bc.Dielectric, Shape: bc.Polygon{X: []float64{0.02, 0.1, 0.1, 0.02}, Y: []float64{0.2, 0.2, 0.25, 0.25}}, EpsR: 4},
		},
	}
	p.Sides[bc.Right] = bc.Side{Kind: bc.Fixed, Conductor: "can"}
	p.Sides[bc.Bottom] = bc.Side{Kind: bc.Fixed, Conductor: "can"}
	g, err := bc.AutoGrid(p, bc.Mesh{Cell: 2.5e-3, Refine: 3})
	if err != nil {
		t.Fatal(err)
	}
	return mustSolve(t, p, g), p
}
