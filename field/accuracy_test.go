package field

import (
	"context"
	"math"
	"testing"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
	"github.com/phigrid/phigrid/solve"
)

// solveMap assembles and solves a rasterised map; with arithmetic set it
// first drops the directional permittivities, so the assembly falls back to
// the plain cell mean.
func solveMap(t testing.TB, m *bc.Map, arithmetic bool) *Solution {
	t.Helper()
	if arithmetic {
		m.EpsX, m.EpsY = nil, nil
	}
	sys, err := solve.Assemble(m)
	if err != nil {
		t.Fatal(err)
	}
	s, err := solve.NewSolver(sys, &solve.Settings{Tol: 1e-12})
	if err != nil {
		t.Fatal(err)
	}
	defer s.Close()
	sol, err := SolveSystem(context.Background(), sys, s)
	if err != nil {
		t.Fatal(err)
	}
	return sol
}

func rasterize(t testing.TB, p *bc.Problem, g *grid.Grid) *bc.Map {
	t.Helper()
	m, err := bc.Rasterize(p, g, nil)
	if err != nil {
		t.Fatal(err)
	}
	return m
}

// TestIdentitiesWithCutsAndOpenSides checks that the discrete Gauss law
// keeps Q = C·V, the symmetry of C and W = ½VᵀCV to round-off when links
// are cut by curved conductors, dielectric interfaces cross cells and the
// sides are open.
func TestIdentitiesWithCutsAndOpenSides(t *testing.T) {
	for _, c := range []struct {
		name   string
		metric grid.Metric
	}{
		{"planar", grid.Planar},
		{"axisymmetric", grid.Axisymmetric},
	} {
		t.Run(c.name, func(t *testing.T) {
			x0 := -0.02
			if c.metric == grid.Axisymmetric {
				x0 = 0
			}
			p := &bc.Problem{
				Metric:     c.metric,
				Domain:     bc.Rect{X0: x0, Y0: -0.02, X1: 0.02, Y1: 0.02},
				Conductors: []bc.Conductor{{Name: "a", Potential: 1}, {Name: "b", Potential: -0.4}, {Name: "c", Potential: 0.3}},
				Regions: []bc.Region{
					{Name: "slab", Kind: bc.Dielectric, Shape: bc.Circle{X: 0.0031, Y: -0.0013, R: 0.0117}, EpsR: 3.7},
					{Kind: bc.ConductorRegion, Conductor: "a", Shape: bc.Circle{X: 0.0043, Y: 0.0051, R: 0.0029}},
					{Kind: bc.ConductorRegion, Conductor: "b", Shape: bc.Circle{X: 0.0117, Y: -0.0063, R: 0.0021}},
					{Kind: bc.ConductorRegion, Conductor: "c", Shape: bc.Polygon{X: []float64{0.001, 0.013, 0.009}, Y: []float64{-0.016, -0.015, -0.011}}},
				},
			}
			for _, s := range []int{bc.Right, bc.Bottom, bc.Top} {
				p.Sides[s] = bc.Side{Kind: bc.Open}
			}
			if c.metric == grid.Planar {
				p.Sides[bc.Left] = bc.Side{Kind: bc.Open}
			}
			g, err := bc.AutoGrid(p, bc.Mesh{Cell: 0.001})
			if err != nil {
				t.Fatal(err)
			}
			m := rasterize(t, p, g)
			if m.EpsX == nil {
				t.Fatal("the dielectric interface should give directional permittivities")
			}
			sys, err := solve.Assemble(m)
			if err != nil {
				t.Fatal(err)
			}
			if sys.Far == nil {
				t.Fatal("open sides should give far couplings")
			}
			set := &solve.Settings{Tol: 1e-13}
			cm, _, err := CapacitanceMatrix(context.Background(), sys, set)
			if err != nil {
				t.Fatal(err)
			}
			v := []float64{1, -0.4, 0.3}
			b := sys.RHS(nil, v, false, false)
			phi := make([]float64, sys.Len())
			if _, err := solve.Solve(context.Background(), sys, b, phi, set); err != nil {
				t.Fatal(err)
			}
			q := Charges(sys, phi, v)
			var vcv float64
			for i := range v {
				var cv float64
				for j := range v {
					cv += cm[i][j] * v[j]
					vcv += v[i] * cm[i][j] * v[j]
					// The Maxwell matrix is symmetric by construction.
					if d := math.Abs(cm[i][j]-cm[j][i]) / cm[i][i]; d > 1e-9 {
						t.Errorf("C[%d][%d] = %g but C[%d][%d] = %g", i, j, cm[i][j], j, i, cm[j][i])
					}
				}
				if d := math.Abs(q[i]-cv) / cm[i][i]; d > 1e-9 {
					t.Errorf("Q[%d] = %g, C·V = %g", i, q[i], cv)
				}
				// With open sides some flux goes to infinity: each row sum
				// is positive (the self-capacitance to infinity).
				var row float64
				for j := range v {
					row += cm[i][j]
				}
				if !(row > 0) {
					t.Errorf("row %d of C sums to %g, want > 0 with open sides", i, row)
				}
			}
			if w := Energy(sys, phi); math.Abs(0.5*vcv/w-1) > 1e-9 {
				t.Errorf("½VᵀCV = %.12g but the field energy is %.12g", 0.5*vcv, w)
			}
		})
	}
}

