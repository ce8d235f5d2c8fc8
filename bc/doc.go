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
// Units are SI throughout: metres, volts, C/m³, and C/m (planar line charge)
// or C (axisymmetric ring charge).
package bc
