package bc

import (
	"errors"
	"fmt"
	"math"

	"github.com/phigrid/phigrid/grid"
)

// ErrProblem is wrapped by every error that reports an invalid problem
// description.
var ErrProblem = errors.New("bc: invalid problem")

// Kind says what a Region is.
type Kind int

const (
	// Dielectric regions set the relative permittivity.
	Dielectric Kind = iota
	// ConductorRegion regions belong to a named conductor.
	ConductorRegion
	// Charge regions carry a free-charge density.
	Charge
)

// String returns the kind's name.
func (k Kind) String() string {
	switch k {
	case Dielectric:
		return "dielectric"
	case ConductorRegion:
		return "conductor"
	case Charge:
		return "charge"
	}
	return fmt.Sprintf("Kind(%d)", int(k))
}

// Region is one shape of a problem with its role.
type Region struct {
	// Name labels the region in messages and reports (optional).
	Name  string
	Shape Shape
	Kind  Kind
	// Conductor names the conductor a ConductorRegion belongs to; several
	// regions may make up one conductor.
	Conductor string
	// EpsR is the relative permittivity of a Dielectric region (required,
	// > 0) or of a Charge region (optional; 0 keeps what lies beneath).
	EpsR float64
	// Rho is the free-charge density of a Charge region, in C/m³.
	Rho float64
}

// Conductor is an electrode: a named set of regions at one potential.
type Conductor struct {
	Name string
	// Potential is the conductor's fixed potential in volts. For a
	// floating conductor it is the initial guess and is replaced by the
	// potential that gives it the charge Charge.
	Potential float64
	// Floating marks a conductor whose charge, not potential, is given.
	Floating bool
	// Charge is the net charge of a floating conductor: C/m in a planar
	// problem, C in an axisymmetric one.
	Charge float64
}

// PointCharge is a concentrated source: a line charge in C/m normal to the
// plane of a planar problem, or a ring charge of total charge Q in C about
// the axis of an axisymmetric problem (a point charge when it sits on the
// axis).
type PointCharge struct {
	Name string
	X, Y float64
	Q    float64
}

// SideKind is the kind of an outer boundary condition.
type SideKind int

const (
	// ZeroFlux is the homogeneous Neumann condition ∂φ/∂n = 0: a symmetry
	// plane or an insulating wall. It is the default.
	ZeroFlux SideKind = iota
	// Fixed holds the side at a potential: either a named conductor's or a
	// prescribed value or function.
	Fixed
	// Open stands for unbounded space beyond the side, with the potential
	// zero at infinity. The side carries the asymptotic (Robin) condition
	// ∂φ/∂n = −n·(n̂·r̂)·φ/R, where R = |r| is the distance from the centre
	// of the far field (Problem.Far) and n the assumed decay power
	// φ ∝ R⁻ⁿ. The condition is exact for a potential that decays like
	// R⁻ⁿ about the centre, and its error falls off with the distance of the
	// side from the geometry; put the side several body sizes away, with a
	// graded far region (Mesh.Far, or ExtendOpen), rather than on a large
	// uniform grid.
	//
	// The default decay n = 1 suits an axisymmetric body with net charge
	// (the monopole 1/R, for example an isolated electrode) and a planar
	// system with zero net charge (the 2-D dipole cos θ/R, for example a
	// two-wire line). Use n = 2 for an axisymmetric system with zero net
	// charge (a dipole). A planar system with net charge has no potential
	// at infinity (it grows like ln R); an Open side then acts like a
	// distant ground and is only a rough approximation.
	Open
)

// String returns the kind's name.
func (k SideKind) String() string {
	switch k {
	case ZeroFlux:
		return "zero-flux"
	case Fixed:
		return "fixed"
	case Open:
		return "open"
	}
	return fmt.Sprintf("SideKind(%d)", int(k))
}

// Side is the boundary condition on one side of the domain.
type Side struct {
	Kind SideKind
	// Conductor, when set on a Fixed side, makes the side part of that
	// conductor, so its charge appears in the capacitance matrix.
	Conductor string
	// Potential is the prescribed potential of a Fixed side without a
	// conductor, in volts.
	Potential float64
	// Func, when not nil, prescribes the potential φ(x, y) along a Fixed
	// side without a conductor instead of the constant Potential.
	Func func(x, y float64) float64
}

// Side indices into Problem.Sides.
const (
	Left   = 0 // x = X0 (the axis r = 0 in most axisymmetric problems)
	Right  = 1 // x = X1
	Bottom = 2 // y = Y0
	Top    = 3 // y = Y1
)

// SideNames names the sides in the order of the side indices.
var SideNames = [4]string{"left", "right", "bottom", "top"}

// Problem is a complete electrostatic problem in continuous space.
type Problem struct {
	Metric grid.Metric
	// Domain is the rectangle the problem lives in. In an axisymmetric
	// problem X is r and the domain must have X0 ≥ 0.
	Domain Rect
	// Background is the relative permittivity where no region sets one.
	// Zero means 1 (vacuum).
	Background float64
	Conductors []Conductor
	Regions    []Region
	Charges    []PointCharge
	Sides      [4]Side
	// Far, when not nil, sets the centre and decay of the far field that
	// Open sides assume. Nil means DefaultFar.
	Far *FarField
}

