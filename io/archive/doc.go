// Package archive reads and writes phigrid result archives: one
// zstd-compressed file that holds a whole solved problem — the model file's
// text, the problem description, the grid, the rasterised map, the
// potential and the report — so that pictures can be redrawn and fields,
// charges and energies evaluated again without solving. Archive.Solution
// rebuilds a field.Solution from it; charges and energy recomputed from a
// reloaded archive equal the originals bit for bit.
//
// The conventional file name extension is ".pga".
//
// # File layout, version 1.0
//
// All integers are little-endian. All floating-point numbers are IEEE 754
// binary64 (float64) bit patterns, little-endian, so every value reads back
// exactly.
//
//	offset  size  content
//	0       8     magic: 0x89 'P' 'G' 'A' 0x0D 0x0A 0x1A 0x0A
//	8       2     major format version, uint16 (1)
//	10      2     minor format version, uint16 (0)
//	12      …     one zstd frame (RFC 8878) holding the payload, with the
//	              content checksum; nothing may follow it
//
// The magic's high first byte and its CR LF, Ctrl-Z and LF catch a file
// sent through a text-mode transfer. The version stands outside the
// compressed frame so a reader can refuse a file it does not understand
// before decompressing it. A reader accepts every minor version of its
// major version and rejects any other major version with a *VersionError.
// The zstd frame's window must not exceed 8 MiB (MaxWindow).
//
// The payload is a sequence of sections, each:
//
//	size  content
//	1     name length n, 1 to 64
//	n     name, of the bytes a–z, 0–9, '.' and '_'
//	1     element type (below)
//	8     data length L in bytes, uint64; a multiple of the element size
//	L     data
//
// Element types and their sizes in bytes:
//
//	1  bytes    1   opaque bytes (the model file's text)
//	2  json     1   UTF-8 JSON (RFC 8259)
//	3  uint8    1
//	4  int8     1
//	5  int32    4
//	6  float64  8
//	7  crossing 58  a conductor-surface crossing (bc.Crossing): Free int32,
//	                Node int32, Axis int8, Dir int8, then Frac, X, Y, Nx,
//	                Ny, EpsR as float64
//
// The first section is "meta" and the last is "end" (type bytes, length
// 0); nothing follows "end". Every other section appears at most once, in
// any order. A reader skips sections whose names it does not know, so a
// later minor version may add sections; a known section with the wrong
// type or length is an error. With N = nx·ny nodes, C = (nx−1)(ny−1) cells
// and K conductors, the sections of version 1.0 are:
//
//	name            type      count  content
//	meta            json      —      {"metric": "planar"|"axisymmetric",
//	                                  "nx", "ny", "conductors": K,
//	                                  "snapped", "model_name",
//	                                  "unit": {"name", "scale"}}
//	model           bytes     —      the model file's text (optional)
//	problem         json      —      the bc.Problem (optional; see below)
//	report          json      —      the JSON report (optional)
//	grid.x, grid.y  float64   nx, ny the node axes (r and z when
//	                                  axisymmetric)
//	map.conductors  json      K      the map's conductors: [{"name",
//	                                  "potential", "floating", "charge"}]
//	map.regions     json      —      the map's regions (optional), as in
//	                                  "problem"
//	map.sides       json      4      the map's sides, as in "problem"
//	map.far         json      —      the far field of open sides:
//	                                  {"x", "y", "decay"}
//	map.kind        uint8     N      node kinds: 0 free, 1 on a conductor,
//	                                  2 prescribed
//	map.cond        int32     N      conductor index per node, −1 for none
//	map.value       float64   N      prescribed node potentials, V
//	map.eps         float64   C      relative permittivity per cell
//	map.epsx        float64   2C     directional permittivities of
//	map.epsy                         half-cells (optional; both or none)
//	map.rho         float64   C      charge density per cell, C/m³
//	                                  (optional)
//	map.point       float64   N      concentrated charge per node
//	                                  (optional)
//	map.cutx        float64   N      cut fractions of +X links
//	map.cuty        float64   N      cut fractions of +Y links
//	map.cellregion  int32     C      region index per cell, −1 for the
//	                                  background (optional)
//	map.surface     crossing  any    conductor-surface crossings (optional)
//	phi             float64   N      node potentials, V, in grid order
//	                                  (node (i, j) at j·nx + i)
//	v               float64   K      conductor potentials, V
//
// An optional section that is absent reads back as a nil slice; one that
// is present with no elements reads back as an empty slice. A reader
// ignores object fields it does not know in JSON sections, so a later
// minor version may add fields as well as sections.
//
// The "problem" section is a JSON object {"metric", "domain",
// "background", "conductors", "regions", "charges", "sides", "far"}: the
// domain is a rect shape (below), "far" is null or {"x", "y", "decay"},
// and a region is {"name", "kind": "dielectric" | "conductor" | "charge",
// "conductor", "eps_r", "rho", "shape"}. A shape is an object tagged by
// "type": {"type": "rect", "x0", "y0", "x1", "y1"}, {"type": "circle",
// "x", "y", "r"}, {"type": "annulus", "x", "y", "r0", "r1"}, {"type":
// "polygon", "x": [...], "y": [...]} or {"type": "strip", "x0", "y0",
// "x1", "y1", "thickness"}. A side is {"kind": "zero-flux" | "fixed" |
// "open", "conductor", "potential", "func"}; a point charge {"name", "x",
// "y", "q"}. A potential prescribed by a Go function (bc.Side.Func) cannot
// be stored: "func" is then true and the prescribed node values in
// "map.value" stand for it; Read gives such a side (in the problem and in
// the map) a Func that interpolates those values linearly along the side,
// so rasterising the problem again on the archived grid reproduces the
// map. Lengths are in metres, potentials in volts, charge densities in
// C/m³ and charges in C/m (planar) or C (axisymmetric).
//
// # Limits
//
// Read checks every declared size before it uses it: at most MaxNodes
// nodes, MaxConductors conductors, MaxText bytes in a bytes or json
// section and 4·N surface crossings. Memory grows with the data actually
// read, never with a size a corrupt header declares. Arrays are checked
// for consistency (indices in range, finite numbers, cut fractions in
// (0, 1]) so that a damaged file cannot make a later computation panic.
//
// # Errors
//
// Read returns a *FormatError, matching ErrFormat, for a file that is not a
// readable archive (wrong magic, truncated or corrupt data, inconsistent
// sections), and a *VersionError, matching ErrVersion, for an archive of
// another major version. Write returns an error wrapping ErrInvalid when
// the Archive is incomplete or inconsistent, before it writes anything.
package archive
