package field

import (
	"context"
	"errors"
	"fmt"
	"math"
	"strings"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
	"github.com/phigrid/phigrid/solve"
)

// ErrConvergence is wrapped by Converge and ConvergeGrids when the grids
// they are given cannot make a convergence study.
var ErrConvergence = errors.New("field: invalid convergence study")

// Level is one grid of a convergence study.
type Level struct {
	// Nodes and Cells count the grid.
	Nodes, Cells int
	// H is the representative cell size √(A/Cells), A the area of the
	// domain: the mean spacing of a graded grid.
	H float64
}

// Estimate is the grid-convergence estimate of one quantity.
type Estimate struct {
	// Name says what the quantity is, for example "C(inner,outer)",
	// "Q(inner)", "W", "Esurf(inner)" or "Emax(oil)".
	Name string
	// Unit is its SI unit, for example "F/m" or "V/m".
	Unit string
	// Values holds the quantity on every level, coarsest first.
	Values []float64
	// Observed is the order of convergence the values show (three or more
	// levels); NaN when they do not converge monotonically or there are
	// only two levels.
	Observed float64
	// Order is the order used for the extrapolation and the band: the
	// observed order limited to [MinOrder, formal order], the formal order
	// for two levels or oscillating values, and MinOrder when the values
	// do not converge.
	Order float64
	// Extrapolated is the Richardson extrapolation of the two finest
	// values with Order.
	Extrapolated float64
	// Band is the half-width of the error band about the finest value:
	// the grid convergence index Fs·|f₁ − f₂|/(r^p − 1) (Roache 1994), in
	// the quantity's unit.
	Band float64
	// Safety is the factor Fs: 1.25 with an observed order, 3 otherwise
	// and for peak values.
	Safety float64
	// Note explains an estimate that used Fs = 3: "two levels",
	// "oscillating", "not converging" or "peak value".
	Note string
}

// Finest returns the value on the finest level.
func (e Estimate) Finest() float64 { return e.Values[len(e.Values)-1] }

// Lo and Hi return the ends of the error band.
func (e Estimate) Lo() float64 { return e.Finest() - e.Band }

// Hi returns the upper end of the error band.
func (e Estimate) Hi() float64 { return e.Finest() + e.Band }

// Contains reports whether v lies in the error band.
func (e Estimate) Contains(v float64) bool { return v >= e.Lo() && v <= e.Hi() }

// RelBand returns the band relative to the finest value (Inf for a zero
// value).
func (e Estimate) RelBand() float64 { return e.Band / math.Abs(e.Finest()) }

// Convergence is the result of a convergence study: the quantities of a
// problem solved on a sequence of refined grids, each with an observed
// order of convergence, a Richardson-extrapolated value and an error band.
type Convergence struct {
	// Levels describes the grids, coarsest first.
	Levels []Level
	// Estimates holds one entry per quantity: every capacitance-matrix
	// entry C(i,j) with i ≤ j, every conductor charge Q(k) at the
	// problem's potentials, the stored energy W, the peak surface field
	// Esurf(k) of every conductor and the peak field Emax(m) of every
	// dielectric material.
	Estimates []Estimate
	// Finest is the solution on the finest grid.
	Finest *Solution
}

// Find returns the estimate of the named quantity.
func (c *Convergence) Find(name string) (Estimate, bool) {
	for _, e := range c.Estimates {
		if e.Name == name {
			return e, true
		}
	}
	return Estimate{}, false
}

