package bc

// Directional permittivity of cells that a dielectric interface crosses.
//
// The flux along a grid link passes through a tube: the link's length
// along its axis times half a cell across it on either side. Within the
// tube the flux along the link is nearly uniform, so each line of the tube
// parallel to the link acts like layers in series (the harmonic mean of ε
// along the line), and the lines side by side act in parallel (the
// arithmetic mean across them). This is exact for an interface along
// either grid axis: a layer boundary normal to the link is averaged
// harmonically (the normal flux D_n is continuous), and one parallel to it
// arithmetically (the tangential field E_t is continuous). For an oblique
// interface it blends the two by the local geometry. Plain arithmetic
// averaging of the cell, by contrast, overestimates the coupling across an
// interface and gives first-order errors in capacitance and interface
// fields.

import (
	"math"
	"sort"

	"github.com/phigrid/phigrid/grid"
)

// crossSamples is the number of points sampled along a line before the
// material changes on it are located by bisection.
const crossSamples = 8

// lineSeg is a piece of a sampled line with one material state; t0 and
// t1 are fractions of the line.
type lineSeg struct {
	t0, t1 float64
	s      pointState
}

// lineSegments splits the segment from (x0, y0) to (x1, y1) into pieces of
// one material. Changes of material are located to round-off by bisection
// between samples, assuming at most one change between neighbouring
// samples.
func (r *rasterizer) lineSegments(x0, y0, x1, y1 float64) []lineSeg {
	at := func(t float64) pointState { return r.state(x0+t*(x1-x0), y0+t*(y1-y0)) }
	var segs []lineSeg
	// Samples at both ends (just inside the segment) and evenly between.
	tAt := func(k int) float64 {
		switch k {
		case 0:
			return 1e-9
		case crossSamples:
			return 1 - 1e-9
		}
		return float64(k) / crossSamples
	}
	prevT, start := tAt(0), 0.0
	prev := at(prevT)
	for k := 1; k <= crossSamples; k++ {
		t := tAt(k)
		s := at(t)
		if s != prev {
			lo, hi := prevT, t
			for it := 0; it < 40; it++ {
				mid := 0.5 * (lo + hi)
				if at(mid) == prev {
					lo = mid
				} else {
					hi = mid
				}
			}
			cut := 0.5 * (lo + hi)
			segs = append(segs, lineSeg{start, cut, prev})
			start, prev = cut, s
		}
		prevT = t
	}
	return append(segs, lineSeg{start, 1, prev})
}

// lineHarmonic returns the harmonic mean of ε along the segment from
// (x0, y0) to (x1, y1), ignoring parts inside a conductor, and the fraction
// of the segment outside conductors.
func (r *rasterizer) lineHarmonic(x0, y0, x1, y1 float64) (eps, free float64) {
	var inv, length float64
	for _, sg := range r.lineSegments(x0, y0, x1, y1) {
		if sg.s.cond >= 0 {
			continue
		}
		l := sg.t1 - sg.t0
		inv += l / r.eps(sg.s)
		length += l
	}
	if length == 0 {
		return 0, 0
	}
	return length / inv, length
}

// cellRho returns the mean charge density of the cell [x0, x1] × [y0, y1]
// weighted by volume (by 2πr in an axisymmetric problem), from lines rows
// along X with their material changes located exactly.
func (r *rasterizer) cellRho(x0, y0, x1, y1 float64, lines int) float64 {
	radial := r.p.Metric == grid.Axisymmetric
	weight := func(a, b float64) float64 {
		if radial {
			return b*b - a*a
		}
		return b - a
	}
	var q, v float64
	for k := 0; k < lines; k++ {
		y := y0 + (float64(k)+0.5)/float64(lines)*(y1-y0)
		for _, sg := range r.lineSegments(x0, y, x1, y) {
			w := weight(x0+sg.t0*(x1-x0), x0+sg.t1*(x1-x0))
			q += r.rho(sg.s) * w
			v += w
		}
	}
	if v == 0 {
		return 0
	}
	return q / v
}

