package field

import (
	"context"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
	"github.com/phigrid/phigrid/solve"
)

// threeWires is two wires and a strip over a dielectric slab in a grounded
// box: a multi-conductor problem without symmetry.
func threeWires() *bc.Problem {
	p := &bc.Problem{
		Domain: bc.Rect{X0: 0, Y0: 0, X1: 0.02, Y1: 0.012},
		Conductors: []bc.Conductor{
			{Name: "box"}, {Name: "a", Potential: 1}, {Name: "b", Potential: -0.5}, {Name: "trace", Potential: 2},
		},
		Regions: []bc.Region{
			{Kind: bc.Dielectric, Shape: bc.Rect{X0: 0, Y0: 0, X1: 0.02, Y1: 0.003}, EpsR: 4.4},
			{Kind: bc.ConductorRegion, Conductor: "a", Shape: bc.Circle{X: 0.006, Y: 0.007, R: 0.0011}},
			{Kind: bc.ConductorRegion, Conductor: "b", Shape: bc.Circle{X: 0.013, Y: 0.008, R: 0.0017}},
			{Kind: bc.ConductorRegion, Conductor: "trace", Shape: bc.Strip{X0: 0.008, Y0: 0.003, X1: 0.012, Y1: 0.003}},
		},
	}
	for s := range p.Sides {
		p.Sides[s] = bc.Side{Kind: bc.Fixed, Conductor: "box"}
	}
	return p
}

func threeWiresSystem(t testing.TB, n int) *solve.System {
	t.Helper()
	p := threeWires()
	g := mustGrid(t, uniform(t, 0, 0.02, n), uniform(t, 0, 0.012, n*3/5+1), grid.Planar)
	m, err := bc.Rasterize(p, g, nil)
	if err != nil {
		t.Fatal(err)
	}
	sys, err := solve.Assemble(m)
	if err != nil {
		t.Fatal(err)
	}
	return sys
}

func TestCapacitanceProperties(t *testing.T) {
	sys := threeWiresSystem(t, 101)
	set := &solve.Settings{Tol: 1e-13, Method: solve.CG}
	c, _, err := CapacitanceMatrix(context.Background(), sys, set)
	if err != nil {
		t.Fatal(err)
	}
	n := len(c)
	for i := 0; i < n; i++ {
		if !(c[i][i] > 0) {
			t.Errorf("C[%d][%d] = %g, want > 0", i, i, c[i][i])
		}
		for j := 0; j < n; j++ {
			if i != j && !(c[i][j] < 0) {
				t.Errorf("C[%d][%d] = %g, want < 0", i, j, c[i][j])
			}
			if d := math.Abs(c[i][j]-c[j][i]) / math.Abs(c[i][i]); d > 1e-9 {
				t.Errorf("C not symmetric at (%d,%d): %g vs %g", i, j, c[i][j], c[j][i])
			}
		}
	}
	// Energy identity: ½VᵀCV equals the field energy of the solve at V.
	v := []float64{0, 1, -0.5, 2}
	b := sys.RHS(nil, v, false, false)
	phi := make([]float64, sys.Len())
	if _, err := solve.Solve(context.Background(), sys, b, phi, set); err != nil {
		t.Fatal(err)
	}
	var vcv float64
	for i := range v {
		for j := range v {
			vcv += v[i] * c[i][j] * v[j]
		}
	}
	w := Energy(sys, phi)
	if e := math.Abs(0.5*vcv/w - 1); e > 1e-9 {
		t.Errorf("½VᵀCV = %.12g, energy = %.12g (rel diff %.2g)", 0.5*vcv, w, e)
	}
	// Q = C·V at the same solve.
	q := Charges(sys, phi, v)
	for i := range v {
		var cv float64
		for j := range v {
			cv += c[i][j] * v[j]
		}
		if math.Abs(q[i]-cv) > 1e-9*math.Abs(c[i][i]) {
			t.Errorf("Q[%d] = %g, C·V = %g", i, q[i], cv)
		}
	}
}

func TestSuperposition(t *testing.T) {
	sys := threeWiresSystem(t, 81)
	set := &solve.Settings{Tol: 1e-13, Method: solve.CG}
	solveFor := func(v []float64) []float64 {
		b := sys.RHS(nil, v, false, false)
		phi := make([]float64, sys.Len())
		if _, err := solve.Solve(context.Background(), sys, b, phi, set); err != nil {
			t.Fatal(err)
		}
		return phi
	}
	va := []float64{0, 1, 0, 0}
	vb := []float64{0, 0, 0, 1}
	vab := []float64{0, 2, 0, -3}
	pa, pb, pab := solveFor(va), solveFor(vb), solveFor(vab)
	comb := make([]float64, len(pa))
	for i := range comb {
		comb[i] = 2*pa[i] - 3*pb[i]
	}
	if d := cmp.Diff(pab, comb, cmpopts.EquateApprox(0, 1e-9)); d != "" {
		t.Errorf("φ(2a − 3b) ≠ 2φ(a) − 3φ(b):\n%s", d[:min(len(d), 400)])
	}
}

