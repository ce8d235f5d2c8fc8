package bc

import (
	"fmt"
	"math"
	"sort"

	"github.com/phigrid/phigrid/grid"
)

// span asks for cells no larger than h on [lo, hi]; away from it the
// allowed size grows by the mesh's ratio per cell.
type span struct{ lo, hi, h float64 }

// axisPlan is everything AutoGrid knows about one axis.
type axisPlan struct {
	lo, hi  float64
	anchors []float64 // coordinates that must be nodes
	spans   []span
	// Cells may exceed cell only beyond [nearLo, nearHi] toward an open
	// side (openLo, openHi).
	cell           float64
	nearLo, nearHi float64
	openLo, openHi bool
	ratio          float64
}

// farCells caps the far region's cells at this many target cells, so that
// the cells where a far region meets the fine grid of the other axis keep
// a bounded aspect ratio as the grid is refined (the multigrid solver's
// convergence degrades beyond about 50:1).
const farCells = 4

// size returns the largest cell size allowed at x. Away from a span the
// size grows linearly with slope 2(r−1)/(r+1): two neighbouring cells h and
// r·h have their middles (1+r)·h/2 apart, so that slope makes their ratio r.
func (a *axisPlan) size(x float64) float64 {
	g := 2 * (a.ratio - 1) / (a.ratio + 1)
	h := a.cell
	far := (a.openLo && x < a.nearLo) || (a.openHi && x > a.nearHi)
	if far {
		// Grow from the near region's edge.
		d := a.nearLo - x
		if x > a.nearHi {
			d = x - a.nearHi
		}
		// A smooth minimum of the linear growth and the cap, so that the
		// size has no kink where the cap takes over.
		lin, c := (a.cell+g*d)/(farCells*a.cell), 1.0
		h = farCells * a.cell * math.Pow(math.Pow(lin, -4)+math.Pow(c, -4), -0.25)
		h = math.Max(h, a.cell)
	}
	for _, s := range a.spans {
		d := 0.0
		if x < s.lo {
			d = s.lo - x
		} else if x > s.hi {
			d = x - s.hi
		}
		if v := s.h + g*d; v < h {
			h = v
		}
	}
	return h
}

// cells returns the number of cells the axis needs, without placing them;
// it stops counting above limit.
func (a *axisPlan) cells(limit int) int {
	n := 0
	anchors := a.mergedAnchors()
	for k := 0; k+1 < len(anchors); k++ {
		n += a.segmentCells(anchors[k], anchors[k+1], nil, limit-n)
		if n > limit {
			return n
		}
	}
	return n
}

// nodes returns the node coordinates of the axis.
func (a *axisPlan) nodes() []float64 {
	anchors := a.mergedAnchors()
	out := []float64{anchors[0]}
	for k := 0; k+1 < len(anchors); k++ {
		var seg []float64
		a.segmentCells(anchors[k], anchors[k+1], &seg, math.MaxInt)
		out = append(out, seg...)
	}
	return out
}

// mergedAnchors returns the sorted anchors inside the axis with the ends,
// dropping an anchor closer than a quarter of the local cell size to the
// one kept before it (or to the far end), so that nearly coincident
// features do not leave a sliver cell.
func (a *axisPlan) mergedAnchors() []float64 {
	pts := []float64{}
	for _, x := range a.anchors {
		if x > a.lo && x < a.hi && !math.IsNaN(x) {
			pts = append(pts, x)
		}
	}
	sort.Float64s(pts)
	out := []float64{a.lo}
	for _, x := range pts {
		prev := out[len(out)-1]
		h := 0.25 * a.size(x)
		if x-prev < h || a.hi-x < h {
			continue
		}
		out = append(out, x)
	}
	return append(out, a.hi)
}

// segmentCells counts the cells of [x0, x1] so that no cell exceeds the
// allowed size, and when seg is not nil appends the interior nodes and x1:
// the nodes equidistribute ∫dx/size, so sizes follow the allowed size
// scaled by a common factor ≤ 1 and keep its smooth grading. Counting
// stops once it passes limit.
func (a *axisPlan) segmentCells(x0, x1 float64, seg *[]float64, limit int) int {
	type pt struct{ x, i float64 }
	var table []pt
	if seg != nil {
		table = append(table, pt{x0, 0})
	}
	var integral float64
	x := x0
	for x < x1 {
		step := math.Min(0.25*a.size(x), x1-x)
		if step <= 0 {
			step = x1 - x
		}
		integral += step / a.size(x+0.5*step)
		x += step
		if integral > float64(limit)+1 {
			return limit + 1
		}
		if seg != nil {
			table = append(table, pt{x, integral})
		}
	}
	n := int(math.Ceil(integral - 1e-9))
	if n < 1 {
		n = 1
	}
	if seg == nil {
		return n
	}
	k := 1
	for c := 1; c < n; c++ {
		target := integral * float64(c) / float64(n)
		for k < len(table)-1 && table[k].i < target {
			k++
		}
		p, q := table[k-1], table[k]
		f := 0.0
		if q.i > p.i {
			f = (target - p.i) / (q.i - p.i)
		}
		*seg = append(*seg, p.x+f*(q.x-p.x))
	}
	*seg = append(*seg, x1)
	return n
}

