// Package bc describes an electrostatic problem in continuous space and
// rasterises it onto a grid.
//
// # Overview
//
// A Problem has a rectangular domain, a metric (planar or axisymmetric), a
// background permittivity, an ordered list of regions, point sources, named
// conductors and one boundary condition per side of the domain. Regions
// carry a Shape and are one of three kinds: part of a named conductor, a
// dielectric with relative permittivity ε_r, or a free-charge region with
// density ρ in C/m³.
//
// # Overlap rule
//
// Regions are applied in order, so later regions override earlier ones
// where they overlap:
//
//   - a conductor region makes the area it covers part of its conductor,
//     whatever was there before;
//   - a dielectric region sets the permittivity of the area it covers and
//     removes any earlier conductor there (ρ is kept);
//   - a charge region sets the charge density of the area it covers, sets
//     the permittivity too when it gives one (EpsR > 0), and removes any
//     earlier conductor there.
//
// Inside a conductor the charge density is ignored and the permittivity does
// not enter the equations.
//
// # Rasterising
//
// Rasterize turns a Problem into a Map on a given grid: the kind of every
// node (free, conductor, prescribed boundary value), the conductor index of
// conductor nodes, ε_r and ρ of every cell from sub-cell sampling, the point
// charge deposited on each node, and for every link between a free node and
// a conductor node the fraction of the link, measured from the free node,
// at which the conductor surface cuts it. Links cut at a very small fraction
// snap their free node onto the conductor.
//
// # Accuracy on curved geometry
//
// Conductors are fixed-potential nodes; where a conductor surface crosses a
// link between a free node and a conductor node, the cut fraction θ (from
// the free node) tells the assembly to use the distance θ·h, which makes
// curved conductors second-order accurate on a rectilinear grid. The
// crossing points, with the surface normal found from the geometry and the
// permittivity just outside, are listed in Map.Surface for the evaluation
// of surface fields.
//
// A cell that a dielectric interface crosses gets, besides its plain mean
// permittivity (Map.Eps, for plots), two directional values per half-cell
// (Map.EpsX for flux along X, Map.EpsY along Y): the mean across the
// half-cell of the harmonic mean along lines parallel to the flux, with
// every change of material located exactly. Flux through layers in series
// sees the harmonic mean (the normal flux density is continuous), flux
// along layers side by side the arithmetic one (the tangential field is
// continuous), so interfaces along either axis are exact wherever they lie
// in a cell. An oblique interface keeps an O(h) error, since a five-point
// operator has no cross terms, but a much smaller one than the plain mean
// gives. Charge densities are volume means (weighted by 2πr in r–z) with
// region boundaries located exactly along lines.
//
// # Open space
//
// An Open side stands for unbounded space with φ = 0 at infinity. It
// carries the asymptotic condition ∂φ/∂n = −n·(n̂·r̂)·φ/R about the
// far-field centre (Problem.Far, DefaultFar), exact for a potential
// decaying like R⁻ⁿ: n = 1 (the default) for an axisymmetric body with net
// charge or a net-neutral planar system. ExtendOpen moves the open sides
// outward and AutoGrid fills the far region with geometrically growing
// cells, so that a boundary ten or twenty body sizes away costs only a few
// dozen cells per axis.
//
// # Automatic grids
//
// AutoGrid turns a target cell size into a graded grid: finer at geometry
// features, finer still at conductor corners, resolved all round on round
// shapes, with Mesh.Gap cells across every thin gap, and growing toward
// open sides. Features become grid lines, so straight edges and layers along
// the axes are exact.
//
// Units are SI throughout: metres, volts, C/m³, and C/m (planar line charge)
// or C (axisymmetric ring charge).
package bc