// TestSolversAgree runs every solver with several worker counts on the
// same system and checks the potentials agree to the tolerance, that the
// worker count does not change the result, and that inputs are unchanged.
func TestSolversAgree(t *testing.T) {
	sys := threeWiresSystem(t, 81)
	v := []float64{0, 1, -0.5, 2}
	b := sys.RHS(nil, v, true, true)
	bCopy := append([]float64(nil), b...)
	diag := append([]float64(nil), sys.Diag...)
	var ref []float64
	results := map[string][]float64{}
	for _, m := range []solve.Method{solve.CG, solve.SOR, solve.Default, solve.MG} {
		for _, w := range []int{1, 2, 3} {
			phi := make([]float64, sys.Len())
			r, err := solve.Solve(context.Background(), sys, b, phi, &solve.Settings{Method: m, Tol: 1e-11, Workers: w})
			if err != nil {
				t.Fatalf("%v workers %d: %v", m, w, err)
			}
			t.Logf("%v workers %d: %d iterations, residual %.2g", m, w, r.Iterations, r.Residual)
			if ref == nil {
				ref = phi
			}
			// Tolerance 1e-11 on the residual; potentials agree to ~1e-8 V.
			if d := cmp.Diff(ref, phi, cmpopts.EquateApprox(0, 1e-7)); d != "" {
				t.Errorf("%v with %d workers differs from CG:\n%s", m, w, d[:min(len(d), 300)])
			}
			key := m.String()
			if prev, ok := results[key]; ok {
				if d := cmp.Diff(prev, phi, cmpopts.EquateApprox(0, 1e-13)); d != "" {
					t.Errorf("%v: result depends on the worker count", m)
				}
			} else {
				results[key] = phi
			}
		}
	}
	if !cmp.Equal(b, bCopy) || !cmp.Equal(diag, sys.Diag) {
		t.Error("solving modified its inputs")
	}
}

func TestNoFixedPotential(t *testing.T) {
	p := &bc.Problem{
		Domain:     bc.Rect{X1: 1, Y1: 1},
		Conductors: []bc.Conductor{{Name: "f", Floating: true}},
		Regions:    []bc.Region{{Kind: bc.ConductorRegion, Conductor: "f", Shape: bc.Circle{X: 0.5, Y: 0.5, R: 0.1}}},
	}
	g := mustGrid(t, uniform(t, 0, 1, 11), uniform(t, 0, 1, 11), grid.Planar)
	if _, err := Solve(context.Background(), p, g, nil); err == nil {
		t.Fatal("a problem without a fixed potential solved")
	}
}

func TestNotConvergedReturnsBestIterate(t *testing.T) {
	sys := threeWiresSystem(t, 81)
	b := sys.RHS(nil, []float64{0, 1, 0, 0}, false, false)
	phi := make([]float64, sys.Len())
	r, err := solve.Solve(context.Background(), sys, b, phi, &solve.Settings{Method: solve.CG, MaxIter: 5})
	if err == nil || r.Status != solve.IterationLimit {
		t.Fatalf("got status %v, err %v; want iteration limit", r.Status, err)
	}
	if r.Residual >= 1 || r.Iterations != 5 {
		t.Errorf("best iterate residual %g after %d iterations", r.Residual, r.Iterations)
	}
}

func TestCancel(t *testing.T) {
	sys := threeWiresSystem(t, 81)
	b := sys.RHS(nil, []float64{0, 1, 0, 0}, false, false)
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	for _, m := range []solve.Method{solve.CG, solve.SOR} {
		phi := make([]float64, sys.Len())
		r, err := solve.Solve(ctx, sys, b, phi, &solve.Settings{Method: m})
		if err == nil || r.Status != solve.Canceled {
			t.Errorf("%v: cancelled solve returned status %v, err %v", m, r.Status, err)
		}
	}
}

func TestFloatingConductor(t *testing.T) {
	// An uncharged floating plate midway between two plates takes the
	// mean potential: common practice (symmetry and superposition).
	p := plates(0.01, 0.002, nil)
	p.Conductors = append(p.Conductors, bc.Conductor{Name: "mid", Floating: true})
	p.Regions = append(p.Regions, bc.Region{Kind: bc.ConductorRegion, Conductor: "mid", Shape: bc.Rect{X0: 0, Y0: 0.0009, X1: 0.01, Y1: 0.0011}})
	g := mustGrid(t, uniform(t, 0, 0.01, 11), uniform(t, 0, 0.002, 21), grid.Planar)
	sol := mustSolve(t, p, g, nil)
	if math.Abs(sol.V[2]-0.5) > 1e-9 {
		t.Errorf("floating plate at %g V, want 0.5 V", sol.V[2])
	}
	if q := sol.Charges()[2]; math.Abs(q) > 1e-9*math.Abs(sol.Charges()[0]) {
		t.Errorf("floating plate charge %g, want 0", q)
	}
}

func TestTwoTerminal(t *testing.T) {
	sys := threeWiresSystem(t, 61)
	c, _, err := CapacitanceMatrix(context.Background(), sys, &solve.Settings{Tol: 1e-12})
	if err != nil {
		t.Fatal(err)
	}
	cab, err := TwoTerminal(c, 1, 0)
	if err != nil {
		t.Fatal(err)
	}
	// With others floating the capacitance lies between c11 − (coupling
	// lost to the floats) and c11 (series combination reduces it).
	if !(cab > 0 && cab <= c[1][1]*(1+1e-12)) {
		t.Errorf("two-terminal %g outside (0, c11 = %g]", cab, c[1][1])
	}
	if _, err := TwoTerminal(c, 1, 1); err == nil {
		t.Error("same conductor twice accepted")
	}
}