// String formats the study as a table: one row per quantity with its
// values from the coarsest to the finest grid, the observed order, the
// extrapolated value and the relative band.
func (c *Convergence) String() string {
	var b strings.Builder
	fmt.Fprintf(&b, "%-22s", "grid")
	for _, l := range c.Levels {
		fmt.Fprintf(&b, " %14s", fmt.Sprintf("%d nodes", l.Nodes))
	}
	fmt.Fprintf(&b, " %6s %14s %9s\n", "order", "extrapolated", "band")
	for _, e := range c.Estimates {
		fmt.Fprintf(&b, "%-22s", e.Name+" ["+e.Unit+"]")
		for _, v := range e.Values {
			fmt.Fprintf(&b, " %14.8g", v)
		}
		ord := fmt.Sprintf("%.2f", e.Observed)
		if math.IsNaN(e.Observed) {
			ord = "-"
		}
		fmt.Fprintf(&b, " %6s %14.8g %8.2g%%", ord, e.Extrapolated, 100*e.RelBand())
		if e.Note != "" {
			fmt.Fprintf(&b, " (%s)", e.Note)
		}
		b.WriteByte('\n')
	}
	return b.String()
}

// Formal orders of convergence assumed for the band when none is observed,
// and the bounds on the observed order.
const (
	// FormalOrder is the order of the discretisation for integral
	// quantities and smooth surface fields.
	FormalOrder = 2
	// MinOrder is the smallest order used for a band; a smaller observed
	// order is taken as MinOrder, which widens the band less than the
	// observation would but keeps it finite.
	MinOrder = 0.5
)

// Converge solves p on levels grids built by bc.AutoGrid, the coarsest
// from mesh and each next one with one more halving (bc.Mesh.Halvings:
// every cell size halves and the growth ratio is square-rooted, so the
// grading keeps its pattern), and estimates the discretisation error of every
// quantity (see Convergence). levels must lie in [2, 5]; three levels give
// an observed order, two assume the formal order with a larger safety
// factor. Every level costs a solve per conductor plus two, and the finest
// has about 4^(levels−1) times the coarsest's nodes.
func Converge(ctx context.Context, p *bc.Problem, mesh bc.Mesh, levels int, set *Settings) (*Convergence, error) {
	if levels < 2 || levels > 5 {
		return nil, fmt.Errorf("%w: a convergence study needs 2 to 5 levels, got %d", ErrConvergence, levels)
	}
	grids := make([]*grid.Grid, levels)
	for l := range grids {
		m := mesh
		m.Halvings = mesh.Halvings + l
		g, err := bc.AutoGrid(p, m)
		if err != nil {
			return nil, fmt.Errorf("field: convergence level %d: %w", l, err)
		}
		grids[l] = g
	}
	return ConvergeGrids(ctx, p, grids, set)
}

// ConvergeGrids is Converge on grids the caller built, coarsest first.
// The grids should be systematically refined (each about twice as fine as
// the one before it in every direction, with the same grading pattern);
// the refinement ratios are measured from the cell counts.
func ConvergeGrids(ctx context.Context, p *bc.Problem, grids []*grid.Grid, set *Settings) (*Convergence, error) {
	if len(grids) < 2 {
		return nil, fmt.Errorf("%w: a convergence study needs at least 2 grids, got %d", ErrConvergence, len(grids))
	}
	c := &Convergence{}
	var rows [][]namedValue
	area := (p.Domain.X1 - p.Domain.X0) * (p.Domain.Y1 - p.Domain.Y0)
	for l, g := range grids {
		lv := Level{Nodes: g.Len(), Cells: g.Cells(), H: math.Sqrt(area / float64(g.Cells()))}
		if l > 0 && !(lv.H < c.Levels[l-1].H) {
			return nil, fmt.Errorf("%w: grid %d (%d cells) is not finer than grid %d (%d cells); order the grids coarsest first", ErrConvergence, l, g.Cells(), l-1, grids[l-1].Cells())
		}
		c.Levels = append(c.Levels, lv)
		sol, vals, err := levelQuantities(ctx, p, g, set)
		if err != nil {
			return nil, fmt.Errorf("field: convergence level %d (%d nodes): %w", l, g.Len(), err)
		}
		if l > 0 && len(vals) != len(rows[0]) {
			return nil, fmt.Errorf("%w: level %d has %d quantities but level 0 has %d (a material or conductor vanished on a coarse grid); refine the coarsest grid", ErrConvergence, l, len(vals), len(rows[0]))
		}
		rows = append(rows, vals)
		c.Finest = sol
	}
	h := make([]float64, len(c.Levels))
	for l, lv := range c.Levels {
		h[l] = lv.H
	}
	for q := range rows[0] {
		vals := make([]float64, len(rows))
		for l := range rows {
			if rows[l][q].name != rows[0][q].name {
				return nil, fmt.Errorf("%w: quantity %q on level 0 is %q on level %d", ErrConvergence, rows[0][q].name, rows[l][q].name, l)
			}
			vals[l] = rows[l][q].value
		}
		e := Richardson(h, vals, FormalOrder, rows[0][q].peak)
		e.Name, e.Unit = rows[0][q].name, rows[0][q].unit
		c.Estimates = append(c.Estimates, e)
	}
	return c, nil
}

