package plot

import (
	"image/color"
	"math"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/field"
	"github.com/phigrid/phigrid/grid"
	"github.com/phigrid/phigrid/solve"
)

// surfaceElement is a short piece of conductor surface: its midpoint, its
// outward unit normal, its length, and the surface charge it carries per
// unit length of the picture plane divided by ε₀ (ε_r·Eₙ·ds, in volts).
type surfaceElement struct {
	p      pt
	nx, ny float64
	ds     float64
	q      float64
	cond   int
}

// seed is the start of a field line.
type seed struct {
	p      pt
	nx, ny float64 // outward normal of the surface
	sign   float64 // +1 traces along E (positive surface charge), −1 against
	cond   int
}

// tracer follows field lines through a solution.
type tracer struct {
	sol  *field.Solution
	fs   *fieldSampler
	p    *bc.Problem
	sc   *scene
	peak float64 // largest |E| at a node, for the stall test
	// shown, when set, reports whether a point is in the picture: see
	// lines.
	shown func(x, y float64) bool
}

func newTracer(sol *field.Solution, p *bc.Problem, sc *scene) *tracer {
	t := &tracer{sol: sol, fs: newFieldSampler(sol), p: p, sc: sc}
	for n := range t.fs.ex {
		t.peak = math.Max(t.peak, math.Hypot(t.fs.ex[n], t.fs.ey[n]))
	}
	return t
}

// localStep returns the smaller spacing of the grid cell at (x, y).
func localStep(g *grid.Grid, x, y float64) float64 {
	i, j, _, _, ok := g.Locate(x, y)
	if !ok {
		lo, _ := g.MinMaxStep()
		return lo
	}
	xs, ys := g.X(), g.Y()
	i, j = min(i, len(xs)-2), min(j, len(ys)-2)
	return math.Min(xs[i+1]-xs[i], ys[j+1]-ys[j])
}

// surface returns the surface elements of every conductor: the outline
// runs of its regions that face a dielectric, both faces and the ends of
// its strips thinner than the scene draws them, and its sides of the
// domain. The charge of an element comes from the normal field half a
// cell outside it.
func (t *tracer) surface(seg float64) [][]surfaceElement {
	out := make([][]surfaceElement, len(t.p.Conductors))
	g := t.sol.Grid
	add := func(k int, a, b pt, nx, ny float64) {
		m := pt{0.5 * (a.x + b.x), 0.5 * (a.y + b.y)}
		ds := math.Hypot(b.x-a.x, b.y-a.y)
		off := 0.5 * localStep(g, m.x, m.y)
		q := pt{m.x + off*nx, m.y + off*ny}
		ex, ey, ok := t.fs.at(q.x, q.y)
		if !ok {
			return
		}
		mat := t.sc.at(q.x, q.y)
		if mat.cond >= 0 {
			return
		}
		out[k] = append(out[k], surfaceElement{p: m, nx: nx, ny: ny, ds: ds, q: mat.eps * (ex*nx + ey*ny) * ds, cond: k})
	}
	for _, b := range t.sc.boundaries(seg) {
		if b.kind != edgeConductor || !b.inside || b.cond < 0 {
			continue
		}
		n := len(b.pts) - 1
		if b.closed {
			n = len(b.pts)
		}
		for i := range n {
			a, c := b.pts[i], b.pts[(i+1)%len(b.pts)]
			l := math.Hypot(c.x-a.x, c.y-a.y)
			if l == 0 {
				continue
			}
			add(b.cond, a, c, (c.y-a.y)/l, -(c.x-a.x)/l)
		}
	}
	// A strip thinner than the scene's strips has no outline run of its
	// own; its surface is the outline of the strip as the scene sees it,
	// where that belongs to the strip's conductor.
	for n, r := range t.p.Regions {
		st, ok := r.Shape.(bc.Strip)
		k := t.sc.condIdx[n]
		if !ok || k < 0 || t.sc.stripHalf <= 0.5*st.Thickness {
			continue
		}
		rg := subdivide(stripRing(st, 2*t.sc.stripHalf), seg)
		for i := range rg {
			a, c := rg[i], rg[(i+1)%len(rg)]
			l := math.Hypot(c.x-a.x, c.y-a.y)
			if l == 0 {
				continue
			}
			nx, ny := (c.y-a.y)/l, -(c.x-a.x)/l
			in := 0.5 * t.sc.stripHalf
			if t.sc.at(0.5*(a.x+c.x)-in*nx, 0.5*(a.y+c.y)-in*ny).cond != k {
				continue // hidden by a later region
			}
			add(k, a, c, nx, ny)
		}
	}
	d := t.p.Domain
	for s, side := range t.p.Sides {
		if side.Kind != bc.Fixed || side.Conductor == "" {
			continue
		}
		k := t.p.ConductorIndex(side.Conductor)
		var a, b pt
		var nx, ny float64
		switch s {
		case bc.Left:
			a, b, nx = pt{d.X0, d.Y0}, pt{d.X0, d.Y1}, 1
		case bc.Right:
			a, b, nx = pt{d.X1, d.Y0}, pt{d.X1, d.Y1}, -1
		case bc.Bottom:
			a, b, ny = pt{d.X0, d.Y0}, pt{d.X1, d.Y0}, 1
		case bc.Top:
			a, b, ny = pt{d.X0, d.Y1}, pt{d.X1, d.Y1}, -1
		}
		l := math.Hypot(b.x-a.x, b.y-a.y)
		n := int(math.Ceil(l / seg))
		for i := range n {
			p0 := pt{a.x + (b.x-a.x)*float64(i)/float64(n), a.y + (b.y-a.y)*float64(i)/float64(n)}
			p1 := pt{a.x + (b.x-a.x)*float64(i+1)/float64(n), a.y + (b.y-a.y)*float64(i+1)/float64(n)}
			// Only where the side faces a dielectric, not another
			// conductor's region.
			m := pt{0.5*(p0.x+p1.x) + t.sc.eps*nx, 0.5*(p0.y+p1.y) + t.sc.eps*ny}
			if t.sc.at(m.x, m.y).cond >= 0 {
				continue
			}
			add(k, p0, p1, nx, ny)
		}
	}
	for k := range out {
		t.refine(k, out[k])
	}
	return out
}

