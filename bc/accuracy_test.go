package bc

import (
	"errors"
	"math"
	"testing"

	"github.com/phigrid/phigrid/grid"
)

// TestDirectionalPermittivity: a horizontal layer boundary inside a row of
// cells gives harmonic means for flux across it (EpsY) and arithmetic
// means for flux along it (EpsX), half-cell by half-cell.
func TestDirectionalPermittivity(t *testing.T) {
	// ε = 4 below y = 0.23, 1 above; cells of 0.1, so the boundary cuts
	// the lower half of row 2 (0.2..0.25) at 60 %.
	p := &Problem{
		Domain:     Rect{0, 0, 1, 1},
		Conductors: []Conductor{{Name: "g"}},
		Regions:    []Region{{Kind: Dielectric, Shape: Rect{0, 0, 1, 0.23}, EpsR: 4}},
	}
	p.Sides[Bottom] = Side{Kind: Fixed, Conductor: "g"}
	g := testGrid(t, 0, 1, 11, 0, 1, 11, grid.Planar)
	m, err := Rasterize(p, g, nil)
	if err != nil {
		t.Fatal(err)
	}
	if m.EpsX == nil || m.EpsY == nil {
		t.Fatal("no directional permittivities for a cell crossed by an interface")
	}
	c := g.CellIndex(4, 2)
	for _, w := range []struct {
		name      string
		got, want float64
	}{
		// X-links of row 2 see the lower half: 0.3 of it at 4, 0.2 at 1, side by side.
		// common practice: parallel layers average arithmetically
		{"EpsX lower", m.EpsX[2*c], (0.03*4 + 0.02*1) / 0.05},
		{"EpsX upper", m.EpsX[2*c+1], 1},
		// Y-links cross the whole cell height in series: 0.03 at 4 and 0.07 at 1.
		// common practice: series layers average harmonically
		{"EpsY left", m.EpsY[2*c], 0.1 / (0.03/4 + 0.07)},
		{"EpsY right", m.EpsY[2*c+1], 0.1 / (0.03/4 + 0.07)},
	} {
		if math.Abs(w.got-w.want) > 1e-9 {
			t.Errorf("%s = %.12g, want %.12g", w.name, w.got, w.want)
		}
	}
	// A cell away from the interface keeps its own value in all four.
	c = g.CellIndex(4, 6)
	for k := 0; k < 2; k++ {
		if m.EpsX[2*c+k] != 1 || m.EpsY[2*c+k] != 1 {
			t.Errorf("uniform cell: EpsX %v EpsY %v, want 1", m.EpsX[2*c:2*c+2], m.EpsY[2*c:2*c+2])
		}
	}
	// An interface on a grid line leaves every half-cell with its own
	// layer's value.
	p.Regions[0].Shape = Rect{0, 0, 1, 0.2}
	if m, err = Rasterize(p, g, nil); err != nil {
		t.Fatal(err)
	}
	for j, want := range map[int]float64{1: 4, 2: 1} {
		c := g.CellIndex(4, j)
		got := []float64{m.Eps[c]}
		if m.EpsX != nil {
			got = append(got, m.EpsX[2*c], m.EpsX[2*c+1], m.EpsY[2*c], m.EpsY[2*c+1])
		}
		for _, v := range got {
			if v != want {
				t.Errorf("interface on a grid line: row %d has ε %v, want %g", j, got, want)
				break
			}
		}
	}
}

