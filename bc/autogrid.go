package bc

import (
	"fmt"
	"math"
	"sort"

	"github.com/phigrid/phigrid/grid"
)

// Mesh controls the automatic grid of a problem. The zero value of every
// field except Cell means its documented default.
type Mesh struct {
	// Cell is the target cell size away from geometry features, in metres.
	// It must be positive.
	Cell float64
	// Refine divides Cell near conductor and interface edges: the cell
	// size there is Cell/Refine. Zero means 4; 1 gives a uniform grid.
	Refine float64
	// Ratio bounds the growth of neighbouring cells. Zero means 1.2.
	Ratio float64
	// MaxNodes caps the node count; AutoGrid fails above it. Zero means
	// 4 097² nodes.
	MaxNodes int
}

// DefaultMaxNodes is the node cap used when Mesh.MaxNodes is zero.
const DefaultMaxNodes = 4097 * 4097

// ErrTooLarge is wrapped by AutoGrid when the grid would exceed the node
// cap.
var ErrTooLarge = fmt.Errorf("bc: grid too large")

// Features returns the coordinates along X and Y where the problem's
// geometry has edges: the domain, every shape's bounding box, circle
// centres and polygon vertices. AutoGrid grades the grid toward them.
func (p *Problem) Features() (xs, ys []float64) {
	add := func(x, y float64) {
		xs = append(xs, x)
		ys = append(ys, y)
	}
	d := p.Domain
	add(d.X0, d.Y0)
	add(d.X1, d.Y1)
	for _, r := range p.Regions {
		switch s := r.Shape.(type) {
		case Polygon:
			for i := range s.X {
				add(s.X[i], s.Y[i])
			}
		case Circle:
			add(s.X-s.R, s.Y-s.R)
			add(s.X+s.R, s.Y+s.R)
		case Annulus:
			add(s.X-s.R1, s.Y-s.R1)
			add(s.X+s.R1, s.Y+s.R1)
			add(s.X-s.R0, s.Y-s.R0)
			add(s.X+s.R0, s.Y+s.R0)
		case Strip:
			add(s.X0, s.Y0)
			add(s.X1, s.Y1)
		default:
			x0, y0, x1, y1 := r.Shape.Bounds()
			add(x0, y0)
			add(x1, y1)
		}
	}
	clip := func(v []float64, lo, hi float64) []float64 {
		out := v[:0]
		for _, x := range v {
			if x >= lo && x <= hi {
				out = append(out, x)
			}
		}
		sort.Float64s(out)
		return out
	}
	return clip(xs, d.X0, d.X1), clip(ys, d.Y0, d.Y1)
}

// AutoGrid builds a graded grid for p following m: cells of Cell/Refine at
// geometry features, growing by Ratio to Cell elsewhere.
func AutoGrid(p *Problem, m Mesh) (*grid.Grid, error) {
	if !(m.Cell > 0) || math.IsInf(m.Cell, 0) {
		return nil, fmt.Errorf("%w: the target cell size must be positive, got %g", ErrProblem, m.Cell)
	}
	if m.Refine == 0 {
		m.Refine = 4
	}
	if m.Refine < 1 {
		return nil, fmt.Errorf("%w: the refinement factor must be ≥ 1, got %g", ErrProblem, m.Refine)
	}
	if m.MaxNodes == 0 {
		m.MaxNodes = DefaultMaxNodes
	}
	d := p.Domain
	fx, fy := p.Features()
	est := EstimateNodes(p, m)
	if est > float64(m.MaxNodes) {
		return nil, fmt.Errorf("%w: about %.3g nodes needed but the cap is %d; raise the cap or coarsen the cell size", ErrTooLarge, est, m.MaxNodes)
	}
	gr := grid.Grading{Fine: m.Cell / m.Refine, Max: m.Cell, Ratio: m.Ratio}
	gr.Focus = fx
	x, err := grid.Graded(d.X0, d.X1, gr)
	if err != nil {
		return nil, fmt.Errorf("%w: x axis: %w", ErrProblem, err)
	}
	gr.Focus = fy
	y, err := grid.Graded(d.Y0, d.Y1, gr)
	if err != nil {
		return nil, fmt.Errorf("%w: y axis: %w", ErrProblem, err)
	}
	if n := len(x) * len(y); n > m.MaxNodes {
		return nil, fmt.Errorf("%w: %d × %d = %d nodes exceed the cap of %d; raise the cap or coarsen the cell size", ErrTooLarge, len(x), len(y), n, m.MaxNodes)
	}
	return grid.New(x, y, p.Metric)
}

// EstimateNodes returns a quick upper estimate of the node count AutoGrid
// would produce, without building the grid.
func EstimateNodes(p *Problem, m Mesh) float64 {
	if m.Refine == 0 {
		m.Refine = 4
	}
	d := p.Domain
	fx, fy := p.Features()
	nx := (d.X1-d.X0)/m.Cell + 1 + float64(len(fx))*math.Log(m.Refine)/math.Log(1.2)
	ny := (d.Y1-d.Y0)/m.Cell + 1 + float64(len(fy))*math.Log(m.Refine)/math.Log(1.2)
	return nx * ny
}
