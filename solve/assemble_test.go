package solve

import (
	"math"
	"testing"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
)

func assembleProblem(t *testing.T, p *bc.Problem, nx, ny int) *System {
	t.Helper()
	d := p.Domain
	x, _ := grid.Uniform(d.X0, d.X1, nx)
	y, _ := grid.Uniform(d.Y0, d.Y1, ny)
	return buildSystem(t, p, x, y)
}

// TestFarCouplings: on a closed open boundary about the far-field centre
// the couplings add up to the flux of r̂/R through it, 2π·ε0 per metre of
// depth, every coupling is non-negative and sits on free nodes of open
// sides, and the diagonal stays dominant.
func TestFarCouplings(t *testing.T) {
	p := &bc.Problem{
		Domain:     bc.Rect{X0: -0.01, Y0: -0.01, X1: 0.01, Y1: 0.01},
		Conductors: []bc.Conductor{{Name: "a", Potential: 1}},
		Regions:    []bc.Region{{Kind: bc.ConductorRegion, Conductor: "a", Shape: bc.Circle{R: 0.002}}},
	}
	for s := range p.Sides {
		p.Sides[s] = bc.Side{Kind: bc.Open}
	}
	s := assembleProblem(t, p, 81, 81)
	if s.Far == nil {
		t.Fatal("no far couplings with open sides")
	}
	var sum float64
	for n, f := range s.Far {
		i, j := n%s.Nx, n/s.Nx
		onSide := i == 0 || j == 0 || i == s.Nx-1 || j == s.Ny-1
		if f < 0 || (f > 0 && (!onSide || s.Fixed[n])) {
			t.Fatalf("node (%d, %d): far coupling %g", i, j, f)
		}
		sum += f
	}
	// common practice: Gauss's theorem for the 2-D field r̂/R, ∮ n̂·r̂/R dl = 2π
	if e := math.Abs(sum/(2*math.Pi*Eps0) - 1); e > 1e-3 {
		t.Errorf("Σ Far = %.6g·2πε0, want 1 (rel err %.2g)", sum/(2*math.Pi*Eps0), e)
	}
	for n := range s.Diag {
		if s.Fixed[n] {
			continue
		}
		off := 0.0
		if n+1 < s.Len() {
			off += s.AX[n]
		}
		if n >= 1 {
			off += s.AX[n-1]
		}
		if n+s.Nx < s.Len() {
			off += s.AY[n]
		}
		if n >= s.Nx {
			off += s.AY[n-s.Nx]
		}
		if s.Diag[n] < off*(1-1e-12) {
			t.Fatalf("row %d: diagonal %g below the couplings' sum %g", n, s.Diag[n], off)
		}
	}
	// Without a fixed node the open sides alone make the system definite.
	p.Conductors[0].Floating = true
	if _, err := Assemble(mustMap(t, p, 21)); err != nil {
		t.Errorf("a floating conductor in open space: %v", err)
	}
}

func mustMap(t *testing.T, p *bc.Problem, n int) *bc.Map {
	t.Helper()
	d := p.Domain
	x, _ := grid.Uniform(d.X0, d.X1, n)
	y, _ := grid.Uniform(d.Y0, d.Y1, n)
	g, err := grid.New(x, y, p.Metric)
	if err != nil {
		t.Fatal(err)
	}
	m, err := bc.Rasterize(p, g, nil)
	if err != nil {
		t.Fatal(err)
	}
	return m
}

// TestCutRadialLink: in r–z a cut radial link has its face at the middle
// of the free part, so its coupling is 2π·r_mid'·w/(θh).
func TestCutRadialLink(t *testing.T) {
	p := &bc.Problem{
		Metric:     grid.Axisymmetric,
		Domain:     bc.Rect{X0: 0, Y0: -0.01, X1: 0.01, Y1: 0.01},
		Conductors: []bc.Conductor{{Name: "a", Potential: 1}},
		Regions:    []bc.Region{{Kind: bc.ConductorRegion, Conductor: "a", Shape: bc.Circle{R: 0.00537}}},
	}
	p.Sides[bc.Right] = bc.Side{Kind: bc.Fixed}
	s := assembleProblem(t, p, 21, 41)
	m := s.Map
	g := s.Grid
	xs := g.X()
	j := 20 // z = 0
	found := false
	for i := 0; i+1 < g.Nx(); i++ {
		n := g.Index(i, j)
		if m.Kind[n] == bc.OnConductor && m.Kind[n+1] == bc.Free {
			theta := m.CutX[n]
			h := xs[i+1] - xs[i]
			// The free node is at the larger radius; the surface at
			// r = 5.37 mm.
			rmid := xs[i+1] - 0.5*theta*h
			lo, hi := g.DualY(j)
			// common practice: finite-volume flux through an annular face, ε0·2πr·(face height)/(θh)
			want := Eps0 * 2 * math.Pi * rmid * (lo + hi) / (theta * h)
			if math.Abs(s.LinkX[n]/want-1) > 1e-12 {
				t.Errorf("cut radial link coupling %g, want %g", s.LinkX[n], want)
			}
			if math.Abs(xs[i+1]-theta*h-0.00537) > 1e-12 {
				t.Errorf("cut at r = %g, want 5.37 mm", xs[i+1]-theta*h)
			}
			found = true
		}
	}
	if !found {
		t.Fatal("no cut radial link found")
	}
}

// TestDirectionalHalves: the assembly reads EpsX and EpsY half by half.
func TestDirectionalHalves(t *testing.T) {
	x, _ := grid.Uniform(0, 1, 3)
	g, _ := grid.New(x, x, grid.Planar)
	m := &bc.Map{Grid: g, Kind: make([]bc.NodeKind, g.Len()), Cond: make([]int32, g.Len()), Value: make([]float64, g.Len()),
		Eps: make([]float64, g.Cells()), CutX: make([]float64, g.Len()), CutY: make([]float64, g.Len()),
		EpsX: make([]float64, 2*g.Cells()), EpsY: make([]float64, 2*g.Cells())}
	for i := range m.CutX {
		m.CutX[i], m.CutY[i], m.Cond[i] = 1, 1, -1
	}
	for c := range m.Eps {
		m.Eps[c] = 1
		m.EpsX[2*c], m.EpsX[2*c+1] = float64(10*c+1), float64(10*c+2)
		m.EpsY[2*c], m.EpsY[2*c+1] = float64(10*c+3), float64(10*c+4)
	}
	m.Kind[0], m.Value[0] = bc.Prescribed, 1
	s, err := Assemble(m)
	if err != nil {
		t.Fatal(err)
	}
	// The X-link from node (0, 1) to (1, 1) crosses the upper half of
	// cell 0 and the lower half of cell 2, each half a cell high (0.25).
	want := Eps0 * (0.25*2 + 0.25*21) / 0.5
	if got := s.LinkX[g.Index(0, 1)]; math.Abs(got/want-1) > 1e-12 {
		t.Errorf("X-link coupling %g, want %g", got, want)
	}
	// The Y-link from node (1, 0) to (1, 1) crosses the right half of cell
	// 0 and the left half of cell 1.
	want = Eps0 * (0.25*4 + 0.25*13) / 0.5
	if got := s.LinkY[g.Index(1, 0)]; math.Abs(got/want-1) > 1e-12 {
		t.Errorf("Y-link coupling %g, want %g", got, want)
	}
}
