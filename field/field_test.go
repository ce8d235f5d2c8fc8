package field

import (
	"context"
	"math"
	"testing"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
	"github.com/phigrid/phigrid/solve"
)

const eps0 = solve.Eps0

func mustGrid(t testing.TB, x, y []float64, m grid.Metric) *grid.Grid {
	t.Helper()
	g, err := grid.New(x, y, m)
	if err != nil {
		t.Fatal(err)
	}
	return g
}

func uniform(t testing.TB, lo, hi float64, n int) []float64 {
	t.Helper()
	a, err := grid.Uniform(lo, hi, n)
	if err != nil {
		t.Fatal(err)
	}
	return a
}

func mustSolve(t testing.TB, p *bc.Problem, g *grid.Grid, set *Settings) *Solution {
	t.Helper()
	if set == nil {
		set = &Settings{Solver: solve.Settings{Tol: 1e-12}}
	}
	sol, err := Solve(context.Background(), p, g, set)
	if err != nil {
		t.Fatal(err)
	}
	return sol
}

func relErr(got, want float64) float64 { return math.Abs(got/want - 1) }

// plates returns a parallel-plate problem: top at 1 V, bottom at 0 V,
// zero-flux sides, optional layers given as (thickness from the bottom,
// ε_r) pairs.
func plates(w, d float64, layers [][2]float64) *bc.Problem {
	p := &bc.Problem{
		Domain:     bc.Rect{X0: 0, Y0: 0, X1: w, Y1: d},
		Conductors: []bc.Conductor{{Name: "hv", Potential: 1}, {Name: "gnd"}},
	}
	p.Sides[bc.Top] = bc.Side{Kind: bc.Fixed, Conductor: "hv"}
	p.Sides[bc.Bottom] = bc.Side{Kind: bc.Fixed, Conductor: "gnd"}
	y := 0.0
	for _, l := range layers {
		p.Regions = append(p.Regions, bc.Region{Kind: bc.Dielectric, Shape: bc.Rect{X0: 0, Y0: y, X1: w, Y1: y + l[0]}, EpsR: l[1]})
		y += l[0]
	}
	return p
}

func TestParallelPlates(t *testing.T) {
	for _, c := range []struct {
		name  string
		epsR  float64
		wantC float64 // F/m
	}{
		// source: Griffiths, Introduction to Electrodynamics, Gauss's law: C' = ε0 εr w/d
		{"air", 1, 88.541878e-12},
		{"fr4", 4.4, 389.58426e-12},
	} {
		t.Run(c.name, func(t *testing.T) {
			p := plates(0.01, 0.001, [][2]float64{{0.001, c.epsR}})
			g := mustGrid(t, uniform(t, 0, 0.01, 21), uniform(t, 0, 0.001, 11), grid.Planar)
			sol := mustSolve(t, p, g, nil)
			cm, _, err := CapacitanceMatrix(context.Background(), sol.Sys, &solve.Settings{Tol: 1e-12})
			if err != nil {
				t.Fatal(err)
			}
			if e := relErr(cm[0][0], c.wantC); e > 1e-7 {
				t.Errorf("C' = %.9g, want %.9g (rel err %.2g)", cm[0][0], c.wantC, e)
			}
			c2, err := TwoTerminal(cm, 0, 1)
			if err != nil || relErr(c2, c.wantC) > 1e-7 {
				t.Errorf("two-terminal C' = %.9g (%v), want %.9g", c2, err, c.wantC)
			}
			ex, ey := sol.NodeFieldTo(nil, nil)
			for n := range ex {
				if sol.Map.Kind[n] != bc.Free {
					continue
				}
				// source: Griffiths, Introduction to Electrodynamics: E = V/d = 1000 V/m
				if math.Abs(ex[n]) > 1e-6 || math.Abs(-ey[n]-1000) > 1e-6 {
					t.Fatalf("node %d: E = (%g, %g), want (0, -1000)", n, ex[n], ey[n])
				}
			}
			// source: Griffiths, Introduction to Electrodynamics: W' = C'V²/2 (44.270939 pJ/m for air)
			if e := relErr(sol.Energy(), 0.5*c.wantC); e > 1e-7 {
				t.Errorf("W' = %g, want %g", sol.Energy(), 0.5*c.wantC)
			}
		})
	}
}

