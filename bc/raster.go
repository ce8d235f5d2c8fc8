package bc

import (
	"fmt"
	"math"

	"github.com/phigrid/phigrid/grid"
)

// NodeKind classifies a grid node.
type NodeKind uint8

const (
	// Free nodes carry an unknown potential.
	Free NodeKind = iota
	// OnConductor nodes belong to a conductor and take its potential.
	OnConductor
	// Prescribed nodes lie on a Fixed side without a conductor and take a
	// given potential.
	Prescribed
)

// Options tunes rasterisation. The zero value gives the documented
// defaults.
type Options struct {
	// Samples is the number of sub-cell samples per axis used to average
	// ε and ρ over a cell that a region boundary crosses. Zero means 4.
	Samples int
	// Snap is the cut fraction below which a free node next to a conductor
	// is moved onto the conductor, which keeps the system well conditioned.
	// Zero means 1e-3; a negative value disables snapping. Larger values
	// move the conductor surface by up to Snap·h and cost accuracy.
	Snap float64
}

// Map is a problem rasterised onto a grid. All per-node slices have
// Grid.Len() entries and all per-cell slices Grid.Cells() entries, in the
// grid's index order.
type Map struct {
	Grid *grid.Grid
	// Conductors are the problem's conductors, indexed as in Cond.
	Conductors []Conductor
	// Kind is the kind of every node.
	Kind []NodeKind
	// Cond is the conductor index of OnConductor nodes and −1 elsewhere.
	Cond []int32
	// Value is the potential of Prescribed nodes (zero elsewhere).
	Value []float64
	// Eps is the relative permittivity of every cell.
	Eps []float64
	// Rho is the free-charge density of every cell in C/m³, the mean over
	// the cell by volume (weighted by 2πr in an axisymmetric problem), with
	// the boundaries of charge regions located exactly along 2·Samples
	// lines; nil when the problem has no charge region.
	Rho []float64
	// Point is the concentrated charge deposited on every node (C/m planar,
	// C axisymmetric); nil when the problem has no point charge.
	Point []float64
	// CutX[n] is, for the link from node n to its +X neighbour when exactly
	// one of the two is a conductor node, the fraction of the link length,
	// measured from the free node, at which the conductor surface crosses
	// it; it is 1 for every other link. CutY is the same for +Y links.
	CutX, CutY []float64
	// Snapped counts the free nodes moved onto a conductor by Options.Snap.
	Snapped int
	// Regions are the problem's regions, indexed as in CellRegion.
	Regions []Region
	// CellRegion is, for every cell, the index of the region whose
	// permittivity applies at the cell centre, or −1 for the background.
	// Cells whose centre lies inside a conductor hold the region beneath it.
	CellRegion []int32
	// EpsX and EpsY are the relative permittivities the assembly uses for
	// flux along X and along Y, two per cell: EpsX[2c] for the lower half
	// of cell c along Y (the half next to its lower row of nodes, crossed
	// by the X-links of that row) and EpsX[2c+1] for the upper half;
	// EpsY[2c] for the left half along X and EpsY[2c+1] for the right
	// half. In a cell that a dielectric interface crosses each value is the
	// arithmetic mean, across the half-cell, of the harmonic mean of ε along
	// lines parallel to the flux, which is exact for interfaces along
	// either axis (see the package documentation). Elsewhere both equal
	// Eps. Both are nil when no cell holds more than one permittivity; then
	// Eps serves for every direction.
	EpsX, EpsY []float64
	// Sides are the problem's boundary conditions.
	Sides [4]Side
	// Far is the far field assumed by Open sides (Problem.Far or
	// Problem.DefaultFar).
	Far FarField
	// Surface lists every point where a conductor surface cuts a link
	// between a free node and a conductor node, with the surface normal
	// there, in order of the free node.
	Surface []Crossing
}

// pointState is the material at one point after applying every region.
type pointState struct {
	cond   int32 // conductor index, −1 if none
	epsReg int32 // region that set ε last, −1 for the background
	rhoReg int32 // region that set ρ last, −1 for none
}

type rasterizer struct {
	p       *Problem
	g       *grid.Grid
	condIdx []int32 // conductor index of each region (−1 if not a conductor)
	bg      float64
}

// state walks the regions in order at point (x, y).
func (r *rasterizer) state(x, y float64) pointState {
	s := pointState{-1, -1, -1}
	for n := range r.p.Regions {
		reg := &r.p.Regions[n]
		if !reg.Shape.Contains(x, y) {
			continue
		}
		r.apply(&s, int32(n))
	}
	return s
}

