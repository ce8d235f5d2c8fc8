package field

import (
	"context"
	"math"
	"sort"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
)

// TestSharpFeatures checks which ends and corners count as sharp: free
// strip ends and convex corners do; ends and corners that a symmetry
// plane's mirror image continues, that join an equipotential body, or
// that are re-entrant or nearly straight do not.
func TestSharpFeatures(t *testing.T) {
	const l = 1.0 // the domain is the unit square; the grid has 0.05 cells
	type pt = sharpFeature
	cond := func(name string, s bc.Shape) bc.Region {
		return bc.Region{Kind: bc.ConductorRegion, Conductor: name, Shape: s}
	}
	circle := bc.Polygon{}
	for i := range 100 {
		s, c := math.Sincos(2 * math.Pi * float64(i) / 100)
		circle.X = append(circle.X, 0.5+0.2*c)
		circle.Y = append(circle.Y, 0.5+0.2*s)
	}
	zero, fixed := bc.Side{}, bc.Side{Kind: bc.Fixed, Conductor: "gnd"}
	for _, c := range []struct {
		name    string
		reason  string
		metric  grid.Metric
		regions []bc.Region
		sides   [4]bc.Side // left, right, bottom, top
		k       string     // the conductor examined; "" means "c"
		want    []pt
	}{
		{name: "free strip", reason: "both ends are knife edges",
			regions: []bc.Region{cond("c", bc.Strip{X0: 0.2, Y0: 0.5, X1: 0.8, Y1: 0.5})},
			want:    []pt{{0.2, 0.5}, {0.8, 0.5}}},
		{name: "half strip on a symmetry plane", reason: "the mirror continues the strip square to the plane",
			regions: []bc.Region{cond("c", bc.Strip{X0: 0, Y0: 0.5, X1: 0.4, Y1: 0.5})},
			want:    []pt{{0.4, 0.5}}},
		{name: "oblique strip on a symmetry plane", reason: "the mirror makes a kink",
			regions: []bc.Region{cond("c", bc.Strip{X0: 0, Y0: 0.5, X1: 0.4, Y1: 0.7})},
			want:    []pt{{0, 0.5}, {0.4, 0.7}}},
		{name: "thick strip", reason: "a strip thicker than two cells has two corners at each end",
			regions: []bc.Region{cond("c", bc.Strip{X0: 0.2, Y0: 0.5, X1: 0.8, Y1: 0.5, Thickness: 0.2})},
			want:    []pt{{0.2, 0.4}, {0.2, 0.6}, {0.8, 0.4}, {0.8, 0.6}}},
		{name: "strip on its own wall", reason: "a strip standing on the grounded wall it belongs to has one free end",
			regions: []bc.Region{cond("gnd", bc.Strip{X0: 0.5, Y0: 0, X1: 0.5, Y1: 0.3})}, k: "gnd",
			sides: [4]bc.Side{zero, zero, fixed, zero},
			want:  []pt{{0.5, 0.3}}},
		{name: "strip on an equipotential wall", reason: "another conductor at the same potential joins the strip",
			regions: []bc.Region{cond("c", bc.Strip{X0: 0.5, Y0: 0, X1: 0.5, Y1: 0.3})},
			sides:   [4]bc.Side{zero, zero, {Kind: bc.Fixed, Conductor: "a"}, zero},
			want:    []pt{{0.5, 0.3}}},
		{name: "rectangle", reason: "four convex right angles",
			regions: []bc.Region{cond("c", bc.Rect{X0: 0.2, Y0: 0.3, X1: 0.6, Y1: 0.7})},
			want:    []pt{{0.2, 0.3}, {0.2, 0.7}, {0.6, 0.3}, {0.6, 0.7}}},
		{name: "rectangle on a symmetry plane", reason: "the corners on the plane are halves of a straight edge",
			regions: []bc.Region{cond("c", bc.Rect{X0: 0, Y0: 0.3, X1: 0.6, Y1: 0.7})},
			want:    []pt{{0.6, 0.3}, {0.6, 0.7}}},
		{name: "rectangle in the corner of two symmetry planes", reason: "three corners are mirrored away",
			regions: []bc.Region{cond("c", bc.Rect{X0: 0, Y0: 0, X1: 0.6, Y1: 0.7})},
			want:    []pt{{0.6, 0.7}}},
		{name: "rectangle on its own wall", reason: "the corners on the wall are re-entrant",
			regions: []bc.Region{cond("gnd", bc.Rect{X0: 0.2, Y0: 0, X1: 0.6, Y1: 0.3})}, k: "gnd",
			sides: [4]bc.Side{zero, zero, fixed, zero},
			want:  []pt{{0.2, 0.3}, {0.6, 0.3}}},
		{name: "two rectangles in an L", reason: "a corner on the other rectangle's edge is straight, the re-entrant one is no vertex",
			regions: []bc.Region{cond("c", bc.Rect{X0: 0.2, Y0: 0.2, X1: 0.8, Y1: 0.5}), cond("c", bc.Rect{X0: 0.2, Y0: 0.2, X1: 0.5, Y1: 0.8})},
			want:    []pt{{0.2, 0.2}, {0.2, 0.8}, {0.5, 0.8}, {0.8, 0.2}, {0.8, 0.5}}},
		{name: "L-shaped polygon", reason: "five convex corners, one re-entrant",
			regions: []bc.Region{cond("c", bc.Polygon{X: []float64{0.2, 0.8, 0.8, 0.5, 0.5, 0.2}, Y: []float64{0.2, 0.2, 0.5, 0.5, 0.8, 0.8}})},
			want:    []pt{{0.2, 0.2}, {0.2, 0.8}, {0.5, 0.8}, {0.8, 0.2}, {0.8, 0.5}}},
		{name: "clockwise triangle", reason: "orientation does not matter",
			regions: []bc.Region{cond("c", bc.Polygon{X: []float64{0.2, 0.5, 0.8}, Y: []float64{0.2, 0.8, 0.2}})},
			want:    []pt{{0.2, 0.2}, {0.5, 0.8}, {0.8, 0.2}}},
		{name: "fine polygon", reason: "a 100-gon standing in for a circle turns 3.6° per vertex",
			regions: []bc.Region{cond("c", circle)}},
		{name: "side meeting a prescribed side", reason: "the potential jumps at the corner",
			regions: []bc.Region{cond("c", bc.Circle{X: 0.5, Y: 0.5, R: 0.1})}, k: "gnd",
			sides: [4]bc.Side{{Kind: bc.Fixed, Potential: 0.5}, zero, fixed, zero},
			want:  []pt{{0, 0}}},
		{name: "side meeting its own side", reason: "a grounded corner of the box is re-entrant",
			regions: []bc.Region{cond("c", bc.Circle{X: 0.5, Y: 0.5, R: 0.1})}, k: "gnd",
			sides: [4]bc.Side{zero, fixed, fixed, zero}},
		{name: "disc in r–z", reason: "a strip from the axis is a disc: its only edge is the rim",
			metric:  grid.Axisymmetric,
			regions: []bc.Region{cond("c", bc.Strip{X0: 0, Y0: 0.5, X1: 0.4, Y1: 0.5})},
			sides:   [4]bc.Side{zero, fixed, fixed, fixed},
			want:    []pt{{0.4, 0.5}}},
	} {
		t.Run(c.name, func(t *testing.T) {
			p := &bc.Problem{
				Metric:  c.metric,
				Domain:  bc.Rect{X0: 0, Y0: 0, X1: l, Y1: l},
				Regions: c.regions,
				Sides:   c.sides,
			}
			open := true
			for _, sd := range c.sides {
				open = open && sd.Kind == bc.ZeroFlux
			}
			if open {
				p.Sides[bc.Top] = fixed // something to hold the potential
			}
			// The conductors the case uses: "c" and "a" at 1 V, "gnd" at 0 V.
			used := map[string]bool{}
			for _, r := range p.Regions {
				used[r.Conductor] = true
			}
			for _, sd := range p.Sides {
				used[sd.Conductor] = true
			}
			for _, name := range []string{"c", "gnd", "a"} {
				if used[name] {
					v := 1.0
					if name == "gnd" {
						v = 0
					}
					p.Conductors = append(p.Conductors, bc.Conductor{Name: name, Potential: v})
				}
			}
			name := c.k
			if name == "" {
				name = "c"
			}
			g := mustGrid(t, uniform(t, 0, l, 21), uniform(t, 0, l, 21), c.metric)
			m, err := bc.Rasterize(p, g, nil)
			if err != nil {
				t.Fatal(err)
			}
			sol := &Solution{Grid: g, Map: m}
			got := sol.sharpFeatures(p.ConductorIndex(name), sol.featureScene())
			sortFeatures(got)
			got = dedupFeatures(got)
			if d := cmp.Diff(c.want, got, cmp.AllowUnexported(sharpFeature{}), cmpopts.EquateApprox(0, 1e-12), cmpopts.EquateEmpty()); d != "" {
				t.Errorf("%s: sharp features differ (-want +got):\n%s", c.reason, d)
			}
		})
	}
}

