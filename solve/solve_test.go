package solve

import (
	"context"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
)

// unitSquare is the unit-square Poisson problem: ρ constant, every side at
// 0 V, n × n nodes.
func unitSquare(t testing.TB, n int) *System {
	t.Helper()
	p := &bc.Problem{
		Domain:  bc.Rect{X1: 1, Y1: 1},
		Regions: []bc.Region{{Kind: bc.Charge, Shape: bc.Rect{X1: 1, Y1: 1}, Rho: Eps0}},
	}
	for s := range p.Sides {
		p.Sides[s] = bc.Side{Kind: bc.Fixed}
	}
	x, _ := grid.Uniform(0, 1, n)
	return buildSystem(t, p, x, x)
}

// mixed is an axisymmetric problem with an electrode, a dielectric and a
// graded grid, so every code path of the assembly is exercised.
func mixed(t testing.TB, n int) *System {
	t.Helper()
	p := &bc.Problem{
		Metric:     grid.Axisymmetric,
		Domain:     bc.Rect{X0: 0, Y0: 0, X1: 0.05, Y1: 0.08},
		Conductors: []bc.Conductor{{Name: "hv", Potential: 10}, {Name: "tank"}},
		Regions: []bc.Region{
			{Kind: bc.Dielectric, Shape: bc.Rect{X0: 0, Y0: 0, X1: 0.03, Y1: 0.02}, EpsR: 5},
			{Kind: bc.ConductorRegion, Conductor: "hv", Shape: bc.Circle{X: 0, Y: 0.04, R: 0.01}},
			{Kind: bc.Charge, Shape: bc.Rect{X0: 0.035, Y0: 0.05, X1: 0.045, Y1: 0.06}, Rho: 1e-6},
		},
	}
	p.Sides[bc.Right] = bc.Side{Kind: bc.Fixed, Conductor: "tank"}
	p.Sides[bc.Top] = bc.Side{Kind: bc.Fixed, Conductor: "tank"}
	x, _ := grid.Graded(0, 0.05, grid.Grading{Focus: []float64{0.01, 0.03}, Fine: 0.05 / float64(4*n), Max: 0.05 / float64(n)})
	y, _ := grid.Graded(0, 0.08, grid.Grading{Focus: []float64{0.02, 0.03, 0.05}, Fine: 0.05 / float64(4*n), Max: 0.05 / float64(n)})
	return buildSystem(t, p, x, y)
}

func TestAssemblySymmetricDefinite(t *testing.T) {
	s := mixed(t, 20)
	for n := range s.Diag {
		if s.Fixed[n] {
			if s.Diag[n] != 1 || s.AX[n] != 0 || s.AY[n] != 0 {
				t.Fatalf("fixed row %d is not an identity row", n)
			}
			continue
		}
		// Weak diagonal dominance: the diagonal is at least the sum of the
		// off-diagonal couplings (equality away from fixed nodes).
		off := s.AX[n] + s.AY[n]
		if n%s.Nx > 0 {
			off += s.AX[n-1]
		}
		if n >= s.Nx {
			off += s.AY[n-s.Nx]
		}
		if s.Diag[n] < off*(1-1e-12) || s.AX[n] < 0 || s.AY[n] < 0 {
			t.Fatalf("row %d: diag %g < off-diagonal sum %g", n, s.Diag[n], off)
		}
	}
}

func TestParallelKernelsMatchReference(t *testing.T) {
	s := mixed(t, 24)
	x := make([]float64, s.Len())
	for i := range x {
		x[i] = math.Sin(float64(i) * 0.37)
	}
	want := make([]float64, s.Len())
	s.Apply(want, x)
	for _, w := range []int{1, 2, 5} {
		k := newKernels(s, w)
		got := make([]float64, s.Len())
		d := k.apply(got, x)
		k.close()
		if diff := cmp.Diff(want, got, cmpopts.EquateApprox(1e-14, 0)); diff != "" {
			t.Errorf("workers %d: parallel apply differs:\n%s", w, diff[:min(300, len(diff))])
		}
		if math.Abs(d-dot(x, want)) > 1e-12*math.Abs(d) {
			t.Errorf("workers %d: x·Ax = %g, want %g", w, d, dot(x, want))
		}
	}
}

