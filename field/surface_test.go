package field

import (
	"context"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
)

// TestSurfaceFieldCoax checks every surface point of a coax filled with
// PTFE: position on the circle, the outward normal, the sign and size of
// En, and σ = ε0·εr·En.
func TestSurfaceFieldCoax(t *testing.T) {
	const a, b, epsR = 1e-3, 3e-3, 2.1
	p := coaxQuarter(a, b, epsR)
	L := p.Domain.X1
	g := mustGrid(t, uniform(t, 0, L, 101), uniform(t, 0, L, 101), grid.Planar)
	sol := mustSolve(t, p, g, nil)
	if err := sol.RefineSurface(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		k       int
		r       float64
		outward float64 // +1: normal along r̂; −1: against it
		want    float64 // En in V/m
	}{
		// source: Ramo, Whinnery & Van Duzer, Fields and Waves in Communication Electronics, 1994 [case P04a], E(a) = V/(a ln(b/a)) = 910.23923 V/m, whatever εr
		{0, a, 1, 910.23923},
		// source: Ramo, Whinnery & Van Duzer, Fields and Waves in Communication Electronics, 1994 [case P04a], E(b) = 303.41308 V/m, pointing into the outer conductor
		{1, b, -1, -303.41308},
	} {
		pts := sol.SurfaceField(c.k)
		if len(pts) < 20 {
			t.Fatalf("conductor %d: only %d surface points", c.k, len(pts))
		}
		var worst float64
		for _, q := range pts {
			r := math.Hypot(q.X, q.Y)
			if math.Abs(r-c.r) > 1e-12 {
				t.Errorf("conductor %d: point (%g, %g) at r = %g, want %g", c.k, q.X, q.Y, r, c.r)
			}
			if d := math.Hypot(q.Nx-c.outward*q.X/r, q.Ny-c.outward*q.Y/r); d > 1e-6 {
				t.Errorf("conductor %d: normal (%g, %g) at (%g, %g) is off by %g", c.k, q.Nx, q.Ny, q.X, q.Y, d)
			}
			worst = math.Max(worst, relErr(q.En, c.want))
			if e := relErr(q.Sigma, eps0*epsR*q.En); e > 1e-12 {
				t.Errorf("σ = %g, want ε0·εr·En = %g", q.Sigma, eps0*epsR*q.En)
			}
		}
		t.Logf("conductor %d: %d points, worst rel err of En %.2e", c.k, len(pts), worst)
		// 32 cells per inner radius.
		if worst > 1e-3 {
			t.Errorf("conductor %d: worst rel err of En %.2e, want ≤ 1e-3", c.k, worst)
		}
	}
}

