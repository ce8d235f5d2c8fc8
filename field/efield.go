package field

import (
	"math"

	"github.com/phigrid/phigrid/bc"
)

// NodeFieldTo writes E = −∇φ at every node into ex and ey and returns them;
// nil slices are allocated. Derivatives are the second-order three-point
// formulas on the non-uniform grid; across a link cut by a conductor
// surface the neighbour is the conductor at the cut distance, so fields
// next to curved electrodes keep their accuracy. At the outer boundary the
// formulas are one-sided. Conductor nodes get E = 0 (the field inside a
// conductor); use the surface-field functions for the field on a
// conductor.
func (sol *Solution) NodeFieldTo(ex, ey []float64) ([]float64, []float64) {
	g, m := sol.Grid, sol.Map
	n := g.Len()
	if ex == nil {
		ex = make([]float64, n)
	}
	if ey == nil {
		ey = make([]float64, n)
	}
	nx, ny := g.Nx(), g.Ny()
	xs, ys := g.X(), g.Y()
	for j := 0; j < ny; j++ {
		for i := 0; i < nx; i++ {
			idx := j*nx + i
			if m.Kind[idx] == bc.OnConductor {
				ex[idx], ey[idx] = 0, 0
				continue
			}
			ex[idx] = -sol.derivative(idx, i, nx, xs, 1, m.CutX)
			ey[idx] = -sol.derivative(idx, j, ny, ys, nx, m.CutY)
		}
	}
	return ex, ey
}

// derivative returns ∂φ/∂s at node idx along one axis with coordinates a
// (position p along it, n nodes, index stride st, cut fractions cut).
func (sol *Solution) derivative(idx, p, n int, a []float64, st int, cut []float64) float64 {
	phi := sol.Phi
	m := sol.Map
	f0 := phi[idx]
	// Neighbour values and distances, shortened by cuts.
	var hm, hp, fm, fp float64
	hasM, hasP := p > 0, p+1 < n
	if hasM {
		hm = a[p] - a[p-1]
		fm = phi[idx-st]
		if c := cut[idx-st]; c < 1 && m.Kind[idx-st] == bc.OnConductor {
			hm *= c
		}
	}
	if hasP {
		hp = a[p+1] - a[p]
		fp = phi[idx+st]
		if c := cut[idx]; c < 1 && m.Kind[idx+st] == bc.OnConductor {
			hp *= c
		}
	}
	switch {
	case hasM && hasP:
		return (hm*hm*(fp-f0) + hp*hp*(f0-fm)) / (hm * hp * (hm + hp))
	case hasP:
		// One-sided second order from the next two nodes when available.
		if p+2 < n && cut[idx] == 1 && cut[idx+st] == 1 {
			h1, h2 := a[p+1]-a[p], a[p+2]-a[p]
			f2 := phi[idx+2*st]
			return ((fp-f0)*h2*h2 - (f2-f0)*h1*h1) / (h1 * h2 * (h2 - h1))
		}
		return (fp - f0) / hp
	case hasM:
		if p-2 >= 0 && cut[idx-st] == 1 && cut[idx-2*st] == 1 {
			h1, h2 := a[p]-a[p-1], a[p]-a[p-2]
			f2 := phi[idx-2*st]
			return ((f0-fm)*h2*h2 - (f0-f2)*h1*h1) / (h1 * h2 * (h2 - h1))
		}
		return (f0 - fm) / hm
	}
	return 0
}

// CellFieldTo writes E = −∇φ at every cell centre (the gradient of the
// bilinear interpolant there) into ex and ey and returns them; nil slices
// are allocated.
func (sol *Solution) CellFieldTo(ex, ey []float64) ([]float64, []float64) {
	g := sol.Grid
	nc := g.Cells()
	if ex == nil {
		ex = make([]float64, nc)
	}
	if ey == nil {
		ey = make([]float64, nc)
	}
	nx, ny := g.Nx(), g.Ny()
	xs, ys := g.X(), g.Y()
	phi := sol.Phi
	for j := 0; j+1 < ny; j++ {
		hy := ys[j+1] - ys[j]
		for i := 0; i+1 < nx; i++ {
			hx := xs[i+1] - xs[i]
			n := j*nx + i
			f00, f10, f01, f11 := phi[n], phi[n+1], phi[n+nx], phi[n+nx+1]
			c := j*(nx-1) + i
			ex[c] = -0.5 * ((f10 - f00) + (f11 - f01)) / hx
			ey[c] = -0.5 * ((f01 - f00) + (f11 - f10)) / hy
		}
	}
	return ex, ey
}

// Magnitude returns √(ex²+ey²) element by element into dst (allocated when
// nil).
func Magnitude(dst, ex, ey []float64) []float64 {
	if dst == nil {
		dst = make([]float64, len(ex))
	}
	for i := range ex {
		dst[i] = math.Hypot(ex[i], ey[i])
	}
	return dst
}

// PotentialAt returns the potential at (x, y) by bilinear interpolation;
// ok is false outside the grid.
func (sol *Solution) PotentialAt(x, y float64) (phi float64, ok bool) {
	g := sol.Grid
	i, j, s, t, ok := g.Locate(x, y)
	if !ok {
		return 0, false
	}
	i, j, s, t = clampCell(g.Nx(), g.Ny(), i, j, s, t)
	nx := g.Nx()
	n := j*nx + i
	p := sol.Phi
	return (1-s)*(1-t)*p[n] + s*(1-t)*p[n+1] + (1-s)*t*p[n+nx] + s*t*p[n+nx+1], true
}

func clampCell(nx, ny, i, j int, s, t float64) (int, int, float64, float64) {
	if i >= nx-1 {
		i, s = nx-2, 1
	}
	if j >= ny-1 {
		j, t = ny-2, 1
	}
	return i, j, s, t
}

// FieldAt returns E at (x, y); ok is false outside the grid. It
// interpolates the nodal field bilinearly (second order). In a cell that
// touches a conductor only the free corners take part, with their weights
// renormalised, so the zero field inside the conductor is not mixed in;
// a cell with no free corner uses the gradient of the bilinear potential.
// The nodal field is computed once and cached.
func (sol *Solution) FieldAt(x, y float64) (ex, ey float64, ok bool) {
	g := sol.Grid
	i, j, s, t, ok := g.Locate(x, y)
	if !ok {
		return 0, 0, false
	}
	i, j, s, t = clampCell(g.Nx(), g.Ny(), i, j, s, t)
	nx := g.Nx()
	n := j*nx + i
	if sol.ex == nil {
		sol.ex, sol.ey = sol.NodeFieldTo(nil, nil)
	}
	k := sol.Map.Kind
	corners := [4]int{n, n + 1, n + nx, n + nx + 1}
	weights := [4]float64{(1 - s) * (1 - t), s * (1 - t), (1 - s) * t, s * t}
	var wsum float64
	for c, idx := range corners {
		if k[idx] == bc.OnConductor {
			weights[c] = 0
		}
		wsum += weights[c]
	}
	if wsum > 1e-12 {
		for c, idx := range corners {
			w := weights[c] / wsum
			ex += w * sol.ex[idx]
			ey += w * sol.ey[idx]
		}
		return ex, ey, true
	}
	xs, ys := g.X(), g.Y()
	hx, hy := xs[i+1]-xs[i], ys[j+1]-ys[j]
	p := sol.Phi
	ex = -((1-t)*(p[n+1]-p[n]) + t*(p[n+nx+1]-p[n+nx])) / hx
	ey = -((1-s)*(p[n+nx]-p[n]) + s*(p[n+nx+1]-p[n+1])) / hy
	return ex, ey, true
}
