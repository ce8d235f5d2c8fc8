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
// Units are SI. In a planar problem charges are per metre of depth (C/m),
// energies J/m and capacitances F/m; in an axisymmetric problem they are
// C, J and F.
package field