// TestRefineSurface: the correction costs one solve, leaves the solution's
// potential, charges and energy alone, improves the surface field and is
// done once.
func TestRefineSurface(t *testing.T) {
	p := cylinderInField(5e-3, 1000, 15e-3, 0)
	g := ladder(t, p, 0.25e-3, 1)[0]
	sol := mustSolve(t, p, g, nil)
	phi := append([]float64(nil), sol.Phi...)
	q, w := sol.Charges(), sol.Energy()
	worst := func() float64 {
		var e float64
		for _, s := range sol.SurfaceField(0) {
			// source: Jackson, Classical Electrodynamics, 1999, §4.4, 2-D analogue (from memory) [case P13b], surface E = 2E0·cos θ
			e = math.Max(e, math.Abs(s.En-2000*s.Nx)/2000)
		}
		return e
	}
	local := worst()
	n := len(sol.Results)
	if err := sol.RefineSurface(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	refined := worst()
	t.Logf("worst rel err of En: %.2e local, %.2e refined", local, refined)
	if len(sol.Results) != n+1 {
		t.Errorf("RefineSurface made %d solves, want 1", len(sol.Results)-n)
	}
	if !(refined < local) {
		t.Errorf("refined error %.2e is not below the local one %.2e", refined, local)
	}
	if err := sol.RefineSurface(context.Background(), nil); err != nil || len(sol.Results) != n+1 {
		t.Errorf("a second RefineSurface solved again (err %v)", err)
	}
	if !cmp.Equal(phi, sol.Phi) || !cmp.Equal(q, sol.Charges()) || w != sol.Energy() {
		t.Error("RefineSurface changed the solution's potential, charges or energy")
	}
}

func TestSurfaceFieldBadConductor(t *testing.T) {
	p := coaxQuarter(1e-3, 3e-3, 1)
	g := mustGrid(t, uniform(t, 0, p.Domain.X1, 21), uniform(t, 0, p.Domain.Y1, 21), grid.Planar)
	sol := mustSolve(t, p, g, nil)
	for _, k := range []int{-1, 2} {
		if pts := sol.SurfaceField(k); pts != nil {
			t.Errorf("SurfaceField(%d) = %d points, want nil", k, len(pts))
		}
		if pk := sol.PeakSurfaceField(k); pk != (Peak{}) {
			t.Errorf("PeakSurfaceField(%d) = %+v, want the zero Peak", k, pk)
		}
	}
}

// TestPeakSurfaceFieldLocation: the peak sits where the closed form puts
// it, on smooth bodies only.
func TestPeakSurfaceFieldLocation(t *testing.T) {
	const mm = 1e-3
	for _, c := range []struct {
		name   string
		p      *bc.Problem
		h      float64
		k      int
		want   float64
		x, y   float64 // one of the peak locations
		mirror bool    // the peak may be at (−x, y) too
		tol    float64
	}{
		// source: Jackson, Classical Electrodynamics, 1999, §4.4, 2-D analogue (from memory) [case P13b], E_max = 2E0 at θ = 0 and π
		{"P13b cylinder", cylinderInField(5*mm, 1000, 15*mm, 0), 0.25 * mm, 0, 2000, 5 * mm, 0, true, 1e-2},
		// source: Smythe, Static and Dynamic Electricity, 1968, ch. 4 (from memory) [case P05], 1394.0231 V/m on the narrow-gap side of the inner conductor
		{"P05 eccentric coax", coaxFull(1*mm, 3*mm, 1*mm, 3.2*mm), 0.05 * mm, 0, 1394.0231, 2 * mm, 0, false, 1e-2},
	} {
		t.Run(c.name, func(t *testing.T) {
			sol := mustSolve(t, c.p, ladder(t, c.p, c.h, 1)[0], nil)
			if err := sol.RefineSurface(context.Background(), nil); err != nil {
				t.Fatal(err)
			}
			pk := sol.PeakSurfaceField(c.k)
			t.Logf("peak %.6g V/m at (%g, %g) on %q", pk.Value, pk.X, pk.Y, pk.Where)
			if relErr(pk.Value, c.want) > c.tol {
				t.Errorf("peak %.6g V/m, want %.6g within %.0e", pk.Value, c.want, c.tol)
			}
			d := math.Hypot(pk.X-c.x, pk.Y-c.y)
			if c.mirror {
				d = math.Min(d, math.Hypot(pk.X+c.x, pk.Y-c.y))
			}
			if d > 3*c.h {
				t.Errorf("peak at (%g, %g), want within 3 cells of (%g, %g)", pk.X, pk.Y, c.x, c.y)
			}
			if pk.Where != c.p.Conductors[c.k].Name {
				t.Errorf("peak on %q, want %q", pk.Where, c.p.Conductors[c.k].Name)
			}
		})
	}
}

// TestPeakRegionFields checks the materials reported: background first,
// regions merged by name, unnamed ones by index, hidden ones left out, and
// the peak in each of series layers.
func TestPeakRegionFields(t *testing.T) {
	p := plates(0.01, 0.002, nil)
	p.Regions = []bc.Region{
		{Name: "hidden", Kind: bc.Dielectric, Shape: bc.Rect{X0: 0.001, Y0: 0.0005, X1: 0.002, Y1: 0.001}, EpsR: 9},
		{Name: "board", Kind: bc.Dielectric, Shape: bc.Rect{X0: 0, Y0: 0, X1: 0.005, Y1: 0.001}, EpsR: 4},
		{Name: "board", Kind: bc.Dielectric, Shape: bc.Rect{X0: 0.006, Y0: 0, X1: 0.01, Y1: 0.001}, EpsR: 4},
		{Kind: bc.Dielectric, Shape: bc.Rect{X0: 0.005, Y0: 0, X1: 0.006, Y1: 0.001}, EpsR: 4},
	}
	g := mustGrid(t, uniform(t, 0, 0.01, 41), uniform(t, 0, 0.002, 21), grid.Planar)
	sol := mustSolve(t, p, g, nil)
	// source: Griffiths, Introduction to Electrodynamics (D_n and E_t continuity) [case P02a], series layers: E_air = V/(d1/εr + d2), E_layer = E_air/εr
	eAir := 1 / (0.001/4 + 0.001)
	want := map[string]float64{"background": eAir, "board": eAir / 4, "region 3": eAir / 4}
	var names []string
	for _, pk := range sol.PeakRegionFields() {
		names = append(names, pk.Where)
		if relErr(pk.Value, want[pk.Where]) > 1e-6 {
			t.Errorf("%s: peak %.8g V/m, want %.8g", pk.Where, pk.Value, want[pk.Where])
		}
	}
	if w := []string{"background", "board", "region 3"}; !cmp.Equal(names, w) {
		t.Errorf("materials %q, want %q", names, w)
	}
}

// TestSurfaceNormalsAxisymmetric: on a sphere in r–z the normals are
// radial, also at the poles on the axis.
func TestSurfaceNormalsAxisymmetric(t *testing.T) {
	p := concentricSpheres(0.01, 0.02)
	sol := mustSolve(t, p, ladder(t, p, 0.5e-3, 1)[0], nil)
	poles := 0
	for _, q := range sol.SurfaceField(0) {
		r := math.Hypot(q.X, q.Y)
		if d := math.Hypot(q.Nx-q.X/r, q.Ny-q.Y/r); d > 1e-6 {
			t.Errorf("normal (%g, %g) at (%g, %g) is off by %g", q.Nx, q.Ny, q.X, q.Y, d)
		}
		if q.X == 0 {
			poles++
		}
	}
	if poles != 2 {
		t.Errorf("%d surface points on the axis, want the two poles", poles)
	}
}
