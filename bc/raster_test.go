package bc

import (
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/phigrid/phigrid/grid"
)

func testGrid(t *testing.T, x0, x1 float64, nx int, y0, y1 float64, ny int, m grid.Metric) *grid.Grid {
	t.Helper()
	x, err := grid.Uniform(x0, x1, nx)
	if err != nil {
		t.Fatal(err)
	}
	y, err := grid.Uniform(y0, y1, ny)
	if err != nil {
		t.Fatal(err)
	}
	g, err := grid.New(x, y, m)
	if err != nil {
		t.Fatal(err)
	}
	return g
}

func TestRasterizeCutFractions(t *testing.T) {
	// A disk of radius 0.3 at the origin on a grid of spacing 0.1: node
	// (0.2, 0.2) is inside (r = 0.283) and its +x neighbour (0.3, 0.2) at
	// r = 0.361 is free, so the surface cuts that link where
	// x = √(0.09−0.04).
	p := &Problem{
		Domain:     Rect{0, 0, 1, 1},
		Conductors: []Conductor{{Name: "c", Potential: 1}},
		Regions:    []Region{{Kind: ConductorRegion, Conductor: "c", Shape: Circle{0, 0, 0.3}}},
	}
	g := testGrid(t, 0, 1, 11, 0, 1, 11, grid.Planar)
	m, err := Rasterize(p, g, nil)
	if err != nil {
		t.Fatal(err)
	}
	in := g.Index(2, 2)
	if m.Kind[in] != OnConductor || m.Cond[in] != 0 {
		t.Fatalf("node (0.2, 0.2) should be on the conductor")
	}
	// Cut fraction measured from the free node (0.3, 0.2) toward (0.2, 0.2).
	want := (0.3 - math.Sqrt(0.09-0.04)) / 0.1 // common practice: circle–line intersection
	if got := m.CutX[in]; math.Abs(got-want) > 1e-9 {
		t.Errorf("cut fraction %g, want %g", got, want)
	}
	if m.CutX[g.Index(6, 6)] != 1 || m.CutY[g.Index(6, 6)] != 1 {
		t.Error("an uncut link has a cut fraction")
	}
}

func TestRasterizeEpsilonAveraging(t *testing.T) {
	// A dielectric half-plane y < 0.25 cuts the cells of row 2 (0.2..0.3)
	// in half: their mean ε is (4+1)/2.
	p := &Problem{
		Domain:     Rect{0, 0, 1, 1},
		Conductors: []Conductor{{Name: "g"}},
		Regions:    []Region{{Kind: Dielectric, Shape: Rect{0, 0, 1, 0.25}, EpsR: 4}},
	}
	p.Sides[Bottom] = Side{Kind: Fixed, Conductor: "g"}
	g := testGrid(t, 0, 1, 11, 0, 1, 11, grid.Planar)
	m, err := Rasterize(p, g, nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		j    int
		want float64
	}{{0, 4}, {1, 4}, {2, 2.5}, {3, 1}} {
		if got := m.Eps[g.CellIndex(5, c.j)]; math.Abs(got-c.want) > 1e-12 {
			t.Errorf("cell row %d: ε = %g, want %g", c.j, got, c.want)
		}
	}
}

func TestRasterizeOverrides(t *testing.T) {
	// A grounded block with an air hole cut by a later dielectric region
	// and an electrode inside it.
	p := &Problem{
		Domain:     Rect{0, 0, 1, 1},
		Conductors: []Conductor{{Name: "gnd"}, {Name: "hv", Potential: 5}},
		Regions: []Region{
			{Kind: ConductorRegion, Conductor: "gnd", Shape: Rect{0, 0, 1, 1}},
			{Kind: Dielectric, Shape: Rect{0.2, 0.2, 0.8, 0.8}, EpsR: 2},
			{Kind: ConductorRegion, Conductor: "hv", Shape: Circle{0.5, 0.5, 0.1}},
		},
	}
	g := testGrid(t, 0, 1, 21, 0, 1, 21, grid.Planar)
	m, err := Rasterize(p, g, nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		i, j int
		kind NodeKind
		cond int32
	}{
		{0, 0, OnConductor, 0}, {5, 5, Free, -1}, {10, 10, OnConductor, 1}, {6, 10, Free, -1},
	} {
		n := g.Index(c.i, c.j)
		if m.Kind[n] != c.kind || m.Cond[n] != c.cond {
			t.Errorf("node (%d,%d): kind %d cond %d, want %d %d", c.i, c.j, m.Kind[n], m.Cond[n], c.kind, c.cond)
		}
	}
	if got := m.Eps[g.CellIndex(7, 7)]; got != 2 {
		t.Errorf("hole ε = %g, want 2", got)
	}
}

