package field

import (
	"math"
	"testing"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
)

// faceSums returns Σ σ·Area over the points of conductor k facing up
// (Ny > 0.5), facing down (Ny < −0.5) and facing sideways.
func faceSums(pts []SurfacePoint) (up, down, side float64) {
	for _, p := range pts {
		q := p.Sigma * p.Area
		switch {
		case p.Ny > 0.5:
			up += q
		case p.Ny < -0.5:
			down += q
		default:
			side += q
		}
	}
	return up, down, side
}

// TestSurfaceFieldStripPlates: a zero-thickness strip across the whole
// width of a box between grounded plates, with zero-flux sides, is a pair
// of parallel-plate capacitors; the discrete potential is linear in y, so
// both faces carry the exact field V/gap and σ = ε0·εr·V/gap, and
// Σ σ·Area equals the charge of the discrete Gauss law to round-off. The
// strip lies on a grid line or between two (then its nodes are claimed and
// the face is the node row), over air or over a laminate.
func TestSurfaceFieldStripPlates(t *testing.T) {
	const w, d, n = 4e-3, 2e-3, 21
	h := d / (n - 1)
	for _, c := range []struct {
		name   string
		y      float64 // strip height
		yFace  float64 // the node row that holds the strip
		epsLow float64 // εr below the strip
	}{
		{"on a grid line", d / 2, d / 2, 1},
		{"between grid lines", d/2 + 0.3*h, d / 2, 1},
		{"on a laminate", d / 2, d / 2, 4},
	} {
		t.Run(c.name, func(t *testing.T) {
			p := &bc.Problem{
				Domain:     bc.Rect{X0: 0, Y0: 0, X1: w, Y1: d},
				Conductors: []bc.Conductor{{Name: "strip", Potential: 1}, {Name: "gnd"}},
			}
			if c.epsLow != 1 {
				p.Regions = append(p.Regions, bc.Region{Kind: bc.Dielectric, Shape: bc.Rect{X0: 0, Y0: 0, X1: w, Y1: c.y}, EpsR: c.epsLow})
			}
			p.Regions = append(p.Regions, bc.Region{Kind: bc.ConductorRegion, Conductor: "strip", Shape: bc.Strip{X0: 0, Y0: c.y, X1: w, Y1: c.y}})
			p.Sides[bc.Top] = bc.Side{Kind: bc.Fixed, Conductor: "gnd"}
			p.Sides[bc.Bottom] = bc.Side{Kind: bc.Fixed, Conductor: "gnd"}
			g := mustGrid(t, uniform(t, 0, w, n), uniform(t, 0, d, n), grid.Planar)
			sol := mustSolve(t, p, g, nil)
			// Closed form of the discrete problem: linear potential over
			// each gap. source: Griffiths, Introduction to Electrodynamics, Gauss's law, E = V/gap
			eUp, eDown := 1/(d-c.yFace), 1/c.yFace
			pts := sol.SurfaceField(0)
			var nUp, nDown int
			for _, q := range pts {
				want, eps := eUp, 1.0
				if q.Ny < 0 {
					want, eps = eDown, c.epsLow
					nDown++
				} else {
					nUp++
				}
				if q.Nx != 0 || math.Abs(q.Ny) != 1 || math.Abs(q.Y-c.yFace) > 1e-15 {
					t.Errorf("point (%g, %g) with normal (%g, %g), want on y = %g facing ±y", q.X, q.Y, q.Nx, q.Ny, c.yFace)
				}
				if relErr(q.En, want) > 1e-9 {
					t.Errorf("En = %.10g V/m at (%g, %g) facing %+g, want %.10g", q.En, q.X, q.Y, q.Ny, want)
				}
				if relErr(q.Sigma, eps0*eps*want) > 1e-9 {
					t.Errorf("σ = %g at (%g, %g) facing %+g, want ε0·%g·En = %g", q.Sigma, q.X, q.Y, q.Ny, eps, eps0*eps*want)
				}
			}
			if nUp != n || nDown != n {
				t.Errorf("%d points facing up and %d facing down, want %d each (one per strip node)", nUp, nDown, n)
			}
			up, down, side := faceSums(pts)
			if side != 0 {
				t.Errorf("sideways points carry %g C/m, want none", side)
			}
			if relErr(up, eps0*eUp*w) > 1e-9 || relErr(down, eps0*c.epsLow*eDown*w) > 1e-9 {
				t.Errorf("face charges %g (up) and %g (down) C/m, want %g and %g", up, down, eps0*eUp*w, eps0*c.epsLow*eDown*w)
			}
			q := sol.Charges()
			if relErr(up+down, q[0]) > 1e-9 {
				t.Errorf("Σ σ·Area = %.10g C/m, Gauss-law charge %.10g C/m", up+down, q[0])
			}
			var gnd float64
			for _, p := range sol.SurfaceField(1) {
				gnd += p.Sigma * p.Area
			}
			if relErr(gnd, q[1]) > 1e-9 {
				t.Errorf("ground: Σ σ·Area = %.10g C/m, Gauss-law charge %.10g C/m", gnd, q[1])
			}
		})
	}
}

