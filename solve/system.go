package solve

import (
	"errors"
	"fmt"
	"math"
	"sort"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
)

// Eps0 is the vacuum permittivity in F/m (CODATA 2018).
const Eps0 = 8.8541878128e-12

// ErrNoFixed is returned by Assemble when no node has a fixed potential, so
// the potential is determined only up to a constant.
var ErrNoFixed = errors.New("solve: no fixed potential anywhere")

// Part is a sparse right-hand-side part: Value[n] is added at row Index[n].
type Part struct {
	Index []int32
	Value []float64
}

// Link is a coupling between two fixed nodes that do not share one
// potential source; it carries flux between them but is not part of the
// system's unknowns.
type Link struct {
	A, B int32
	G    float64
}

// System is the assembled finite-volume system A·φ = b on the full node
// grid. Rows of fixed nodes (conductor or prescribed) are identity rows and
// take their potential from the right-hand side; couplings between a free
// node and a fixed one are moved to the right-hand side, so A is symmetric
// positive definite.
//
// A free row n reads
//
//	Diag[n]·φ[n] − AX[n]·φ[n+1] − AX[n−1]·φ[n−1] − AY[n]·φ[n+Nx] − AY[n−Nx]·φ[n−Nx] = b[n]
//
// where AX[n] ≥ 0 is the coupling of node n to its +X neighbour (zero when
// either end is fixed or n is in the last column) and AY[n] likewise along
// +Y. Couplings are in farads per metre of depth (planar) or farads
// (axisymmetric), so b is a charge.
type System struct {
	Grid *grid.Grid
	Nx   int
	Ny   int
	// Diag, AX and AY hold the operator; see the type's documentation.
	Diag, AX, AY []float64
	// Fixed marks the identity rows.
	Fixed []bool
	// Charge is the free charge of every free node's control volume
	// (ρ·volume plus point charges), zero on fixed rows.
	Charge []float64
	// Prescribed is the part of b from prescribed boundary values: their
	// couplings on free rows and the values themselves on their own rows.
	Prescribed []float64
	// Parts[k] holds, for conductor k at unit potential, the coupling of
	// every adjacent free node to the conductor; Nodes[k] lists the
	// conductor's own nodes.
	Parts []Part
	Nodes [][]int32
	// FixedLinks are the links between fixed nodes of different potential
	// sources (two conductors, or a conductor and a prescribed side).
	FixedLinks []Link
	// PrescribedLinks are the links from a free node (A) to a prescribed
	// node (B); their flux enters the right-hand side through Prescribed.
	PrescribedLinks []Link
	// Map is the rasterised problem the system came from.
	Map *bc.Map
	// LinkX and LinkY hold the coupling of every link, to the +X and +Y
	// neighbour, including links that end on a fixed node (which AX and
	// AY leave out); zero on the last column and row. Post-processing
	// reads them to evaluate fluxes and local stencils.
	LinkX, LinkY []float64
	// Far is, for every free node on an Open side, its coupling to the
	// far region at 0 V (infinity), from the asymptotic boundary
	// condition; it is already part of Diag. Nil when no side is open.
	// The flux Far[n]·φ[n] leaves the domain through the open sides.
	Far []float64
}

// Len returns the number of rows, Nx·Ny.
func (s *System) Len() int { return s.Nx * s.Ny }

// Conductors returns the number of conductors.
func (s *System) Conductors() int { return len(s.Parts) }

// RHS writes into dst the right-hand side for conductor potentials v (one per
// conductor, volts), including free charge when withCharge is set and the
// prescribed boundary values when withPrescribed is set, and returns dst. A
// nil dst is allocated.
func (s *System) RHS(dst, v []float64, withCharge, withPrescribed bool) []float64 {
	if len(v) != len(s.Parts) {
		panic("solve: RHS needs one potential per conductor")
	}
	n := s.Len()
	if dst == nil {
		dst = make([]float64, n)
	}
	if len(dst) != n {
		panic("solve: RHS destination has the wrong length")
	}
	switch {
	case withCharge && withPrescribed:
		for i := range dst {
			dst[i] = s.Charge[i] + s.Prescribed[i]
		}
	case withCharge:
		copy(dst, s.Charge)
	case withPrescribed:
		copy(dst, s.Prescribed)
	default:
		clear(dst)
	}
	for k, p := range s.Parts {
		vk := v[k]
		if vk == 0 {
			continue
		}
		for q, idx := range p.Index {
			dst[idx] += vk * p.Value[q]
		}
		for _, idx := range s.Nodes[k] {
			dst[idx] = vk
		}
	}
	return dst
}