// refine replaces the charge of every surface element of conductor k by
// the mean of the solution's own surface field (field.SurfaceField, second
// order at each link crossing) over the crossings within one and a half
// cells, weighted by a tent in the distance. Elements with no crossing
// nearby keep their first estimate.
func (t *tracer) refine(k int, es []surfaceElement) {
	sp := t.sol.SurfaceField(k)
	if len(sp) == 0 || len(es) == 0 {
		return
	}
	_, hmax := t.sol.Grid.MinMaxStep()
	cell := 1.5 * hmax
	type key struct{ i, j int }
	buckets := map[key][]int{}
	for n, p := range sp {
		kk := key{int(math.Floor(p.X / cell)), int(math.Floor(p.Y / cell))}
		buckets[kk] = append(buckets[kk], n)
	}
	for i := range es {
		e := &es[i]
		r := 1.5 * localStep(t.sol.Grid, e.p.x, e.p.y)
		bi, bj := int(math.Floor(e.p.x/cell)), int(math.Floor(e.p.y/cell))
		var sw, sv float64
		for di := -1; di <= 1; di++ {
			for dj := -1; dj <= 1; dj++ {
				for _, n := range buckets[key{bi + di, bj + dj}] {
					p := sp[n]
					d := math.Hypot(p.X-e.p.x, p.Y-e.p.y)
					if d >= r || p.Nx*e.nx+p.Ny*e.ny < 0.5 {
						continue
					}
					w := 1 - d/r
					sw += w
					sv += w * p.Sigma / solve.Eps0
				}
			}
		}
		if sw > 0 {
			e.q = sv / sw * e.ds
		}
	}
}