// TestUnitSquare checks the discrete solution of −Δφ = 1 at the centre
// against the series value u(½,½) = 0.073671353 (Prandtl torsion function series).
func TestUnitSquare(t *testing.T) {
	s := unitSquare(t, 129)
	b := s.RHS(nil, nil, true, true)
	for _, m := range []Method{CG, SOR} {
		x := make([]float64, s.Len())
		r, err := Solve(context.Background(), s, b, x, &Settings{Method: m, Tol: 1e-10})
		if err != nil {
			t.Fatal(err)
		}
		got := x[s.Grid.Index(64, 64)]
		// source: series of the Prandtl torsion function
		// (Timoshenko & Goodier, from memory); O(h²) discretisation error.
		if math.Abs(got/0.073671353-1) > 1e-4 {
			t.Errorf("%v: centre value %.9g, want 0.073671353", m, got)
		}
		t.Logf("%v: %d iterations, residual %.2g", m, r.Iterations, r.Residual)
	}
}

func TestEstimateOmega(t *testing.T) {
	// For the 5-point Laplacian on an n×n Dirichlet grid of spacing
	// h = 1/(n−1), ρ_J = cos(πh): common practice (Young's SOR theory).
	n := 65
	s := unitSquare(t, n)
	rho := math.Cos(math.Pi / float64(n-1))
	want := 2 / (1 + math.Sqrt(1-rho*rho))
	got := EstimateOmega(s)
	if got > want+1e-3 || got < want-0.02 {
		t.Errorf("ω = %.5f, want about %.5f", got, want)
	}
}

func TestSmallestEigen(t *testing.T) {
	// The n×n tridiagonal (2, −1) has eigenvalues 2 − 2cos(kπ/(n+1)):
	// common practice.
	n := 30
	d := make([]float64, n)
	e := make([]float64, n-1)
	for i := range d {
		d[i] = 2
	}
	for i := range e {
		e[i] = -1
	}
	want := 2 - 2*math.Cos(math.Pi/float64(n+1))
	if got := smallestEigen(d, e); math.Abs(got-want) > 1e-12 {
		t.Errorf("smallest eigenvalue %g, want %g", got, want)
	}
}

func TestCGDoesNotAllocatePerIteration(t *testing.T) {
	s := unitSquare(t, 65)
	b := s.RHS(nil, nil, true, true)
	solver, err := NewSolver(s, &Settings{Method: CG, Tol: 1e-8})
	if err != nil {
		t.Fatal(err)
	}
	defer solver.Close()
	x := make([]float64, s.Len())
	iters := func(maxIter int) float64 {
		cg := solver.(*cgSolver)
		cg.set.MaxIter = maxIter
		return testing.AllocsPerRun(3, func() {
			clear(x)
			solver.Solve(context.Background(), b, x)
		})
	}
	few, many := iters(5), iters(50)
	if many > few {
		t.Errorf("allocations grow with iterations: %g for 5, %g for 50", few, many)
	}
}

func TestSettingsErrors(t *testing.T) {
	s := unitSquare(t, 9)
	for _, c := range []struct {
		reason string
		set    Settings
	}{
		{"tolerance above one", Settings{Tol: 2}},
		{"negative iteration limit", Settings{MaxIter: -1}},
		{"omega out of range", Settings{Method: SOR, Omega: 2.5}},
		{"unknown method", Settings{Method: Method(42)}},
	} {
		if _, err := NewSolver(s, &c.set); err == nil {
			t.Errorf("%s: accepted", c.reason)
		}
	}
	if _, err := ParseMethod("multigrid"); err == nil {
		t.Error("unknown method name accepted")
	}
	for _, m := range []Method{SOR, CG, MGCG, MG} {
		if got, err := ParseMethod(m.String()); err != nil || got != m {
			t.Errorf("ParseMethod(%q) = %v, %v", m.String(), got, err)
		}
	}
}

func TestNoFixedNodes(t *testing.T) {
	p := &bc.Problem{Domain: bc.Rect{X1: 1, Y1: 1}, Conductors: []bc.Conductor{{Name: "f", Floating: true}},
		Regions: []bc.Region{{Kind: bc.ConductorRegion, Conductor: "f", Shape: bc.Circle{X: 0.5, Y: 0.5, R: 0.2}}}}
	x, _ := grid.Uniform(0, 1, 5)
	g, _ := grid.New(x, x, grid.Planar)
	// Rasterize refuses it already; the assembly refuses a map without
	// fixed nodes too.
	if _, err := bc.Rasterize(p, g, nil); err == nil {
		t.Fatal("rasterised a problem with nothing fixed")
	}
	m := &bc.Map{Grid: g, Kind: make([]bc.NodeKind, g.Len()), Cond: make([]int32, g.Len()), Value: make([]float64, g.Len()),
		Eps: make([]float64, g.Cells()), CutX: make([]float64, g.Len()), CutY: make([]float64, g.Len())}
	for i := range m.CutX {
		m.CutX[i], m.CutY[i] = 1, 1
	}
	for i := range m.Eps {
		m.Eps[i] = 1
	}
	if _, err := Assemble(m); err == nil {
		t.Error("assembled a system without fixed nodes")
	}
}