func sortFeatures(f []sharpFeature) {
	sort.Slice(f, func(i, j int) bool {
		if f[i].x != f[j].x {
			return f[i].x < f[j].x
		}
		return f[i].y < f[j].y
	})
}

func dedupFeatures(f []sharpFeature) []sharpFeature {
	var out []sharpFeature
	for _, v := range f {
		if n := len(out); n > 0 && math.Hypot(out[n-1].x-v.x, out[n-1].y-v.y) < 1e-12 {
			continue
		}
		out = append(out, v)
	}
	return out
}

// TestPeakSharp: the peak on a trace lies at its edge and is marked; the
// peaks on the ground plane under it and on a smooth cylinder are not.
func TestPeakSharp(t *testing.T) {
	const mm = 1e-3
	p := &bc.Problem{
		Domain:     bc.Rect{X0: 0, Y0: 0, X1: 4 * mm, Y1: 4 * mm},
		Conductors: []bc.Conductor{{Name: "ground"}, {Name: "trace", Potential: 1}},
		Regions: []bc.Region{
			{Name: "substrate", Kind: bc.Dielectric, Shape: bc.Rect{X0: 0, Y0: 0, X1: 4 * mm, Y1: 0.5 * mm}, EpsR: 4},
			{Kind: bc.ConductorRegion, Conductor: "trace", Shape: bc.Strip{X0: 0, Y0: 0.5 * mm, X1: 1 * mm, Y1: 0.5 * mm}},
		},
	}
	for _, s := range []int{bc.Bottom, bc.Right, bc.Top} {
		p.Sides[s] = bc.Side{Kind: bc.Fixed, Conductor: "ground"}
	}
	g := mustGrid(t, uniform(t, 0, 4*mm, 81), uniform(t, 0, 4*mm, 81), grid.Planar)
	sol := mustSolve(t, p, g, nil)
	tr := sol.PeakSurfaceField(1)
	if !tr.Sharp || math.Hypot(tr.X-1*mm, tr.Y-0.5*mm) > 2*0.05*mm {
		t.Errorf("trace peak %+v, want it marked sharp at the edge (1, 0.5) mm", tr)
	}
	if gnd := sol.PeakSurfaceField(0); gnd.Sharp || gnd.Value == 0 {
		t.Errorf("ground peak %+v, want an unmarked peak", gnd)
	}
	for _, pk := range sol.PeakRegionFields() {
		// Both materials meet the trace's edge, where the field is largest.
		if !pk.Sharp {
			t.Errorf("%s: peak %+v, want it marked sharp", pk.Where, pk)
		}
	}

	cyl := cylinderInField(5e-3, 1000, 15e-3, 0)
	sol = mustSolve(t, cyl, ladder(t, cyl, 0.5e-3, 1)[0], nil)
	if err := sol.RefineSurface(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	if pk := sol.PeakSurfaceField(0); pk.Sharp {
		t.Errorf("cylinder peak %+v marked sharp", pk)
	}
	for _, pk := range sol.PeakRegionFields() {
		if pk.Sharp {
			t.Errorf("%s: peak %+v marked sharp", pk.Where, pk)
		}
	}
}
