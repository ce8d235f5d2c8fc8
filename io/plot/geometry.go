package plot

import (
	"math"

	"github.com/phigrid/phigrid/bc"
)

// material is what lies at a point once every region of the problem has
// been applied in order, the rule bc uses to rasterise.
type material struct {
	cond   int     // conductor index, −1 for none
	eps    float64 // relative permittivity
	epsReg int     // region that set eps, −1 for the background
	rhoReg int     // charge region, −1 for none
}

// scene answers geometric questions about a problem: what is at a point,
// and where the boundaries between materials run.
type scene struct {
	p       *bc.Problem
	bg      float64
	condIdx []int
	// stripHalf is the smallest half-thickness given to conductor strips
	// in point tests, so that a strip thinner than the grid still stops
	// field lines.
	stripHalf float64
	// eps is the offset used to test the two sides of a boundary.
	eps float64
}

func newScene(p *bc.Problem, stripHalf float64) *scene {
	s := &scene{p: p, bg: p.Background, stripHalf: stripHalf}
	if s.bg == 0 {
		s.bg = 1
	}
	s.condIdx = make([]int, len(p.Regions))
	for n, r := range p.Regions {
		s.condIdx[n] = -1
		if r.Kind == bc.ConductorRegion {
			s.condIdx[n] = p.ConductorIndex(r.Conductor)
		}
	}
	d := p.Domain
	s.eps = 1e-7 * math.Max(d.X1-d.X0, d.Y1-d.Y0)
	return s
}

// at returns the material at (x, y).
func (s *scene) at(x, y float64) material {
	m := material{cond: -1, eps: s.bg, epsReg: -1, rhoReg: -1}
	for n := range s.p.Regions {
		r := &s.p.Regions[n]
		if r.Shape == nil || !s.contains(r, x, y) {
			continue
		}
		switch r.Kind {
		case bc.ConductorRegion:
			m.cond = s.condIdx[n]
		case bc.Dielectric:
			m.cond, m.eps, m.epsReg = -1, r.EpsR, n
		case bc.Charge:
			m.cond, m.rhoReg = -1, n
			if r.EpsR > 0 {
				m.eps, m.epsReg = r.EpsR, n
			}
		}
	}
	return m
}

func (s *scene) contains(r *bc.Region, x, y float64) bool {
	if st, ok := r.Shape.(bc.Strip); ok && r.Kind == bc.ConductorRegion && s.stripHalf > 0.5*st.Thickness {
		st.Thickness = 2 * s.stripHalf
		return st.Contains(x, y)
	}
	return r.Shape.Contains(x, y)
}

// pt is a point in model coordinates (metres).
type pt struct{ x, y float64 }

// ring is a closed outline, counter-clockwise around the region it
// bounds (clockwise around a hole); the closing edge is implied.
type ring []pt

// outline returns the rings of a shape, with edges no longer than seg on
// curves.
func outline(sh bc.Shape, seg float64) []ring {
	switch v := sh.(type) {
	case bc.Rect:
		return []ring{{{v.X0, v.Y0}, {v.X1, v.Y0}, {v.X1, v.Y1}, {v.X0, v.Y1}}}
	case bc.Circle:
		return []ring{circleRing(v.X, v.Y, v.R, seg, false)}
	case bc.Annulus:
		out := []ring{circleRing(v.X, v.Y, v.R1, seg, false)}
		if v.R0 > 0 {
			out = append(out, circleRing(v.X, v.Y, v.R0, seg, true))
		}
		return out
	case bc.Polygon:
		r := make(ring, len(v.X))
		for i := range v.X {
			r[i] = pt{v.X[i], v.Y[i]}
		}
		if signedArea(r) < 0 {
			for i, j := 0, len(r)-1; i < j; i, j = i+1, j-1 {
				r[i], r[j] = r[j], r[i]
			}
		}
		return []ring{r}
	case bc.Strip:
		return []ring{stripRing(v, v.Thickness)}
	}
	return nil
}

func circleRing(cx, cy, r, seg float64, hole bool) ring {
	n := int(math.Ceil(2 * math.Pi * r / seg))
	n = min(max(n, 48), 4000)
	out := make(ring, n)
	for i := range out {
		a := 2 * math.Pi * float64(i) / float64(n)
		if hole {
			a = -a
		}
		s, c := math.Sincos(a)
		out[i] = pt{cx + r*c, cy + r*s}
	}
	return out
}

// stripRing returns the rectangle of a strip with thickness t.
func stripRing(s bc.Strip, t float64) ring {
	dx, dy := s.X1-s.X0, s.Y1-s.Y0
	l := math.Hypot(dx, dy)
	ox, oy := -0.5*t*dy/l, 0.5*t*dx/l // to the left of the centre line
	return ring{{s.X0 - ox, s.Y0 - oy}, {s.X1 - ox, s.Y1 - oy}, {s.X1 + ox, s.Y1 + oy}, {s.X0 + ox, s.Y0 + oy}}
}

