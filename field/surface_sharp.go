package field

import (
	"math"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
)

// This file finds the sharp features of conductors, where the field is
// singular (it grows like ρ^(−1/2) at a knife edge and
// like ρ^(−1/3) at a convex right-angled corner), so that a peak found
// next to one can be marked as not converged.

// sharpAngle is the largest interior angle of a conductor corner, as seen
// from the conductor, that counts as sharp; vertices within five degrees
// of straight (a fine polygon standing in for a curve) count as smooth.
const sharpAngle = 175 * math.Pi / 180

// sharpSamples is the number of directions sampled about a feature to
// find how much of its surroundings is conductor.
const sharpSamples = 144

// sharpReach is the distance, in local cells, within which a peak counts
// as lying at a sharp feature.
const sharpReach = 2

// sharpFeature is the position of a sharp edge or corner.
type sharpFeature struct{ x, y float64 }

// featureScene answers what lies around a point once the boundary
// conditions are applied beyond the domain: mirror images across
// zero-flux and open sides (and the axis of an r–z problem), the side's
// conductor beyond a fixed side.
type featureScene struct {
	sol            *Solution
	rs             *regions
	x0, y0, x1, y1 float64
	tol            float64 // length below which two positions coincide
}

func (sol *Solution) featureScene() *featureScene {
	x0, y0, x1, y1 := sol.Grid.Bounds()
	return &featureScene{
		sol: sol, rs: newRegions(sol.Map),
		x0: x0, y0: y0, x1: x1, y1: y1,
		tol: 1e-9 * math.Max(x1-x0, y1-y0),
	}
}

// prescribed is what at returns beyond a fixed side without a conductor.
const prescribed = -2

// mirror reports whether side s mirrors the field: a zero-flux side is a
// symmetry plane, an open side continues the space beyond it, and in an
// r–z problem the axis is the body's centre line.
func (fs *featureScene) mirror(s int) bool {
	m := fs.sol.Map
	if s == bc.Left && m.Grid.Metric() == grid.Axisymmetric && fs.x0 == 0 {
		return true
	}
	k := m.Sides[s].Kind
	return k == bc.ZeroFlux || k == bc.Open
}

// sideConductor returns the conductor of fixed side s, or prescribed.
func (fs *featureScene) sideConductor(s int) int {
	name := fs.sol.Map.Sides[s].Conductor
	if name == "" {
		return prescribed
	}
	for k, c := range fs.sol.Map.Conductors {
		if c.Name == name {
			return k
		}
	}
	return prescribed
}

// at returns the conductor at (x, y), −1 for none and prescribed beyond
// a side at a given potential, leaving region skip out (−1 for none).
func (fs *featureScene) at(x, y float64, skip int) int {
	type beyond struct {
		out  bool
		side int
	}
	for _, b := range []beyond{{x < fs.x0, bc.Left}, {x > fs.x1, bc.Right}} {
		if !b.out {
			continue
		}
		if !fs.mirror(b.side) {
			return fs.sideConductor(b.side)
		}
		if b.side == bc.Left {
			x = 2*fs.x0 - x
		} else {
			x = 2*fs.x1 - x
		}
	}
	for _, b := range []beyond{{y < fs.y0, bc.Bottom}, {y > fs.y1, bc.Top}} {
		if !b.out {
			continue
		}
		if !fs.mirror(b.side) {
			return fs.sideConductor(b.side)
		}
		if b.side == bc.Bottom {
			y = 2*fs.y0 - y
		} else {
			y = 2*fs.y1 - y
		}
	}
	return fs.rs.at(x, y, skip)
}

// equipotential returns which conductors are at the potential of
// conductor k: k itself, and every other conductor held at the same
// fixed potential, for together they form one body.
func (fs *featureScene) equipotential(k int) []bool {
	cs := fs.sol.Map.Conductors
	eq := make([]bool, len(cs))
	for j, c := range cs {
		eq[j] = j == k || (!c.Floating && !cs[k].Floating && c.Potential == cs[k].Potential)
	}
	return eq
}

// fraction returns the share of a circle of radius rad about (x, y) that
// lies in the conductors eq, leaving region skip out.
func (fs *featureScene) fraction(x, y, rad float64, eq []bool, skip int) float64 {
	in := 0
	for s := range sharpSamples {
		sn, cs := math.Sincos((float64(s) + 0.5) * 2 * math.Pi / sharpSamples)
		if c := fs.at(x+rad*cs, y+rad*sn, skip); c >= 0 && eq[c] {
			in++
		}
	}
	return float64(in) / sharpSamples
}

// inside reports whether (x, y) lies in the closed domain.
func (fs *featureScene) inside(x, y float64) bool {
	return x >= fs.x0-fs.tol && x <= fs.x1+fs.tol && y >= fs.y0-fs.tol && y <= fs.y1+fs.tol
}

