package grid

import (
	"fmt"
	"math"
)

// Metric says how lengths on the grid become areas and volumes.
type Metric int

const (
	// Planar is a 2D cross-section; measures are per metre of depth.
	Planar Metric = iota
	// Axisymmetric is an r–z body of revolution; X is r and Y is z, and
	// measures are exact integrals of 2πr.
	Axisymmetric
)

// String returns "planar" or "axisymmetric".
func (m Metric) String() string {
	switch m {
	case Planar:
		return "planar"
	case Axisymmetric:
		return "axisymmetric"
	}
	return fmt.Sprintf("Metric(%d)", int(m))
}

// Grid is a rectilinear node grid with its finite-volume metric.
// Its zero value is not usable; build one with New.
type Grid struct {
	x, y   []float64
	metric Metric

	// Half measures of each node's control volume along X and Y.
	dxLo, dxHi []float64
	dyLo, dyHi []float64
	// Link factors: face measure per unit face length over link length.
	linkX, linkY []float64
}

// New returns a grid on the node axes x and y with metric m. In an
// axisymmetric grid x holds radii and must start at r ≥ 0.
func New(x, y []float64, m Metric) (*Grid, error) {
	if err := checkAxis("x", x); err != nil {
		return nil, err
	}
	if err := checkAxis("y", y); err != nil {
		return nil, err
	}
	switch m {
	case Planar:
	case Axisymmetric:
		if x[0] < 0 {
			return nil, fmt.Errorf("%w: an axisymmetric grid needs r ≥ 0, but its first radius is %g; move the domain to r ≥ 0", ErrAxis, x[0])
		}
	default:
		return nil, fmt.Errorf("%w: unknown metric %d", ErrAxis, int(m))
	}
	g := &Grid{
		x:      append([]float64(nil), x...),
		y:      append([]float64(nil), y...),
		metric: m,
	}
	g.dxLo, g.dxHi, g.linkX = halves(g.x, m == Axisymmetric)
	g.dyLo, g.dyHi, g.linkY = halves(g.y, false)
	return g, nil
}

// halves returns the low and high half measures of each node's dual
// interval and the link factor of each link. With radial set, measures are
// the areas of annuli (π(r₂²−r₁²)) and link factors are 2π·r_mid/h.
func halves(x []float64, radial bool) (lo, hi, link []float64) {
	n := len(x)
	lo = make([]float64, n)
	hi = make([]float64, n)
	link = make([]float64, n-1)
	for i := 0; i < n; i++ {
		if i > 0 {
			m := 0.5 * (x[i-1] + x[i])
			if radial {
				lo[i] = math.Pi * (x[i]*x[i] - m*m)
			} else {
				lo[i] = x[i] - m
			}
		}
		if i < n-1 {
			m := 0.5 * (x[i] + x[i+1])
			h := x[i+1] - x[i]
			if radial {
				hi[i] = math.Pi * (m*m - x[i]*x[i])
				link[i] = 2 * math.Pi * m / h
			} else {
				hi[i] = m - x[i]
				link[i] = 1 / h
			}
		}
	}
	return lo, hi, link
}

// Metric returns the grid's metric.
func (g *Grid) Metric() Metric { return g.metric }

// Nx returns the number of nodes along X.
func (g *Grid) Nx() int { return len(g.x) }

// Ny returns the number of nodes along Y.
func (g *Grid) Ny() int { return len(g.y) }

// Len returns the number of nodes, Nx·Ny.
func (g *Grid) Len() int { return len(g.x) * len(g.y) }

// Cells returns the number of cells, (Nx−1)·(Ny−1).
func (g *Grid) Cells() int { return (len(g.x) - 1) * (len(g.y) - 1) }

// X returns the node coordinates along X (r in an axisymmetric grid).
func (g *Grid) X() []float64 { return g.x }

// Y returns the node coordinates along Y (z in an axisymmetric grid).
func (g *Grid) Y() []float64 { return g.y }

// Index returns the flat index j·Nx + i of node (i, j).
func (g *Grid) Index(i, j int) int { return j*len(g.x) + i }

// CellIndex returns the flat index j·(Nx−1) + i of cell (i, j).
func (g *Grid) CellIndex(i, j int) int { return j*(len(g.x)-1) + i }

// Bounds returns the extent of the grid.
func (g *Grid) Bounds() (x0, y0, x1, y1 float64) {
	return g.x[0], g.y[0], g.x[len(g.x)-1], g.y[len(g.y)-1]
}

// DualX returns the measures of the low and high halves of the control
// volume of node column i along X: lengths in a planar grid, annulus areas
// π(r²−r'²) in an axisymmetric one. The halves outside the grid are zero.
func (g *Grid) DualX(i int) (lo, hi float64) { return g.dxLo[i], g.dxHi[i] }

// DualY returns the lengths of the low and high halves of the control
// volume of node row j along Y. The halves outside the grid are zero.
func (g *Grid) DualY(j int) (lo, hi float64) { return g.dyLo[j], g.dyHi[j] }

// LinkX returns the geometric factor of the X-link from node column i to
// i+1: 1/h in a planar grid, 2π·r_mid/h in an axisymmetric one. Multiplied by
// the permittivity-weighted face length along Y it gives the coupling.
func (g *Grid) LinkX(i int) float64 { return g.linkX[i] }

// LinkY returns the geometric factor 1/h of the Y-link from node row j to
// j+1. Multiplied by the permittivity-weighted face measure along X it gives
// the coupling.
func (g *Grid) LinkY(j int) float64 { return g.linkY[j] }

// Volume returns the measure of the control volume of node (i, j):
// an area per metre of depth (planar) or a volume (axisymmetric).
func (g *Grid) Volume(i, j int) float64 {
	return (g.dxLo[i] + g.dxHi[i]) * (g.dyLo[j] + g.dyHi[j])
}

// CellVolume returns the measure of cell (i, j).
func (g *Grid) CellVolume(i, j int) float64 {
	return (g.dxHi[i] + g.dxLo[i+1]) * (g.dyHi[j] + g.dyLo[j+1])
}

// MinMaxStep returns the smallest and largest node spacing over both axes.
func (g *Grid) MinMaxStep() (lo, hi float64) {
	lo, hi = math.Inf(1), 0
	for _, a := range [][]float64{g.x, g.y} {
		for i := 1; i < len(a); i++ {
			h := a[i] - a[i-1]
			lo = math.Min(lo, h)
			hi = math.Max(hi, h)
		}
	}
	return lo, hi
}

// Locate returns the cell (i, j) containing point (x, y) and the local
// coordinates (s, t) ∈ [0, 1]² of the point inside it. Points outside the
// grid report ok = false.
func (g *Grid) Locate(x, y float64) (i, j int, s, t float64, ok bool) {
	i, s, okx := locate1(g.x, x)
	j, t, oky := locate1(g.y, y)
	return i, j, s, t, okx && oky
}

func locate1(a []float64, v float64) (int, float64, bool) {
	n := len(a)
	if !(v >= a[0] && v <= a[n-1]) {
		return 0, 0, false
	}
	lo, hi := 0, n-1
	for hi-lo > 1 {
		m := (lo + hi) / 2
		if a[m] <= v {
			lo = m
		} else {
			hi = m
		}
	}
	return lo, (v - a[lo]) / (a[lo+1] - a[lo]), true
}
