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
	// size there is Cell/Refine. Zero means 4; 1 gives a uniform grid
	// apart from the rules below.
	Refine float64
	// Ratio bounds the growth of neighbouring cells. Zero means 1.2;
	// values must lie in [1, 3], and 1 keeps every cell at the finest size
	// any rule asks for.
	Ratio float64
	// MaxNodes caps the node count; AutoGrid fails above it. Zero means
	// 4 097² nodes.
	MaxNodes int
	// Gap is the smallest number of cells across a thin gap: between two
	// shapes facing each other, between a shape and a fixed side (across
	// twice the distance to a zero-flux side, the gap to the mirror
	// image), and across a dielectric or charge layer. Zero means 4.
	Gap int
	// Corner divides the fine size once more at conductor corners
	// (rectangle corners, polygon vertices, strip ends), where the field is
	// singular. Zero means 2; 1 turns it off.
	Corner float64
	// Halvings halves every cell size the rules below ask for (the target,
	// the fine sizes, the curvature and gap rules) this many times and takes
	// the square root of Ratio each time, so the grid is refined in the
	// same pattern: the grids of a convergence study. Zero means the grid as
	// described.
	Halvings int
}

// withDefaults returns m with its zero fields replaced by the defaults,
// or an error for invalid values.
func (m Mesh) withDefaults() (Mesh, error) {
	if !(m.Cell > 0) || math.IsInf(m.Cell, 0) {
		return m, fmt.Errorf("%w: the target cell size must be positive, got %g", ErrProblem, m.Cell)
	}
	if m.Refine == 0 {
		m.Refine = 4
	}
	if !(m.Refine >= 1) || math.IsInf(m.Refine, 0) {
		return m, fmt.Errorf("%w: the refinement factor must be ≥ 1, got %g", ErrProblem, m.Refine)
	}
	if m.Ratio == 0 {
		m.Ratio = 1.2
	}
	if !(m.Ratio >= 1 && m.Ratio <= 3) {
		return m, fmt.Errorf("%w: the growth ratio must lie in [1, 3], got %g", ErrProblem, m.Ratio)
	}
	if m.MaxNodes == 0 {
		m.MaxNodes = DefaultMaxNodes
	}
	if m.MaxNodes < 4 {
		return m, fmt.Errorf("%w: the node cap must be at least 4, got %d", ErrProblem, m.MaxNodes)
	}
	if m.Gap == 0 {
		m.Gap = 4
	}
	if m.Gap < 1 {
		return m, fmt.Errorf("%w: the cells across a gap must be ≥ 1, got %d", ErrProblem, m.Gap)
	}
	if m.Corner == 0 {
		m.Corner = 2
	}
	if !(m.Corner >= 1) || math.IsInf(m.Corner, 0) {
		return m, fmt.Errorf("%w: the corner refinement must be ≥ 1, got %g", ErrProblem, m.Corner)
	}
	if m.Halvings < 0 || m.Halvings > 30 {
		return m, fmt.Errorf("%w: the number of halvings must lie in [0, 30], got %d", ErrProblem, m.Halvings)
	}
	return m, nil
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

// AutoGrid builds a graded grid for p following m. Along each axis the
// cell size is the smallest that any of these rules asks for, and grows by
// at most Ratio from one cell to the next away from where a rule applies:
//
//   - Cell everywhere (the target size);
//   - Cell/Refine at geometry features: the domain's edges, every shape's
//     bounding box, circle extremes and polygon vertices, which are also
//     made grid lines so that straight edges and layer boundaries along
//     the axes fall on the grid;
//   - Cell/(Refine·Corner) at conductor corners and strip ends;
//   - over the extent of a circle or annulus, min(R/4, max(Cell/Refine,
//     R/16)), so that round surfaces, where peak fields sit, are resolved
//     all round and not only at their extremes (an ellipse counts as a
//     circle of its minor semi-axis, and its tips get an eighth of their
//     radius of curvature);
//   - Gap cells across every thin gap: between two shapes facing each
//     other (the exact narrowest gap for circles and the bores of
//     annuli, the bounding boxes otherwise), between a shape and a fixed
//     side (twice the distance to a zero-flux side), and across a
//     dielectric or charge layer.
//
// Beyond the geometry's bounding box (plus two cells), toward an Open side,
// the Cell cap is lifted: the cells keep growing by Ratio toward 4 Cell,
// which makes a far region out to a distant open boundary cheap (see
// ExtendOpen) while the cells where it meets the fine grid of the other
// axis keep a bounded aspect ratio, so multigrid convergence does not
// degrade as the grid is refined.
// Features closer than a quarter of the local cell size are merged.
// Mesh.Halvings refines all of it in the same pattern.
func AutoGrid(p *Problem, m Mesh) (*grid.Grid, error) {
	m, err := m.withDefaults()
	if err != nil {
		return nil, err
	}
	px, py := plan(p, m)
	limit := m.MaxNodes
	cx := px.cells(limit)
	cy := py.cells(limit)
	if n := float64(cx+1) * float64(cy+1); n > float64(limit) {
		return nil, fmt.Errorf("%w: about %.3g nodes needed but the cap is %d; raise the cap or coarsen the cell size", ErrTooLarge, n, limit)
	}
	x, y := px.nodes(), py.nodes()
	if n := len(x) * len(y); n > m.MaxNodes {
		return nil, fmt.Errorf("%w: %d × %d = %d nodes exceed the cap of %d; raise the cap or coarsen the cell size", ErrTooLarge, len(x), len(y), n, m.MaxNodes)
	}
	g, err := grid.New(x, y, p.Metric)
	if err != nil {
		return nil, fmt.Errorf("%w: %w", ErrProblem, err)
	}
	return g, nil
}

// EstimateNodes returns the node count AutoGrid would produce (an upper
// estimate when it exceeds the cap), without building the grid. It
// returns +Inf for an invalid mesh.
func EstimateNodes(p *Problem, m Mesh) float64 {
	m, err := m.withDefaults()
	if err != nil {
		return math.Inf(1)
	}
	px, py := plan(p, m)
	// Count each axis up to the cap: beyond it the product is over the
	// cap anyway.
	cx := px.cells(m.MaxNodes)
	cy := py.cells(m.MaxNodes)
	return float64(cx+1) * float64(cy+1)
}
