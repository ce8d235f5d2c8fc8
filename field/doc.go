// Package field derives the quantities engineers act on from a solved
// potential: the electric field at nodes, cells and arbitrary points, the
// charge on every conductor, the stored energy and the capacitance matrix.
//
// Charges follow the discrete Gauss law: the charge on a conductor is the
// net flux of the finite-volume operator out of its nodes, through the very
// couplings the solver used. Hence Q = C·V holds for the matrix C that
// CapacitanceMatrix returns, C is symmetric up to the solver tolerance, and
// the stored energy ½·Σ g·(Δφ)² over all links equals ½·VᵀCV to the
// solver's accuracy in a charge-free problem.
//
// With open sides the flux that leaves the domain toward infinity enters
// the energy as ½·Σ Far·φ², the energy of the field beyond the boundary, so
// the identities hold there too.
//
// # Surface and peak fields
//
// SurfaceField gives the normal field and the surface charge density at
// every point where a conductor surface crosses a grid link, from
// one-sided differences along the grid line through the crossing, turned
// into the normal field with the surface normal, and on the faces that
// lie on a grid line without crossing one (thin and zero-thickness
// strips, the sides of the domain held by a conductor), both faces of a
// strip included. Each point carries the piece of surface it stands for,
// so Σ σ·Area estimates the conductor's charge. PeakSurfaceField fits the
// samples near the largest one to locate the peak on each conductor, and
// PeakRegionFields gives the peak in every dielectric material. The
// potential next to the surface is first corrected toward the
// Shortley–Weller discretisation: locally at no cost, or, after
// RefineSurface, with one more solve, which makes surface fields converge
// at second order on smooth bodies. Fields at sharp edges and corners are
// singular and never converge; a Peak near one is marked Sharp, and its
// value must not be read as a converged figure.
//
// # Error estimates
//
// A single grid gives numbers without an error bar. Converge (grids built
// by bc.AutoGrid from a mesh, halving the cell size per level) and
// ConvergeGrids (grids of the caller's) solve the problem on two to five
// refined grids and return, for every capacitance-matrix entry, conductor
// charge, the energy and every peak field, the values per grid, the
// observed order of convergence, a Richardson-extrapolated value and an
// error band after Roache's grid convergence index (Fs = 1.25 with three
// grids and a monotone observed order, 3 otherwise). Richardson does the
// same for any quantity the caller measures. The error band is an estimate
// of the discretisation error only; it does not cover modelling errors such
// as a truncated domain or wrong material data.
//
// Electrostatic estimates are not a substitute for testing and for the
// applicable standards and codes; peak fields and margins need qualified
// review.
//
// Units are SI. In a planar problem charges are per metre of depth (C/m),
// energies J/m and capacitances F/m; in an axisymmetric problem they are
// C, J and F.
package field
