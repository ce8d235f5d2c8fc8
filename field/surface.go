package field

import (
	"fmt"
	"math"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/solve"
)

// SurfacePoint is a point on a conductor surface with the field there.
// X and Y are its position (r and z in an axisymmetric problem); Nx and Ny
// the outward unit normal, pointing out of the conductor into the
// dielectric; En the normal field in V/m, positive when it points out of
// the conductor (a conductor above its surroundings' potential); Sigma the
// surface charge density ε₀·ε_r·En in C/m², with ε_r of the dielectric at
// the point.
type SurfacePoint struct{ X, Y, Nx, Ny, En, Sigma float64 }

// Peak is the largest field magnitude found somewhere: Value in V/m at
// (X, Y), and Where names the conductor or region it belongs to.
type Peak struct {
	Value, X, Y float64
	Where       string
}

// SurfaceField returns points on the surface of conductor k with the
// normal field and the surface charge density there, one point for every
// grid link that joins a free node to the conductor, at the point where the
// conductor surface cuts the link. It returns nil when k is not a conductor
// index or the conductor has no free neighbour.
//
// # Method
//
// The conductor surface is an equipotential, so the tangential derivative
// of φ vanishes there and ∇φ = (∂φ/∂n)·n. Along the link, with s measured
// from the surface point into the dielectric in direction d, the potential
// is known at three points: the conductor potential at s = 0, the free node
// at s₁ = θ·h (θ the cut fraction) and the next point along the same grid
// line at s₂ (the next node, or the next conductor surface if the link
// beyond is cut too). The quadratic through them gives ∂φ/∂s at s = 0 with
// a truncation error of O(h²), and En = −(∂φ/∂s)/(n·d). Points where the
// link runs almost along the surface (|n·d| < 0.35) would amplify the
// error of ∂φ/∂s and are left out; the links of the other axis cover
// those parts of the surface. Where the line has no further point (the
// free node lies on the outer boundary) the two-point difference is used.
//
// The normal comes from the geometry of the rasterised problem when the
// map carries it (bc.Map.Surface) and from the link direction otherwise.
func (sol *Solution) SurfaceField(k int) []SurfacePoint {
	m := sol.Map
	if k < 0 || k >= len(m.Conductors) {
		return nil
	}
	var out []SurfacePoint
	sol.eachSurfaceLink(func(l surfaceLink) {
		if l.cond != k {
			return
		}
		if p, ok := sol.surfacePoint(l); ok {
			out = append(out, p)
		}
	})
	return out
}

// surfaceLink is one link from a free node to a conductor node.
type surfaceLink struct {
	free, cnode int     // node indices
	cond        int     // conductor index
	axis        int     // 0 along X, 1 along Y
	dir         int     // +1 when the conductor node is at the higher index
	theta       float64 // cut fraction from the free node
	// Geometry from the map, when present.
	x, y, nx, ny, eps float64
	geom              bool
}

// eachSurfaceLink calls f for every link that joins a free node to a
// conductor node.
func (sol *Solution) eachSurfaceLink(f func(surfaceLink)) {
	m := sol.Map
	g := sol.Grid
	nx, ny := g.Nx(), g.Ny()
	if len(m.Surface) > 0 {
		for _, c := range m.Surface {
			l := surfaceLink{
				free: int(c.Free), cnode: int(c.Node), cond: int(m.Cond[c.Node]),
				axis: int(c.Axis), dir: int(c.Dir), theta: c.Frac,
				x: c.X, y: c.Y, nx: c.Nx, ny: c.Ny, eps: c.EpsR, geom: true,
			}
			f(l)
		}
		return
	}
	for j := 0; j < ny; j++ {
		for i := 0; i < nx; i++ {
			n := j*nx + i
			if m.Kind[n] != bc.Free {
				continue
			}
			try := func(c int, axis, dir int, theta float64) {
				if m.Kind[c] == bc.OnConductor {
					f(surfaceLink{free: n, cnode: c, cond: int(m.Cond[c]), axis: axis, dir: dir, theta: theta})
				}
			}
			if i+1 < nx {
				try(n+1, 0, 1, m.CutX[n])
			}
			if i > 0 {
				try(n-1, 0, -1, m.CutX[n-1])
			}
			if j+1 < ny {
				try(n+nx, 1, 1, m.CutY[n])
			}
			if j > 0 {
				try(n-nx, 1, -1, m.CutY[n-nx])
			}
		}
	}
}