// TestDirectionalPermittivityExactForLayers: with an interface inside a
// row of cells, the harmonic mean along the flux makes series layers
// exact, and the arithmetic mean across it makes side-by-side layers
// exact; the plain cell mean gets the series case wrong.
func TestDirectionalPermittivityExactForLayers(t *testing.T) {
	const w, d = 0.01, 0.001
	for _, c := range []struct {
		name   string
		layers []bc.Region
		want   float64 // C' in F/m
	}{
		{
			// source: Griffiths, Introduction to Electrodynamics (D_n and E_t continuity) [case P02a], C' = ε0·w/(d1/εr1 + d2/εr2); 0.45 mm of εr = 4.4 on the
			// 0 V plate is off the grid lines (h = 0.1 mm)
			name:   "series",
			layers: []bc.Region{{Kind: bc.Dielectric, Shape: bc.Rect{X1: w, Y1: 0.00045}, EpsR: 4.4}},
			want:   eps0 * w / (0.00045/4.4 + 0.00055),
		},
		{
			// source: Griffiths, Introduction to Electrodynamics (D_n and E_t continuity) [case P02b], C' = ε0(εr1w1 + εr2w2)/d; 4.35 mm of air beside εr = 4.4
			name:   "side by side",
			layers: []bc.Region{{Kind: bc.Dielectric, Shape: bc.Rect{X0: 0.00435, X1: w, Y1: d}, EpsR: 4.4}},
			want:   eps0 * (0.00435 + 4.4*(w-0.00435)) / d,
		},
	} {
		t.Run(c.name, func(t *testing.T) {
			p := plates(w, d, nil)
			p.Regions = c.layers
			g := mustGrid(t, uniform(t, 0, w, 21), uniform(t, 0, d, 11), grid.Planar)
			dir := solveMap(t, rasterize(t, p, g), false).Charges()[0]
			arith := solveMap(t, rasterize(t, p, g), true).Charges()[0]
			t.Logf("C' = %.9g (directional), %.9g (cell mean), want %.9g", dir, arith, c.want)
			if e := relErr(dir, c.want); e > 1e-9 {
				t.Errorf("directional C' = %.12g, want %.12g (rel err %.2g)", dir, c.want, e)
			}
			if c.name == "series" && relErr(arith, c.want) < 1e-3 {
				t.Errorf("the cell mean should miss the series case, got rel err %.2g", relErr(arith, c.want))
			}
		})
	}
}