// FarField describes the far field assumed by Open sides.
type FarField struct {
	// X and Y locate the centre of the far-field expansion. In an
	// axisymmetric problem X must be 0 (the centre lies on the axis).
	X, Y float64
	// Decay is the power n in φ ∝ R⁻ⁿ. Zero means 1.
	Decay float64
}

// DefaultFar returns the far field Open sides assume when Problem.Far is
// nil: decay 1 about the centre of the bounding box of the geometry (every
// region and point charge, clipped to the domain), after mirroring that box
// across every zero-flux side it touches, since such a side is a symmetry
// plane. In an axisymmetric problem the centre lies on the axis, at the
// middle of the box along z. Without any geometry the centre is that of the
// domain.
func (p *Problem) DefaultFar() FarField {
	d := p.Domain
	x0, y0, x1, y1 := math.Inf(1), math.Inf(1), math.Inf(-1), math.Inf(-1)
	grow := func(a0, b0, a1, b1 float64) {
		x0, y0 = math.Min(x0, math.Max(a0, d.X0)), math.Min(y0, math.Max(b0, d.Y0))
		x1, y1 = math.Max(x1, math.Min(a1, d.X1)), math.Max(y1, math.Min(b1, d.Y1))
	}
	for _, r := range p.Regions {
		if r.Shape == nil {
			continue
		}
		grow(r.Shape.Bounds())
	}
	for _, q := range p.Charges {
		grow(q.X, q.Y, q.X, q.Y)
	}
	if !(x0 <= x1 && y0 <= y1) {
		x0, y0, x1, y1 = d.X0, d.Y0, d.X1, d.Y1
	}
	tol := 1e-9 * math.Max(d.X1-d.X0, d.Y1-d.Y0)
	if p.Sides[Left].Kind == ZeroFlux && x0-d.X0 <= tol {
		x0 = d.X0 - (x1 - d.X0)
	}
	if p.Sides[Right].Kind == ZeroFlux && d.X1-x1 <= tol {
		x1 = d.X1 + (d.X1 - x0)
	}
	if p.Sides[Bottom].Kind == ZeroFlux && y0-d.Y0 <= tol {
		y0 = d.Y0 - (y1 - d.Y0)
	}
	if p.Sides[Top].Kind == ZeroFlux && d.Y1-y1 <= tol {
		y1 = d.Y1 + (d.Y1 - y0)
	}
	f := FarField{X: 0.5 * (x0 + x1), Y: 0.5 * (y0 + y1), Decay: 1}
	if p.Metric == grid.Axisymmetric {
		f.X = 0
	}
	return f
}

// far returns the far field Open sides use.
func (p *Problem) far() FarField {
	if p.Far == nil {
		return p.DefaultFar()
	}
	f := *p.Far
	if f.Decay == 0 {
		f.Decay = 1
	}
	return f
}

// ConductorIndex returns the index of the named conductor, or −1.
func (p *Problem) ConductorIndex(name string) int {
	for k, c := range p.Conductors {
		if c.Name == name {
			return k
		}
	}
	return -1
}

