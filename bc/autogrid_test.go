package bc

import (
	"errors"
	"math"
	"testing"

	"github.com/phigrid/phigrid/grid"
)

// cellsIn counts the cells of axis a that overlap (lo, hi).
func cellsIn(a []float64, lo, hi float64) int {
	n := 0
	for i := 0; i+1 < len(a); i++ {
		if a[i+1] > lo+1e-12 && a[i] < hi-1e-12 {
			n++
		}
	}
	return n
}

// maxStep returns the largest step of axis a within [lo, hi].
func maxStep(a []float64, lo, hi float64) float64 {
	var h float64
	for i := 0; i+1 < len(a); i++ {
		if a[i+1] > lo && a[i] < hi {
			h = math.Max(h, a[i+1]-a[i])
		}
	}
	return h
}

// hasNode reports whether axis a has a node at v.
func hasNode(a []float64, v float64) bool {
	for _, x := range a {
		if math.Abs(x-v) < 1e-12 {
			return true
		}
	}
	return false
}

func TestAutoGridRules(t *testing.T) {
	const cell = 1e-3
	for _, c := range []struct {
		reason string
		p      *Problem
		mesh   Mesh
		check  func(t *testing.T, g *grid.Grid)
	}{
		{
			reason: "the narrow gap of an eccentric coax gets Gap cells along the axis it runs on",
			p: &Problem{
				Domain:     Rect{-3.2e-3, -3.2e-3, 3.2e-3, 3.2e-3},
				Conductors: []Conductor{{Name: "in", Potential: 1}, {Name: "out"}},
				Regions: []Region{
					{Kind: ConductorRegion, Conductor: "out", Shape: Annulus{R0: 3e-3, R1: 1}},
					{Kind: ConductorRegion, Conductor: "in", Shape: Circle{X: 1.5e-3, R: 1e-3}},
				},
			},
			mesh: Mesh{Cell: cell, Gap: 6},
			check: func(t *testing.T, g *grid.Grid) {
				if n := cellsIn(g.X(), 2.5e-3, 3e-3); n < 6 {
					t.Errorf("%d cells across the 0.5 mm gap, want ≥ 6", n)
				}
			},
		},
		{
			reason: "a thin slab between two plates gets Gap cells across, and a wire near a fixed side too",
			p: &Problem{
				Domain:     Rect{0, 0, 0.02, 0.01},
				Conductors: []Conductor{{Name: "w", Potential: 1}, {Name: "g"}},
				Regions: []Region{
					{Kind: Dielectric, Shape: Rect{0, 0.002, 0.02, 0.0022}, EpsR: 3},
					{Kind: ConductorRegion, Conductor: "w", Shape: Circle{X: 0.01, Y: 0.0065, R: 0.003}},
				},
				Sides: [4]Side{Bottom: {Kind: Fixed, Conductor: "g"}, Top: {Kind: Fixed, Conductor: "g"}},
			},
			mesh: Mesh{Cell: cell},
			check: func(t *testing.T, g *grid.Grid) {
				if n := cellsIn(g.Y(), 0.002, 0.0022); n < 4 {
					t.Errorf("%d cells across the 0.2 mm slab, want ≥ 4", n)
				}
				if n := cellsIn(g.Y(), 0.0095, 0.01); n < 4 {
					t.Errorf("%d cells across the 0.5 mm gap to the top, want ≥ 4", n)
				}
				if !hasNode(g.Y(), 0.002) || !hasNode(g.Y(), 0.0022) {
					t.Error("the slab's faces are not grid lines")
				}
			},
		},
		{
			reason: "conductor corners get Cell/(Refine·Corner), and round conductors are resolved all round",
			p: &Problem{
				Domain:     Rect{0, 0, 0.02, 0.02},
				Conductors: []Conductor{{Name: "b", Potential: 1}, {Name: "r", Potential: 1}},
				Regions: []Region{
					{Kind: ConductorRegion, Conductor: "b", Shape: Rect{0.003, 0.003, 0.007, 0.007}},
					{Kind: ConductorRegion, Conductor: "r", Shape: Circle{X: 0.014, Y: 0.014, R: 0.003}},
				},
				Sides: [4]Side{Left: {Kind: Fixed}},
			},
			mesh: Mesh{Cell: cell},
			check: func(t *testing.T, g *grid.Grid) {
				// The cells next to a focus point follow the allowed size at
				// their middle, so they may exceed it by up to the ratio.
				if h := maxStep(g.X(), 0.007-1e-9, 0.007+1e-9); h > 1.2*cell/8 {
					t.Errorf("step %g at the corner, want about %g", h, cell/8)
				}
				// R/16 < Cell/4: the whole circle at the fine size.
				if h := maxStep(g.X(), 0.011, 0.017); h > cell/4*(1+1e-9) {
					t.Errorf("step %g over the circle, want ≤ %g", h, cell/4)
				}
			},
		},
		{
			reason: "toward open sides the cells grow past Cell in a far region",
			p: &Problem{
				Metric:     grid.Axisymmetric,
				Domain:     Rect{0, -0.2, 0.2, 0.2},
				Conductors: []Conductor{{Name: "s", Potential: 1}},
				Regions:    []Region{{Kind: ConductorRegion, Conductor: "s", Shape: Circle{R: 0.01}}},
				Sides:      [4]Side{Right: {Kind: Open}, Bottom: {Kind: Open}, Top: {Kind: Open}},
			},
			mesh: Mesh{Cell: cell},
			check: func(t *testing.T, g *grid.Grid) {
				x := g.X()
				last := x[len(x)-1] - x[len(x)-2]
				// The far region grows toward the cap of 4 target cells.
				if last < 2*cell || last > 4*cell*(1+1e-9) {
					t.Errorf("last cell %g toward the open side, want a far region grown to at most %g", last, 4*cell)
				}
				if h := maxStep(x, 0, 0.01); h > cell {
					t.Errorf("step %g near the sphere, want ≤ %g", h, cell)
				}
				for i := 2; i < len(x); i++ {
					if r := (x[i] - x[i-1]) / (x[i-1] - x[i-2]); r > 1.2*(1+1e-6) || r < 1/1.2/(1+1e-6) {
						t.Fatalf("cells %d and %d differ by a factor %g, above the ratio 1.2", i-2, i-1, r)
					}
				}
				if n := g.Nx(); n > 80 {
					t.Errorf("%d nodes along r for a 20R far region, want a graded one (≤ 80)", n)
				}
			},
		},
	} {
		t.Run(c.reason, func(t *testing.T) {
			g, err := AutoGrid(c.p, c.mesh)
			if err != nil {
				t.Fatal(err)
			}
			t.Logf("%d × %d nodes", g.Nx(), g.Ny())
			c.check(t, g)
			if est := EstimateNodes(c.p, c.mesh); est != float64(g.Len()) {
				t.Errorf("EstimateNodes = %g, AutoGrid made %d", est, g.Len())
			}
		})
	}
}