// TestSurfaceFieldStripInBox: a finite zero-thickness strip in the middle
// of a grounded square box. By symmetry about the strip's plane both faces
// carry the same field point by point and the same charge. Σ σ·Area over
// the faces and ends exceeds the Gauss-law charge by the truncation error
// of the one-sided differences at the knife edges, where the field grows
// like r^(−1/2): the excess shrinks like h^(1/2) under refinement.
func TestSurfaceFieldStripInBox(t *testing.T) {
	const a, l = 1e-3, 2e-3
	var excess []float64
	for _, n := range []int{41, 81} {
		p := &bc.Problem{
			Domain:     bc.Rect{X0: -l, Y0: -l, X1: l, Y1: l},
			Conductors: []bc.Conductor{{Name: "strip", Potential: 1}, {Name: "box"}},
			Regions:    []bc.Region{{Kind: bc.ConductorRegion, Conductor: "strip", Shape: bc.Strip{X0: -a, Y0: 0, X1: a, Y1: 0}}},
		}
		for s := range p.Sides {
			p.Sides[s] = bc.Side{Kind: bc.Fixed, Conductor: "box"}
		}
		g := mustGrid(t, uniform(t, -l, l, n), uniform(t, -l, l, n), grid.Planar)
		sol := mustSolve(t, p, g, nil)
		pts := sol.SurfaceField(0)
		up := map[float64]float64{}
		down := map[float64]float64{}
		ends := 0
		for _, q := range pts {
			switch {
			case q.Ny == 1:
				up[q.X] = q.En
			case q.Ny == -1:
				down[q.X] = q.En
			case math.Abs(q.Nx) == 1 && math.Abs(math.Abs(q.X)-a) < 1e-12:
				ends++
			default:
				t.Errorf("point (%g, %g) with normal (%g, %g) is neither on a face nor at an end", q.X, q.Y, q.Nx, q.Ny)
			}
			if q.Y != 0 {
				t.Errorf("point (%g, %g) off the strip", q.X, q.Y)
			}
		}
		// One point on either face of each of the 2a/h + 1 strip nodes.
		if want := (n-1)/2 + 1; len(up) != want || len(down) != want || ends != 2 {
			t.Errorf("%d nodes: %d points facing up, %d down, %d at the ends; want %d, %d, 2", n, len(up), len(down), ends, want, want)
		}
		for x, e := range up {
			if relErr(down[x], e) > 1e-8 {
				t.Errorf("%d nodes, x = %g: En = %.10g V/m above, %.10g below", n, x, e, down[x])
			}
		}
		u, d, s := faceSums(pts)
		if relErr(u, d) > 1e-8 {
			t.Errorf("%d nodes: the faces carry %.10g and %.10g C/m, want equal charges", n, u, d)
		}
		q := sol.Charges()
		total := u + d + s
		t.Logf("%d nodes: faces %.6g and %.6g C/m, ends %.3g C/m; Σ σ·Area = %.6g, Gauss-law charge %.6g (ratio %.4f)", n, u, d, s, total, q[0], total/q[0])
		excess = append(excess, total/q[0]-1)
		var box float64
		for _, p := range sol.SurfaceField(1) {
			box += p.Sigma * p.Area
		}
		// The walls carry a smooth field: the second-order differences and
		// the Gauss law's two-point fluxes differ by O(h²).
		if relErr(box, q[1]) > 5e-3 {
			t.Errorf("%d nodes, box: Σ σ·Area = %.6g C/m, Gauss-law charge %.6g", n, box, q[1])
		}
	}
	// 40 cells across the strip leave about 6 %; halving h divides the
	// excess by about √2.
	if !(excess[1] > 0 && excess[1] < 0.07) {
		t.Errorf("Σ σ·Area exceeds the Gauss-law charge by %.3g on the finer grid, want (0, 0.07)", excess[1])
	}
	if r := excess[1] / excess[0]; !(r > 0.6 && r < 0.8) {
		t.Errorf("the excess fell by a factor %.3g when h halved, want about 1/√2 (0.6 to 0.8)", r)
	}
}

