package solve

import (
	"context"
	"math"
	"testing"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
)

// coaxInBox is a coaxial line (inner radius 1, shield from 3 to 5) in a
// square of half-width 3.5, so that the corners and a margin along every
// side are shield: the free nodes fill about half of the grid.
func coaxInBox(t testing.TB, n int) *System {
	p := &bc.Problem{
		Domain:     bc.Rect{X0: -3.5, Y0: -3.5, X1: 3.5, Y1: 3.5},
		Conductors: []bc.Conductor{{Name: "inner", Potential: 1}, {Name: "outer"}},
		Regions: []bc.Region{
			{Kind: bc.ConductorRegion, Conductor: "outer", Shape: bc.Annulus{R0: 3, R1: 5}},
			{Kind: bc.ConductorRegion, Conductor: "inner", Shape: bc.Circle{R: 1}},
		},
	}
	x, _ := grid.Uniform(-3.5, 3.5, n)
	return buildSystem(t, p, x, x)
}

func TestFreeBox(t *testing.T) {
	s := coaxInBox(t, 71)
	i0, i1, j0, j1, ok := s.freeBox()
	if !ok {
		t.Fatal("no free node found")
	}
	for j := 0; j < s.Ny; j++ {
		for i := 0; i < s.Nx; i++ {
			inside := i >= i0 && i < i1 && j >= j0 && j < j1
			if !s.Fixed[j*s.Nx+i] && !inside {
				t.Fatalf("free node (%d, %d) outside the box [%d,%d)×[%d,%d)", i, j, i0, i1, j0, j1)
			}
		}
	}
	// The shield's inner radius 3 in a square of half-width 3.5, nodes
	// 0.1 apart: the free nodes reach from x = −2.9 to 2.9.
	if i0 != 6 || i1 != 65 || j0 != 6 || j1 != 65 {
		t.Errorf("box [%d,%d)×[%d,%d), want [6,65)×[6,65)", i0, i1, j0, j1)
	}
	if _, _, _, _, ok := (&System{Nx: 2, Ny: 2, Fixed: []bool{true, true, true, true}}).freeBox(); ok {
		t.Error("a grid without free nodes reports a box")
	}
}

// TestCroppedSolveMatchesWholeGrid checks that every method solving on the
// box around the free nodes gives the whole-grid solution, sets every fixed
// node from b, and reports the whole grid's residual.
func TestCroppedSolveMatchesWholeGrid(t *testing.T) {
	s := coaxInBox(t, 71)
	b := caseRHS(s)
	for _, m := range []Method{MGCG, CG, SOR, MG} {
		set := Settings{Method: m, Tol: 1e-10, MaxIter: 100000}
		solver, err := NewSolver(s, &set)
		if err != nil {
			t.Fatal(err)
		}
		c, ok := solver.(*cropped)
		if !ok {
			t.Fatalf("%v: solver works on the whole grid, want the box", m)
		}
		if got := c.sub.Len(); got > s.Len()*3/4 {
			t.Errorf("%v: box has %d of %d nodes", m, got, s.Len())
		}
		x := make([]float64, s.Len())
		res, err := solver.Solve(context.Background(), b, x)
		solver.Close()
		if err != nil {
			t.Fatalf("%v: %v", m, err)
		}
		whole, err := newMethod(s, set.withDefaults())
		if err != nil {
			t.Fatal(err)
		}
		y := make([]float64, s.Len())
		if _, err := whole.Solve(context.Background(), b, y); err != nil {
			t.Fatal(err)
		}
		whole.Close()
		var diff float64
		for i := range x {
			if s.Fixed[i] && x[i] != b[i]/s.Diag[i] {
				t.Fatalf("%v: fixed node %d holds %g, want %g", m, i, x[i], b[i]/s.Diag[i])
			}
			diff = math.Max(diff, math.Abs(x[i]-y[i]))
		}
		if diff > 1e-8 {
			t.Errorf("%v: box and whole-grid solutions differ by %g V", m, diff)
		}
		// The residual on the whole grid, as the result reports it.
		r := make([]float64, s.Len())
		s.Apply(r, x)
		var rr float64
		for i := range r {
			if !s.Fixed[i] {
				rr += (b[i] - r[i]) * (b[i] - r[i])
			}
		}
		if got := math.Sqrt(rr) / s.freeNorm(b); math.Abs(got-res.Residual) > 1e-3*res.Residual+1e-14 {
			t.Errorf("%v: reported residual %g, whole grid's %g", m, res.Residual, got)
		}
	}
}

// TestNoCropWhenFreeNodesFillTheGrid: the unit square's free nodes fill
// all but its boundary, so the solver keeps the whole grid.
func TestNoCropWhenFreeNodesFillTheGrid(t *testing.T) {
	s := mgSquare(t, 33)
	solver, err := NewSolver(s, nil)
	if err != nil {
		t.Fatal(err)
	}
	defer solver.Close()
	if _, ok := solver.(*cropped); ok {
		t.Error("unit square solved on a box")
	}
}

// TestCroppedSolveDoesNotAllocate: a solve on the box allocates only its
// Result, like a solve on the whole grid.
func TestCroppedSolveDoesNotAllocate(t *testing.T) {
	s := coaxInBox(t, 71)
	b := caseRHS(s)
	solver, err := NewSolver(s, nil)
	if err != nil {
		t.Fatal(err)
	}
	defer solver.Close()
	if _, ok := solver.(*cropped); !ok {
		t.Fatal("solver works on the whole grid, want the box")
	}
	x := make([]float64, s.Len())
	allocs := testing.AllocsPerRun(5, func() {
		clear(x)
		if _, err := solver.Solve(context.Background(), b, x); err != nil {
			t.Fatal(err)
		}
	})
	if allocs > 1 {
		t.Errorf("a solve on the box allocates %v times, want only its Result", allocs)
	}
}