// TestDirectionalPermittivityBeatsCellMean compares the directional
// averaging with the plain cell mean on curved interfaces that do not
// follow the grid.
func TestDirectionalPermittivityBeatsCellMean(t *testing.T) {
	const mm = 1e-3
	// Two-layer coax: εr = 4 from a = 1 mm to c = 2 mm, air to b = 3 mm.
	twoLayer := coaxFull(1*mm, 3*mm, 0, 3.2*mm)
	twoLayer.Regions = append([]bc.Region{{Kind: bc.Dielectric, Shape: bc.Circle{R: 2 * mm}, EpsR: 4}}, twoLayer.Regions...)
	// Dielectric rod εr = 4, a = 5 mm, in 1 kV/m.
	rod := cylinderInField(5*mm, 1000, 15*mm, 4)
	for _, c := range []struct {
		name   string
		p      *bc.Problem
		hs     []float64
		value  func(*Solution) float64
		want   float64
		tol    float64 // at the finest grid, directional
		source string
	}{
		{
			name: "P04b two-layer coax", p: twoLayer, hs: []float64{0.1 * mm, 0.05 * mm, 0.025 * mm},
			value: func(s *Solution) float64 { return s.Charges()[0] },
			// source: Ramo, Whinnery & Van Duzer, Fields and Waves in Communication Electronics, 1994 [case P04b], C' = 2πε0/[ln(c/a)/εr1 + ln(b/c)/εr2] (Ramo et al.)
			want: 96.124959e-12, tol: 1e-3, source: "P04b",
		},
		{
			name: "P13a dielectric rod", p: rod, hs: []float64{0.5 * mm, 0.25 * mm, 0.125 * mm},
			value: func(s *Solution) float64 { ex, _, _ := s.FieldAt(0, 0); return ex },
			// source: Jackson, Classical Electrodynamics, 1999, §4.4, 2-D analogue (from memory) [case P13a], E_in = 2E0/(εr+1) = 400 V/m (2-D analogue of Jackson §4.4)
			want: 400, tol: 5e-3, source: "P13a",
		},
	} {
		t.Run(c.name, func(t *testing.T) {
			var last float64
			for _, h := range c.hs {
				g := ladder(t, c.p, h, 1)[0]
				dir := relErr(c.value(solveMap(t, rasterize(t, c.p, g), false)), c.want)
				arith := relErr(c.value(solveMap(t, rasterize(t, c.p, g), true)), c.want)
				t.Logf("%s h = %g mm: rel err %.2e directional, %.2e cell mean", c.source, h/mm, dir, arith)
				if !(dir < arith) {
					t.Errorf("%s h = %g mm: directional error %.2e is not below the cell mean's %.2e", c.source, h/mm, dir, arith)
				}
				last = dir
			}
			if last > c.tol {
				t.Errorf("%s: rel err %.2e at the finest grid, want ≤ %.1e", c.source, last, c.tol)
			}
		})
	}
}

// TestCoaxThreeHalvings: circular coax conductors on a Cartesian grid
// converge at second order over three halvings of the cell, and 40 cells
// across the gap give C' within 0.05 %.
func TestCoaxThreeHalvings(t *testing.T) {
	const mm = 1e-3
	// source: Ramo, Whinnery & Van Duzer, Fields and Waves in Communication Electronics, 1994 [case P04a], C' = 2πε0/ln(b/a) (Ramo, Whinnery & Van Duzer)
	const want = 50.638886e-12
	p := coaxFull(1*mm, 3*mm, 0, 3.2*mm)
	gaps := []int{10, 20, 40, 80}
	grids := ladder(t, p, 2*mm/float64(gaps[0]), len(gaps))
	var errs []float64
	for l, g := range grids {
		sol := mustSolve(t, p, g, &Settings{Solver: solve.Settings{Tol: 1e-12}})
		e := relErr(sol.Charges()[0], want)
		errs = append(errs, e)
		t.Logf("%3d cells across the gap (%d nodes): C' = %.8g pF/m, rel err %.2e", gaps[l], g.Len(), sol.Charges()[0]*1e12, e)
	}
	for l := 1; l < len(errs); l++ {
		order := math.Log2(errs[l-1] / errs[l])
		t.Logf("observed order %d→%d cells: %.2f", gaps[l-1], gaps[l], order)
		if order < 1.8 {
			t.Errorf("observed order %.2f from %d to %d cells across the gap, want ≥ 1.8", order, gaps[l-1], gaps[l])
		}
	}
	if errs[2] > 5e-4 {
		t.Errorf("rel err %.2e with 40 cells across the gap, want ≤ 5e-4", errs[2])
	}
}
