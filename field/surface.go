package field

import (
	"context"
	"fmt"
	"math"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
	"github.com/phigrid/phigrid/solve"
)

// SurfacePoint is a point on a conductor surface with the field there.
// X and Y are its position (r and z in an axisymmetric problem); Nx and Ny
// the outward unit normal, pointing out of the conductor into the
// dielectric; En the normal field in V/m, positive when it points out of
// the conductor (a conductor above its surroundings' potential); Sigma the
// surface charge density ε₀·ε_r·En in C/m², with ε_r of the dielectric at
// the point.
//
// Area is the part of the surface the point stands for, so that
// Σ Sigma·Area over a conductor's points estimates its charge: a length
// (m², per metre of depth) in a planar problem, an area of revolution
// (m²) in an axisymmetric one. It is the face of the point's grid link,
// the control-volume side across the link, divided by |n·d| for the link
// direction d (halved where the links of both axes sample the surface).
type SurfacePoint struct{ X, Y, Nx, Ny, En, Sigma, Area float64 }

// Peak is the largest field magnitude found somewhere: Value in V/m at
// (X, Y), and Where names the conductor or region it belongs to.
//
// Sharp is set when the peak lies within about two cells of a sharp
// feature of a conductor: the end of a strip, a convex corner of a
// rectangle or polygon, or a corner where a conductor side of the domain
// meets a side at another potential (for a material's peak, of any
// conductor). The field there is singular: its grid value grows without
// bound under refinement and is not a converged figure.
type Peak struct {
	Value, X, Y float64
	Where       string
	Sharp       bool
}

// surfaceCache holds the potential corrected near conductor surfaces.
type surfaceCache struct {
	phi     []float64
	refined bool
}

// SurfaceField returns points on the surface of conductor k with the
// normal field and the surface charge density there, in grid order: one
// for every grid link that joins a free node to the conductor, at the
// point where the surface cuts the link (links that run obliquely to the
// surface left out, see below), or at the conductor node when the link
// has no surface crossing (see Faces). It returns nil when k is not a
// conductor index or the conductor has no free neighbour. The first call
// computes a locally corrected potential and caches it, so a Solution is
// not safe for concurrent use.
//
// # Method
//
// The conductor surface is an equipotential, so the tangential derivative
// of φ vanishes there and ∇φ = (∂φ/∂n)·n. Along a link, with s measured
// from the surface point into the dielectric in direction d, the potential
// is known at three points: the conductor potential at s = 0, the free
// node at s₁ = θ·h (θ the cut fraction) and the next point along the same
// grid line at s₂ (the next node, or the next conductor surface if the
// link beyond is cut too). The quadratic through them gives the one-sided
// derivative ∂φ/∂s at s = 0 with an O(h²) truncation error, and
// En = −(∂φ/∂s)/(n·d). Links that run obliquely to the surface
// (|n·d| < 0.7) would amplify the error and are left out; the links of the
// other axis cover those parts of the surface. Where the line has no
// further point (the free node lies on the outer boundary) the two-point
// difference is used. The normal and the permittivity just outside come
// from the geometry (bc.Map.Surface); maps without it fall back to the
// link direction and to the permittivity the assembly gives the link,
// which also serves where the link runs along a dielectric interface.
//
// # Faces
//
// Some conductor nodes have no surface crossing on their links: nodes of
// a strip thinner than a cell (claimed because its centre line crosses
// the node's control volume, or lying on a grid line with zero
// thickness), nodes claimed as a conductor's anchor, and the nodes of a
// side of the domain held by a conductor. The conductor's face then lies
// on the grid line through the node: a link counts as such a face when no
// surface cuts it short of the conductor node and the conductor has
// little interior about that node (less than a quarter of a small circle
// about it lies inside). Its surface point sits at the conductor node
// with the normal along the link, toward the free node; En comes from the
// quadratic through the conductor node, the free node and the next node on
// the same line when that is free (second order), else from the two-point
// difference (first order); and Sigma uses the permittivity the assembly
// gives the link (bc.Map.EpsX, EpsY). A zero-thickness strip thus has points on both
// faces, above and below, and Σ Sigma·Area over its points matches its
// charge by the discrete Gauss law up to the truncation error of the
// differences, which is largest at its edges.
//
// # Accuracy next to curved surfaces
//
// The one-sided difference needs potentials next to the surface that are
// accurate beyond the O(h²) of the solve: the symmetric cut-link operator
// is only first-order consistent at the nodes next to a curved surface, so
// its nodal errors there are O(h²) but irregular, and a difference of them
// is only first-order accurate. SurfaceField therefore first relaxes the
// free nodes within a few links of a conductor to the Shortley–Weller
// equations (which are second-order consistent there), holding the rest
// of the solution fixed. That costs no solve and cuts the error several
// times. RefineSurface goes further with one more solve, after which the
// surface field converges at second order.
func (sol *Solution) SurfaceField(k int) []SurfacePoint {
	m := sol.Map
	if k < 0 || k >= len(m.Conductors) {
		return nil
	}
	phi := sol.surfacePhi()
	var out []SurfacePoint
	sol.eachSurfaceLink(k, func(l surfaceLink) {
		if p, ok := sol.surfacePoint(l, phi); ok {
			out = append(out, p)
		}
	})
	return out
}