func signedArea(r ring) float64 {
	var a float64
	for i := range r {
		j := (i + 1) % len(r)
		a += r[i].x*r[j].y - r[j].x*r[i].y
	}
	return 0.5 * a
}

// edgeKind says which boundary an outline edge is.
type edgeKind int

const (
	edgeNone       edgeKind = iota
	edgeConductor           // between a conductor and anything else
	edgeDielectric          // between two permittivities, no conductor
	edgeCharge              // around a charge region, no conductor
)

// boundary is a run of outline edges of one kind, open or closed.
type boundary struct {
	kind edgeKind
	cond int // the conductor, for edgeConductor
	// inside is set when the conductor lies on the left of the run (the
	// inside of its own region's outline); such runs are the conductor's
	// surface with the outward normal on their right.
	inside bool
	pts    []pt
	closed bool
}

// boundaries splits the outlines of every region of the problem into the
// runs that are real boundaries inside the domain: a run is kept where the
// two sides differ as the rasteriser sees them, so a region hidden by a
// later one, or two touching regions of one conductor, draw no line.
func (s *scene) boundaries(seg float64) []boundary {
	var out []boundary
	d := s.p.Domain
	for n := range s.p.Regions {
		r := &s.p.Regions[n]
		if r.Shape == nil {
			continue
		}
		for _, rg := range outline(r.Shape, seg) {
			rg = subdivide(rg, seg)
			var cur *boundary
			flush := func() {
				if cur != nil && len(cur.pts) >= 2 {
					out = append(out, *cur)
				}
				cur = nil
			}
			start := len(out)
			all := true
			for i := range rg {
				a, b := rg[i], rg[(i+1)%len(rg)]
				k, c, in := s.classify(a, b, d)
				if k == edgeNone {
					all = false
					flush()
					continue
				}
				if cur != nil && (cur.kind != k || cur.cond != c || cur.inside != in) {
					all = false
					flush()
				}
				if cur == nil {
					cur = &boundary{kind: k, cond: c, inside: in, pts: []pt{a}}
				}
				cur.pts = append(cur.pts, b)
			}
			flush()
			if all && len(out) == start+1 {
				// The whole ring is one run: drop the repeated first point.
				out[start].pts = out[start].pts[:len(out[start].pts)-1]
				out[start].closed = true
			} else if len(out) > start+1 && !all {
				// Join the last run to the first when they meet at the
				// ring's first point.
				f, l := &out[start], &out[len(out)-1]
				if f.kind == l.kind && f.cond == l.cond && f.inside == l.inside && f.pts[0] == rg[0] && l.pts[len(l.pts)-1] == rg[0] {
					l.pts = append(l.pts, f.pts[1:]...)
					out[start] = *l
					out = out[:len(out)-1]
				}
			}
		}
	}
	return out
}

// classify returns the kind of the outline edge a→b (its region on the
// left), the conductor beside it, and whether that conductor is on the
// left. Edges outside the domain or along its sides are no boundary: the
// frame of the picture is drawn there.
func (s *scene) classify(a, b pt, d bc.Rect) (edgeKind, int, bool) {
	mx, my := 0.5*(a.x+b.x), 0.5*(a.y+b.y)
	dx, dy := b.x-a.x, b.y-a.y
	l := math.Hypot(dx, dy)
	if l == 0 {
		return edgeNone, -1, false
	}
	// Test a little off the edge, outward for a counter-clockwise ring,
	// beyond the sagitta of a curve's chord (under 2 % of the chord with
	// at least 48 chords to a circle).
	off := s.eps + 0.04*l
	nx, ny := dy/l*off, -dx/l*off
	ix, iy, ox, oy := mx-nx, my-ny, mx+nx, my+ny
	if !d.Contains(ix, iy) || !d.Contains(ox, oy) {
		return edgeNone, -1, false
	}
	in, out := s.at(ix, iy), s.at(ox, oy)
	switch {
	case in.cond >= 0 && out.cond != in.cond:
		return edgeConductor, in.cond, true
	case out.cond >= 0 && in.cond != out.cond:
		return edgeConductor, out.cond, false
	case in.cond >= 0 || out.cond >= 0:
		return edgeNone, -1, false
	case in.eps != out.eps:
		return edgeDielectric, -1, false
	case in.rhoReg != out.rhoReg:
		return edgeCharge, -1, false
	}
	return edgeNone, -1, false
}

// subdivide splits ring edges longer than seg so that boundary runs can
// start and end part-way along a straight edge.
func subdivide(r ring, seg float64) ring {
	out := make(ring, 0, len(r))
	for i := range r {
		a, b := r[i], r[(i+1)%len(r)]
		out = append(out, a)
		l := math.Hypot(b.x-a.x, b.y-a.y)
		n := int(math.Ceil(l / seg))
		for k := 1; k < n; k++ {
			t := float64(k) / float64(n)
			out = append(out, pt{a.x + t*(b.x-a.x), a.y + t*(b.y-a.y)})
		}
	}
	return out
}