// Assemble builds the finite-volume system of a rasterised problem.
//
// The coupling of two neighbouring nodes is ε₀ times the link factor of the
// grid times the permittivity-weighted face measure: the face between them
// crosses two half-cells, each contributing its own ε_r times its share of
// the face. A link between a free node and a conductor node that the
// conductor surface cuts at fraction θ uses the distance θ·h instead of h,
// so its coupling is divided by θ (in r–z its face moves to the middle of
// the shortened link, r_free ± θh/2); this keeps the system symmetric and
// makes curved conductors second-order accurate. Cells that a dielectric
// interface crosses contribute their directional permittivities
// (bc.Map.EpsX, EpsY) when the map has them, and Open sides add the
// asymptotic condition's coupling to the far region (see Far).
func Assemble(m *bc.Map) (*System, error) {
	g := m.Grid
	nx, ny := g.Nx(), g.Ny()
	n := g.Len()
	s := &System{
		Grid:       g,
		Nx:         nx,
		Ny:         ny,
		Diag:       make([]float64, n),
		AX:         make([]float64, n),
		AY:         make([]float64, n),
		Fixed:      make([]bool, n),
		Charge:     make([]float64, n),
		Prescribed: make([]float64, n),
		Parts:      make([]Part, len(m.Conductors)),
		Nodes:      make([][]int32, len(m.Conductors)),
		Map:        m,
		LinkX:      make([]float64, n),
		LinkY:      make([]float64, n),
	}
	anyFixed := false
	for i, k := range m.Kind {
		if k != bc.Free {
			s.Fixed[i] = true
			anyFixed = true
			if k == bc.OnConductor {
				s.Nodes[m.Cond[i]] = append(s.Nodes[m.Cond[i]], int32(i))
			} else {
				s.Prescribed[i] = m.Value[i]
			}
		}
	}
	open := false
	for _, sd := range m.Sides {
		if sd.Kind == bc.Open {
			open = true
		}
	}
	if !anyFixed && !open {
		return nil, fmt.Errorf("%w: fix a side or a conductor at a potential", ErrNoFixed)
	}
	type entry struct {
		idx int32
		g   float64
	}
	parts := make([][]entry, len(m.Conductors))
	cx := nx - 1
	eps := m.Eps
	// Permittivity of the half-cells a link crosses: lower/upper halves
	// for X-links, left/right halves for Y-links.
	epsX := func(c, half int) float64 { return eps[c] }
	epsY := epsX
	if m.EpsX != nil && m.EpsY != nil {
		epsX = func(c, half int) float64 { return m.EpsX[2*c+half] }
		epsY = func(c, half int) float64 { return m.EpsY[2*c+half] }
	}
	link := func(a, b int, gl float64) {
		fa, fb := s.Fixed[a], s.Fixed[b]
		switch {
		case !fa && !fb:
			s.Diag[a] += gl
			s.Diag[b] += gl
		case !fa && fb:
			s.Diag[a] += gl
			s.fixedCoupling(a, b, gl, func(k int32) { parts[k] = append(parts[k], entry{int32(a), gl}) })
		case fa && !fb:
			s.Diag[b] += gl
			s.fixedCoupling(b, a, gl, func(k int32) { parts[k] = append(parts[k], entry{int32(b), gl}) })
		default:
			if m.Kind[a] == bc.OnConductor && m.Kind[b] == bc.OnConductor && m.Cond[a] == m.Cond[b] {
				return
			}
			s.FixedLinks = append(s.FixedLinks, Link{int32(a), int32(b), gl})
		}
	}
	radial := g.Metric() == grid.Axisymmetric
	xs := g.X()
	for j := 0; j < ny; j++ {
		ylo, yhi := g.DualY(j)
		for i := 0; i < nx; i++ {
			a := j*nx + i
			xlo, xhi := g.DualX(i)
			if i+1 < nx {
				var w float64
				if j > 0 {
					w += epsX((j-1)*cx+i, 1) * ylo
				}
				if j+1 < ny {
					w += epsX(j*cx+i, 0) * yhi
				}
				gl := Eps0 * g.LinkX(i) * w / m.CutX[a]
				if radial && m.CutX[a] < 1 {
					// The face of a cut radial link lies at the middle of
					// its shortened part, from the free end.
					gl *= cutRadius(m, a, a+1, xs[i], xs[i+1]) / (0.5 * (xs[i] + xs[i+1]))
				}
				s.LinkX[a] = gl
				if !s.Fixed[a] && !s.Fixed[a+1] {
					s.AX[a] = gl
				}
				link(a, a+1, gl)
			}
			if j+1 < ny {
				var w float64
				if i > 0 {
					w += epsY(j*cx+i-1, 1) * xlo
				}
				if i+1 < nx {
					w += epsY(j*cx+i, 0) * xhi
				}
				gl := Eps0 * g.LinkY(j) * w / m.CutY[a]
				s.LinkY[a] = gl
				if !s.Fixed[a] && !s.Fixed[a+nx] {
					s.AY[a] = gl
				}
				link(a, a+nx, gl)
			}
			if s.Fixed[a] {
				continue
			}
			// Free charge in the four quarter cells of the control volume.
			if m.Rho != nil {
				var q float64
				if i > 0 && j > 0 {
					q += m.Rho[(j-1)*cx+i-1] * xlo * ylo
				}
				if i+1 < nx && j > 0 {
					q += m.Rho[(j-1)*cx+i] * xhi * ylo
				}
				if i > 0 && j+1 < ny {
					q += m.Rho[j*cx+i-1] * xlo * yhi
				}
				if i+1 < nx && j+1 < ny {
					q += m.Rho[j*cx+i] * xhi * yhi
				}
				s.Charge[a] = q
			}
			if m.Point != nil {
				s.Charge[a] += m.Point[a]
			}
		}
	}
	if open {
		s.Far = farCouplings(m, s.Fixed)
		for i, f := range s.Far {
			s.Diag[i] += f
		}
	}
	for i := range s.Diag {
		if s.Fixed[i] {
			s.Diag[i] = 1
		} else if s.Diag[i] == 0 {
			// An isolated free node with no coupling (a degenerate grid
			// corner): pin it so the system stays definite.
			s.Diag[i] = 1
		}
	}
	for k, es := range parts {
		sort.Slice(es, func(a, b int) bool { return es[a].idx < es[b].idx })
		var p Part
		for _, e := range es {
			if l := len(p.Index); l > 0 && p.Index[l-1] == e.idx {
				p.Value[l-1] += e.g
				continue
			}
			p.Index = append(p.Index, e.idx)
			p.Value = append(p.Value, e.g)
		}
		s.Parts[k] = p
	}
	return s, nil
}