func (r *rasterizer) apply(s *pointState, n int32) {
	reg := &r.p.Regions[n]
	switch reg.Kind {
	case ConductorRegion:
		s.cond = r.condIdx[n]
	case Dielectric:
		s.cond = -1
		s.epsReg = n
	case Charge:
		s.cond = -1
		s.rhoReg = n
		if reg.EpsR > 0 {
			s.epsReg = n
		}
	}
}

func (r *rasterizer) eps(s pointState) float64 {
	if s.epsReg < 0 {
		return r.bg
	}
	return r.p.Regions[s.epsReg].EpsR
}

func (r *rasterizer) rho(s pointState) float64 {
	if s.rhoReg < 0 || s.cond >= 0 {
		return 0
	}
	return r.p.Regions[s.rhoReg].Rho
}

// Rasterize validates p and rasterises it onto g. The grid must cover the
// problem's domain exactly and have the problem's metric. A nil opt means
// the defaults.
func Rasterize(p *Problem, g *grid.Grid, opt *Options) (*Map, error) {
	if err := p.Validate(); err != nil {
		return nil, err
	}
	if g.Metric() != p.Metric {
		return nil, fmt.Errorf("%w: the grid is %v but the problem is %v", ErrProblem, g.Metric(), p.Metric)
	}
	x0, y0, x1, y1 := g.Bounds()
	d := p.Domain
	tol := 1e-9 * math.Max(d.X1-d.X0, d.Y1-d.Y0)
	if math.Abs(x0-d.X0) > tol || math.Abs(x1-d.X1) > tol || math.Abs(y0-d.Y0) > tol || math.Abs(y1-d.Y1) > tol {
		return nil, fmt.Errorf("%w: the grid spans [%g, %g]×[%g, %g] but the domain is [%g, %g]×[%g, %g]; build the grid on the domain", ErrProblem, x0, x1, y0, y1, d.X0, d.X1, d.Y0, d.Y1)
	}
	var o Options
	if opt != nil {
		o = *opt
	}
	if o.Samples <= 0 {
		o.Samples = 4
	}
	if o.Snap == 0 {
		o.Snap = 1e-3
	}
	r := &rasterizer{p: p, g: g, bg: p.Background}
	if r.bg == 0 {
		r.bg = 1
	}
	r.condIdx = make([]int32, len(p.Regions))
	for n, reg := range p.Regions {
		r.condIdx[n] = -1
		if reg.Kind == ConductorRegion {
			r.condIdx[n] = int32(p.ConductorIndex(reg.Conductor))
		}
	}
	m := &Map{
		Grid:       g,
		Conductors: append([]Conductor(nil), p.Conductors...),
		Kind:       make([]NodeKind, g.Len()),
		Cond:       make([]int32, g.Len()),
		Value:      make([]float64, g.Len()),
		Eps:        make([]float64, g.Cells()),
		Regions:    append([]Region(nil), p.Regions...),
		CellRegion: make([]int32, g.Cells()),
		Sides:      p.Sides,
		Far:        p.far(),
		CutX:       make([]float64, g.Len()),
		CutY:       make([]float64, g.Len()),
	}
	states := make([]pointState, g.Len())
	if err := r.nodes(m, states); err != nil {
		return nil, err
	}
	if err := r.sides(m); err != nil {
		return nil, err
	}
	r.cuts(m)
	if o.Snap > 0 {
		r.snap(m, o.Snap)
	}
	r.cells(m, states, o.Samples)
	r.surface(m)
	r.points(m)
	for k, c := range p.Conductors {
		found := false
		for _, ck := range m.Cond {
			if ck == int32(k) {
				found = true
				break
			}
		}
		if !found {
			return nil, fmt.Errorf("%w: conductor %q covers no grid node (a later region hides it); refine the grid or check the region order", ErrProblem, c.Name)
		}
	}
	return m, nil
}