func TestSeriesLayers(t *testing.T) {
	// 0.6 mm of εr = 4.4 on the 0 V plate, 0.4 mm of air below the 1 V plate.
	p := plates(0.01, 0.001, [][2]float64{{0.0006, 4.4}, {0.0004, 1}})
	g := mustGrid(t, uniform(t, 0, 0.01, 11), uniform(t, 0, 0.001, 51), grid.Planar)
	sol := mustSolve(t, p, g, nil)
	q := sol.Charges()
	// source: series capacitors, D_n continuous (Griffiths, Introduction to Electrodynamics): C' = ε0 w/(d1/εr1 + d2/εr2)
	if e := relErr(q[0], 165.07808e-12); e > 1e-7 {
		t.Errorf("C' = %.9g, want 165.07808 pF/m", q[0])
	}
	phi, _ := sol.PotentialAt(0.005, 0.0006)
	// source: same series-layer closed form: interface potential
	if math.Abs(phi-0.25423729) > 1e-8 {
		t.Errorf("interface potential %.9g, want 0.25423729", phi)
	}
	_, eyAir, _ := sol.FieldAt(0.005, 0.0008)
	_, eyDiel, _ := sol.FieldAt(0.005, 0.0003)
	// source: same series-layer closed form: E_air = 1864.4068, E_diel = 423.72881 V/m
	if relErr(-eyAir, 1864.4068) > 1e-6 || relErr(-eyDiel, 423.72881) > 1e-6 {
		t.Errorf("fields %g (air), %g (dielectric), want 1864.4068 and 423.72881", -eyAir, -eyDiel)
	}
}

// coaxQuarter is a quarter of a coaxial line (symmetry planes x = 0 and
// y = 0), inner radius a at 1 V, outer radius b at 0 V.
func coaxQuarter(a, b, epsR float64) *bc.Problem {
	L := b * 1.05
	p := &bc.Problem{
		Domain:     bc.Rect{X0: 0, Y0: 0, X1: L, Y1: L},
		Conductors: []bc.Conductor{{Name: "inner", Potential: 1}, {Name: "outer"}},
		Regions: []bc.Region{
			{Kind: bc.Dielectric, Shape: bc.Circle{R: b}, EpsR: epsR},
			{Kind: bc.ConductorRegion, Conductor: "outer", Shape: bc.Annulus{R0: b, R1: 2 * L}},
			{Kind: bc.ConductorRegion, Conductor: "inner", Shape: bc.Circle{R: a}},
		},
	}
	return p
}

