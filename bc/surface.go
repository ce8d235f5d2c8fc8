package bc

import (
	"math"

	"github.com/phigrid/phigrid/grid"
)

// Crossing is a point where a conductor surface cuts a grid link between a
// free node and a conductor node. Post-processing evaluates surface fields
// there.
type Crossing struct {
	// Free and Node are the free node and the conductor node of the link.
	Free, Node int32
	// Axis is 0 for a link along X and 1 for a link along Y.
	Axis int8
	// Dir is +1 when Node is the free node's higher neighbour along Axis
	// and −1 when it is the lower one.
	Dir int8
	// Frac is the cut fraction of the link measured from the free node,
	// as in Map.CutX and Map.CutY.
	Frac float64
	// X and Y locate the crossing.
	X, Y float64
	// Nx and Ny are the outward unit normal of the conductor surface at
	// the crossing, pointing from the conductor into its surroundings.
	Nx, Ny float64
	// EpsR is the relative permittivity just outside the surface.
	EpsR float64
}

// surface lists the crossings of every free–conductor link. The normal is
// found from the geometry: the conductor's indicator is sampled on a small
// circle about the crossing, the two angles where it changes are refined by
// bisection, and the normal bisects the outside arc. For a circle, a
// straight edge or any surface that is locally symmetric about its normal
// this is exact whatever the sampling radius; where the indicator changes
// more than twice around the circle (a corner or a thin feature) the normal
// is the mean direction of the outside samples.
func (r *rasterizer) surface(m *Map) {
	g := r.g
	nx, ny := g.Nx(), g.Ny()
	xs, ys := g.X(), g.Y()
	m.Surface = m.Surface[:0]
	for j := 0; j < ny; j++ {
		for i := 0; i < nx; i++ {
			n := j*nx + i
			if m.Kind[n] != Free {
				continue
			}
			add := func(c, axis, dir int, frac float64) {
				if m.Kind[c] != OnConductor {
					return
				}
				ci, cj := c%nx, c/nx
				h := math.Hypot(xs[ci]-xs[i], ys[cj]-ys[j])
				cr := Crossing{
					Free: int32(n), Node: int32(c), Axis: int8(axis), Dir: int8(dir), Frac: frac,
					X: xs[i] + frac*(xs[ci]-xs[i]),
					Y: ys[j] + frac*(ys[cj]-ys[j]),
				}
				// The link direction from the conductor toward the free
				// node is the fallback normal.
				lx, ly := (xs[i]-xs[ci])/h, (ys[j]-ys[cj])/h
				cr.Nx, cr.Ny = r.normal(m.Cond[c], cr.X, cr.Y, 0.1*h, lx, ly)
				ox, oy := cr.X+0.05*h*cr.Nx, cr.Y+0.05*h*cr.Ny
				cr.EpsR = r.eps(r.stateAt(ox, oy))
				m.Surface = append(m.Surface, cr)
			}
			if i+1 < nx {
				add(n+1, 0, 1, m.CutX[n])
			}
			if i > 0 {
				add(n-1, 0, -1, m.CutX[n-1])
			}
			if j+1 < ny {
				add(n+nx, 1, 1, m.CutY[n])
			}
			if j > 0 {
				add(n-nx, 1, -1, m.CutY[n-nx])
			}
		}
	}
}

// stateAt is state with the axisymmetric mirror: in an r–z problem a point
// at r < 0 is its mirror image at −r, so sampling about a point on the axis
// sees a body of revolution.
func (r *rasterizer) stateAt(x, y float64) pointState {
	if r.p.Metric == grid.Axisymmetric && x < 0 {
		x = -x
	}
	return r.state(x, y)
}

// normalSamples is the number of directions sampled about a crossing.
const normalSamples = 48

// normal returns the outward unit normal of conductor k at (x, y), sampling
// the conductor's indicator at distance rad; (fx, fy) is the fallback
// direction.
func (r *rasterizer) normal(k int32, x, y, rad, fx, fy float64) (float64, float64) {
	in := func(a float64) bool {
		return r.stateAt(x+rad*math.Cos(a), y+rad*math.Sin(a)).cond == k
	}
	var inside [normalSamples]bool
	step := 2 * math.Pi / normalSamples
	var sx, sy float64
	nout := 0
	for s := range inside {
		a := float64(s) * step
		inside[s] = in(a)
		if !inside[s] {
			sx += math.Cos(a)
			sy += math.Sin(a)
			nout++
		}
	}
	if nout == 0 || nout == normalSamples {
		return fx, fy
	}
	// Find the changes of the indicator going round.
	var changes []int
	for s := range inside {
		if inside[s] != inside[(s+1)%normalSamples] {
			changes = append(changes, s)
		}
	}
	if len(changes) != 2 {
		l := math.Hypot(sx, sy)
		if l == 0 {
			return fx, fy
		}
		return sx / l, sy / l
	}
	// Refine both changes: the angle where the indicator flips between
	// samples s and s+1.
	refine := func(s int) float64 {
		lo, hi := float64(s)*step, float64(s+1)*step
		vlo := inside[s]
		for it := 0; it < 40; it++ {
			mid := 0.5 * (lo + hi)
			if in(mid) == vlo {
				lo = mid
			} else {
				hi = mid
			}
		}
		return 0.5 * (lo + hi)
	}
	a0, a1 := refine(changes[0]), refine(changes[1])
	// The outside arc runs from the change into "outside" to the change
	// back to "inside", going counter-clockwise.
	start, end := a0, a1
	if !inside[changes[0]] {
		// Sample changes[0] is outside and changes[0]+1 inside: the
		// outside arc ends at a0.
		start, end = a1, a0
	}
	if end < start {
		end += 2 * math.Pi
	}
	mid := 0.5 * (start + end)
	return math.Cos(mid), math.Sin(mid)
}