// nodes classifies every node by walking the regions in order. A conductor
// region also claims nodes whose control volume its centre line crosses
// (strips) and the node nearest its anchor point.
func (r *rasterizer) nodes(m *Map, states []pointState) error {
	g, p := r.g, r.p
	nx := g.Nx()
	xs, ys := g.X(), g.Y()
	anchor := make([]int, len(p.Regions))
	for n, reg := range p.Regions {
		anchor[n] = -1
		if reg.Kind == ConductorRegion {
			ax, ay := reg.Shape.Anchor()
			if i, j, ok := nearestNode(g, ax, ay); ok {
				anchor[n] = g.Index(i, j)
			}
		}
	}
	boxes := make([][4]float64, len(p.Regions))
	for n, reg := range p.Regions {
		bx0, by0, bx1, by1 := reg.Shape.Bounds()
		boxes[n] = [4]float64{bx0, by0, bx1, by1}
	}
	for j, y := range ys {
		ylo, yhi := dualEdges(ys, j)
		for i, x := range xs {
			idx := j*nx + i
			xlo, xhi := dualEdges(xs, i)
			s := pointState{-1, -1, -1}
			for n := range p.Regions {
				reg := &p.Regions[n]
				b := &boxes[n]
				if xhi < b[0] || xlo > b[2] || yhi < b[1] || ylo > b[3] {
					if anchor[n] != idx {
						continue
					}
				}
				in := reg.Shape.Contains(x, y)
				if !in && reg.Kind == ConductorRegion {
					if st, ok := reg.Shape.(Strip); ok && st.crossesRect(xlo, ylo, xhi, yhi) {
						in = true
					}
					if anchor[n] == idx {
						in = true
					}
				}
				if !in {
					continue
				}
				if reg.Kind == ConductorRegion && s.cond >= 0 && s.cond != r.condIdx[n] {
					a, c := p.Conductors[s.cond], p.Conductors[r.condIdx[n]]
					if a.Floating || c.Floating || a.Potential != c.Potential {
						return fmt.Errorf("%w: conductors %q and %q overlap near (%g, %g) but are not at one fixed potential; separate them", ErrProblem, a.Name, c.Name, x, y)
					}
				}
				r.apply(&s, int32(n))
			}
			states[idx] = s
			m.Cond[idx] = s.cond
			if s.cond >= 0 {
				m.Kind[idx] = OnConductor
			}
		}
	}
	return nil
}

// dualEdges returns the control-volume interval [lo, hi) of node i.
func dualEdges(a []float64, i int) (lo, hi float64) {
	lo = a[i]
	if i > 0 {
		lo = 0.5 * (a[i-1] + a[i])
	}
	if i < len(a)-1 {
		hi = 0.5 * (a[i] + a[i+1])
	} else {
		hi = math.Nextafter(a[i], math.Inf(1))
	}
	return lo, hi
}

func nearestNode(g *grid.Grid, x, y float64) (int, int, bool) {
	i, j, s, t, ok := g.Locate(x, y)
	if !ok {
		return 0, 0, false
	}
	if s >= 0.5 && i+1 < g.Nx() {
		i++
	}
	if t >= 0.5 && j+1 < g.Ny() {
		j++
	}
	return i, j, true
}

// sides applies the outer boundary conditions; they override regions.
func (r *rasterizer) sides(m *Map) error {
	g, p := r.g, r.p
	nx, ny := g.Nx(), g.Ny()
	xs, ys := g.X(), g.Y()
	for s, side := range p.Sides {
		if side.Kind != Fixed {
			continue
		}
		k := int32(-1)
		if side.Conductor != "" {
			k = int32(p.ConductorIndex(side.Conductor))
		}
		var nodes []int
		switch s {
		case Left, Right:
			i := 0
			if s == Right {
				i = nx - 1
			}
			for j := 0; j < ny; j++ {
				nodes = append(nodes, g.Index(i, j))
			}
		case Bottom, Top:
			j := 0
			if s == Top {
				j = ny - 1
			}
			for i := 0; i < nx; i++ {
				nodes = append(nodes, g.Index(i, j))
			}
		}
		for _, idx := range nodes {
			i, j := idx%nx, idx/nx
			if c := m.Cond[idx]; c >= 0 && k >= 0 && c != k {
				a, b := p.Conductors[c], p.Conductors[k]
				if a.Floating || b.Floating || a.Potential != b.Potential {
					return fmt.Errorf("%w: conductor %q touches the %s side, which belongs to conductor %q at another potential; move it off the side", ErrProblem, a.Name, SideNames[s], b.Name)
				}
			}
			if k >= 0 {
				m.Kind[idx], m.Cond[idx] = OnConductor, k
				continue
			}
			if m.Kind[idx] == OnConductor {
				// A conductor touching a prescribed side keeps its own
				// potential on the shared nodes.
				continue
			}
			m.Kind[idx], m.Cond[idx] = Prescribed, -1
			if side.Func != nil {
				m.Value[idx] = side.Func(xs[i], ys[j])
			} else {
				m.Value[idx] = side.Potential
			}
		}
	}
	return nil
}

