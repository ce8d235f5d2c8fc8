package field

import (
	"math"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
	"github.com/phigrid/phigrid/solve"
)

// This file covers the conductor faces that lie on a grid line: links from
// a free node to a conductor node that no conductor surface crosses. The
// rasteriser claims such nodes for conductors thinner than a cell (strips
// whose centre line crosses the node's control volume, zero-thickness
// strips on a grid line, rectangles of zero width), for the nodes nearest
// a conductor's anchor, and for the sides of the domain held by a
// conductor. The conductor's face is then the grid line through the
// conductor node, facing the free node.

// faceSamples is the number of points on the small circle about a
// conductor node that onFace tests for conductor interior.
const faceSamples = 48

// regions holds what the pointwise rule of the rasteriser needs about
// the map's regions: the conductor of each (−1 for the others) and its
// bounding box.
type regions struct {
	m    *bc.Map
	cond []int
	box  [][4]float64
}

func newRegions(m *bc.Map) *regions {
	idx := make(map[string]int, len(m.Conductors))
	for k, c := range m.Conductors {
		if _, ok := idx[c.Name]; !ok {
			idx[c.Name] = k
		}
	}
	rs := &regions{m: m, cond: make([]int, len(m.Regions)), box: make([][4]float64, len(m.Regions))}
	for n, r := range m.Regions {
		rs.cond[n] = -1
		if r.Kind == bc.ConductorRegion {
			if k, ok := idx[r.Conductor]; ok {
				rs.cond[n] = k
			}
		}
		if r.Shape != nil {
			x0, y0, x1, y1 := r.Shape.Bounds()
			rs.box[n] = [4]float64{x0, y0, x1, y1}
		}
	}
	return rs
}

// at returns the conductor whose region covers (x, y) once every region
// but skip (−1 for none) has been applied in order (the rasteriser's
// pointwise rule), or −1. In an axisymmetric problem a point at r < 0 is
// its mirror image.
func (rs *regions) at(x, y float64, skip int) int {
	if rs.m.Grid.Metric() == grid.Axisymmetric && x < 0 {
		x = -x
	}
	c := -1
	for n := range rs.m.Regions {
		r := &rs.m.Regions[n]
		b := &rs.box[n]
		if n == skip || r.Shape == nil || x < b[0] || x > b[2] || y < b[1] || y > b[3] || !r.Shape.Contains(x, y) {
			continue
		}
		switch r.Kind {
		case bc.ConductorRegion:
			c = rs.cond[n]
		case bc.Dielectric, bc.Charge:
			c = -1
		}
	}
	return c
}

// onFace reports whether the link l has no surface crossing, so that the
// conductor node is on the conductor's face. A link that the surface cuts
// before the conductor node (θ < 1 beyond the round-off of the
// rasteriser's bisection) has a crossing. Otherwise the surface passes
// through the conductor node or the node was claimed without lying inside
// (a strip thinner than a cell, an anchor, a side of the domain), and what
// decides is whether the conductor has interior about the node: points on
// a circle of a tenth of the smallest adjacent spacing, placed off the
// grid directions, are tested against the conductor's regions (the
// rasteriser's pointwise rule). Where fewer than a quarter lie inside, the
// node is a face. Where more do, the node lies on the surface of a body
// (a rectangle's edge or corner on a grid line, a circle touching the
// node, a node snapped onto a curved surface) and the crossing with its
// geometric normal serves. cache holds the answer per conductor node.
func (sol *Solution) onFace(l surfaceLink, rs *regions, cache map[int]bool) bool {
	if l.theta < 1-1e-9 {
		return false
	}
	if v, ok := cache[l.cnode]; ok {
		return v
	}
	g := sol.Grid
	nx := g.Nx()
	xs, ys := g.X(), g.Y()
	i, j := l.cnode%nx, l.cnode/nx
	h := math.Inf(1)
	for _, d := range [][2]int{{i - 1, i}, {i, i + 1}} {
		if d[0] >= 0 && d[1] < len(xs) {
			h = math.Min(h, xs[d[1]]-xs[d[0]])
		}
	}
	for _, d := range [][2]int{{j - 1, j}, {j, j + 1}} {
		if d[0] >= 0 && d[1] < len(ys) {
			h = math.Min(h, ys[d[1]]-ys[d[0]])
		}
	}
	rad := 0.1 * h
	x, y := xs[i], ys[j]
	in := 0
	for s := range faceSamples {
		sn, cs := math.Sincos((float64(s) + 0.5) * 2 * math.Pi / faceSamples)
		if rs.at(x+rad*cs, y+rad*sn, -1) == l.cond {
			in++
		}
	}
	face := 4*in < faceSamples
	cache[l.cnode] = face
	return face
}

