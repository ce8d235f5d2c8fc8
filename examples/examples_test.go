// Package examples_test solves every shipped example model and checks a
// quantity of each against an independent estimate: a closed form, a
// published formula or a rigorous bound.
package examples_test

import (
	"context"
	"math"
	"path/filepath"
	"testing"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/field"
	"github.com/phigrid/phigrid/io/model"
	"github.com/phigrid/phigrid/solve"
)

const (
	eps0   = solve.Eps0
	clight = 299792458.0 // m/s, exact (SI definition)
)

type solved struct {
	m   *model.Model
	sol *field.Solution
	c   [][]float64
}

// load parses an example, solves it and computes its capacitance matrix.
func load(t *testing.T, name string, edit func(*bc.Problem)) solved {
	t.Helper()
	m, err := model.Load(filepath.Join(name, name+".toml"))
	if err != nil {
		t.Fatal(err)
	}
	if edit != nil {
		edit(m.Problem)
	}
	g, err := m.Grid()
	if err != nil {
		t.Fatal(err)
	}
	set := &field.Settings{Solver: solve.Settings{Tol: 1e-10}}
	sol, err := field.Solve(context.Background(), m.Problem, g, set)
	if err != nil {
		t.Fatal(err)
	}
	c, _, err := field.CapacitanceMatrix(context.Background(), sol.Sys, &set.Solver)
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("%s: %d × %d nodes", name, g.Nx(), g.Ny())
	return solved{m, sol, c}
}

func index(t *testing.T, p *bc.Problem, name string) int {
	t.Helper()
	k := p.ConductorIndex(name)
	if k < 0 {
		t.Fatalf("no conductor %q", name)
	}
	return k
}

// TestCoax checks the coaxial line against C' = 2πε0/ln(b/a).
func TestCoax(t *testing.T) {
	s := load(t, "coax", nil)
	k := index(t, s.m.Problem, "inner")
	// source: Ramo, Whinnery & Van Duzer, Fields and Waves in Communication Electronics, 1994
	want := 2 * math.Pi * eps0 / math.Log(3)
	if e := math.Abs(s.c[k][k]/want - 1); e > 1e-3 {
		t.Errorf("C' = %.6g pF/m, want %.6g (rel err %.2g)", s.c[k][k]*1e12, want*1e12, e)
	}
}

// TestTwinax compares the capacitance matrix of the shielded pair with the
// thin-wire image solution: a line charge at distance d from the axis of a
// grounded cylinder of radius R has its image at R²/d, so the potential
// coefficients are P11 = ln((R²−d²)/(aR))/(2πε) and
// P12 = ln((R²+d²)/(2dR))/(2πε), and C = P⁻¹. The thin-wire form neglects
// terms of order (a/2d)² and (a/(R−d))², a few percent here.
func TestTwinax(t *testing.T) {
	s := load(t, "twinax", nil)
	const a, d, R, epsR = 0.5e-3, 2.5e-3, 6e-3, 2.25 // polyethylene, common practice
	eps := eps0 * epsR
	// source: method of images for a line charge in a grounded cylinder,
	// Smythe, Static and Dynamic Electricity, 1968, ch. 4 (from memory)
	p11 := math.Log((R*R-d*d)/(a*R)) / (2 * math.Pi * eps)
	p12 := math.Log((R*R+d*d)/(2*d*R)) / (2 * math.Pi * eps)
	det := p11*p11 - p12*p12
	c11, c12 := p11/det, -p12/det
	kp, km := index(t, s.m.Problem, "plus"), index(t, s.m.Problem, "minus")
	got11, got12 := s.c[kp][kp], s.c[kp][km]
	t.Logf("c11 = %.5g pF/m (images %.5g), c12 = %.5g pF/m (images %.5g)", got11*1e12, c11*1e12, got12*1e12, c12*1e12)
	if e := math.Abs(got11/c11 - 1); e > 0.03 {
		t.Errorf("c11 = %.5g pF/m, images give %.5g (rel err %.2g)", got11*1e12, c11*1e12, e)
	}
	if e := math.Abs(got12/c12 - 1); e > 0.05 {
		t.Errorf("c12 = %.5g pF/m, images give %.5g (rel err %.2g)", got12*1e12, c12*1e12, e)
	}
	// Symmetry of the cable: both wires see the same self-capacitance.
	if e := math.Abs(s.c[km][km]/got11 - 1); e > 1e-3 {
		t.Errorf("c22 = %g differs from c11 = %g", s.c[km][km], got11)
	}
}