// plan builds the axis plans of p for mesh m (defaults applied).
func plan(p *Problem, m Mesh) (px, py *axisPlan) {
	d := p.Domain
	fine := m.Cell / m.Refine
	corner := fine / m.Corner
	gapCells := float64(m.Gap)
	px = &axisPlan{lo: d.X0, hi: d.X1, cell: m.Cell, ratio: m.Ratio}
	py = &axisPlan{lo: d.Y0, hi: d.Y1, cell: m.Cell, ratio: m.Ratio}
	fx, fy := p.Features()
	px.anchors, py.anchors = fx, fy
	// Every feature is fine, except the edge of an open side: the far
	// region grows toward it.
	openAt := func(v, edge float64, side int) bool { return v == edge && p.Sides[side].Kind == Open }
	for _, x := range fx {
		if !openAt(x, d.X0, Left) && !openAt(x, d.X1, Right) {
			px.spans = append(px.spans, span{x, x, fine})
		}
	}
	for _, y := range fy {
		if !openAt(y, d.Y0, Bottom) && !openAt(y, d.Y1, Top) {
			py.spans = append(py.spans, span{y, y, fine})
		}
	}
	// The near region: the geometry's bounding box within the domain.
	nx0, ny0, nx1, ny1 := math.Inf(1), math.Inf(1), math.Inf(-1), math.Inf(-1)
	grow := func(x0, y0, x1, y1 float64) {
		nx0, ny0 = math.Min(nx0, math.Max(x0, d.X0)), math.Min(ny0, math.Max(y0, d.Y0))
		nx1, ny1 = math.Max(nx1, math.Min(x1, d.X1)), math.Max(ny1, math.Min(y1, d.Y1))
	}
	for _, r := range p.Regions {
		grow(r.Shape.Bounds())
	}
	for _, q := range p.Charges {
		grow(q.X, q.Y, q.X, q.Y)
	}
	if !(nx0 <= nx1 && ny0 <= ny1) {
		nx0, ny0, nx1, ny1 = d.X0, d.Y0, d.X1, d.Y1
	}
	// Leave a few cells of margin before the far region grows.
	margin := 2 * m.Cell
	px.nearLo, px.nearHi = nx0-margin, nx1+margin
	py.nearLo, py.nearHi = ny0-margin, ny1+margin
	px.openLo, px.openHi = p.Sides[Left].Kind == Open, p.Sides[Right].Kind == Open
	py.openLo, py.openHi = p.Sides[Bottom].Kind == Open, p.Sides[Top].Kind == Open
	if px.openLo {
		px.anchors = append(px.anchors, px.nearLo)
	}
	if px.openHi {
		px.anchors = append(px.anchors, px.nearHi)
	}
	if py.openLo {
		py.anchors = append(py.anchors, py.nearLo)
	}
	if py.openHi {
		py.anchors = append(py.anchors, py.nearHi)
	}
	for _, r := range p.Regions {
		cond := r.Kind == ConductorRegion
		switch s := r.Shape.(type) {
		case Circle:
			curve(px, py, s.X, s.Y, s.R, fine, m.Cell)
		case Ellipse:
			// Resolve it like a circle of the minor semi-axis, and its
			// tips, where the radius of curvature is smallest.
			lo, hi := math.Min(s.A, s.B), math.Max(s.A, s.B)
			curve(px, py, s.X, s.Y, lo, fine, m.Cell)
			tip := lo * lo / hi
			h := math.Min(fine, tip/8)
			if s.A >= s.B {
				px.spans = append(px.spans, span{s.X - s.A, s.X - s.A, h}, span{s.X + s.A, s.X + s.A, h})
				py.spans = append(py.spans, span{s.Y, s.Y, h})
			} else {
				py.spans = append(py.spans, span{s.Y - s.B, s.Y - s.B, h}, span{s.Y + s.B, s.Y + s.B, h})
				px.spans = append(px.spans, span{s.X, s.X, h})
			}
		case Annulus:
			curve(px, py, s.X, s.Y, s.R1, fine, m.Cell)
			if s.R0 > 0 {
				curve(px, py, s.X, s.Y, s.R0, fine, m.Cell)
			}
		case Rect:
			if cond {
				px.spans = append(px.spans, span{s.X0, s.X0, corner}, span{s.X1, s.X1, corner})
				py.spans = append(py.spans, span{s.Y0, s.Y0, corner}, span{s.Y1, s.Y1, corner})
			}
		case Polygon:
			if cond {
				for i := range s.X {
					px.spans = append(px.spans, span{s.X[i], s.X[i], corner})
					py.spans = append(py.spans, span{s.Y[i], s.Y[i], corner})
				}
			}
		case Strip:
			if cond {
				for _, e := range [][2]float64{{s.X0, s.Y0}, {s.X1, s.Y1}} {
					px.spans = append(px.spans, span{e[0], e[0], corner})
					py.spans = append(py.spans, span{e[1], e[1], corner})
				}
			}
		}
		// A dielectric or charge layer gets Gap cells across.
		if !cond {
			switch r.Shape.(type) {
			case Circle, Ellipse:
			default:
				x0, y0, x1, y1 := r.Shape.Bounds()
				if w := x1 - x0; w > 0 {
					px.spans = append(px.spans, span{x0, x1, w / gapCells})
				}
				if h := y1 - y0; h > 0 {
					py.spans = append(py.spans, span{y0, y1, h / gapCells})
				}
			}
		}
		sideGaps(p, px, py, r.Shape, gapCells)
	}
	for a := range p.Regions {
		for b := a + 1; b < len(p.Regions); b++ {
			pairGap(px, py, p.Regions[a].Shape, p.Regions[b].Shape, gapCells)
		}
	}
	// Refine the whole pattern: every size halves and the ratio's root is
	// taken once per halving, so gradings keep their physical extent.
	scale := math.Pow(0.5, float64(m.Halvings))
	ratio := math.Pow(m.Ratio, scale)
	for _, ax := range []*axisPlan{px, py} {
		ax.cell *= scale
		ax.ratio = ratio
		for k := range ax.spans {
			ax.spans[k].h *= scale
		}
	}
	return px, py
}