// linkFace returns, for the link of l, the relative permittivity the
// assembly gives it (the mean of the two half-cells beside it, weighted
// by their shares of the face, from bc.Map.EpsX and EpsY when the map has
// them) and the measure of its face: the length of the node's control
// volume across the link (planar), or the area of revolution of that face
// at radius r (axisymmetric X-links; Y-links give the annulus of the
// control volume). Mixed is set when the two half-cells differ, so that
// the link runs along a dielectric interface.
func (sol *Solution) linkFace(l surfaceLink, r float64) (eps, area float64, mixed bool) {
	g, m := sol.Grid, sol.Map
	nx, ny := g.Nx(), g.Ny()
	cx := nx - 1
	lo := l.free
	if l.dir < 0 {
		lo = l.cnode
	}
	i, j := lo%nx, lo/nx
	half := func(c, side int, dirEps []float64) float64 {
		if dirEps != nil {
			return dirEps[2*c+side]
		}
		return m.Eps[c]
	}
	var epsX, epsY []float64
	if m.EpsX != nil && m.EpsY != nil {
		epsX, epsY = m.EpsX, m.EpsY
	}
	var w, face float64
	first := math.NaN()
	add := func(e, d float64) {
		w += e * d
		if math.IsNaN(first) {
			first = e
		} else if e != first {
			mixed = true
		}
	}
	if l.axis == 0 {
		dlo, dhi := g.DualY(j)
		if j > 0 {
			add(half((j-1)*cx+i, 1, epsX), dlo)
		}
		if j+1 < ny {
			add(half(j*cx+i, 0, epsX), dhi)
		}
		face = dlo + dhi
		area = face
		if g.Metric() == grid.Axisymmetric {
			area *= 2 * math.Pi * r
		}
	} else {
		dlo, dhi := g.DualX(i)
		if i > 0 {
			add(half(j*cx+i-1, 1, epsY), dlo)
		}
		if i+1 < nx {
			add(half(j*cx+i, 0, epsY), dhi)
		}
		face = dlo + dhi
		area = face
	}
	if !(face > 0) {
		return 1, 0, false
	}
	return w / face, area, mixed
}

// facePoint evaluates the surface point of a link without a surface
// crossing (see onFace): at the conductor node, with the normal along the
// link toward the free node, and En from the one-sided difference along
// the link: the quadratic through the conductor node, the free node and
// the next node on the same grid line when that node is free too, and the
// two-point difference otherwise.
func (sol *Solution) facePoint(l surfaceLink, phi []float64) SurfacePoint {
	g, m := sol.Grid, sol.Map
	nx := g.Nx()
	xs, ys := g.X(), g.Y()
	var a []float64
	var p, st, n int
	if l.axis == 0 {
		a, p, st, n = xs, l.free%nx, 1, nx
	} else {
		a, p, st, n = ys, l.free/nx, nx, g.Ny()
	}
	back := -l.dir // from the conductor node toward the free node
	h1 := math.Abs(a[p] - a[p+l.dir])
	v0, v1 := sol.V[l.cond], phi[l.free]
	var dphi float64
	if q := p + back; q >= 0 && q < n && m.Kind[l.free+back*st] == bc.Free {
		h2 := math.Abs(a[q] - a[p])
		v2 := phi[l.free+back*st]
		// Derivative at 0 of the quadratic through (0, v0), (h1, v1),
		// (h1+h2, v2).
		dphi = -(2*h1+h2)/(h1*(h1+h2))*v0 + (h1+h2)/(h1*h2)*v1 - h1/(h2*(h1+h2))*v2
	} else {
		dphi = (v1 - v0) / h1
	}
	x, y := xs[l.cnode%nx], ys[l.cnode/nx]
	var nvx, nvy float64
	if l.axis == 0 {
		nvx = float64(back)
	} else {
		nvy = float64(back)
	}
	en := -dphi
	eps, area, _ := sol.linkFace(l, x)
	return SurfacePoint{X: x, Y: y, Nx: nvx, Ny: nvy, En: en, Sigma: solve.Eps0 * eps * en, Area: area}
}