// TestCoaxConvergence checks C' = 2πε/ln(b/a) and the inner surface field
// V/(a ln(b/a)) as h halves and asserts the observed order of the
// capacitance error.
func TestCoaxConvergence(t *testing.T) {
	const a, b = 1e-3, 3e-3
	// source: Ramo, Whinnery & Van Duzer, Fields and Waves in Communication Electronics, 1994: C' = 2πε0/ln(b/a)
	wantC := 50.638886e-12
	// source: Ramo, Whinnery & Van Duzer, 1994: E(a) = V/(a ln(b/a))
	wantEa := 910.23923
	sizes := []int{41, 81, 161}
	if !testing.Short() {
		sizes = append(sizes, 321)
	}
	var errs []float64
	t.Logf("%6s %12s %10s %12s %10s", "nodes", "C' pF/m", "rel err", "E(a) V/m", "rel err")
	for _, n := range sizes {
		p := coaxQuarter(a, b, 1)
		L := p.Domain.X1
		g := mustGrid(t, uniform(t, 0, L, n), uniform(t, 0, L, n), grid.Planar)
		sol := mustSolve(t, p, g, nil)
		c := 4 * sol.Charges()[0]
		// Mean normal field on the inner surface from Gauss's law.
		ea := c / (eps0 * 2 * math.Pi * a)
		ec := relErr(c, wantC)
		t.Logf("%6d %12.6f %10.2e %12.4f %10.2e", n, c*1e12, ec, ea, relErr(ea, wantEa))
		errs = append(errs, ec)
	}
	for i := 1; i < len(errs); i++ {
		order := math.Log2(errs[i-1] / errs[i])
		t.Logf("observed order %d→%d: %.2f", sizes[i-1], sizes[i], order)
	}
	// The errors oscillate with how the circles meet the grid, so the order
	// is judged over the whole ladder.
	order := math.Log2(errs[0]/errs[len(errs)-1]) / float64(len(errs)-1)
	if order < 1.5 {
		t.Errorf("observed order %.2f over the ladder, want ≥ 1.5 (second order with cut links)", order)
	}
	if errs[len(errs)-1] > 1e-3 {
		t.Errorf("finest error %.2e, want < 1e-3", errs[len(errs)-1])
	}
}

// TestConcentricSpheres solves the r–z half-plane: inner sphere a at 1 V,
// outer sphere b grounded.
func TestConcentricSpheres(t *testing.T) {
	const a, b = 0.01, 0.02
	L := 1.05 * b
	p := &bc.Problem{
		Metric:     grid.Axisymmetric,
		Domain:     bc.Rect{X0: 0, Y0: -L, X1: L, Y1: L},
		Conductors: []bc.Conductor{{Name: "inner", Potential: 1}, {Name: "outer"}},
		Regions: []bc.Region{
			{Kind: bc.ConductorRegion, Conductor: "outer", Shape: bc.Annulus{R0: b, R1: 4 * L}},
			{Kind: bc.ConductorRegion, Conductor: "inner", Shape: bc.Circle{R: a}},
		},
	}
	// source: Jackson, Classical Electrodynamics, 3rd ed., 1999: C = 4πε0 ab/(b−a)
	want := 2.2253001e-12
	var errs []float64
	for _, n := range []int{41, 81, 161} {
		g := mustGrid(t, uniform(t, 0, L, n), uniform(t, -L, L, 2*n-1), grid.Axisymmetric)
		sol := mustSolve(t, p, g, nil)
		c := sol.Charges()[0]
		errs = append(errs, relErr(c, want))
		t.Logf("%4d nodes/radius: C = %.8g pF, rel err %.2e", n, c*1e12, errs[len(errs)-1])
	}
	order := math.Log2(errs[0]/errs[2]) / 2
	t.Logf("observed order %.2f", order)
	if errs[2] > 5e-5 || order < 1.5 {
		t.Errorf("errors %v: want order ≥ 1.5 and the finest below 5e-5", errs)
	}
}