// minNormalDot is the smallest |n·d| for which a link's derivative is
// turned into a normal field.
const minNormalDot = 0.35

// surfacePoint evaluates the normal field at the surface point of l.
func (sol *Solution) surfacePoint(l surfaceLink) (SurfacePoint, bool) {
	g, m, phi := sol.Grid, sol.Map, sol.Phi
	nx := g.Nx()
	xs, ys := g.X(), g.Y()
	// Position along the axis of the link.
	var a []float64
	var p, st, n int
	var cut []float64
	if l.axis == 0 {
		a, p, st, n, cut = xs, l.free%nx, 1, nx, m.CutX
	} else {
		a, p, st, n, cut = ys, l.free/nx, nx, g.Ny(), m.CutY
	}
	// d points from the conductor into the dielectric: opposite to dir.
	back := -l.dir
	h1 := math.Abs(a[p+l.dir] - a[p])
	s1 := l.theta * h1
	f0 := sol.V[l.cond]
	f1 := phi[l.free]
	// The surface point.
	sx, sy := xs[l.free%nx], ys[l.free/nx]
	if l.axis == 0 {
		sx += float64(l.dir) * s1
	} else {
		sy += float64(l.dir) * s1
	}
	dx, dy := 0.0, 0.0
	if l.axis == 0 {
		dx = float64(back)
	} else {
		dy = float64(back)
	}
	nvx, nvy := dx, dy
	eps := 0.0
	if l.geom {
		sx, sy, nvx, nvy, eps = l.x, l.y, l.nx, l.ny, l.eps
	}
	dot := nvx*dx + nvy*dy
	if math.Abs(dot) < minNormalDot {
		return SurfacePoint{}, false
	}
	var dphi float64
	q := p + back
	if q >= 0 && q < n {
		h2 := math.Abs(a[q] - a[p])
		nb := l.free + back*st
		// Link from the free node to the next one, in index order.
		lk := l.free
		if back < 0 {
			lk = nb
		}
		s2 := s1 + h2
		if m.Kind[nb] == bc.OnConductor {
			s2 = s1 + cut[lk]*h2
		}
		f2 := phi[nb]
		dphi = ((f1-f0)*s2*s2 - (f2-f0)*s1*s1) / (s1 * s2 * (s2 - s1))
	} else {
		dphi = (f1 - f0) / s1
	}
	en := -dphi / dot
	if eps == 0 {
		eps = sol.linkEps(l)
	}
	return SurfacePoint{X: sx, Y: sy, Nx: nvx, Ny: nvy, En: en, Sigma: solve.Eps0 * eps * en}, true
}

// linkEps returns the mean relative permittivity of the cells beside the
// link of l.
func (sol *Solution) linkEps(l surfaceLink) float64 {
	g, m := sol.Grid, sol.Map
	nx, ny := g.Nx(), g.Ny()
	lo := l.free
	if l.dir < 0 {
		lo = l.cnode
	}
	i, j := lo%nx, lo/nx
	var sum float64
	var cnt int
	if l.axis == 0 {
		for _, cj := range []int{j - 1, j} {
			if cj >= 0 && cj < ny-1 {
				sum += m.Eps[g.CellIndex(i, cj)]
				cnt++
			}
		}
	} else {
		for _, ci := range []int{i - 1, i} {
			if ci >= 0 && ci < nx-1 {
				sum += m.Eps[g.CellIndex(ci, j)]
				cnt++
			}
		}
	}
	if cnt == 0 {
		return 1
	}
	return sum / float64(cnt)
}

