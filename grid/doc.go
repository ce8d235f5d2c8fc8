// Package grid holds the rectilinear node axes and the finite-volume metric on
// which phigrid discretises the electrostatic equations.
//
// # Overview
//
// A Grid is the tensor product of two strictly increasing node axes, X and Y.
// In a planar problem X and Y are Cartesian coordinates and every measure is
// per metre of depth. In an axisymmetric problem X is the radius r (r ≥ 0)
// and Y is the axial coordinate z; every area and volume is the exact
// integral of 2πr over the region it describes, so the axis r = 0 needs no
// special treatment (the control volume of a node on the axis simply has no
// inner face).
//
// Nodes are numbered row by row: node (i, j) has index j·Nx + i, with i along
// X and j along Y. The cell (i, j) is the rectangle [X[i], X[i+1]] × [Y[j],
// Y[j+1]]; materials live on cells, potentials on nodes.
//
// The control volume of node (i, j) is bounded by the midpoints between
// neighbouring nodes. It is split into a low and a high half along each axis;
// DualX and DualY give their measures, so the part of the control volume
// lying in cell (ci, cj) is DualX·DualY of the matching halves. LinkX and
// LinkY give the geometric factor of a link between two neighbouring nodes
// (face measure per unit face length divided by the link length), from which
// the assembly forms the coupling coefficient.
//
// # Invariants
//
// A Grid is immutable after construction and safe for concurrent use.
// len(X) ≥ 2 and len(Y) ≥ 2; both are strictly increasing and finite; in an
// axisymmetric grid X[0] ≥ 0.
//
// # Aliasing
//
// New copies the axes it is given; the slices returned by the accessors are
// the grid's own storage and must not be modified.
package grid