// TestSurfaceCrossings: every free–conductor link of a disk has a crossing
// on the circle with the radial outward normal and the permittivity just
// outside.
func TestSurfaceCrossings(t *testing.T) {
	for _, metric := range []grid.Metric{grid.Planar, grid.Axisymmetric} {
		p := &Problem{
			Metric:     metric,
			Domain:     Rect{0, -1, 1, 1},
			Background: 2.5,
			Conductors: []Conductor{{Name: "c", Potential: 1}},
			Regions:    []Region{{Kind: ConductorRegion, Conductor: "c", Shape: Circle{0, 0.013, 0.371}}},
		}
		g := testGrid(t, 0, 1, 41, -1, 1, 81, metric)
		m, err := Rasterize(p, g, nil)
		if err != nil {
			t.Fatal(err)
		}
		links := 0
		for n, k := range m.Kind {
			if k != Free {
				continue
			}
			i, j := n%g.Nx(), n/g.Nx()
			for _, nb := range []int{n + 1, n - 1, n + g.Nx(), n - g.Nx()} {
				ni, nj := nb%g.Nx(), nb/g.Nx()
				if nb >= 0 && nb < g.Len() && (ni == i || nj == j) && abs(ni-i)+abs(nj-j) == 1 && m.Kind[nb] == OnConductor {
					links++
				}
			}
		}
		if len(m.Surface) != links {
			t.Errorf("%v: %d crossings for %d free–conductor links", metric, len(m.Surface), links)
		}
		for _, c := range m.Surface {
			dx, dy := c.X-0, c.Y-0.013
			r := math.Hypot(dx, dy)
			if math.Abs(r-0.371) > 1e-9 {
				t.Errorf("%v: crossing at r = %g, want 0.371", metric, r)
			}
			if d := math.Hypot(c.Nx-dx/r, c.Ny-dy/r); d > 1e-6 {
				t.Errorf("%v: normal (%g, %g) at (%g, %g) off by %g", metric, c.Nx, c.Ny, c.X, c.Y, d)
			}
			if c.EpsR != 2.5 {
				t.Errorf("%v: permittivity outside %g, want the background 2.5", metric, c.EpsR)
			}
			if m.Kind[c.Free] != Free || m.Kind[c.Node] != OnConductor {
				t.Errorf("%v: crossing joins node kinds %v and %v", metric, m.Kind[c.Free], m.Kind[c.Node])
			}
		}
	}
}

func abs(v int) int {
	if v < 0 {
		return -v
	}
	return v
}

// TestChargeVolume: the charge of a uniformly charged disk or ball is
// rasterised with its exact volume, also in r–z where the cell mean is
// weighted by 2πr.
func TestChargeVolume(t *testing.T) {
	for _, c := range []struct {
		metric grid.Metric
		want   float64 // ∫ρ dV
	}{
		// common practice: disk area πR² (per metre of depth)
		{grid.Planar, math.Pi * 0.3 * 0.3},
		// common practice: ball volume 4πR³/3
		{grid.Axisymmetric, 4 * math.Pi * 0.3 * 0.3 * 0.3 / 3},
	} {
		p := &Problem{
			Metric:     c.metric,
			Domain:     Rect{0, -1, 1, 1},
			Conductors: []Conductor{{Name: "g"}},
			Regions:    []Region{{Kind: Charge, Shape: Circle{0, 0.0123, 0.3}, Rho: 1}},
		}
		p.Sides[Right] = Side{Kind: Fixed, Conductor: "g"}
		g := testGrid(t, 0, 1, 21, -1, 1, 41, c.metric)
		m, err := Rasterize(p, g, nil)
		if err != nil {
			t.Fatal(err)
		}
		var q float64
		for j := 0; j+1 < g.Ny(); j++ {
			for i := 0; i+1 < g.Nx(); i++ {
				q += m.Rho[g.CellIndex(i, j)] * g.CellVolume(i, j)
			}
		}
		if c.metric == grid.Planar {
			q *= 2 // the domain holds the half x ≥ 0
		}
		// The lines are exact along X and a midpoint rule across.
		if e := math.Abs(q/c.want - 1); e > 1e-3 {
			t.Errorf("%v: charge %.8g, want %.8g (rel err %.2g)", c.metric, q, c.want, e)
		}
	}
}

