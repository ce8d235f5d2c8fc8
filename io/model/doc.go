// Package model reads phigrid model files: a human-written, commented TOML
// description of an electrostatic problem, parsed strictly into the types
// of package bc and checked before any grid is built or any equation
// solved.
//
// # Overview
//
// A model file states its length unit once, describes a rectangular
// domain (a planar cross-section or an axisymmetric r–z half-plane), names
// its conductors and their potentials, lists regions (conductor,
// dielectric and charge) in the order they are laid down, and says which
// outer-boundary condition holds on each side. Optional tables control the
// grid, the solver and the output files.
//
//	m, err := model.Load("coax.toml")
//	if err != nil {
//		log.Fatal(err) // coax.toml:17:3: region[2].circle.radius: ...
//	}
//	g, err := m.Grid()
//	mp, err := bc.Rasterize(m.Problem, g, nil)
//
// Parse and Load return a Model whose Problem has passed
// bc.Problem.Validate and every check listed under Validation below. All
// values in a Model are in SI units (metres, volts, C/m³, C/m or C); Unit
// and PotentialUnit keep the file's units for axes and tables.
//
// The file is TOML 1.0 (https://toml.io), decoded by
// github.com/pelletier/go-toml/v2 in strict mode: an unknown key (a typo)
// is an error, never silently ignored. That library was chosen over
// BurntSushi/toml because its errors carry line, column and key for syntax
// errors, values of the wrong type and unknown keys alike — also inside
// arrays of tables — and because its syntax-tree parser gives the position
// of every key, which this package uses to place its own errors.
//
// # Complete example
//
// A commented model using every table. Comments start with # and run to
// the end of the line.
//
//	# Two traces on a board inside a grounded enclosure, cross-section.
//	title = "Coupled traces in a shielded box"
//	description = "The example of the model-file manual."
//
//	[units]
//	length = "mm"              # every length in the file
//	potential = "V"            # every potential in the file (V or kV)
//
//	[domain]
//	kind = "planar"            # per metre of depth; or "axisymmetric"
//	x = [-10, 10]
//	y = [0, 8]
//	material = "air"           # the background, where no region is
//
//	[materials]                # the file's own dielectrics: name = eps_r
//	"solder mask" = 3.8
//
//	[[conductor]]
//	name = "ground"
//	potential = 0
//
//	[[conductor]]
//	name = "signal"
//	potential = 1
//
//	[[conductor]]
//	name = "guard"             # an isolated trace, its charge given
//	floating = true
//	charge = 0                 # C/m in a planar model, C in an axisymmetric one
//
//	# Regions are laid down in file order: a later region overrides an
//	# earlier one where they overlap.
//	[[region]]
//	name = "board"
//	kind = "dielectric"
//	material = "FR-4"
//	rect = { x = [-10, 10], y = [0, 1.6] }
//
//	[[region]]
//	name = "mask"
//	kind = "dielectric"
//	material = "solder mask"
//	rect = { x = [-4, 4], y = [1.6, 1.7] }
//
//	[[region]]
//	name = "trace"
//	kind = "conductor"
//	conductor = "signal"
//	strip = { from = [-1.5, 1.6], to = [-0.5, 1.6], thickness = 0.035 }
//
//	[[region]]
//	kind = "conductor"
//	conductor = "guard"
//	strip = { from = [0.5, 1.6], to = [1.5, 1.6] }   # zero thickness
//
//	[[region]]
//	name = "return wire"
//	kind = "conductor"
//	conductor = "ground"
//	circle = { center = [6, 5], radius = 0.5 }
//
//	[[region]]
//	name = "space charge"
//	kind = "charge"
//	charge_density = 1e-6      # C/m³
//	polygon = { points = [[-8, 4], [-6, 4], [-7, 6]] }
//
//	[[region]]
//	name = "sleeve"
//	kind = "dielectric"
//	eps_r = 2.5                # a permittivity without a material name
//	annulus = { center = [6, 5], inner_radius = 0.5, outer_radius = 0.8 }
//
//	[[line_charge]]
//	name = "q1"
//	at = [7, 2]
//	charge = 1e-12             # C/m
//
//	[boundary]                 # sides not listed are zero-flux
//	bottom = { kind = "fixed", conductor = "ground" }
//	top = { kind = "fixed", conductor = "ground" }
//	left = { kind = "fixed", potential = 0 }
//	right = { kind = "zero-flux" }
//
//	[grid]
//	cell = 0.25                # target cell size away from edges
//	refine = 8                 # cells of 0.25/8 mm at edges
//	ratio = 1.2                # growth between neighbouring cells
//	gap = 6                    # cells across the thinnest gap (board and trace)
//	corner = 3                 # cells of 0.25/(8·3) mm at conductor corners
//	max_nodes = 2_000_000
//
//	[solver]
//	method = "mg-pcg"          # or "cg", "sor"
//	tolerance = 1e-10
//	max_iterations = 200
//
//	[output]
//	directory = "traces-out"
//	report = true
//	csv = true
//	npy = false
//	vtk = true
//	archive = true
//
//	[[output.picture]]
//	kind = "potential"
//	file = "potential.png"
//	contours = 20
//	width = 1200
//	height = 500
//
//	[[output.picture]]
//	kind = "field"
//	file = "field.png"
//	log_scale = true
//
//	[[output.picture]]
//	kind = "arrows"
//	file = "arrows.svg"
//	arrow_length = "log"
//
//	[[output.picture]]
//	kind = "field-lines"
//	file = "lines.svg"
//	lines = 32
//
//	[[output.probe]]
//	name = "above trace"
//	at = [-1, 2.5]
//
//	[[output.cut]]
//	name = "vertical"
//	from = [-1, 0]
//	to = [-1, 8]
//	samples = 161
//
// # Units
//
// Every length — coordinates, radii, thicknesses, the cell size — is in
// the unit of [units] length: "m", "cm", "mm", "um" (also written "µm"),
// "in" (25.4 mm) or "mil" (0.0254 mm). Every potential — of conductors and
// of fixed sides — is a plain number in the unit of [units] potential, "V"
// (the default) or "kV". Charges are always SI, whatever the length unit:
// charge density in C/m³, line charges and the charge of a floating
// conductor in C/m (planar) or C (axisymmetric), ring charges in C.
//
// # Top level
//
//	title        string  optional; a one-line name for reports
//	description  string  optional; free text
//
// Top-level keys must come before the first [table] header, as TOML
// requires.
//
// # [units] (required)
//
//	length     string  required: m, cm, mm, um, µm, in or mil
//	potential  string  "V" (default) or "kV"
//
// # [domain] (required)
//
//	kind      string          required: "planar" or "axisymmetric"
//	x         [x0, x1]        required; x0 < x1
//	y         [y0, y1]        required; y0 < y1
//	material  string          background dielectric (default "vacuum")
//	eps_r     number          background relative permittivity, instead of material
//
// A planar domain is a cross-section; capacitances and charges are per
// metre of depth. In an axisymmetric domain x is the radius r and y the
// axial coordinate z; the domain must lie at r ≥ 0 and usually starts at
// the axis, x0 = 0. Shapes are drawn in the r–z half-plane only: a rect or
// polygon must lie at r ≥ 0, a strip's centre line too, and a circle,
// ellipse or annulus must be centred at r ≥ 0 (centred on the axis it is a
// sphere, a spheroid or a spherical shell; what falls at r < 0 is
// ignored).
//
// # [materials]
//
// The file's own dielectrics, one line each: name = relative permittivity
// (> 0). Names ignore case, spaces, hyphens and underscores: "FR-4", "fr4"
// and "Fr_4" are one material. A name quoted as "solder mask" may contain
// spaces. A file's own material overrides a built-in one of the same name.
// The built-in table (see Materials) holds vacuum, air (ε_r taken as 1),
// dry-air (1.00054), PTFE (2.1), FR-4 (4.4), alumina (9.8), transformer-oil
// (2.2), polyethylene (2.25), polyimide (3.4), silicon (11.7), GaAs (12.9),
// water (80) and SF6 (1.002); these are typical values, so define your own
// from the data sheet when the exact permittivity matters.
//
// # [[conductor]]
//
// One table per electrode. Regions and boundary sides refer to it by name.
//
//	name       string   required; unique
//	potential  number   required unless floating; in the potential unit
//	floating   bool     true: the charge is given and the potential found
//	charge     number   floating conductors only; C/m planar, C axisymmetric (default 0)
//
// Every conductor must have at least one region or boundary side.
//
// # [[region]]
//
// One table per region, in the order they are laid down.
//
//	name            string  optional label for messages and reports; unique when given
//	kind            string  required: "conductor", "dielectric" or "charge"
//	conductor       string  kind conductor: the [[conductor]] it belongs to (required)
//	material        string  kind dielectric: a material name (this or eps_r required)
//	eps_r           number  kind dielectric: relative permittivity > 0, instead of material
//	charge_density  number  kind charge: free-charge density in C/m³ (required);
//	                        a charge region may also give material or eps_r
//
// and exactly one shape, written inline as shown or as a sub-table such as
// [region.polygon] right after its [[region]] line:
//
//	rect     = { x = [x0, x1], y = [y0, y1] }
//	circle   = { center = [x, y], radius = r }
//	ellipse  = { center = [x, y], semi_axes = [a, b] }
//	annulus  = { center = [x, y], inner_radius = r0, outer_radius = r1 }
//	polygon  = { points = [[x, y], [x, y], [x, y], ...] }
//	strip    = { from = [x, y], to = [x, y], thickness = t }
//
// A rect may have zero width or height. An ellipse has the semi-axis a
// along x and b along y, both > 0. An annulus (ring) needs
// 0 ≤ inner_radius < outer_radius. A polygon needs at least three vertices
// and no crossing edges; the closing edge is implied. A strip is a straight
// band about its centre line, such as a board trace or a thin plate; its
// thickness defaults to 0, and a conductor strip thinner than a cell still
// claims every grid node its centre line passes. In an axisymmetric model a
// circle off the axis is a torus (a grading ring), one centred on the axis
// a sphere, an ellipse centred on the axis a spheroid (prolate when b > a,
// as a rounded tip; oblate when b < a, as a disk with a rounded rim), and a
// rect touching the axis a solid cylinder.
//
// # Region order
//
// Regions are laid down in the order they appear in the file, so a later
// region overrides an earlier one where they overlap — the way layers are
// painted. A conductor region makes the area it covers part of its
// conductor; a dielectric region sets the permittivity and removes any
// earlier conductor there; a charge region sets the charge density (and
// the permittivity, when it gives one) and also removes any earlier
// conductor. So a hollow electrode can be written as a filled conductor
// followed by a dielectric inside it. Conductors at different potentials
// must not overlap where both remain: that is an error, as is a conductor
// that later regions cover entirely.
//
// # [[line_charge]] and [[ring_charge]]
//
// Concentrated charges: a line charge normal to the plane of a planar
// model, in C/m, or a ring charge about the axis of an axisymmetric model,
// total charge in C (a point charge when it sits on the axis). Each must
// lie inside the domain; a planar model takes only [[line_charge]], an
// axisymmetric one only [[ring_charge]].
//
//	name    string  optional; unique when given
//	at      [x, y]  required; position in the length unit
//	charge  number  required; C/m or C
//
// # [boundary]
//
// The condition on each side of the domain, keys left (x = x0), right
// (x = x1), bottom (y = y0) and top (y = y1). A side not listed is
// zero-flux.
//
//	{ kind = "zero-flux" }                      ∂φ/∂n = 0: a symmetry plane or insulating wall
//	{ kind = "fixed", potential = 0 }           held at a potential (potential unit)
//	{ kind = "fixed", conductor = "ground" }    part of a conductor: its charge counts
//	{ kind = "open" }                           unbounded space beyond, φ = 0 at infinity
//
// In an axisymmetric domain that starts at r = 0 the left side is the
// axis and must stay zero-flux (it can be neither fixed nor open). Two
// sides that meet at a corner cannot belong to conductors at different
// potentials, and a conductor region must not touch a side belonging to a
// conductor at another potential.
//
// # Open sides
//
// An open side stands for empty space reaching to infinity, where the
// potential is zero; an isolated electrode in open space is written with
// its outer sides open and needs no ground at all. The side carries the
// asymptotic (Robin) condition ∂φ/∂n = −n·(n̂·r̂)·φ/R, exact for a
// potential that falls off like R⁻ⁿ with the distance R from a centre,
// and its error shrinks as the side moves away from the geometry. The
// optional key far of [boundary] sets that far field:
//
//	far = { center = [x, y], decay = n, extend = f }
//
//	center  [x, y]  centre of the far field in the length unit, in the domain
//	                (default: the middle of the geometry, mirrored across the
//	                zero-flux sides it touches); in an axisymmetric model x
//	                must be 0
//	decay   number  the power n in φ ∝ R⁻ⁿ, in (0, 10] (default 1)
//	extend  number  in [1, 1000]: move the open sides f times as far from the
//	                centre (default 1: they stay where [domain] puts them)
//
// Choose decay by what the far field looks like. n = 1, the default, is
// right for a body of revolution with net charge, such as an isolated
// electrode (the monopole, 1/R), and for a planar system with no net
// charge, such as a two-wire line (the 2-D dipole, cos θ/R). Use n = 2
// for a body of revolution with no net charge, such as two electrodes at
// +V and −V (a dipole). A planar system with net charge has no potential
// at infinity — it grows like ln R — so there an open side only acts like
// a distant ground: the result is approximate and depends on where the
// side is; check it by moving the side, or use a fixed side far away.
//
// Put open sides well away from the geometry, cheaply: let [domain] reach
// two to three body sizes beyond the geometry and set extend = 5 to 20 (10
// is a good start). The sides then move outward, and the grid fills the far
// region with cells growing by [grid] ratio, which costs few nodes.
// Probes and cuts must lie in the domain as written; the solution, the
// charges and the pictures cover the extended one. far without any open
// side is an error.
//
// # [grid]
//
// Controls the automatic graded grid (bc.AutoGrid): cells of cell/refine
// at every geometry edge, cell/(refine·corner) at conductor corners, at
// least gap cells across every thin gap, growing by at most ratio between
// neighbours to cell away from them (and beyond cell toward open sides).
//
//	cell       number  target cell size in the length unit (default: the longer
//	                   side of the domain as written / 100)
//	refine     number  ≥ 1, cell size divisor at edges (default 4; 1 = uniform)
//	ratio      number  in (1, 2], growth between neighbouring cells (default 1.2)
//	gap        number  whole, 1 to 1000: the fewest cells across a thin gap —
//	                   between two shapes facing each other, between a shape
//	                   and a fixed side, across a dielectric layer (default 4)
//	corner     number  ≥ 1, extra divisor at conductor corners and strip ends,
//	                   where the field is singular (default 2; 1 = off)
//	max_nodes  number  whole; node cap (default 4097² = 16 785 409)
//
// Raise gap when a thin insulation layer or a narrow slot decides the
// result: its field is only as good as the cells across it.
//
// # [solver]
//
//	method          string  "mg-pcg" (default: conjugate gradients preconditioned by
//	                        multigrid), "mg" (multigrid V-cycles), "cg"
//	                        (Jacobi-preconditioned) or "sor"
//	tolerance       number  relative residual in (0, 1) (default 1e-10)
//	max_iterations  number  whole ≥ 1 (default: the solver's own limit)
//
// # [output]
//
//	directory  string  output directory, relative to the model file (default:
//	                   the command's choice)
//	report     bool    JSON report (default true)
//	csv        bool    CSV tables (default false)
//	npy        bool    NumPy .npy arrays (default false)
//	vtk        bool    VTK rectilinear-grid file (default false)
//	archive    bool    compressed archive of the whole solution (default false)
//
// # [[output.picture]]
//
//	kind          string  required: "potential" (colour map of φ), "field"
//	                      (colour map of |E|), "arrows" (E vectors) or
//	                      "field-lines"
//	file          string  plain file name ending in .png or .svg
//	                      (default "<kind>.png"); unique
//	width, height number  pixels, or points in an SVG, up to 10000
//	                      (default 0: automatic)
//	contours      number  approximate number of equipotentials, ≥ 1 (default 10)
//	log_scale     bool    "field" and "arrows": |E| on a logarithmic colour
//	                      scale (default false)
//	arrow_length  string  "arrows" only: "scaled" (∝ |E|, default), "uniform"
//	                      (one length, colour shows |E|) or "log" (∝ log |E|)
//	lines         number  "field-lines" only: approximate number of lines,
//	                      started on the conductor surfaces (default 24)
//
// # [[output.probe]] and [[output.cut]]
//
// A probe reports φ and E at a point; a cut samples them along a segment
// into a table. Both must lie inside the domain; names default to probe1,
// probe2, … and cut1, cut2, … and must be distinct.
//
//	[[output.probe]]  name string, at [x, y] (required)
//	[[output.cut]]    name string, from [x, y] and to [x, y] (required),
//	                  samples number (whole, 2 to 1 000 000, default 101)
//
// # Validation
//
// Before returning, Parse checks, and reports the first failure of:
// unknown keys, values of the wrong type, missing required keys and unknown
// keywords; shapes that are malformed, lie entirely outside the domain or
// reach r < 0 in an axisymmetric model; a fixed or open axis; a far field
// without open sides, centred outside the domain or off the axis of an
// axisymmetric model, or with a decay or an extension out of range;
// permittivities ≤ 0; unknown or
// duplicate names of materials, conductors, regions, charges, probes and
// cuts; conductors at different potentials that overlap or touch, found by
// sampling the geometry in region order; conductors hidden by later
// regions; a model with no fixed potential anywhere; and a grid that would
// exceed the node cap or the machine's memory (BytesPerNode per node
// against MemTotal in /proc/meminfo, skipped where that is not available).
// What remains is checked at node level when the problem is rasterised;
// Model.Locate places those errors in the file too.
//
// # Errors
//
// Every error from Parse and Load is an *Error with the file name, line,
// column and key path, formatted as
//
//	file.toml:LINE:COL: KEY: message
//
// Key paths are dotted, and count the entries of an array of tables from 1
// in file order: "region[3].circle.radius" is the radius of the third
// [[region]]. errors.Is tells ErrSyntax (not TOML), ErrSchema (unknown key,
// wrong type, missing value) and ErrInvalid (a problem that cannot be
// solved) apart; errors that package bc found also match bc.ErrProblem or
// bc.ErrTooLarge.
package model