// TestMicrostrip compares the trace's characteristic impedance and
// effective permittivity with Hammerstad & Jensen's formulas for w/h = 2.
func TestMicrostrip(t *testing.T) {
	s := load(t, "microstrip", nil)
	air := load(t, "microstrip", func(p *bc.Problem) {
		for n := range p.Regions {
			if p.Regions[n].Kind == bc.Dielectric {
				p.Regions[n].EpsR = 1
			}
		}
	})
	k := index(t, s.m.Problem, "trace")
	c, cAir := 2*s.c[k][k], 2*air.c[k][k] // two halves
	z0 := 1 / (clight * math.Sqrt(c*cAir))
	epsEff := c / cAir
	// source: Hammerstad & Jensen, "Accurate models for microstrip
	// computer-aided design", IEEE MTT-S Digest, 1980, zero thickness,
	// u = 2, εr = 4.4: Z0 = 48.685768 Ω, εeff = 3.3439383.
	t.Logf("Z0 = %.4f Ω (H&J 48.6858), εeff = %.4f (H&J 3.3439)", z0, epsEff)
	if e := math.Abs(z0/48.685768 - 1); e > 0.01 {
		t.Errorf("Z0 = %.4f Ω, want 48.686 Ω within 1 %% (rel err %.2g)", z0, e)
	}
	if e := math.Abs(epsEff/3.3439383 - 1); e > 0.005 {
		t.Errorf("εeff = %.4f, want 3.3439 within 0.5 %% (rel err %.2g)", epsEff, e)
	}
}

// TestBushing bounds the electrode's capacitance: capacitance grows with
// the conductor and shrinks as the grounded enclosure grows, so the
// electrode (which contains a 40 mm sphere and lies within an 80 mm one)
// inside the tank (which contains a 250 mm sphere and lies within a
// 250√2 mm one) has C(40 mm in 250√2 mm) ≤ C ≤ C(80 mm in 250 mm), with
// C(a in b) = 4πε·ab/(b−a).
func TestBushing(t *testing.T) {
	s := load(t, "bushing", nil)
	k := index(t, s.m.Problem, "electrode")
	eps := eps0 * 1.002 // SF6 at 0.1 MPa, common practice
	// source: Jackson, Classical Electrodynamics, 1999 (concentric spheres);
	// monotonicity of capacitance: Pólya & Szegő, Isoperimetric
	// Inequalities in Mathematical Physics, 1951 (from memory)
	sphere := func(a, b float64) float64 { return 4 * math.Pi * eps * a * b / (b - a) }
	lo, hi := sphere(0.04, 0.25*math.Sqrt2), sphere(0.08, 0.25)
	got := s.c[k][k]
	t.Logf("C = %.4g pF, bounds [%.4g, %.4g] pF", got*1e12, lo*1e12, hi*1e12)
	if got < lo || got > hi {
		t.Errorf("C = %.4g pF outside the bounds [%.4g, %.4g] pF", got*1e12, lo*1e12, hi*1e12)
	}
}

// TestTouchpad checks the guarded pad: with the guard at the pad's
// potential the field over the pad is uniform, so its charge is that of two
// parallel-plate capacitors (overlay to the finger, board to the ground
// plane) over an area between the pad itself and the pad plus half the gap
// on each side (the guard-ring correction).
func TestTouchpad(t *testing.T) {
	s := load(t, "touchpad", nil)
	k := index(t, s.m.Problem, "pad")
	q := s.sol.Charges()[k]
	const v, half, gap = 3.3, 5e-3, 0.5e-3
	// source: parallel-plate capacitance ε w/d (Griffiths, Introduction to
	// Electrodynamics); FR-4 4.4 and overlay 2.7, common practice
	perWidth := eps0 * (2.7/2e-3 + 4.4/1.6e-3) * v
	lo, hi := perWidth*half, perWidth*(half+gap)
	t.Logf("pad charge %.4g C/m, bounds [%.4g, %.4g]", q, lo, hi)
	if q < lo || q > hi {
		t.Errorf("pad charge %.4g C/m outside [%.4g, %.4g]", q, lo, hi)
	}
}

// TestSphere checks the isolated sphere in open space against its closed
// forms: the capacitance 4πε0R and the uniform surface field V/R. The open
// sides are what this example tests; a grounded enclosure would add
// 4πε0R²/(b−R) to the capacitance.
func TestSphere(t *testing.T) {
	s := load(t, "sphere", nil)
	k := index(t, s.m.Problem, "sphere")
	const R, V = 10e-3, 1000.0
	// source: Jackson, Classical Electrodynamics, 3rd ed., 1999: C = 4πε0R
	wantC := 4 * math.Pi * eps0 * R // 1.1126501 pF
	if e := math.Abs(s.c[k][k]/wantC - 1); e > 5e-3 {
		t.Errorf("C = %.6g pF, want %.6g pF within 0.5 %% (rel err %.2g)", s.c[k][k]*1e12, wantC*1e12, e)
	}
	set := solve.Settings{Tol: 1e-10}
	if err := s.sol.RefineSurface(context.Background(), &set); err != nil {
		t.Fatal(err)
	}
	// source: Jackson, Classical Electrodynamics, 3rd ed., 1999: E = Q/(4πε0R²) = V/R
	wantE := V / R // 100 kV/m
	pk := s.sol.PeakSurfaceField(k)
	t.Logf("C = %.6g pF (4πε0R %.6g), peak |E| = %.5g V/m at (%.3g, %.3g) mm (V/R %.5g)",
		s.c[k][k]*1e12, wantC*1e12, pk.Value, pk.X*1e3, pk.Y*1e3, wantE)
	if e := math.Abs(pk.Value/wantE - 1); e > 0.02 {
		t.Errorf("peak surface field %.5g V/m, want %.5g V/m within 2 %% (rel err %.2g)", pk.Value, wantE, e)
	}
}