func TestAutoGridErrors(t *testing.T) {
	p := &Problem{
		Domain:     Rect{0, 0, 1, 1},
		Conductors: []Conductor{{Name: "c", Potential: 1}},
		Regions:    []Region{{Kind: ConductorRegion, Conductor: "c", Shape: Circle{0.5, 0.5, 0.1}}},
	}
	for _, c := range []struct {
		reason string
		mesh   Mesh
		want   error
	}{
		{"zero cell", Mesh{}, ErrProblem},
		{"refinement below 1", Mesh{Cell: 0.1, Refine: 0.5}, ErrProblem},
		{"ratio above 3", Mesh{Cell: 0.1, Ratio: 4}, ErrProblem},
		{"negative gap", Mesh{Cell: 0.1, Gap: -1}, ErrProblem},
		{"corner below 1", Mesh{Cell: 0.1, Corner: 0.5}, ErrProblem},
		{"over the cap, quickly even for an absurd cell", Mesh{Cell: 1e-12, MaxNodes: 1000}, ErrTooLarge},
	} {
		if _, err := AutoGrid(p, c.mesh); !errors.Is(err, c.want) {
			t.Errorf("%s: got %v, want %v", c.reason, err, c.want)
		}
	}
	if est := EstimateNodes(p, Mesh{}); !math.IsInf(est, 1) {
		t.Errorf("EstimateNodes of an invalid mesh = %g, want +Inf", est)
	}
}
