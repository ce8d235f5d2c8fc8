package solve

import (
	"context"
	"math"
	"testing"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
)

// mgCase builds one test system.
type mgCase struct {
	name  string
	build func(t testing.TB, n int) *System
}

func buildSystem(t testing.TB, p *bc.Problem, x, y []float64) *System {
	t.Helper()
	g, err := grid.New(x, y, p.Metric)
	if err != nil {
		t.Fatal(err)
	}
	m, err := bc.Rasterize(p, g, nil)
	if err != nil {
		t.Fatal(err)
	}
	s, err := Assemble(m)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

func allFixed(p *bc.Problem) {
	for s := range p.Sides {
		p.Sides[s] = bc.Side{Kind: bc.Fixed}
	}
}

// mgSquare is −Δφ = 1 on the unit square, φ = 0 on every side.
func mgSquare(t testing.TB, n int) *System {
	p := &bc.Problem{
		Domain:  bc.Rect{X1: 1, Y1: 1},
		Regions: []bc.Region{{Kind: bc.Charge, Shape: bc.Rect{X1: 1, Y1: 1}, Rho: Eps0}},
	}
	allFixed(p)
	x, _ := grid.Uniform(0, 1, n)
	return buildSystem(t, p, x, x)
}

// mgConductor has a round electrode at 1 V and a plate at −1 V inside a
// grounded box with a zero-flux left side.
func mgConductor(t testing.TB, n int) *System {
	p := &bc.Problem{
		Domain:     bc.Rect{X1: 1, Y1: 1},
		Conductors: []bc.Conductor{{Name: "a", Potential: 1}, {Name: "b", Potential: -1}},
		Regions: []bc.Region{
			{Kind: bc.ConductorRegion, Conductor: "a", Shape: bc.Circle{X: 0.37, Y: 0.41, R: 0.13}},
			{Kind: bc.ConductorRegion, Conductor: "b", Shape: bc.Rect{X0: 0.62, Y0: 0.2, X1: 0.66, Y1: 0.83}},
		},
	}
	allFixed(p)
	p.Sides[bc.Left] = bc.Side{Kind: bc.ZeroFlux}
	x, _ := grid.Uniform(0, 1, n)
	return buildSystem(t, p, x, x)
}

// mgJump has a 1000:1 permittivity jump across an off-grid interface and an
// electrode straddling it.
func mgJump(t testing.TB, n int) *System {
	p := &bc.Problem{
		Domain:     bc.Rect{X1: 1, Y1: 1},
		Conductors: []bc.Conductor{{Name: "a", Potential: 1}},
		Regions: []bc.Region{
			{Kind: bc.Dielectric, Shape: bc.Rect{X0: 0.213, Y0: 0.117, X1: 0.711, Y1: 0.633}, EpsR: 1000},
			{Kind: bc.Dielectric, Shape: bc.Circle{X: 0.3, Y: 0.75, R: 0.1}, EpsR: 1000},
			{Kind: bc.ConductorRegion, Conductor: "a", Shape: bc.Rect{X0: 0.45, Y0: 0.5, X1: 0.55, Y1: 0.8}},
		},
	}
	allFixed(p)
	p.Sides[bc.Bottom] = bc.Side{Kind: bc.ZeroFlux}
	x, _ := grid.Uniform(0, 1, n)
	return buildSystem(t, p, x, x)
}

// mgAxi is an axisymmetric electrode on the axis in a grounded can with a
// dielectric disc and a space charge.
func mgAxi(t testing.TB, n int) *System {
	p := &bc.Problem{
		Metric:     grid.Axisymmetric,
		Domain:     bc.Rect{X1: 0.05, Y1: 0.1},
		Conductors: []bc.Conductor{{Name: "hv", Potential: 1000}, {Name: "can"}},
		Regions: []bc.Region{
			{Kind: bc.Dielectric, Shape: bc.Rect{X1: 0.031, Y0: 0.021, Y1: 0.034}, EpsR: 4},
			{Kind: bc.ConductorRegion, Conductor: "hv", Shape: bc.Circle{Y: 0.06, R: 0.011}},
			{Kind: bc.Charge, Shape: bc.Rect{X0: 0.01, Y0: 0.08, X1: 0.02, Y1: 0.09}, Rho: 1e-5},
		},
	}
	p.Sides[bc.Right] = bc.Side{Kind: bc.Fixed, Conductor: "can"}
	p.Sides[bc.Top] = bc.Side{Kind: bc.Fixed, Conductor: "can"}
	p.Sides[bc.Bottom] = bc.Side{Kind: bc.Fixed, Conductor: "can"}
	x, _ := grid.Uniform(0, 0.05, n)
	y, _ := grid.Uniform(0, 0.1, 2*n-1)
	return buildSystem(t, p, x, y)
}

// mgGraded has a graded X axis whose finest cells are 50 times narrower
// than they are tall, next to a thin electrode.
func mgGraded(t testing.TB, n int) *System {
	p := &bc.Problem{
		Domain:     bc.Rect{X1: 1, Y1: 1},
		Conductors: []bc.Conductor{{Name: "a", Potential: 1}},
		Regions: []bc.Region{
			{Kind: bc.Dielectric, Shape: bc.Rect{X0: 0.5, Y0: 0, X1: 1, Y1: 0.5}, EpsR: 3},
			{Kind: bc.ConductorRegion, Conductor: "a", Shape: bc.Rect{X0: 0.499, Y0: 0.3, X1: 0.501, Y1: 0.7}},
		},
	}
	allFixed(p)
	h := 1 / float64(n-1)
	x, err := grid.Graded(0, 1, grid.Grading{Focus: []float64{0.499, 0.501}, Fine: h / 50, Max: h, Ratio: 1.2})
	if err != nil {
		t.Fatal(err)
	}
	y, _ := grid.Uniform(0, 1, n)
	return buildSystem(t, p, x, y)
}

var mgCases = []mgCase{
	{"square", mgSquare},
	{"conductor", mgConductor},
	{"jump", mgJump},
	{"axisymmetric", mgAxi},
	{"graded", mgGraded},
}

func TestMGDebug(t *testing.T) {
	for _, c := range mgCases {
		for _, n := range []int{33, 65, 129, 257} {
			s := c.build(t, n)
			b := s.RHS(nil, []float64{1, -1}[:s.Conductors()], true, true)
			for _, m := range []Method{MGCG, CG} {
				x := make([]float64, s.Len())
				r, err := Solve(context.Background(), s, b, x, &Settings{Method: m, Tol: 1e-8})
				t.Logf("%s %dx%d %v: it %d res %.2g setup %v solve %v err %v", c.name, s.Nx, s.Ny, m, r.Iterations, r.Residual, r.Setup, r.Elapsed, err)
			}
			mg, _ := NewMultigrid(s, &Settings{Tol: 1e-8})
			x := make([]float64, s.Len())
			r, err := mg.Solve(context.Background(), b, x)
			t.Logf("   standalone: it %d res %.2g err %v levels %v", r.Iterations, r.Residual, err, len(mg.Levels()))
			mg.Close()
			_ = math.Abs
		}
	}
}

func TestMGLevelsDebug(t *testing.T) {
	for _, c := range mgCases {
		s := c.build(t, 129)
		mg, _ := NewMultigrid(s, nil)
		t.Logf("%s: %v", c.name, mg.Levels())
		mg.Close()
	}
}