// cell returns the smaller and larger spacing of the grid cell at (x, y).
func (fs *featureScene) cell(x, y float64) (lo, hi float64) {
	g := fs.sol.Grid
	x = math.Min(fs.x1, math.Max(fs.x0, x))
	y = math.Min(fs.y1, math.Max(fs.y0, y))
	i, j, _, _, _ := g.Locate(x, y)
	xs, ys := g.X(), g.Y()
	i, j = min(i, len(xs)-2), min(j, len(ys)-2)
	hx, hy := xs[i+1]-xs[i], ys[j+1]-ys[j]
	return math.Min(hx, hy), math.Max(hx, hy)
}

// crowded reports whether anything but region n lies within rad of
// (x, y): a side of the domain or another region's bounding box. Only
// then does the neighbourhood of a corner need sampling.
func (fs *featureScene) crowded(x, y, rad float64, n int) bool {
	if x-fs.x0 < rad || fs.x1-x < rad || y-fs.y0 < rad || fs.y1-y < rad {
		return true
	}
	for o, r := range fs.sol.Map.Regions {
		if o == n || r.Shape == nil {
			continue
		}
		b := &fs.rs.box[o]
		if x >= b[0]-rad && x <= b[2]+rad && y >= b[1]-rad && y <= b[3]+rad {
			return true
		}
	}
	return false
}

// sharpFeatures returns the sharp features of conductor k: the ends of
// its strips (and of rectangles of zero width), the convex corners of its
// rectangles and polygons (interior angle below sharpAngle), and the
// corners where a side of the domain that k holds meets a side at another
// potential. What surrounds each candidate decides: an end or corner on a
// symmetry plane is continued by its mirror image (a strip that meets the
// plane square has no edge there, a rectangle's corner on it is half of a
// straight edge), and one that joins another part of the same or an
// equipotential conductor (a strip ending on a grounded wall it belongs
// to) is no edge either. Other conductors cannot touch a conductor side
// at a different potential (bc.Rasterize rejects it), so the domain
// corners are where a side at another potential meets it.
func (sol *Solution) sharpFeatures(k int, fs *featureScene) []sharpFeature {
	m := sol.Map
	if k < 0 || k >= len(m.Conductors) {
		return nil
	}
	eq := fs.equipotential(k)
	var out []sharpFeature
	for n, r := range m.Regions {
		if fs.rs.cond[n] != k || r.Shape == nil {
			continue
		}
		switch s := r.Shape.(type) {
		case bc.Strip:
			out = fs.stripEnds(out, n, s.X0, s.Y0, s.X1, s.Y1, s.Thickness, eq)
		case bc.Rect:
			w, h := s.X1-s.X0, s.Y1-s.Y0
			switch {
			case w > 0 && h > 0:
				xs := []float64{s.X0, s.X1, s.X1, s.X0}
				ys := []float64{s.Y0, s.Y0, s.Y1, s.Y1}
				for c := range 4 {
					out = fs.corner(out, n, xs[c], ys[c], math.Pi/2, math.Min(w, h), eq)
				}
			case w > 0 || h > 0:
				out = fs.stripEnds(out, n, s.X0, s.Y0, s.X1, s.Y1, 0, eq)
			default:
				if fs.inside(s.X0, s.Y0) {
					out = append(out, sharpFeature{s.X0, s.Y0})
				}
			}
		case bc.Polygon:
			out = fs.polygonCorners(out, n, s, eq)
		}
	}
	for s, side := range m.Sides {
		if side.Kind != bc.Fixed || fs.sideConductor(s) != k {
			continue
		}
		var ends [2][2]float64
		switch s {
		case bc.Left:
			ends = [2][2]float64{{fs.x0, fs.y0}, {fs.x0, fs.y1}}
		case bc.Right:
			ends = [2][2]float64{{fs.x1, fs.y0}, {fs.x1, fs.y1}}
		case bc.Bottom:
			ends = [2][2]float64{{fs.x0, fs.y0}, {fs.x1, fs.y0}}
		case bc.Top:
			ends = [2][2]float64{{fs.x0, fs.y1}, {fs.x1, fs.y1}}
		}
		for _, e := range ends {
			lo, _ := fs.cell(e[0], e[1])
			if f := fs.fraction(e[0], e[1], 0.25*lo, eq, -1); f < sharpAngle/(2*math.Pi) {
				out = append(out, sharpFeature{e[0], e[1]})
			}
		}
	}
	return out
}

// corner adds the corner (x, y) of region n, whose own interior angle is
// alpha and whose shortest adjacent edge is edge, when it is sharp in its
// surroundings.
func (fs *featureScene) corner(out []sharpFeature, n int, x, y, alpha, edge float64, eq []bool) []sharpFeature {
	if alpha >= sharpAngle || !fs.inside(x, y) {
		return out
	}
	lo, _ := fs.cell(x, y)
	rad := 0.25 * math.Min(lo, edge)
	if !fs.crowded(x, y, rad, n) {
		return append(out, sharpFeature{x, y})
	}
	f := fs.fraction(x, y, rad, eq, -1)
	if f == 0 {
		// Either a later region hides the corner, or the corner is finer
		// than the sampling: the corner itself tells.
		if c := fs.at(x, y, -1); c < 0 || !eq[c] {
			return out
		}
		return append(out, sharpFeature{x, y})
	}
	if f < sharpAngle/(2*math.Pi) {
		out = append(out, sharpFeature{x, y})
	}
	return out
}