type namedValue struct {
	name, unit string
	value      float64
	peak       bool // a maximum over sampled points
}

// levelQuantities solves p on g and returns the quantities of a study.
func levelQuantities(ctx context.Context, p *bc.Problem, g *grid.Grid, set *Settings) (*Solution, []namedValue, error) {
	var o Settings
	if set != nil {
		o = *set
	}
	sol, err := Solve(ctx, p, g, &o)
	if err != nil {
		return nil, nil, err
	}
	cm := sol.Capacitance
	if cm == nil && len(sol.Map.Conductors) > 0 {
		var res []*solve.Result
		cm, res, err = CapacitanceMatrix(ctx, sol.Sys, &o.Solver)
		sol.Results = append(sol.Results, res...)
		if err != nil {
			return nil, nil, err
		}
	}
	if err := sol.RefineSurface(ctx, &o.Solver); err != nil {
		return nil, nil, err
	}
	planar := p.Metric == grid.Planar
	unit := func(planarUnit, axiUnit string) string {
		if planar {
			return planarUnit
		}
		return axiUnit
	}
	names := make([]string, len(sol.Map.Conductors))
	for k, cd := range sol.Map.Conductors {
		names[k] = cd.Name
	}
	var out []namedValue
	for i := range cm {
		for j := i; j < len(cm); j++ {
			out = append(out, namedValue{fmt.Sprintf("C(%s,%s)", names[i], names[j]), unit("F/m", "F"), cm[i][j], false})
		}
	}
	for k, q := range sol.Charges() {
		out = append(out, namedValue{fmt.Sprintf("Q(%s)", names[k]), unit("C/m", "C"), q, false})
	}
	out = append(out, namedValue{"W", unit("J/m", "J"), sol.Energy(), false})
	for k := range names {
		out = append(out, namedValue{fmt.Sprintf("Esurf(%s)", names[k]), "V/m", sol.PeakSurfaceField(k).Value, true})
	}
	for _, pk := range sol.PeakRegionFields() {
		out = append(out, namedValue{fmt.Sprintf("Emax(%s)", pk.Where), "V/m", pk.Value, true})
	}
	return sol, out, nil
}