// seeds distributes about n field-line starts over the conductor surfaces
// in proportion to the surface charge: every conductor gets a number of
// seeds proportional to the total |charge| on its surface, one per equal
// share, each at the middle of its share along the surface. The share is
// set so that the positively charged surfaces get n seeds (the negative
// ones when nothing is positive).
func (t *tracer) seeds(elems [][]surfaceElement, n int) ([]seed, []int) {
	var pos, neg float64
	for _, es := range elems {
		for _, e := range es {
			if e.q > 0 {
				pos += e.q
			} else {
				neg -= e.q
			}
		}
	}
	share := pos / float64(n)
	if !(pos > 0) {
		share = neg / float64(n)
	}
	counts := make([]int, len(elems))
	if !(share > 0) {
		return nil, counts
	}
	var out []seed
	for k, es := range elems {
		var w float64
		for _, e := range es {
			w += math.Abs(e.q)
		}
		m := int(math.Round(w / share))
		if m == 0 {
			continue
		}
		step := w / float64(m)
		next := 0.5 * step
		var acc float64
		for _, e := range es {
			a := math.Abs(e.q)
			for acc+a >= next && len(out) < 1<<20 {
				sgn := 1.0
				if e.q < 0 {
					sgn = -1
				}
				out = append(out, seed{p: e.p, nx: e.nx, ny: e.ny, sign: sgn, cond: k})
				counts[k]++
				next += step
			}
			acc += a
		}
	}
	return out, counts
}

// lineEnd says why a field line stopped.
type lineEnd int

const (
	endLength    lineEnd = iota // reached the length limit
	endConductor                // reached a conductor
	endEdge                     // left the domain through a side that is not a conductor
	endStall                    // the field vanished
)

// fieldLine is a traced line in model coordinates, from its seed.
type fieldLine struct {
	pts  []pt
	sign float64
	end  lineEnd
}

// trace follows the field from s: along E for a positive seed, against
// it for a negative one, by classical fourth-order Runge–Kutta steps on
// the unit direction field with the step adapted to the local cell size
// and to the turning of the line.
func (t *tracer) trace(s seed) fieldLine {
	g := t.sol.Grid
	d := t.p.Domain
	ext := math.Max(d.X1-d.X0, d.Y1-d.Y0)
	maxLen := 3 * ((d.X1 - d.X0) + (d.Y1 - d.Y0))
	hmax := ext / 150
	off := 1e-3 * localStep(g, s.p.x, s.p.y)
	p := pt{s.p.x + off*s.nx, s.p.y + off*s.ny}
	line := fieldLine{pts: []pt{s.p, p}, sign: s.sign}
	dir := func(q pt) (float64, float64, bool) {
		q = clampToDomain(q, d)
		ex, ey, ok := t.fs.at(q.x, q.y)
		if !ok {
			return 0, 0, false
		}
		m := math.Hypot(ex, ey)
		if !(m > 1e-9*t.peak) {
			return 0, 0, false
		}
		return s.sign * ex / m, s.sign * ey / m, true
	}
	h := 0.25 * localStep(g, p.x, p.y)
	var length float64
	stuck := 0
	for range 40000 {
		if length >= maxLen {
			line.end = endLength
			return line
		}
		h = math.Min(h, math.Min(hmax, 0.4*localStep(g, p.x, p.y)))
		k1x, k1y, ok := dir(p)
		if !ok {
			if d.Contains(p.x, p.y) {
				line.end = endStall
			} else {
				line.end = endEdge
			}
			return line
		}
		var q pt
		for {
			q, ok = rk4(dir, p, h, k1x, k1y)
			if ok {
				// Turning test: the direction at the new point.
				if nx, ny, ok2 := dir(q); ok2 && nx*k1x+ny*k1y < math.Cos(0.12) && h > 1e-4*ext {
					h *= 0.5
					continue
				}
				break
			}
			// A stage fell where the field vanishes: inside a conductor
			// the line has arrived; elsewhere try a shorter step.
			e := pt{p.x + h*k1x, p.y + h*k1y}
			if t.sc.at(e.x, e.y).cond >= 0 {
				q, ok = e, true
				break
			}
			if h < 1e-4*ext {
				break
			}
			h *= 0.5
		}
		if !ok {
			line.end = endStall
			return line
		}
		if !d.Contains(q.x, q.y) {
			if !t.mirrorsOnly(q) {
				// Leave through the domain edge.
				e := clipToDomain(p, q, d)
				line.pts = append(line.pts, e)
				line.end = t.edgeEnd(e)
				return line
			}
			// A zero-flux side is a symmetry plane: no line crosses it,
			// so a step over it is round-off; move back onto it. A line
			// that keeps pressing into it makes no progress and stops.
			q = clampToDomain(q, d)
			if math.Hypot(q.x-p.x, q.y-p.y) < 0.1*h {
				stuck++
				if stuck > 3 {
					line.end = endEdge
					return line
				}
			} else {
				stuck = 0
			}
		}
		if t.sc.at(q.x, q.y).cond >= 0 {
			// Find the surface by bisection.
			a, b := p, q
			for range 30 {
				m := pt{0.5 * (a.x + b.x), 0.5 * (a.y + b.y)}
				if t.sc.at(m.x, m.y).cond >= 0 {
					b = m
				} else {
					a = m
				}
			}
			line.pts = append(line.pts, b)
			line.end = endConductor
			return line
		}
		length += math.Hypot(q.x-p.x, q.y-p.y)
		line.pts = append(line.pts, q)
		p = q
		h *= 1.3
	}
	line.end = endLength
	return line
}