// fixedCoupling records the coupling gl of free node a to fixed node b:
// on the right-hand side of a's row, as part of b's conductor or of the
// prescribed values.
func (s *System) fixedCoupling(a, b int, gl float64, addPart func(k int32)) {
	m := s.Map
	if m.Kind[b] == bc.OnConductor {
		addPart(m.Cond[b])
		return
	}
	s.Prescribed[a] += gl * m.Value[b]
	s.PrescribedLinks = append(s.PrescribedLinks, Link{int32(a), int32(b), gl})
}

// cutRadius returns the radius of the middle of the free part of the cut
// radial link between nodes a (at radius ra) and b (at rb).
func cutRadius(m *bc.Map, a, b int, ra, rb float64) float64 {
	theta := m.CutX[a]
	if m.Kind[a] == bc.OnConductor {
		ra, rb = rb, ra
	}
	return ra + 0.5*theta*(rb-ra)
}

// farCouplings returns the coupling of every free node on an Open side to
// the far region. The asymptotic condition ∂φ/∂n = −n·(n̂·r̂)·φ/R turns the
// outward flux through a boundary face of measure A into
// ε₀·ε_r·A·n·(n̂·r̂)/R·φ, a coupling to 0 V that adds to the node's diagonal
// and keeps the operator symmetric positive definite (it is never
// negative: a side facing away from the centre gets none). For a potential
// that decays exactly like R⁻ⁿ about the centre, ½·Σ Far·φ² is the energy
// of the field outside the domain.
func farCouplings(m *bc.Map, fixed []bool) []float64 {
	g := m.Grid
	nx, ny := g.Nx(), g.Ny()
	cx := nx - 1
	xs, ys := g.X(), g.Y()
	x0, y0, x1, y1 := g.Bounds()
	radial := g.Metric() == grid.Axisymmetric
	far := make([]float64, g.Len())
	decay := m.Far.Decay
	if decay == 0 {
		decay = 1
	}
	// factor returns n·(n̂·r̂)/R at (x, y) for outward normal (nx, ny).
	factor := func(x, y, ux, uy float64) float64 {
		dx, dy := x-m.Far.X, y-m.Far.Y
		r2 := dx*dx + dy*dy
		if r2 == 0 {
			return 0
		}
		return decay * math.Max(0, ux*dx+uy*dy) / r2
	}
	for side, sd := range m.Sides {
		if sd.Kind != bc.Open {
			continue
		}
		switch side {
		case bc.Left, bc.Right:
			i, ci, ux, x := 0, 0, -1.0, x0
			if side == bc.Right {
				i, ci, ux, x = nx-1, nx-2, 1, x1
			}
			w := 1.0
			if radial {
				w = 2 * math.Pi * x
			}
			for j := 0; j < ny; j++ {
				n := j*nx + i
				if fixed[n] {
					continue
				}
				lo, hi := g.DualY(j)
				var a float64
				if j > 0 {
					a += m.Eps[(j-1)*cx+ci] * lo
				}
				if j+1 < ny {
					a += m.Eps[j*cx+ci] * hi
				}
				far[n] += Eps0 * w * a * factor(x, ys[j], ux, 0)
			}
		case bc.Bottom, bc.Top:
			j, cj, uy, y := 0, 0, -1.0, y0
			if side == bc.Top {
				j, cj, uy, y = ny-1, ny-2, 1, y1
			}
			for i := 0; i < nx; i++ {
				n := j*nx + i
				if fixed[n] {
					continue
				}
				lo, hi := g.DualX(i)
				var a float64
				if i > 0 {
					a += m.Eps[cj*cx+i-1] * lo
				}
				if i+1 < nx {
					a += m.Eps[cj*cx+i] * hi
				}
				far[n] += Eps0 * a * factor(xs[i], y, 0, uy)
			}
		}
	}
	return far
}