// curve asks for a resolved round surface over the shape's extent: cells
// of at most a quarter of the radius, at most the fine size unless the
// radius exceeds sixteen fine cells, and at most R/16 up to the target
// size.
func curve(px, py *axisPlan, cx, cy, r, fine, cell float64) {
	h := math.Min(cell, math.Min(math.Max(fine, r/16), r/4))
	if h >= cell {
		return
	}
	px.spans = append(px.spans, span{cx - r, cx + r, h})
	py.spans = append(py.spans, span{cy - r, cy + r, h})
}

// gapSpan adds the constraint of a gap of width w between the points a and
// b: Gap cells across it along each axis the gap mainly runs along.
func gapSpan(px, py *axisPlan, ax, ay, bx, by, w, cells float64) {
	if !(w > 0) {
		return
	}
	h := w / cells
	if math.Abs(bx-ax) >= 0.3*w {
		px.spans = append(px.spans, span{math.Min(ax, bx), math.Max(ax, bx), h})
	}
	if math.Abs(by-ay) >= 0.3*w {
		py.spans = append(py.spans, span{math.Min(ay, by), math.Max(ay, by), h})
	}
}

// pairGap adds the thin-gap constraint between two shapes: exactly for
// circles and the bores of annuli, from bounding boxes otherwise.
func pairGap(px, py *axisPlan, a, b Shape, cells float64) {
	type round struct{ x, y, r float64 }
	outer := func(s Shape) (round, bool) {
		switch v := s.(type) {
		case Circle:
			return round{v.X, v.Y, v.R}, true
		case Annulus:
			return round{v.X, v.Y, v.R1}, true
		}
		return round{}, false
	}
	// bores returns the circles that enclose free space inside s: the
	// bore of an annulus, or a circle itself (a region may nest others).
	bore := func(s Shape) (round, bool) {
		switch v := s.(type) {
		case Circle:
			return round{v.X, v.Y, v.R}, true
		case Annulus:
			if v.R0 > 0 {
				return round{v.X, v.Y, v.R0}, true
			}
		}
		return round{}, false
	}
	ca, okA := outer(a)
	cb, okB := outer(b)
	if okA && okB {
		dx, dy := cb.x-ca.x, cb.y-ca.y
		dist := math.Hypot(dx, dy)
		if w := dist - ca.r - cb.r; w > 0 {
			ux, uy := dx/dist, dy/dist
			gapSpan(px, py, ca.x+ca.r*ux, ca.y+ca.r*uy, cb.x-cb.r*ux, cb.y-cb.r*uy, w, cells)
			return
		}
		// One inside the other's bore: the narrowest part of the ring
		// between them.
		for _, pair := range [][2]Shape{{a, b}, {b, a}} {
			in, _ := outer(pair[0])
			bo, ok := bore(pair[1])
			if !ok {
				continue
			}
			dx, dy := in.x-bo.x, in.y-bo.y
			dist := math.Hypot(dx, dy)
			w := bo.r - dist - in.r
			if !(w > 0) {
				continue
			}
			if dist < 1e-12*bo.r {
				// Concentric: the ring is equally thin all round.
				gapSpan(px, py, bo.x+in.r, bo.y, bo.x+bo.r, bo.y, w, cells)
				gapSpan(px, py, bo.x-in.r, bo.y, bo.x-bo.r, bo.y, w, cells)
				gapSpan(px, py, bo.x, bo.y+in.r, bo.x, bo.y+bo.r, w, cells)
				gapSpan(px, py, bo.x, bo.y-in.r, bo.x, bo.y-bo.r, w, cells)
				return
			}
			ux, uy := dx/dist, dy/dist
			gapSpan(px, py, in.x+in.r*ux, in.y+in.r*uy, bo.x+bo.r*ux, bo.y+bo.r*uy, w, cells)
			return
		}
		return
	}
	ax0, ay0, ax1, ay1 := a.Bounds()
	bx0, by0, bx1, by1 := b.Bounds()
	if ay0 < by1 && by0 < ay1 {
		if w := bx0 - ax1; w > 0 {
			px.spans = append(px.spans, span{ax1, bx0, w / cells})
		}
		if w := ax0 - bx1; w > 0 {
			px.spans = append(px.spans, span{bx1, ax0, w / cells})
		}
	}
	if ax0 < bx1 && bx0 < ax1 {
		if w := by0 - ay1; w > 0 {
			py.spans = append(py.spans, span{ay1, by0, w / cells})
		}
		if w := ay0 - by1; w > 0 {
			py.spans = append(py.spans, span{by1, ay0, w / cells})
		}
	}
}