func TestRasterizeErrors(t *testing.T) {
	base := func() *Problem {
		return &Problem{
			Domain:     Rect{0, 0, 1, 1},
			Conductors: []Conductor{{Name: "a", Potential: 1}, {Name: "b"}},
			Regions: []Region{
				{Kind: ConductorRegion, Conductor: "a", Shape: Circle{0.3, 0.5, 0.1}},
				{Kind: ConductorRegion, Conductor: "b", Shape: Circle{0.7, 0.5, 0.1}},
			},
		}
	}
	for _, c := range []struct {
		reason string
		edit   func(p *Problem)
		want   string
	}{
		{"overlap at different potentials", func(p *Problem) { p.Regions[1].Shape = Circle{0.35, 0.5, 0.1} }, `"a" and "b" overlap`},
		{"undefined conductor", func(p *Problem) { p.Regions[1].Conductor = "c" }, `"c", which is not defined`},
		{"unused conductor", func(p *Problem) { p.Conductors = append(p.Conductors, Conductor{Name: "d"}) }, `"d" has no region`},
		{"bad permittivity", func(p *Problem) {
			p.Regions = append(p.Regions, Region{Kind: Dielectric, Shape: Rect{0, 0, 1, 1}, EpsR: -2})
		}, "permittivity > 0"},
		{"shape outside", func(p *Problem) { p.Regions[0].Shape = Circle{3, 3, 0.1} }, "outside the domain"},
		{"nothing fixed", func(p *Problem) { p.Conductors[0].Floating, p.Conductors[1].Floating = true, true }, "nothing has a fixed potential"},
		{"duplicate", func(p *Problem) { p.Conductors[1].Name = "a"; p.Regions[1].Conductor = "a" }, "defined twice"},
	} {
		p := base()
		c.edit(p)
		g := testGrid(t, 0, 1, 21, 0, 1, 21, grid.Planar)
		_, err := Rasterize(p, g, nil)
		if err == nil || !errors.Is(err, ErrProblem) || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: got %v, want an ErrProblem containing %q", c.reason, err, c.want)
		}
	}
}

func TestRasterizeAxisymmetric(t *testing.T) {
	p := &Problem{
		Metric:     grid.Axisymmetric,
		Domain:     Rect{0, -1, 1, 1},
		Conductors: []Conductor{{Name: "s", Potential: 1}},
		Regions:    []Region{{Kind: ConductorRegion, Conductor: "s", Shape: Circle{0, 0, 0.3}}},
	}
	p.Sides[Right] = Side{Kind: Fixed}
	g := testGrid(t, 0, 1, 11, -1, 1, 21, grid.Axisymmetric)
	if _, err := Rasterize(p, g, nil); err != nil {
		t.Fatalf("sphere on the axis: %v", err)
	}
	p.Sides[Left] = Side{Kind: Fixed}
	if _, err := Rasterize(p, g, nil); err == nil || !strings.Contains(err.Error(), "axis") {
		t.Errorf("fixed potential on the axis accepted: %v", err)
	}
	p.Sides[Left] = Side{}
	p.Regions[0].Shape = Rect{-0.2, 0, 0.3, 0.2}
	if _, err := Rasterize(p, g, nil); err == nil || !strings.Contains(err.Error(), "r = -0.2") {
		t.Errorf("shape at r < 0 accepted: %v", err)
	}
}

func TestThinStripClaimsNodes(t *testing.T) {
	// A zero-thickness strip between grid lines still claims one row.
	p := &Problem{
		Domain:     Rect{0, 0, 1, 1},
		Conductors: []Conductor{{Name: "s", Potential: 1}},
		Regions:    []Region{{Kind: ConductorRegion, Conductor: "s", Shape: Strip{0.2, 0.53, 0.8, 0.53, 0}}},
	}
	g := testGrid(t, 0, 1, 11, 0, 1, 11, grid.Planar)
	m, err := Rasterize(p, g, nil)
	if err != nil {
		t.Fatal(err)
	}
	for i := 0; i < 11; i++ {
		for j := 0; j < 11; j++ {
			want := j == 5 && i >= 2 && i <= 8
			if got := m.Kind[g.Index(i, j)] == OnConductor; got != want {
				t.Errorf("node (%d,%d): on strip %v, want %v", i, j, got, want)
			}
		}
	}
}

func TestPointChargeConserved(t *testing.T) {
	p := &Problem{
		Domain:  Rect{0, 0, 1, 1},
		Charges: []PointCharge{{X: 0.33, Y: 0.71, Q: 2e-9}, {X: 1, Y: 1, Q: 1e-9}},
	}
	p.Sides[Left] = Side{Kind: Fixed}
	g := testGrid(t, 0, 1, 11, 0, 1, 11, grid.Planar)
	m, err := Rasterize(p, g, nil)
	if err != nil {
		t.Fatal(err)
	}
	var sum float64
	for _, q := range m.Point {
		sum += q
	}
	if math.Abs(sum-3e-9) > 1e-20 {
		t.Errorf("deposited charge %g, want 3e-9", sum)
	}
}

func TestAutoGrid(t *testing.T) {
	p := &Problem{
		Domain:     Rect{0, 0, 0.1, 0.05},
		Conductors: []Conductor{{Name: "c", Potential: 1}},
		Regions:    []Region{{Kind: ConductorRegion, Conductor: "c", Shape: Circle{0.05, 0.025, 0.005}}},
	}
	p.Sides[Bottom] = Side{Kind: Fixed}
	g, err := AutoGrid(p, Mesh{Cell: 0.005})
	if err != nil {
		t.Fatal(err)
	}
	lo, hi := g.MinMaxStep()
	if lo > 0.005/4*(1+1e-9) || hi > 0.005*(1+1e-9) {
		t.Errorf("steps %g..%g, want ≤ %g near features and ≤ %g elsewhere", lo, hi, 0.005/4, 0.005)
	}
	if _, err := AutoGrid(p, Mesh{Cell: 1e-6, MaxNodes: 1000}); !errors.Is(err, ErrTooLarge) {
		t.Errorf("over the node cap: got %v", err)
	}
}