// Richardson estimates the discretisation error of a quantity with values
// f on grids of representative cell sizes h (coarsest first, at least
// two), for a discretisation of the given formal order. Set peak for a
// maximum over sampled points (a peak field), whose convergence is less
// regular.
//
// With three or more levels it uses the three finest, f₁ the finest, with
// refinement ratios r₂₁ = h₂/h₁ and r₃₂ = h₃/h₂. The observed order p
// solves p·ln r₂₁ = ln(|f₃ − f₂|/|f₂ − f₁|) + ln((r₂₁ᵖ − 1)/(r₃₂ᵖ − 1)),
// the form of Celik et al. (2008) for non-constant ratios, which for a
// constant ratio r is p = ln(|f₃ − f₂|/|f₂ − f₁|)/ln r. The order used is
// p limited to [MinOrder, formal]; the limit at the formal order keeps
// the band conservative when noise makes the convergence look faster than
// it is. The extrapolated value is f₁ + (f₁ − f₂)/(r₂₁ᵖ − 1) and the band
// (grid convergence index, P. J. Roache, "Perspective: a method for
// uniform reporting of grid refinement studies", J. Fluids Eng. 116
// (1994) 405–413) is Fs·|f₁ − f₂|/(r₂₁ᵖ − 1) with Fs = 1.25.
//
// Peak values, two levels, and differences that change sign (oscillating
// convergence) or do not shrink use Fs = 3, and all but two levels also
// cover the coarser step scaled to the finest grid,
// max(|f₁ − f₂|, |f₂ − f₃|/r₂₁ᵖ)·Fs/(r^p − 1), since the finest difference
// may happen to be small. The order is the formal one for two levels and
// oscillating values, and MinOrder for differences that do not shrink.
func Richardson(h, f []float64, formal float64, peak bool) Estimate {
	n := len(f)
	e := Estimate{Values: append([]float64(nil), f...), Observed: math.NaN(), Order: formal, Safety: 3}
	if n < 2 || len(h) != n {
		e.Extrapolated = math.NaN()
		e.Band = math.Inf(1)
		e.Note = "one level"
		return e
	}
	f1, f2 := f[n-1], f[n-2]
	r21 := h[n-2] / h[n-1]
	d21 := f2 - f1
	wide := peak
	var d32, r32 float64
	if n == 2 {
		e.Note = "two levels"
		wide = false
	} else {
		f3 := f[n-3]
		r32 = h[n-3] / h[n-2]
		d32 = f3 - f2
		switch {
		case d21 == 0 && d32 == 0:
			// Converged to round-off.
			e.Observed, e.Safety = formal, 1.25
		case d21 == 0 || d32 == 0 || math.Signbit(d21) != math.Signbit(d32):
			e.Note = "oscillating"
			wide = true
		default:
			p, ok := observedOrder(d21, d32, r21, r32)
			if !ok {
				// The differences do not shrink: assume the slowest
				// convergence the band allows for.
				e.Note = "not converging"
				e.Order = MinOrder
				wide = true
				break
			}
			e.Observed = p
			e.Order = math.Min(math.Max(p, MinOrder), formal)
			e.Safety = 1.25
		}
	}
	if wide {
		e.Safety = 3
		if peak && e.Note == "" {
			e.Note = "peak value"
		}
	}
	rp := math.Pow(r21, e.Order)
	e.Extrapolated = f1 - d21/(rp-1)
	e.Band = e.Safety * math.Abs(d21) / (rp - 1)
	if wide {
		coarse := e.Safety * math.Abs(d32) / (math.Pow(r32, e.Order) - 1) / rp
		e.Band = math.Max(e.Band, coarse)
	}
	return e
}

// observedOrder solves for the observed order with refinement ratios r21
// (finest pair) and r32 by fixed-point iteration (Celik et al., "Procedure
// for estimation and reporting of uncertainty due to discretization in CFD
// applications", J. Fluids Eng. 130 (2008) 078001). It reports false when
// the differences grow (no convergence).
func observedOrder(d21, d32, r21, r32 float64) (float64, bool) {
	ratio := math.Abs(d32 / d21)
	if !(ratio > 1) {
		return 0, false
	}
	// Same-sign differences, so s = 1.
	p := math.Log(ratio) / math.Log(r21)
	for it := 0; it < 100; it++ {
		q := math.Log((math.Pow(r21, p) - 1) / (math.Pow(r32, p) - 1))
		pn := math.Abs(math.Log(ratio)+q) / math.Log(r21)
		if math.Abs(pn-p) < 1e-12 {
			p = pn
			break
		}
		p = pn
	}
	if math.IsNaN(p) || math.IsInf(p, 0) {
		return 0, false
	}
	return p, true
}