// sideGaps adds the constraint of the gap between a shape and the sides
// of the domain: Gap cells across the gap to a fixed side, and across
// twice the gap to a zero-flux side (a symmetry plane, whose mirror image
// of the shape lies twice as far). Open sides are far by construction.
func sideGaps(p *Problem, px, py *axisPlan, s Shape, cells float64) {
	d := p.Domain
	x0, y0, x1, y1 := s.Bounds()
	width := func(side int, g float64) float64 {
		switch p.Sides[side].Kind {
		case Fixed:
			return g
		case ZeroFlux:
			return 2 * g
		}
		return 0
	}
	add := func(ax *axisPlan, side int, lo, hi float64) {
		if w := width(side, hi-lo); w > 0 && lo >= ax.lo && hi <= ax.hi {
			ax.spans = append(ax.spans, span{lo, hi, w / cells})
		}
	}
	if y1 > d.Y0 && y0 < d.Y1 {
		add(px, Left, d.X0, x0)
		add(px, Right, x1, d.X1)
	}
	if x1 > d.X0 && x0 < d.X1 {
		add(py, Bottom, d.Y0, y0)
		add(py, Top, y1, d.Y1)
	}
}

// ExtendOpen returns a copy of p whose Open sides lie factor times farther
// from the centre of the far field (Problem.Far or DefaultFar), for a
// far region that AutoGrid fills with geometrically growing cells. A
// factor of 5 to 20 suits most problems; the asymptotic condition's error
// falls like a power of the distance. The far-field centre of the copy is
// fixed to that of p. Sides whose distance from the centre is not
// positive are left where they are. The regions and slices are shared
// with p.
func ExtendOpen(p *Problem, factor float64) (*Problem, error) {
	if !(factor >= 1) || math.IsInf(factor, 0) {
		return nil, fmt.Errorf("%w: the open-boundary extension factor must be ≥ 1, got %g", ErrProblem, factor)
	}
	q := *p
	f := p.far()
	q.Far = &f
	d := &q.Domain
	if p.Sides[Left].Kind == Open && f.X > d.X0 {
		d.X0 = f.X - factor*(f.X-d.X0)
		if p.Metric == grid.Axisymmetric && d.X0 < 0 {
			d.X0 = 0
		}
	}
	if p.Sides[Right].Kind == Open && d.X1 > f.X {
		d.X1 = f.X + factor*(d.X1-f.X)
	}
	if p.Sides[Bottom].Kind == Open && f.Y > d.Y0 {
		d.Y0 = f.Y - factor*(f.Y-d.Y0)
	}
	if p.Sides[Top].Kind == Open && d.Y1 > f.Y {
		d.Y1 = f.Y + factor*(d.Y1-f.Y)
	}
	return &q, nil
}