// PeakSurfaceField returns the largest |En| on the surface of conductor k
// and where it occurs, named after the conductor. A conductor without
// surface points gives a zero Peak. Never trust a peak at a sharp edge or
// corner: the field there grows without bound under refinement.
func (sol *Solution) PeakSurfaceField(k int) Peak {
	if k < 0 || k >= len(sol.Map.Conductors) {
		return Peak{}
	}
	pk := Peak{Where: sol.Map.Conductors[k].Name}
	for _, p := range sol.SurfaceField(k) {
		if v := math.Abs(p.En); v > pk.Value {
			pk.Value, pk.X, pk.Y = v, p.X, p.Y
		}
	}
	return pk
}

// PeakRegionFields returns the largest field magnitude in every dielectric
// material of the problem: one Peak per region that sets a permittivity
// (dielectric regions, and charge regions that give one), merging regions
// of the same name, and one for the background, in order of first
// appearance with the background first. Regions that cover no cell are
// left out.
//
// The field is evaluated at the centres of cells whose four corners are
// free or prescribed nodes (the gradient of the bilinear potential, second
// order at the centre) and at the conductor surface points of
// SurfaceField, which are attributed to the material at the surface.
func (sol *Solution) PeakRegionFields() []Peak {
	m, g := sol.Map, sol.Grid
	names, slot := sol.regionSlots()
	peaks := make([]Peak, len(names))
	seen := make([]bool, len(names))
	for i, n := range names {
		peaks[i].Where = n
	}
	ex, ey := sol.CellFieldTo(nil, nil)
	nx, ny := g.Nx(), g.Ny()
	xs, ys := g.X(), g.Y()
	for j := 0; j+1 < ny; j++ {
		for i := 0; i+1 < nx; i++ {
			c := g.CellIndex(i, j)
			n0 := g.Index(i, j)
			if m.Kind[n0] == bc.OnConductor || m.Kind[n0+1] == bc.OnConductor ||
				m.Kind[n0+nx] == bc.OnConductor || m.Kind[n0+nx+1] == bc.OnConductor {
				continue
			}
			s := slot(m.CellRegion, c)
			seen[s] = true
			if v := math.Hypot(ex[c], ey[c]); v > peaks[s].Value {
				peaks[s].Value = v
				peaks[s].X = 0.5 * (xs[i] + xs[i+1])
				peaks[s].Y = 0.5 * (ys[j] + ys[j+1])
			}
		}
	}
	for k := range m.Conductors {
		for _, p := range sol.SurfaceField(k) {
			// The material just outside the surface point.
			ci, cj, _, _, ok := g.Locate(p.X+1e-6*p.Nx*cellScale(g), p.Y+1e-6*p.Ny*cellScale(g))
			if !ok {
				continue
			}
			ci, cj = min(ci, nx-2), min(cj, ny-2)
			s := slot(m.CellRegion, g.CellIndex(ci, cj))
			seen[s] = true
			if v := math.Abs(p.En); v > peaks[s].Value {
				peaks[s].Value, peaks[s].X, peaks[s].Y = v, p.X, p.Y
			}
		}
	}
	out := peaks[:0]
	for i, p := range peaks {
		if seen[i] {
			out = append(out, p)
		}
	}
	return out
}

// cellScale returns the smallest node spacing of the grid.
func cellScale(g interface{ MinMaxStep() (float64, float64) }) float64 {
	lo, _ := g.MinMaxStep()
	return lo
}

// regionSlots returns the material names (background first, then every
// region that sets ε, merged by name) and a function mapping a cell's
// region index to its slot.
func (sol *Solution) regionSlots() ([]string, func(reg []int32, c int) int) {
	m := sol.Map
	names := []string{"background"}
	idx := map[string]int{"background": 0}
	regSlot := make([]int, len(m.Regions))
	for n, r := range m.Regions {
		regSlot[n] = 0
		if r.Kind == bc.Dielectric || (r.Kind == bc.Charge && r.EpsR > 0) {
			name := r.Name
			if name == "" {
				name = fmt.Sprintf("region %d", n)
			}
			s, ok := idx[name]
			if !ok {
				s = len(names)
				idx[name] = s
				names = append(names, name)
			}
			regSlot[n] = s
		}
	}
	return names, func(reg []int32, c int) int {
		if reg == nil || reg[c] < 0 || int(reg[c]) >= len(regSlot) {
			return 0
		}
		return regSlot[reg[c]]
	}
}