// TestSurfaceFieldMicrostrip: the board trace of examples/microstrip, w/h
// = 2 on FR-4 in a grounded box with a symmetry plane through the trace.
// The trace gets points on both faces and at its edge; their charge
// matches the Gauss-law charge within a few per cent (the edge singularity
// limits it), and the ground plane's and box walls' matches closely.
func TestSurfaceFieldMicrostrip(t *testing.T) {
	const mm = 1e-3
	p := &bc.Problem{
		Domain:     bc.Rect{X0: 0, Y0: 0, X1: 8 * mm, Y1: 8 * mm},
		Conductors: []bc.Conductor{{Name: "ground"}, {Name: "trace", Potential: 1}},
		Regions: []bc.Region{
			{Name: "substrate", Kind: bc.Dielectric, Shape: bc.Rect{X0: 0, Y0: 0, X1: 8 * mm, Y1: 0.8 * mm}, EpsR: 4.4},
			{Name: "trace", Kind: bc.ConductorRegion, Conductor: "trace", Shape: bc.Strip{X0: 0, Y0: 0.8 * mm, X1: 0.8 * mm, Y1: 0.8 * mm}},
		},
	}
	for _, s := range []int{bc.Bottom, bc.Right, bc.Top} {
		p.Sides[s] = bc.Side{Kind: bc.Fixed, Conductor: "ground"}
	}
	g, err := bc.AutoGrid(p, bc.Mesh{Cell: 0.1 * mm, Refine: 5})
	if err != nil {
		t.Fatal(err)
	}
	sol := mustSolve(t, p, g, nil)
	q := sol.Charges()
	trace := sol.SurfaceField(1)
	u, d, s := faceSums(trace)
	total := u + d + s
	t.Logf("%d × %d nodes; trace: top %.5g, bottom %.5g, edge %.3g C/m; Σ σ·Area = %.5g, Gauss-law charge %.5g (ratio %.4f)",
		g.Nx(), g.Ny(), u, d, s, total, q[1], total/q[1])
	if !(u > 0 && d > u && s > 0) {
		t.Errorf("trace faces carry %g (top), %g (bottom), %g (edge) C/m; want all positive, most on the bottom", u, d, s)
	}
	if relErr(total, q[1]) > 0.05 {
		t.Errorf("trace: Σ σ·Area = %.5g C/m, want the Gauss-law charge %.5g within 5 %%", total, q[1])
	}
	var gnd float64
	for _, p := range sol.SurfaceField(0) {
		gnd += p.Sigma * p.Area
	}
	if relErr(gnd, q[0]) > 1e-3 {
		t.Errorf("ground: Σ σ·Area = %.6g C/m, Gauss-law charge %.6g", gnd, q[0])
	}
}

// TestOnFace checks which links count as faces of their conductor: those
// of thin strips, anchors and conductor sides do; those where a body's
// surface passes through the conductor node do not.
func TestOnFace(t *testing.T) {
	const l, n = 1e-3, 11
	h := l / (n - 1)
	box := func(regions ...bc.Region) *bc.Problem {
		p := &bc.Problem{
			Domain:     bc.Rect{X0: 0, Y0: 0, X1: l, Y1: l},
			Conductors: []bc.Conductor{{Name: "c", Potential: 1}, {Name: "gnd"}},
			Regions:    regions,
		}
		p.Sides[bc.Bottom] = bc.Side{Kind: bc.Fixed, Conductor: "gnd"}
		return p
	}
	cond := func(s bc.Shape) bc.Region { return bc.Region{Kind: bc.ConductorRegion, Conductor: "c", Shape: s} }
	for _, c := range []struct {
		name        string
		p           *bc.Problem
		k           int
		faces, rest int // links that are faces, links with a crossing
	}{
		{"strip on a grid line", box(cond(bc.Strip{X0: 3 * h, Y0: 5 * h, X1: 7 * h, Y1: 5 * h})), 0, 12, 0},
		{"strip between grid lines", box(cond(bc.Strip{X0: 3 * h, Y0: 5.2 * h, X1: 7 * h, Y1: 5.2 * h, Thickness: 0.1 * h})), 0, 12, 0},
		{"anchor", box(cond(bc.Circle{X: 5.3 * h, Y: 5.3 * h, R: 0.05 * h})), 0, 4, 0},
		{"conductor side", box(cond(bc.Circle{X: 5 * h, Y: 5 * h, R: 1.5 * h})), 1, n, 0},
		{"square on grid lines", box(cond(bc.Rect{X0: 3 * h, Y0: 3 * h, X1: 6 * h, Y1: 6 * h})), 0, 0, 16},
		{"circle through nodes", box(cond(bc.Circle{X: 5 * h, Y: 5 * h, R: 2 * h})), 0, 0, -1},
	} {
		t.Run(c.name, func(t *testing.T) {
			g := mustGrid(t, uniform(t, 0, l, n), uniform(t, 0, l, n), grid.Planar)
			sol := mustSolve(t, c.p, g, nil)
			var faces, rest int
			sol.eachSurfaceLink(c.k, func(sl surfaceLink) {
				if sl.face {
					faces++
				} else {
					rest++
				}
			})
			if faces != c.faces || (c.rest >= 0 && rest != c.rest) || (c.rest < 0 && rest == 0) {
				t.Errorf("%d faces and %d crossings, want %d and %d", faces, rest, c.faces, c.rest)
			}
		})
	}
}