// rk4 takes one step of length h along the unit field dir from p, whose
// direction there is (kx, ky).
func rk4(dir func(pt) (float64, float64, bool), p pt, h, kx, ky float64) (pt, bool) {
	k2x, k2y, ok := dir(pt{p.x + 0.5*h*kx, p.y + 0.5*h*ky})
	if !ok {
		return pt{}, false
	}
	k3x, k3y, ok := dir(pt{p.x + 0.5*h*k2x, p.y + 0.5*h*k2y})
	if !ok {
		return pt{}, false
	}
	k4x, k4y, ok := dir(pt{p.x + h*k3x, p.y + h*k3y})
	if !ok {
		return pt{}, false
	}
	return pt{p.x + h/6*(kx+2*k2x+2*k3x+k4x), p.y + h/6*(ky+2*k2y+2*k3y+k4y)}, true
}

// clampToDomain returns the point of the domain nearest q.
func clampToDomain(q pt, d bc.Rect) pt {
	return pt{math.Min(d.X1, math.Max(d.X0, q.x)), math.Min(d.Y1, math.Max(d.Y0, q.y))}
}

// mirrorsOnly reports whether every side of the domain that q lies
// beyond is a zero-flux side.
func (t *tracer) mirrorsOnly(q pt) bool {
	d := t.p.Domain
	beyond := [4]bool{
		bc.Left:   q.x < d.X0,
		bc.Right:  q.x > d.X1,
		bc.Bottom: q.y < d.Y0,
		bc.Top:    q.y > d.Y1,
	}
	for s, b := range beyond {
		if b && t.p.Sides[s].Kind != bc.ZeroFlux {
			return false
		}
	}
	return true
}

// clipToDomain returns where the segment from a (inside) towards b first
// meets the domain's edge, or b when it stays inside.
func clipToDomain(a, b pt, d bc.Rect) pt {
	t := 1.0
	dx, dy := b.x-a.x, b.y-a.y
	if dx < 0 {
		t = math.Min(t, (d.X0-a.x)/dx)
	} else if dx > 0 {
		t = math.Min(t, (d.X1-a.x)/dx)
	}
	if dy < 0 {
		t = math.Min(t, (d.Y0-a.y)/dy)
	} else if dy > 0 {
		t = math.Min(t, (d.Y1-a.y)/dy)
	}
	t = math.Max(0, t)
	return pt{a.x + t*dx, a.y + t*dy}
}

// edgeEnd classifies a line that stopped at the domain edge point e: on a
// conductor side it reached a conductor.
func (t *tracer) edgeEnd(e pt) lineEnd {
	d := t.p.Domain
	tol := 1e-9 * math.Max(d.X1-d.X0, d.Y1-d.Y0)
	on := [4]bool{
		bc.Left:   math.Abs(e.x-d.X0) <= tol,
		bc.Right:  math.Abs(e.x-d.X1) <= tol,
		bc.Bottom: math.Abs(e.y-d.Y0) <= tol,
		bc.Top:    math.Abs(e.y-d.Y1) <= tol,
	}
	for s, side := range t.p.Sides {
		if on[s] && side.Kind == bc.Fixed && side.Conductor != "" {
			return endConductor
		}
	}
	return endEdge
}