// TestChargedCylinder: a uniformly charged rod inside a grounded shell
// (Poisson), solved as a quarter with symmetry planes.
func TestChargedCylinder(t *testing.T) {
	const a, R, rho = 0.01, 0.05, 1e-6
	L := 1.05 * R
	p := &bc.Problem{
		Domain:     bc.Rect{X0: 0, Y0: 0, X1: L, Y1: L},
		Conductors: []bc.Conductor{{Name: "shell"}},
		Regions: []bc.Region{
			{Kind: bc.ConductorRegion, Conductor: "shell", Shape: bc.Annulus{R0: R, R1: 4 * L}},
			{Kind: bc.Charge, Shape: bc.Circle{R: a}, Rho: rho},
		},
	}
	g := mustGrid(t, uniform(t, 0, L, 211), uniform(t, 0, L, 211), grid.Planar)
	sol := mustSolve(t, p, g, nil)
	for _, c := range []struct {
		r, want float64
		tol     float64
	}{
		// source: Gauss's law (any textbook, e.g. Griffiths): φ(0), φ(5 mm), φ(a)
		{0, 11.912092, 2e-3},
		{0.005, 11.206211, 2e-3},
		{a, 9.0885689, 3e-3},
		// φ(30 mm) = (ρa²/2ε0)·ln(R/r), common practice (Gauss's law)
		{0.03, rho * a * a / (2 * eps0) * math.Log(R/0.03), 3e-3},
	} {
		got, _ := sol.PotentialAt(c.r/math.Sqrt2, c.r/math.Sqrt2)
		if relErr(got, c.want) > c.tol {
			t.Errorf("φ(%g) = %.8g, want %.8g", c.r, got, c.want)
		}
	}
	// The shell carries the opposite of the rod's charge πa²ρ (quarter).
	q := sol.Charges()[0]
	wantQ := -math.Pi * a * a * rho / 4 // common practice: Gauss's law
	if relErr(q, wantQ) > 1e-3 {
		t.Errorf("shell charge %g, want %g", q, wantQ)
	}
}

// TestSquareSeries checks the P03 box values: top at 1 V (Laplace) and a
// uniformly charged grounded box (Poisson).
func TestSquareSeries(t *testing.T) {
	const L = 0.01
	n := 161
	g := mustGrid(t, uniform(t, 0, L, n), uniform(t, 0, L, n), grid.Planar)
	lap := &bc.Problem{Domain: bc.Rect{X1: L, Y1: L}}
	lap.Sides[bc.Top] = bc.Side{Kind: bc.Fixed, Potential: 1}
	for _, s := range []int{bc.Left, bc.Right, bc.Bottom} {
		lap.Sides[s] = bc.Side{Kind: bc.Fixed}
	}
	sol := mustSolve(t, lap, g, nil)
	for _, c := range []struct{ x, y, want, tol float64 }{
		// source: separation of variables, Jackson, Classical Electrodynamics, 3rd ed., ch. 2 (from memory), series summed
		{0.5, 0.5, 0.25, 1e-5},
		{0.5, 0.75, 0.54052922, 1e-4},
		{0.25, 0.25, 0.067971668, 1e-4},
		{0.5, 0.25, 0.095414118, 1e-4},
	} {
		got, _ := sol.PotentialAt(c.x*L, c.y*L)
		if relErr(got, c.want) > c.tol {
			t.Errorf("Laplace φ(%gL, %gL) = %.9g, want %.9g", c.x, c.y, got, c.want)
		}
	}
	pois := &bc.Problem{
		Domain:  bc.Rect{X1: L, Y1: L},
		Regions: []bc.Region{{Kind: bc.Charge, Shape: bc.Rect{X1: L, Y1: L}, Rho: 1e-6}},
	}
	for s := range pois.Sides {
		pois.Sides[s] = bc.Side{Kind: bc.Fixed}
	}
	sol = mustSolve(t, pois, g, nil)
	scale := 1e-6 * L * L / eps0
	for _, c := range []struct{ x, y, u float64 }{
		// source: Prandtl torsion function series, Timoshenko & Goodier, Theory of Elasticity, 1970 (from memory), series summed
		{0.5, 0.5, 0.073671353},
		{0.25, 0.5, 0.057334906},
	} {
		got, _ := sol.PotentialAt(c.x*L, c.y*L)
		if relErr(got, c.u*scale) > 1e-4 {
			t.Errorf("Poisson φ(%gL, %gL) = %.9g, want %.9g", c.x, c.y, got, c.u*scale)
		}
	}
	// source: same series, W' = ½∫ρφ = 19.846119 pJ/m
	if e := relErr(sol.Energy(), 19.846119e-12); e > 2e-4 {
		t.Errorf("W' = %.8g, want 19.846119 pJ/m (rel err %.2g)", sol.Energy(), e)
	}
}