// polygonCorners adds the convex corners of polygon region n.
func (fs *featureScene) polygonCorners(out []sharpFeature, n int, p bc.Polygon, eq []bool) []sharpFeature {
	nv := len(p.X)
	if nv < 3 || len(p.Y) != nv {
		return out
	}
	var area float64
	for i := range nv {
		j := (i + 1) % nv
		area += p.X[i]*p.Y[j] - p.X[j]*p.Y[i]
	}
	if area == 0 {
		return out
	}
	for i := range nv {
		a, c := (i+nv-1)%nv, (i+1)%nv
		e1x, e1y := p.X[a]-p.X[i], p.Y[a]-p.Y[i] // to the previous vertex
		e2x, e2y := p.X[c]-p.X[i], p.Y[c]-p.Y[i] // to the next vertex
		l1, l2 := math.Hypot(e1x, e1y), math.Hypot(e2x, e2y)
		if l1 == 0 || l2 == 0 {
			continue
		}
		// The interior lies on the left of each edge of a
		// counter-clockwise polygon: turning from the next edge to the
		// previous one counter-clockwise sweeps the interior angle.
		cross, dot := e2x*e1y-e2y*e1x, e2x*e1x+e2y*e1y
		if area < 0 {
			cross = -cross
		}
		alpha := math.Atan2(cross, dot)
		if alpha < 0 {
			alpha += 2 * math.Pi
		}
		out = fs.corner(out, n, p.X[i], p.Y[i], alpha, math.Min(l1, l2), eq)
	}
	return out
}

// stripEnds adds the ends of the strip region n from (x0, y0) to (x1, y1)
// with thickness t that are edges in their surroundings: not on a
// symmetry plane the strip meets square, and not joined to an
// equipotential body. A strip thinner than two cells has its edge at the
// end of its centre line; a thicker one has two corners there.
func (fs *featureScene) stripEnds(out []sharpFeature, n int, x0, y0, x1, y1, t float64, eq []bool) []sharpFeature {
	dx, dy := x1-x0, y1-y0
	l := math.Hypot(dx, dy)
	if l == 0 {
		return out
	}
	ux, uy := dx/l, dy/l
	for _, e := range [2][3]float64{{x0, y0, -1}, {x1, y1, 1}} {
		x, y := e[0], e[1]
		if !fs.inside(x, y) || fs.squareOnMirror(x, y, ux, uy) {
			continue
		}
		lo, _ := fs.cell(x, y)
		rad := 0.25 * math.Min(lo, l)
		if fs.crowded(x, y, rad, n) && fs.fraction(x, y, rad, eq, n) >= sharpAngle/(2*math.Pi) {
			continue // joined to a flat equipotential body
		}
		if t < 2*lo {
			out = append(out, sharpFeature{x, y})
		}
		if t > 0 {
			ox, oy := -0.5*t*uy, 0.5*t*ux
			out = append(out, sharpFeature{x + ox, y + oy}, sharpFeature{x - ox, y - oy})
		}
	}
	return out
}

// squareOnMirror reports whether (x, y) lies on a mirroring side (see
// mirror) that the direction (ux, uy) meets within two degrees of square,
// so that the mirror image continues a strip ending there.
func (fs *featureScene) squareOnMirror(x, y, ux, uy float64) bool {
	const square = 0.9993908270190958 // cos 2°
	type plane struct {
		on     bool
		side   int
		normal float64 // the direction's component across the plane
	}
	for _, p := range []plane{
		{math.Abs(x-fs.x0) <= fs.tol, bc.Left, ux},
		{math.Abs(x-fs.x1) <= fs.tol, bc.Right, ux},
		{math.Abs(y-fs.y0) <= fs.tol, bc.Bottom, uy},
		{math.Abs(y-fs.y1) <= fs.tol, bc.Top, uy},
	} {
		if p.on && fs.mirror(p.side) && math.Abs(p.normal) >= square {
			return true
		}
	}
	return false
}

// nearSharp reports whether (x, y) lies within sharpReach local cells of
// one of the features: cells measured at the feature or at the point,
// whichever are larger.
func (fs *featureScene) nearSharp(feats []sharpFeature, x, y float64) bool {
	_, hp := fs.cell(x, y)
	for _, f := range feats {
		_, hf := fs.cell(f.x, f.y)
		if math.Hypot(x-f.x, y-f.y) <= sharpReach*math.Max(hp, hf) {
			return true
		}
	}
	return false
}
