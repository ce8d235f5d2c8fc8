// Package report turns a solved problem into the solve report: a Report
// value that holds every figure an engineer acts on, and its renderings as
// readable fixed-width text, as JSON and as CSV tables.
//
// # Content
//
// A Report names the model and its kind (planar, per metre of depth, or
// axisymmetric, absolute), summarises the grid and the solver run, and
// lists per conductor its potential, charge, row of the capacitance
// matrix and peak surface field with its position; then the stored
// energy, the peak field in every dielectric material, error estimates
// from a grid-convergence study when one was run, and the probes and line
// cuts the caller asked for.
//
// Build reads the peak fields from package field: the surface field of
// every conductor (field.Solution.SurfaceField; call RefineSurface on the
// solution first for surface fields that converge at second order) and
// the peak field per material (field.Solution.PeakRegionFields). Where a
// peak ties within round-off, as in a uniform field, the conductor peak
// lies at the first tying surface point in grid order, so the position
// does not change from run to run. A peak within about two cells of a
// sharp edge or corner of a conductor (field.Peak.Sharp) has SharpEdge
// set, and WriteText prints a note beside its position: the field there is
// singular, so its value grows with refinement and is not a converged
// figure.
//
// # Renderings
//
// WriteText writes the report for a terminal, WriteJSON as a JSON document
// that ReadJSON reads back exactly, and WriteConductorsCSV,
// WriteProbesCSV and WriteCutsCSV write its tables for spreadsheets and
// scripts (data only: one header row naming every column with its unit).
//
// # Units
//
// Numbers in a Report are SI: volts, V/m, metres. Charges, capacitances and
// energies are per metre of depth in a planar problem (C/m, F/m, J/m) and
// absolute in an axisymmetric one (C, F, J); Report.Units names the unit of
// each so a reader of the JSON need not guess. Every position is given
// twice: in metres (fields ending in _m) and in the model's own length
// unit (Report.Units.Length), for tables and axes the designer recognises.
// WriteText prints numbers with engineering prefixes (pF/m, µJ) and field
// strengths in V/m, V/mm or kV/mm, whichever reads best.
//
// # Safety
//
// Field maps are used to judge insulation. Whenever a report shows a field
// strength it carries the Caution text, and WriteText prints it beside
// every table of field strengths.
//
// # Stability
//
// JSON field names are part of the format and change only with Version.
// ReadJSON accepts reports of this major version and ignores fields it
// does not know, so a newer minor revision still reads.
package report