// tube returns the directional permittivity of the rectangle [x0, x1] ×
// [y0, y1] for flux along X (alongX) or along Y: the mean across the tube
// of the harmonic mean of ε along each line parallel to the flux. The
// material changes across the tube are located exactly on three lines
// across it (at both ends and in the middle), and between them the mean is
// integrated with lines Gauss–Legendre points per piece, so layers parallel
// to the flux are averaged exactly too. It returns 0 when the tube lies
// inside conductors.
func (r *rasterizer) tube(x0, y0, x1, y1 float64, alongX bool, lines int) float64 {
	// Breakpoints across the tube, as fractions of its width.
	cuts := []float64{0, 1}
	for _, f := range [3]float64{0.02, 0.5, 0.98} {
		var segs []lineSeg
		if alongX {
			x := x0 + f*(x1-x0)
			segs = r.lineSegments(x, y0, x, y1)
		} else {
			y := y0 + f*(y1-y0)
			segs = r.lineSegments(x0, y, x1, y)
		}
		for _, sg := range segs[1:] {
			cuts = append(cuts, sg.t0)
		}
	}
	sort.Float64s(cuts)
	nodes, weights := gaussLegendre(lines)
	var sum, wsum float64
	for k := 0; k+1 < len(cuts); k++ {
		a, b := cuts[k], cuts[k+1]
		if b-a < 1e-12 {
			continue
		}
		for q, u := range nodes {
			f := a + 0.5*(u+1)*(b-a)
			w := 0.5 * (b - a) * weights[q]
			var e, free float64
			if alongX {
				y := y0 + f*(y1-y0)
				e, free = r.lineHarmonic(x0, y, x1, y)
			} else {
				x := x0 + f*(x1-x0)
				e, free = r.lineHarmonic(x, y0, x, y1)
			}
			if free > 0 {
				sum += w * e
				wsum += w
			}
		}
	}
	if wsum == 0 {
		return 0
	}
	return sum / wsum
}

// gaussLegendre returns the nodes and weights of the n-point Gauss–Legendre
// rule on [−1, 1] for n up to 4 (more points fall back to 4).
func gaussLegendre(n int) ([]float64, []float64) {
	switch {
	case n <= 1:
		return []float64{0}, []float64{2}
	case n == 2:
		a := 1 / math.Sqrt(3)
		return []float64{-a, a}, []float64{1, 1}
	case n == 3:
		a := math.Sqrt(0.6)
		return []float64{-a, 0, a}, []float64{5.0 / 9, 8.0 / 9, 5.0 / 9}
	}
	a := math.Sqrt(3.0/7 - 2.0/7*math.Sqrt(1.2))
	b := math.Sqrt(3.0/7 + 2.0/7*math.Sqrt(1.2))
	wa := (18 + math.Sqrt(30)) / 36
	wb := (18 - math.Sqrt(30)) / 36
	return []float64{-b, -a, a, b}, []float64{wb, wa, wa, wb}
}

// directional fills EpsX and EpsY of cell c = (i, j), whose plain mean is
// mean, with lines Gauss points per piece of each half-cell.
func (r *rasterizer) directional(m *Map, i, j, c int, mean float64, lines int) {
	xs, ys := r.g.X(), r.g.Y()
	x0, x1, y0, y1 := xs[i], xs[i+1], ys[j], ys[j+1]
	xm, ym := 0.5*(x0+x1), 0.5*(y0+y1)
	or := func(v float64) float64 {
		if v == 0 || math.IsNaN(v) {
			return mean
		}
		return v
	}
	m.EpsX[2*c] = or(r.tube(x0, y0, x1, ym, true, lines))
	m.EpsX[2*c+1] = or(r.tube(x0, ym, x1, y1, true, lines))
	m.EpsY[2*c] = or(r.tube(x0, y0, xm, y1, false, lines))
	m.EpsY[2*c+1] = or(r.tube(xm, y0, x1, y1, false, lines))
}