// RefineSurface makes the surface fields of SurfaceField, PeakSurfaceField
// and PeakRegionFields converge at second order, at the cost of one more
// solve with a solver set up from set (nil means the defaults; a zero
// tolerance means 1e-6, relative to the size of the correction). It
// corrects the potential near conductor surfaces by one step of defect
// correction toward the Shortley–Weller discretisation, between two local
// relaxations, and caches the result. Phi, the charges, the energy and the
// capacitance matrix are not changed: they keep the symmetric operator and
// its exact discrete Gauss law.
func (sol *Solution) RefineSurface(ctx context.Context, set *solve.Settings) error {
	if sol.surf != nil && sol.surf.refined {
		return nil
	}
	var o solve.Settings
	if set != nil {
		o = *set
	}
	if o.Tol == 0 {
		o.Tol = 1e-6
	}
	phi := append([]float64(nil), sol.Phi...)
	band := sol.bandNodes(surfaceBand)
	sol.relaxBand(phi, band)
	r := make([]float64, len(phi))
	sol.correctedResidual(r, phi)
	var rn float64
	for _, v := range r {
		rn = math.Max(rn, math.Abs(v))
	}
	if rn > 0 {
		s, err := solve.NewSolver(sol.Sys, &o)
		if err != nil {
			return fmt.Errorf("field: surface correction: %w", err)
		}
		defer s.Close()
		d := make([]float64, len(phi))
		res, err := s.Solve(ctx, r, d)
		if res != nil {
			sol.Results = append(sol.Results, res)
		}
		if err != nil {
			return fmt.Errorf("field: surface correction: %w", err)
		}
		for i, f := range sol.Sys.Fixed {
			if !f {
				phi[i] += d[i]
			}
		}
		sol.relaxBand(phi, band)
	}
	sol.surf = &surfaceCache{phi: phi, refined: true}
	return nil
}

// surfaceBand is the depth, in links, of the band of free nodes next to
// conductors that the local relaxation corrects.
const surfaceBand = 5

// surfacePhi returns the potential corrected near conductor surfaces,
// computing the local correction on first use.
func (sol *Solution) surfacePhi() []float64 {
	if sol.surf == nil || len(sol.surf.phi) != len(sol.Phi) {
		phi := append([]float64(nil), sol.Phi...)
		sol.relaxBand(phi, sol.bandNodes(surfaceBand))
		sol.surf = &surfaceCache{phi: phi}
	}
	return sol.surf.phi
}

// surfaceLink is one link from a free node to a conductor node.
type surfaceLink struct {
	free, cnode int     // node indices
	cond        int     // conductor index
	axis        int     // 0 along X, 1 along Y
	dir         int     // +1 when the conductor node is at the higher index
	theta       float64 // cut fraction from the free node
	// face is set when no surface crosses the link: the conductor node is
	// on the conductor's face (see onFace).
	face bool
	// Geometry from the map, when present.
	x, y, nx, ny, eps float64
	geom              bool
}