// TestOpenSides covers validation and the default far-field centre.
func TestOpenSides(t *testing.T) {
	base := func() *Problem {
		p := &Problem{
			Metric:     grid.Axisymmetric,
			Domain:     Rect{0, -0.02, 0.03, 0.04},
			Conductors: []Conductor{{Name: "s", Potential: 1}},
			Regions:    []Region{{Kind: ConductorRegion, Conductor: "s", Shape: Circle{0, 0.01, 0.005}}},
		}
		for _, s := range []int{Right, Bottom, Top} {
			p.Sides[s] = Side{Kind: Open}
		}
		return p
	}
	p := base()
	if err := p.Validate(); err != nil {
		t.Fatalf("open sides rejected: %v", err)
	}
	// The centre lies on the axis at the middle of the geometry.
	if f := p.DefaultFar(); f != (FarField{0, 0.01, 1}) {
		t.Errorf("default far field %+v, want the sphere centre with decay 1", f)
	}
	// A floating body in open space is fine: infinity is at 0 V.
	p.Conductors[0].Floating = true
	if err := p.Validate(); err != nil {
		t.Errorf("floating body with open sides rejected: %v", err)
	}
	for _, c := range []struct {
		reason string
		change func(*Problem)
	}{
		{"the axis cannot be open", func(p *Problem) { p.Sides[Left] = Side{Kind: Open} }},
		{"an r–z far-field centre must lie on the axis", func(p *Problem) { p.Far = &FarField{X: 0.01} }},
		{"the decay must be ≥ 0", func(p *Problem) { p.Far = &FarField{Decay: -1} }},
		{"the centre must be finite", func(p *Problem) { p.Far = &FarField{Y: math.NaN()} }},
	} {
		q := base()
		c.change(q)
		if err := q.Validate(); !errors.Is(err, ErrProblem) {
			t.Errorf("%s: got %v", c.reason, err)
		}
	}
	// Planar, mirrored across a symmetry plane it touches.
	q := &Problem{
		Domain:     Rect{0, 0, 0.05, 0.05},
		Conductors: []Conductor{{Name: "w", Potential: 1}},
		Regions:    []Region{{Kind: ConductorRegion, Conductor: "w", Shape: Rect{0, 0.01, 0.004, 0.02}}},
	}
	q.Sides[Right] = Side{Kind: Open}
	q.Sides[Top] = Side{Kind: Open}
	q.Sides[Bottom] = Side{Kind: Fixed}
	if f := q.DefaultFar(); f != (FarField{0, 0.015, 1}) {
		t.Errorf("planar default far field %+v, want (0, 0.015) on the symmetry plane x = 0", f)
	}
}

func TestExtendOpen(t *testing.T) {
	p := &Problem{
		Metric:     grid.Axisymmetric,
		Domain:     Rect{0, -0.03, 0.03, 0.03},
		Conductors: []Conductor{{Name: "s", Potential: 1}},
		Regions:    []Region{{Kind: ConductorRegion, Conductor: "s", Shape: Circle{R: 0.01}}},
	}
	p.Sides[Right] = Side{Kind: Open}
	p.Sides[Top] = Side{Kind: Open}
	p.Sides[Bottom] = Side{Kind: Fixed}
	q, err := ExtendOpen(p, 10)
	if err != nil {
		t.Fatal(err)
	}
	if want := (Rect{0, -0.03, 0.3, 0.3}); q.Domain != want {
		t.Errorf("extended domain %+v, want %+v (the fixed bottom stays)", q.Domain, want)
	}
	if q.Far == nil || *q.Far != (FarField{0, 0, 1}) || p.Far != nil || p.Domain.X1 != 0.03 {
		t.Errorf("far field %+v of the copy, original changed: %v", q.Far, p.Far != nil || p.Domain.X1 != 0.03)
	}
	if _, err := ExtendOpen(p, 0.5); !errors.Is(err, ErrProblem) {
		t.Errorf("factor below 1: got %v", err)
	}
}

func TestEllipse(t *testing.T) {
	e := Ellipse{X: 1, Y: 2, A: 0.5, B: 2}
	for _, c := range []struct {
		x, y float64
		in   bool
	}{{1, 2, true}, {1.5, 2, true}, {1, 4, true}, {1.51, 2, false}, {1, 4.01, false}, {1.4, 3.5, false}, {1.3, 3.1, true}} {
		if got := e.Contains(c.x, c.y); got != c.in {
			t.Errorf("Contains(%g, %g) = %v, want %v", c.x, c.y, got, c.in)
		}
	}
	if x0, y0, x1, y1 := e.Bounds(); x0 != 0.5 || y0 != 0 || x1 != 1.5 || y1 != 4 {
		t.Errorf("Bounds = %g, %g, %g, %g", x0, y0, x1, y1)
	}
	for _, bad := range []Ellipse{{A: 0, B: 1}, {A: 1, B: -1}, {A: math.Inf(1), B: 1}} {
		if bad.Validate() == nil {
			t.Errorf("%+v validated", bad)
		}
	}
	// A spheroid centred on the axis is a valid r–z shape.
	p := &Problem{
		Metric:     grid.Axisymmetric,
		Domain:     Rect{0, -1, 1, 1},
		Conductors: []Conductor{{Name: "s", Potential: 1}},
		Regions:    []Region{{Kind: ConductorRegion, Conductor: "s", Shape: Ellipse{A: 0.2, B: 0.5}}},
	}
	p.Sides[Right] = Side{Kind: Fixed}
	if err := p.Validate(); err != nil {
		t.Errorf("spheroid on the axis: %v", err)
	}
}