// cuts computes the cut fraction of every free–conductor link.
func (r *rasterizer) cuts(m *Map) {
	g := r.g
	nx, ny := g.Nx(), g.Ny()
	xs, ys := g.X(), g.Y()
	for j := 0; j < ny; j++ {
		for i := 0; i < nx; i++ {
			idx := j*nx + i
			m.CutX[idx], m.CutY[idx] = 1, 1
			if i+1 < nx {
				m.CutX[idx] = r.cut(m, idx, idx+1, xs[i], ys[j], xs[i+1], ys[j])
			}
			if j+1 < ny {
				m.CutY[idx] = r.cut(m, idx, idx+nx, xs[i], ys[j], xs[i], ys[j+1])
			}
		}
	}
}

// cut returns the cut fraction of the link a→b measured from its free end.
func (r *rasterizer) cut(m *Map, a, b int, ax, ay, bx, by float64) float64 {
	ka, kb := m.Kind[a], m.Kind[b]
	var k int32
	switch {
	case ka == Free && kb == OnConductor:
		k = m.Cond[b]
	case kb == Free && ka == OnConductor:
		k = m.Cond[a]
		ax, ay, bx, by = bx, by, ax, ay
	default:
		return 1
	}
	// The surface lies between the free end (outside) and the conductor
	// end; the conductor end must be inside by the pointwise rule, else
	// it was claimed as a thin strip or an anchor and the link is whole.
	if r.state(bx, by).cond != k {
		return 1
	}
	lo, hi := 0.0, 1.0
	for it := 0; it < 48; it++ {
		t := 0.5 * (lo + hi)
		if r.state(ax+t*(bx-ax), ay+t*(by-ay)).cond == k {
			hi = t
		} else {
			lo = t
		}
	}
	return hi
}

// snap moves free nodes with a link cut below frac onto the conductor and
// recomputes the affected cut fractions.
func (r *rasterizer) snap(m *Map, frac float64) {
	g := r.g
	nx, ny := g.Nx(), g.Ny()
	type move struct {
		n int
		k int32
	}
	var moves []move
	for idx := range m.Kind {
		if m.Kind[idx] != Free {
			continue
		}
		i, j := idx%nx, idx/nx
		best, bk := frac, int32(-1)
		try := func(c float64, other int) {
			if c < best && m.Kind[other] == OnConductor {
				best, bk = c, m.Cond[other]
			}
		}
		if i+1 < nx {
			try(m.CutX[idx], idx+1)
		}
		if i > 0 {
			try(m.CutX[idx-1], idx-1)
		}
		if j+1 < ny {
			try(m.CutY[idx], idx+nx)
		}
		if j > 0 {
			try(m.CutY[idx-nx], idx-nx)
		}
		if bk >= 0 {
			moves = append(moves, move{idx, bk})
		}
	}
	for _, mv := range moves {
		m.Kind[mv.n], m.Cond[mv.n] = OnConductor, mv.k
	}
	m.Snapped = len(moves)
	if len(moves) > 0 {
		r.cuts(m)
	}
}