// eachSurfaceLink calls f for every link that joins a free node to a node
// of conductor k.
func (sol *Solution) eachSurfaceLink(k int, f func(surfaceLink)) {
	m := sol.Map
	g := sol.Grid
	nx, ny := g.Nx(), g.Ny()
	rs := newRegions(m)
	faces := make(map[int]bool)
	if len(m.Surface) > 0 {
		for _, c := range m.Surface {
			if int(m.Cond[c.Node]) != k {
				continue
			}
			l := surfaceLink{
				free: int(c.Free), cnode: int(c.Node), cond: int(m.Cond[c.Node]),
				axis: int(c.Axis), dir: int(c.Dir), theta: c.Frac,
				x: c.X, y: c.Y, nx: c.Nx, ny: c.Ny, eps: c.EpsR, geom: true,
			}
			l.face = sol.onFace(l, rs, faces)
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
				if m.Kind[c] == bc.OnConductor && int(m.Cond[c]) == k {
					l := surfaceLink{free: n, cnode: c, cond: k, axis: axis, dir: dir, theta: theta}
					l.face = sol.onFace(l, rs, faces)
					f(l)
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

// surfacePoints is the number of points on the line through a surface
// point that the one-sided difference uses, the surface point included.
const surfacePoints = 4

const maxSurfacePoints = 5

// minNormalDot is the smallest |n·d| for which a link's derivative is
// turned into a normal field. Every direction has a grid axis within 45°,
// so 0.7 < cos 45° leaves no part of a surface uncovered.
const minNormalDot = 0.7

// surfacePoint evaluates the normal field at the surface point of l from
// the potential phi.
func (sol *Solution) surfacePoint(l surfaceLink, phi []float64) (SurfacePoint, bool) {
	if l.face {
		return sol.facePoint(l, phi), true
	}
	g, m := sol.Grid, sol.Map
	nx := g.Nx()
	xs, ys := g.X(), g.Y()
	var a []float64
	var p, st, n int
	var cut []float64
	if l.axis == 0 {
		a, p, st, n, cut = xs, l.free%nx, 1, nx, m.CutX
	} else {
		a, p, st, n, cut = ys, l.free/nx, nx, g.Ny(), m.CutY
	}
	// d points from the conductor into the dielectric, against dir.
	back := -l.dir
	h1 := math.Abs(a[p+l.dir] - a[p])
	s1 := l.theta * h1
	sx, sy := xs[l.free%nx], ys[l.free/nx]
	dx, dy := 0.0, 0.0
	if l.axis == 0 {
		sx += float64(l.dir) * s1
		dx = float64(back)
	} else {
		sy += float64(l.dir) * s1
		dy = float64(back)
	}
	nvx, nvy := dx, dy
	eps := 0.0
	if l.geom {
		sx, sy, nvx, nvy, eps = l.x, l.y, l.nx, l.ny, l.eps
	}
	dot := nvx*dx + nvy*dy
	if math.Abs(dot) < minNormalDot || s1 <= 0 {
		return SurfacePoint{}, false
	}
	// Points along the line: the surface, the free node, and further
	// nodes until surfacePoints are known or a conductor surface or the
	// outer boundary is reached.
	var ss, fs [maxSurfacePoints]float64
	ss[0], fs[0] = 0, sol.V[l.cond]
	ss[1], fs[1] = s1, phi[l.free]
	np := 2
	pos, node, dist := p, l.free, s1
	for np < surfacePoints {
		q := pos + back
		if q < 0 || q >= n {
			break
		}
		h := math.Abs(a[q] - a[pos])
		nb := node + back*st
		lk := node // the link node→nb, indexed by its lower node
		if back < 0 {
			lk = nb
		}
		if m.Kind[nb] == bc.OnConductor {
			ss[np], fs[np] = dist+cut[lk]*h, phi[nb]
			np++
			break
		}
		dist += h
		ss[np], fs[np] = dist, phi[nb]
		np++
		if m.Kind[nb] != bc.Free {
			break
		}
		pos, node = q, nb
	}
	dphi := derivAt0(ss[:np], fs[:np])
	en := -dphi / dot
	// The permittivity just outside the surface, from the geometry; where
	// the link runs along a dielectric interface the flux splits between
	// the two materials, and the assembly's mean over the face serves.
	linkEps, area, mixed := sol.linkFace(l, sx)
	if eps == 0 || mixed {
		eps = linkEps
	}
	// The links of this axis sample the surface at one point per face;
	// where the other axis samples it too, each takes half.
	area /= math.Abs(dot)
	if math.Sqrt(max(0, 1-dot*dot)) >= minNormalDot {
		area /= 2
	}
	return SurfacePoint{X: sx, Y: sy, Nx: nvx, Ny: nvy, En: en, Sigma: solve.Eps0 * eps * en, Area: area}, true
}

// PeakSurfaceField returns the peak |En| on the surface of conductor k and
// where it occurs, named after the conductor. A conductor without surface
// points gives a zero Peak. Never trust a peak at a sharp edge or corner:
// the field there grows without bound under refinement. Such a peak is
// marked Sharp when it lies within two local cells of a strip's end, a
// convex corner of a rectangle or polygon (interior angle below 175°), or
// a corner where a side of the domain held by the conductor meets a side
// at another potential; ends and corners on a symmetry plane that their
// mirror image continues, and ends joined to an equipotential body, are
// not edges.
//
// The peak is not simply the largest sample: the samples carry small
// irregular errors (they sit at different distances from the grid), and
// the largest one picks the largest error. Instead a quadratic in the
// tangential coordinate is fitted by weighted least squares to the samples
// within four cells of the largest one, and the peak is the fitted
// maximum when it lies within the samples' span (else the fitted value at
// the end of the span nearest to it; next to a symmetry plane the window
// is one-sided). This keeps the second-order accuracy of the samples and
// makes the peak converge smoothly under refinement.
func (sol *Solution) PeakSurfaceField(k int) Peak {
	if k < 0 || k >= len(sol.Map.Conductors) {
		return Peak{}
	}
	pk := Peak{Where: sol.Map.Conductors[k].Name}
	pts := sol.SurfaceField(k)
	best := -1
	for i, p := range pts {
		if v := math.Abs(p.En); v > pk.Value {
			pk.Value, pk.X, pk.Y = v, p.X, p.Y
			best = i
		}
	}
	if best < 0 {
		return pk
	}
	if v, x, y, ok := sol.fitPeak(pts, best); ok {
		pk.Value, pk.X, pk.Y = v, x, y
	}
	fs := sol.featureScene()
	pk.Sharp = fs.nearSharp(sol.sharpFeatures(k, fs), pk.X, pk.Y)
	return pk
}

// fitPeak fits |En| near pts[best] by a weighted quadratic along the
// surface tangent and returns its maximum in the window and the location
// of the sample nearest to it.
func (sol *Solution) fitPeak(pts []SurfacePoint, best int) (v, x, y float64, ok bool) {
	c := pts[best]
	g := sol.Grid
	i, j, _, _, in := g.Locate(c.X, c.Y)
	if !in {
		return 0, 0, 0, false
	}
	xs, ys := g.X(), g.Y()
	i, j = min(i, g.Nx()-2), min(j, g.Ny()-2)
	h := math.Max(xs[i+1]-xs[i], ys[j+1]-ys[j])
	w := 4 * h
	tx, ty := -c.Ny, c.Nx
	// Normal equations of the weighted fit a + b·s + c·s².
	var m [3][4]float64
	var smin, smax float64
	n := 0
	for _, p := range pts {
		dx, dy := p.X-c.X, p.Y-c.Y
		d := math.Hypot(dx, dy)
		if d > w || p.Nx*c.Nx+p.Ny*c.Ny < 0.5 {
			continue
		}
		s := (dx*tx + dy*ty) / h
		q := 1 - (d/w)*(d/w)
		wt := q * q
		basis := [3]float64{1, s, s * s}
		for r := 0; r < 3; r++ {
			for cc := 0; cc < 3; cc++ {
				m[r][cc] += wt * basis[r] * basis[cc]
			}
			m[r][3] += wt * basis[r] * math.Abs(p.En)
		}
		smin, smax = math.Min(smin, s), math.Max(smax, s)
		n++
	}
	if n < 4 || smax-smin < 2 {
		return 0, 0, 0, false
	}
	coef, solved := solve3(m)
	if !solved {
		return 0, 0, 0, false
	}
	sv := 0.0
	if coef[2] < 0 {
		sv = -coef[1] / (2 * coef[2])
		sv = math.Max(smin, math.Min(smax, sv))
	}
	v = coef[0] + coef[1]*sv + coef[2]*sv*sv
	// Report the sample nearest to the fitted maximum.
	bestD := math.Inf(1)
	for _, p := range pts {
		s := ((p.X-c.X)*tx + (p.Y-c.Y)*ty) / h
		if d := math.Hypot(p.X-c.X, p.Y-c.Y); d <= w && math.Abs(s-sv) < bestD {
			bestD, x, y = math.Abs(s-sv), p.X, p.Y
		}
	}
	return v, x, y, true
}

// solve3 solves the 3×3 system held in the augmented matrix m by Gaussian
// elimination with partial pivoting.
func solve3(m [3][4]float64) ([3]float64, bool) {
	for col := 0; col < 3; col++ {
		piv := col
		for r := col + 1; r < 3; r++ {
			if math.Abs(m[r][col]) > math.Abs(m[piv][col]) {
				piv = r
			}
		}
		if m[piv][col] == 0 {
			return [3]float64{}, false
		}
		m[col], m[piv] = m[piv], m[col]
		for r := col + 1; r < 3; r++ {
			f := m[r][col] / m[col][col]
			for cc := col; cc < 4; cc++ {
				m[r][cc] -= f * m[col][cc]
			}
		}
	}
	var x [3]float64
	for r := 2; r >= 0; r-- {
		v := m[r][3]
		for cc := r + 1; cc < 3; cc++ {
			v -= m[r][cc] * x[cc]
		}
		x[r] = v / m[r][r]
	}
	if math.IsNaN(x[0]) || math.IsInf(x[0], 0) {
		return x, false
	}
	return x, true
}

// PeakRegionFields returns the largest field magnitude in every dielectric
// material of the problem: one Peak for the background, then one per
// region that sets a permittivity (dielectric regions, and charge regions
// that give one), merging regions of the same name, in order of first
// appearance. Unnamed regions are called "region N" after their index.
// Materials that cover no cell are left out.
//
// The field is evaluated at the centres of cells whose four corners are
// free or prescribed nodes and whose neighbours hold the same material
// (the gradient of the bilinear potential, second order at the centre),
// and at the conductor surface points of SurfaceField, which are
// attributed to the material just outside the surface. Cells next to a
// dielectric interface are left out, since their field straddles the jump;
// the nearest values used lie one to two cells from the interface, so a
// field that peaks on an interface is underestimated by O(h). A peak
// within two cells of a sharp feature of any conductor (see
// PeakSurfaceField) is marked Sharp.
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
	// pure reports whether cell (i, j) and its neighbours all hold
	// material s, so that the cell's field does not straddle an interface.
	pure := func(i, j, s int) bool {
		for b := max(j-1, 0); b <= min(j+1, ny-2); b++ {
			for a := max(i-1, 0); a <= min(i+1, nx-2); a++ {
				if slot(g.CellIndex(a, b)) != s {
					return false
				}
			}
		}
		return true
	}
	for j := 0; j+1 < ny; j++ {
		for i := 0; i+1 < nx; i++ {
			c := g.CellIndex(i, j)
			n0 := g.Index(i, j)
			if m.Kind[n0] == bc.OnConductor || m.Kind[n0+1] == bc.OnConductor ||
				m.Kind[n0+nx] == bc.OnConductor || m.Kind[n0+nx+1] == bc.OnConductor {
				continue
			}
			s := slot(c)
			seen[s] = true
			if !pure(i, j, s) {
				continue
			}
			if v := math.Hypot(ex[c], ey[c]); v > peaks[s].Value {
				peaks[s].Value = v
				peaks[s].X = 0.5 * (xs[i] + xs[i+1])
				peaks[s].Y = 0.5 * (ys[j] + ys[j+1])
			}
		}
	}
	lo, _ := g.MinMaxStep()
	for k := range m.Conductors {
		for _, p := range sol.SurfaceField(k) {
			// The material just outside the surface point.
			ci, cj, _, _, ok := g.Locate(p.X+1e-3*lo*p.Nx, p.Y+1e-3*lo*p.Ny)
			if !ok {
				continue
			}
			ci, cj = min(ci, nx-2), min(cj, ny-2)
			s := slot(g.CellIndex(ci, cj))
			seen[s] = true
			if v := math.Abs(p.En); v > peaks[s].Value {
				peaks[s].Value, peaks[s].X, peaks[s].Y = v, p.X, p.Y
			}
		}
	}
	fs := sol.featureScene()
	var feats []sharpFeature
	for k := range m.Conductors {
		feats = append(feats, sol.sharpFeatures(k, fs)...)
	}
	out := peaks[:0]
	for i, p := range peaks {
		if seen[i] {
			p.Sharp = p.Value > 0 && fs.nearSharp(feats, p.X, p.Y)
			out = append(out, p)
		}
	}
	return out
}

// regionSlots returns the material names (background first, then every
// region that sets ε, merged by name) and a function mapping a cell to
// its slot.
func (sol *Solution) regionSlots() ([]string, func(c int) int) {
	m := sol.Map
	names := []string{"background"}
	idx := map[string]int{"background": 0}
	regSlot := make([]int, len(m.Regions))
	for n, r := range m.Regions {
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
	return names, func(c int) int {
		if m.CellRegion == nil || m.CellRegion[c] < 0 || int(m.CellRegion[c]) >= len(regSlot) {
			return 0
		}
		return regSlot[m.CellRegion[c]]
	}
}

// bandNodes returns the free nodes within depth links of a conductor
// node, nearest first.
func (sol *Solution) bandNodes(depth int) []int {
	g, m := sol.Grid, sol.Map
	nx, ny := g.Nx(), g.Ny()
	in := make(map[int]bool)
	var front, out []int
	for n, k := range m.Kind {
		if k == bc.OnConductor {
			front = append(front, n)
		}
	}
	for d := 0; d < depth && len(front) > 0; d++ {
		var next []int
		for _, n := range front {
			i, j := n%nx, n/nx
			for _, nb := range [4][3]int{{i + 1, j, n + 1}, {i - 1, j, n - 1}, {i, j + 1, n + nx}, {i, j - 1, n - nx}} {
				if nb[0] < 0 || nb[0] >= nx || nb[1] < 0 || nb[1] >= ny {
					continue
				}
				c := nb[2]
				if m.Kind[c] != bc.Free || in[c] {
					continue
				}
				in[c] = true
				next = append(next, c)
			}
		}
		out = append(out, next...)
		front = next
	}
	return out
}

// swRow gathers the Shortley–Weller form of the row of free node n for
// potential phi: the operator row is sx·Σₓ g·(φ_nb − φ) + sy·Σ_y g·(φ_nb − φ)
// + q − far·φ, where sx and sy rescale each axis from the full control
// volume to the one bounded by the surface points of cut links. Without
// cut links sx = sy = 1 and the row is the symmetric one.
type swRow struct {
	sum, diag [2]float64 // Σ g·φ_nb and Σ g per axis
	sx, sy    float64
	q, far    float64
	cut       bool
}

func (sol *Solution) swRowAt(n int, phi []float64) swRow {
	g, m, sys := sol.Grid, sol.Map, sol.Sys
	nx, ny := g.Nx(), g.Ny()
	xs, ys := g.X(), g.Y()
	i, j := n%nx, n/nx
	var w swRow
	// Half-lengths of the control volume per axis and side, full and
	// shortened by cuts.
	var full, short [2][2]float64
	add := func(axis, side, c int, gl, h, frac float64) {
		w.sum[axis] += gl * phi[c]
		w.diag[axis] += gl
		full[axis][side] = h / 2
		short[axis][side] = h / 2
		if m.Kind[c] == bc.OnConductor && frac < 1 {
			short[axis][side] = frac * h / 2
			w.cut = true
		}
	}
	if i+1 < nx {
		add(0, 1, n+1, sys.LinkX[n], xs[i+1]-xs[i], m.CutX[n])
	}
	if i > 0 {
		add(0, 0, n-1, sys.LinkX[n-1], xs[i]-xs[i-1], m.CutX[n-1])
	}
	if j+1 < ny {
		add(1, 1, n+nx, sys.LinkY[n], ys[j+1]-ys[j], m.CutY[n])
	}
	if j > 0 {
		add(1, 0, n-nx, sys.LinkY[n-nx], ys[j]-ys[j-1], m.CutY[n-nx])
	}
	w.q = sys.Charge[n]
	if sys.Far != nil {
		w.far = sys.Far[n]
	}
	w.sx, w.sy = 1, 1
	if w.cut {
		radial := g.Metric() == grid.Axisymmetric
		w.sx = dualMeasure(xs[i], full[0], radial) / dualMeasure(xs[i], short[0], radial)
		w.sy = dualMeasure(ys[j], full[1], false) / dualMeasure(ys[j], short[1], false)
	}
	return w
}

// dualMeasure returns the measure of the interval [x − h[0], x + h[1]]:
// its length, or in an axisymmetric grid the annulus area π(r₁² − r₀²).
func dualMeasure(x float64, h [2]float64, radial bool) float64 {
	if radial {
		r0 := math.Max(x-h[0], 0)
		r1 := x + h[1]
		return math.Pi * (r1*r1 - r0*r0)
	}
	return h[0] + h[1]
}

// relaxBand relaxes the band nodes of phi to the Shortley–Weller equations
// by Gauss–Seidel sweeps, holding every other node fixed.
func (sol *Solution) relaxBand(phi []float64, band []int) {
	for sweep := 0; sweep < 500; sweep++ {
		var change, scale float64
		for _, n := range band {
			w := sol.swRowAt(n, phi)
			d := w.sx*w.diag[0] + w.sy*w.diag[1] + w.far
			if d == 0 {
				continue
			}
			v := (w.sx*w.sum[0] + w.sy*w.sum[1] + w.q) / d
			change = math.Max(change, math.Abs(v-phi[n]))
			scale = math.Max(scale, math.Abs(v))
			phi[n] = v
		}
		if change <= 1e-14*scale {
			return
		}
	}
}

// correctedResidual writes into r the residual of phi in the operator that
// uses Shortley–Weller rows next to conductors and the symmetric rows
// elsewhere, each scaled to the symmetric row's diagonal, so that solving
// the symmetric system for it gives a defect-correction step. Fixed rows
// get zero.
func (sol *Solution) correctedResidual(r, phi []float64) {
	m := sol.Map
	clear(r)
	for n := range phi {
		if m.Kind[n] != bc.Free {
			continue
		}
		w := sol.swRowAt(n, phi)
		res := w.sx*(w.sum[0]-w.diag[0]*phi[n]) + w.sy*(w.sum[1]-w.diag[1]*phi[n]) + w.q - w.far*phi[n]
		if w.cut {
			res *= (w.diag[0] + w.diag[1] + w.far) / (w.sx*w.diag[0] + w.sy*w.diag[1] + w.far)
		}
		r[n] = res
	}
}

// derivAt0 returns the derivative at s = 0 of the polynomial through the
// points (s[i], f[i]), from the derivatives of the Lagrange basis.
func derivAt0(s, f []float64) float64 {
	var d float64
	for i := range s {
		var li float64
		for k := range s {
			if k == i {
				continue
			}
			t := 1 / (s[i] - s[k])
			for j := range s {
				if j != i && j != k {
					t *= -s[j] / (s[i] - s[j])
				}
			}
			li += t
		}
		d += f[i] * li
	}
	return d
}