// Validate checks the problem for errors a user can make: malformed
// shapes, shapes outside the domain, r < 0, non-positive permittivity,
// undefined or duplicate conductors, and no fixed potential anywhere.
func (p *Problem) Validate() error {
	d := p.Domain
	if err := d.Validate(); err != nil || !(d.X0 < d.X1) || !(d.Y0 < d.Y1) {
		return fmt.Errorf("%w: the domain [%g, %g]×[%g, %g] must be a rectangle of positive size", ErrProblem, d.X0, d.X1, d.Y0, d.Y1)
	}
	if p.Metric == grid.Axisymmetric && d.X0 < 0 {
		return fmt.Errorf("%w: an axisymmetric domain needs r ≥ 0, but it starts at r = %g", ErrProblem, d.X0)
	}
	if p.Background < 0 || math.IsNaN(p.Background) || math.IsInf(p.Background, 0) {
		return fmt.Errorf("%w: background permittivity must be positive, got %g", ErrProblem, p.Background)
	}
	seen := map[string]bool{}
	for _, c := range p.Conductors {
		if c.Name == "" {
			return fmt.Errorf("%w: every conductor needs a name", ErrProblem)
		}
		if seen[c.Name] {
			return fmt.Errorf("%w: conductor %q is defined twice", ErrProblem, c.Name)
		}
		seen[c.Name] = true
		if !finite(c.Potential, c.Charge) {
			return fmt.Errorf("%w: conductor %q has a potential or charge that is not finite", ErrProblem, c.Name)
		}
	}
	used := make([]bool, len(p.Conductors))
	for n, r := range p.Regions {
		label := regionLabel(n, r)
		if r.Shape == nil {
			return fmt.Errorf("%w: %s has no shape", ErrProblem, label)
		}
		if err := r.Shape.Validate(); err != nil {
			return fmt.Errorf("%w: %s: %v", ErrProblem, label, err)
		}
		x0, y0, x1, y1 := r.Shape.Bounds()
		if p.Metric == grid.Axisymmetric {
			if r0 := minRadius(r.Shape); r0 < -1e-12*(d.X1-d.X0) {
				return fmt.Errorf("%w: %s has r = %g < 0; an axisymmetric shape must be given at r ≥ 0 (a circle may be centred on the axis)", ErrProblem, label, r0)
			}
		}
		if x1 < d.X0 || x0 > d.X1 || y1 < d.Y0 || y0 > d.Y1 {
			return fmt.Errorf("%w: %s lies entirely outside the domain", ErrProblem, label)
		}
		switch r.Kind {
		case ConductorRegion:
			k := p.ConductorIndex(r.Conductor)
			if k < 0 {
				return fmt.Errorf("%w: %s belongs to conductor %q, which is not defined", ErrProblem, label, r.Conductor)
			}
			used[k] = true
		case Dielectric:
			if !(r.EpsR > 0) || math.IsInf(r.EpsR, 0) {
				return fmt.Errorf("%w: %s needs a relative permittivity > 0, got %g", ErrProblem, label, r.EpsR)
			}
		case Charge:
			if r.EpsR < 0 || !finite(r.EpsR, r.Rho) {
				return fmt.Errorf("%w: %s needs a finite charge density and a permittivity ≥ 0 (0 keeps the one beneath)", ErrProblem, label)
			}
		default:
			return fmt.Errorf("%w: %s has unknown kind %d", ErrProblem, label, int(r.Kind))
		}
	}
	for _, q := range p.Charges {
		if !finite(q.X, q.Y, q.Q) || !d.Contains(q.X, q.Y) {
			return fmt.Errorf("%w: point charge %q at (%g, %g) must be finite and inside the domain", ErrProblem, q.Name, q.X, q.Y)
		}
	}
	anyFixed := false
	for s, side := range p.Sides {
		switch side.Kind {
		case ZeroFlux:
		case Fixed:
			if p.Metric == grid.Axisymmetric && s == Left && d.X0 == 0 {
				return fmt.Errorf("%w: the left side is the axis r = 0; it needs no boundary condition, so make it zero-flux", ErrProblem)
			}
			if side.Conductor != "" {
				k := p.ConductorIndex(side.Conductor)
				if k < 0 {
					return fmt.Errorf("%w: the %s side belongs to conductor %q, which is not defined", ErrProblem, SideNames[s], side.Conductor)
				}
				used[k] = true
				if !p.Conductors[k].Floating {
					anyFixed = true
				}
			} else {
				if !finite(side.Potential) {
					return fmt.Errorf("%w: the %s side has a potential that is not finite", ErrProblem, SideNames[s])
				}
				anyFixed = true
			}
		case Open:
			if p.Metric == grid.Axisymmetric && s == Left && d.X0 == 0 {
				return fmt.Errorf("%w: the left side is the axis r = 0; it cannot be open, so make it zero-flux", ErrProblem)
			}
			// Infinity is at 0 V.
			anyFixed = true
		default:
			return fmt.Errorf("%w: the %s side has unknown kind %d", ErrProblem, SideNames[s], int(side.Kind))
		}
	}
	if f := p.Far; f != nil {
		if !finite(f.X, f.Y, f.Decay) || f.Decay < 0 {
			return fmt.Errorf("%w: the far field needs a finite centre and a decay power ≥ 0 (0 means 1), got (%g, %g) and %g", ErrProblem, f.X, f.Y, f.Decay)
		}
		if p.Metric == grid.Axisymmetric && f.X != 0 {
			return fmt.Errorf("%w: in an axisymmetric problem the far-field centre must lie on the axis, but it is at r = %g", ErrProblem, f.X)
		}
	}
	for k, c := range p.Conductors {
		if !used[k] {
			return fmt.Errorf("%w: conductor %q has no region and no side; give it a shape or remove it", ErrProblem, c.Name)
		}
		if !c.Floating {
			anyFixed = true
		}
	}
	if !anyFixed {
		return fmt.Errorf("%w: nothing has a fixed potential, so the potential is undetermined; fix a conductor's potential or a side's", ErrProblem)
	}
	return nil
}

func regionLabel(n int, r Region) string {
	if r.Name != "" {
		return fmt.Sprintf("region %d (%q)", n, r.Name)
	}
	return fmt.Sprintf("region %d", n)
}

// minRadius returns the smallest r at which a shape is defined in an
// axisymmetric problem: its leftmost vertex or corner, or the centre of a
// circle, ellipse or annulus (a circle centred on the axis is a sphere).
func minRadius(s Shape) float64 {
	switch v := s.(type) {
	case Circle:
		return v.X
	case Ellipse:
		return v.X
	case Annulus:
		return v.X
	case Strip:
		return math.Min(v.X0, v.X1)
	}
	x0, _, _, _ := s.Bounds()
	return x0
}