// cells sets ε and ρ of every cell, sampling the cells that a region
// boundary may cross.
func (r *rasterizer) cells(m *Map, states []pointState, samples int) {
	g, p := r.g, r.p
	nx, ny := g.Nx(), g.Ny()
	cx := nx - 1
	xs, ys := g.X(), g.Y()
	mixed := make([]bool, g.Cells())
	hasRho := false
	for _, reg := range p.Regions {
		if reg.Kind == Charge && reg.Rho != 0 {
			hasRho = true
		}
		// Cells along the bounding box's edges may hold a boundary even if
		// their corners agree (small or thin shapes).
		bx0, by0, bx1, by1 := reg.Shape.Bounds()
		i0, i1 := cellSpan(xs, bx0, bx1)
		j0, j1 := cellSpan(ys, by0, by1)
		for j := j0; j <= j1; j++ {
			for i := i0; i <= i1; i++ {
				if j == j0 || j == j1 || i == i0 || i == i1 {
					mixed[j*cx+i] = true
				}
			}
		}
	}
	if hasRho {
		m.Rho = make([]float64, g.Cells())
	}
	inv := 1 / float64(samples)
	var mixedEps []int
	for j := 0; j+1 < ny; j++ {
		for i := 0; i+1 < nx; i++ {
			c := j*cx + i
			n0 := j*nx + i
			s0, s1, s2, s3 := states[n0], states[n0+1], states[n0+nx], states[n0+nx+1]
			if !mixed[c] && s0 == s1 && s0 == s2 && s0 == s3 {
				m.CellRegion[c] = s0.epsReg
				m.Eps[c] = r.eps(s0)
				if hasRho {
					m.Rho[c] = r.rho(s0)
				}
				continue
			}
			m.CellRegion[c] = r.state(0.5*(xs[i]+xs[i+1]), 0.5*(ys[j]+ys[j+1])).epsReg
			var esum, rsum float64
			var ne int
			var under float64
			first, several := math.NaN(), false
			note := func(s pointState) {
				if s.cond >= 0 {
					return
				}
				e := r.eps(s)
				if math.IsNaN(first) {
					first = e
				} else if e != first {
					several = true
				}
			}
			note(s0)
			note(s1)
			note(s2)
			note(s3)
			for b := 0; b < samples; b++ {
				y := ys[j] + (float64(b)+0.5)*inv*(ys[j+1]-ys[j])
				for a := 0; a < samples; a++ {
					x := xs[i] + (float64(a)+0.5)*inv*(xs[i+1]-xs[i])
					s := r.state(x, y)
					under = r.eps(s)
					note(s)
					if s.cond < 0 {
						esum += under
						ne++
					}
					rsum += r.rho(s)
				}
			}
			switch {
			case ne > 0:
				m.Eps[c] = esum / float64(ne)
			case !math.IsNaN(first):
				// Every sample lies in a conductor, but a corner does not:
				// the sliver next to that free corner carries the flux of
				// its cut links.
				m.Eps[c] = first
			default:
				m.Eps[c] = under
			}
			if several {
				mixedEps = append(mixedEps, c)
			}
			if hasRho {
				m.Rho[c] = rsum * inv * inv
				if rsum != 0 || r.rho(s0) != 0 || r.rho(s1) != 0 || r.rho(s2) != 0 || r.rho(s3) != 0 {
					m.Rho[c] = r.cellRho(xs[i], ys[j], xs[i+1], ys[j+1], 2*samples)
				}
			}
		}
	}
	if len(mixedEps) == 0 {
		return
	}
	m.EpsX = make([]float64, 2*g.Cells())
	m.EpsY = make([]float64, 2*g.Cells())
	for c, e := range m.Eps {
		m.EpsX[2*c], m.EpsX[2*c+1] = e, e
		m.EpsY[2*c], m.EpsY[2*c+1] = e, e
	}
	for _, c := range mixedEps {
		r.directional(m, c%cx, c/cx, c, m.Eps[c], 2)
	}
}

// cellSpan returns the range of cell indices along one axis that overlap
// [lo, hi], clamped to the grid.
func cellSpan(a []float64, lo, hi float64) (int, int) {
	n := len(a) - 1
	i0, i1 := 0, n-1
	for i0 < n-1 && a[i0+1] < lo {
		i0++
	}
	for i1 > 0 && a[i1] > hi {
		i1--
	}
	if i1 < i0 {
		i1 = i0
	}
	return i0, i1
}

// points deposits point and ring charges on the four nodes of their cell by
// bilinear weights, which conserves the total charge.
func (r *rasterizer) points(m *Map) {
	if len(r.p.Charges) == 0 {
		return
	}
	g := r.g
	m.Point = make([]float64, g.Len())
	for _, q := range r.p.Charges {
		i, j, s, t, ok := g.Locate(q.X, q.Y)
		if !ok {
			continue
		}
		if i+1 >= g.Nx() {
			i, s = g.Nx()-2, 1
		}
		if j+1 >= g.Ny() {
			j, t = g.Ny()-2, 1
		}
		n := g.Index(i, j)
		nx := g.Nx()
		m.Point[n] += q.Q * (1 - s) * (1 - t)
		m.Point[n+1] += q.Q * s * (1 - t)
		m.Point[n+nx] += q.Q * (1 - s) * t
		m.Point[n+nx+1] += q.Q * s * t
	}
}

// ConductorNodes returns the indices of the nodes of conductor k.
func (m *Map) ConductorNodes(k int) []int {
	var out []int
	for n, c := range m.Cond {
		if c == int32(k) {
			out = append(out, n)
		}
	}
	return out
}

// FreeNodes returns the number of free nodes.
func (m *Map) FreeNodes() int {
	n := 0
	for _, k := range m.Kind {
		if k == Free {
			n++
		}
	}
	return n
}