// lines traces from every seed and keeps what the picture needs: every
// line from a positive surface, and those from negative surfaces that do
// not end on a conductor (the rest retrace flux already drawn from the
// other end), or end on one outside the picture, which starts no lines.
func (t *tracer) lines(seeds []seed) []fieldLine {
	var out []fieldLine
	for _, s := range seeds {
		l := t.trace(s)
		if s.sign < 0 && l.end == endConductor {
			e := l.pts[len(l.pts)-1]
			if t.shown == nil || t.shown(e.x, e.y) {
				continue
			}
		}
		if len(l.pts) >= 2 {
			out = append(out, l)
		}
	}
	return out
}

func (f *figure) prepareLines() {
	lo, hi := f.potentialRange()
	var cs contourSet
	if hi > lo {
		levels, _ := f.equipotentials(lo, hi)
		cs = f.contours(levels)
	}
	tr := newTracer(f.sol, f.p, f.sc)
	elems := tr.surface(f.segment())
	if f.windowed() {
		tr.shown = f.inWindow
		// Seeds only on the surfaces in the picture; the lines are still
		// traced through the whole domain.
		for k, es := range elems {
			kept := es[:0]
			for _, e := range es {
				if f.inWindow(e.p.x, e.p.y) {
					kept = append(kept, e)
				}
			}
			elems[k] = kept
		}
	}
	seeds, _ := tr.seeds(elems, f.o.Lines)
	lines := tr.lines(seeds)
	if f.windowed() {
		// A line that leaves the picture ends there.
		shown := lines[:0]
		for _, l := range lines {
			if l.pts = clipLineToExit(l.pts, f.window()); len(l.pts) >= 2 {
				shown = append(shown, l)
			}
		}
		lines = shown
	}
	f.lines = lines
	if len(lines) == 0 {
		f.notes = append(f.notes, "No conductor surface carries charge, so no field lines start.")
	}
	f.layers = append(f.layers,
		func(v *view) {
			v.c.SetColor(white)
			v.c.Fill(v.c.Rectangle.Path())
		},
		f.contourLayer(cs, 0.6, func(float64) color.Color { return faint }, func(float64) string { return "" }),
		func(v *view) {
			ls := draw.LineStyle{Color: ink, Width: 0.9}
			for _, l := range lines {
				pts := make([]vg.Point, len(l.pts))
				for i, p := range l.pts {
					pts[i] = v.pt(p)
				}
				v.c.StrokeLines(ls, pts)
				chevron(v.c, pts, l.sign, vg.Length(0.45*f.fs))
			}
		},
		rasterLayer(f.conductorMask),
		f.outlineLayer(),
		f.nameLayer(),
	)
	detail := "from the conductors, one per equal share of surface charge: line density shows the flux density εE"
	if f.p.Metric == grid.Axisymmetric {
		detail = "from the conductors, one per equal share of surface charge in the r–z plane: density at a surface shows its charge"
	}
	f.heading("Electric field lines", detail)
}

// chevron draws a small arrowhead at the middle of a line pointing along
// E: along the line for sign > 0, against it otherwise.
func chevron(c draw.Canvas, pts []vg.Point, sign float64, size vg.Length) {
	cum := arcLengths(pts)
	total := cum[len(cum)-1]
	if total < 4*size {
		return
	}
	a := pointAt(pts, cum, 0.5*total-0.5*size)
	b := pointAt(pts, cum, 0.5*total+0.5*size)
	if sign < 0 {
		a, b = b, a
	}
	dx, dy := float64(b.X-a.X), float64(b.Y-a.Y)
	l := math.Hypot(dx, dy)
	if l == 0 {
		return
	}
	ux, uy := dx/l, dy/l
	hw := 0.5 * float64(size)
	tip := b
	back := vg.Point{X: b.X - vg.Length(float64(size)*ux), Y: b.Y - vg.Length(float64(size)*uy)}
	var p vg.Path
	p.Move(tip)
	p.Line(vg.Point{X: back.X - vg.Length(hw*uy), Y: back.Y + vg.Length(hw*ux)})
	p.Line(vg.Point{X: back.X + vg.Length(hw*uy), Y: back.Y - vg.Length(hw*ux)})
	p.Close()
	c.SetColor(ink)
	c.Fill(p)
}
