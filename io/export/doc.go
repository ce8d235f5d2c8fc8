// Package export writes phigrid results in open formats that other tools
// read, and reads back the formats that can be read back.
//
// # Formats
//
//   - NPY (NumPy array files; written as format 1.0, read as 1.0 to 3.0):
//     WriteNPY, ReadNPY, and WriteNPYSet for a directory of arrays on one
//     grid (x.npy, y.npy, phi.npy, ex.npy, …), for numpy.load.
//   - VTK XML RectilinearGrid (.vtr): WriteVTR, for ParaView, VisIt and the
//     VTK libraries; non-uniform axes are kept.
//   - CSV tables: WriteCSV and FormatFloat, for spreadsheets and pandas.
//   - Matrix Market (.mtx) for the assembled linear system:
//     WriteMatrixMarket, WriteMatrixMarketVector, ReadMatrixMarket and
//     ReadMatrixMarketVector, for SciPy, MATLAB, Julia and sparse solvers.
//
// # Layout conventions
//
// Nodal fields are flat slices in grid order, node (i, j) at j·Nx + i. NPY
// files store them with shape (Ny, Nx), so in NumPy phi[j, i] is the node
// at (x[i], y[j]); cell fields use shape (Ny−1, Nx−1). In an axisymmetric
// grid X is the radius r and Y the axial coordinate z: x.npy holds r,
// y.npy holds z, and a .vtr file uses x = r, y = z (with a comment saying
// so). Vectors are given as their X and Y components.
//
// # Numbers
//
// Binary formats (NPY) store float64 bits. Text formats (VTR, CSV, Matrix
// Market) write the shortest decimal that reads back to the same float64,
// so every format round-trips exactly.
//
// # Files
//
// The writers take an io.Writer; AtomicWriteFile gives them a file that
// appears complete or not at all, so an interrupted run never leaves a
// truncated result under the final name.
//
// # Errors
//
// Writers check their arguments first and return an error wrapping
// ErrInvalid before writing anything when the arguments do not fit. Readers
// return a *FormatError with the position of the problem; it matches
// ErrFormat, and also ErrUnsupported when the input is well formed but uses
// a feature the reader does not handle. Readers never panic, and the memory
// they use grows with the input actually read, not with the sizes a header
// declares.
package export
