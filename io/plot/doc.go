// Package plot draws the pictures of a solution that a design review
// asks for, as PNG or SVG, with gonum.org/v1/plot for the axes and the
// canvases.
//
// # Pictures
//
// Draw and Save take the solution, the problem it solves (for the exact
// shapes) and Options. Options.Kind chooses the picture:
//
//   - Potential: a colour map of φ with equipotentials at round levels,
//     labelled in gaps along the lines; the conductors' names and
//     potentials where they fit.
//   - FieldMagnitude: a colour map of |E|, linear or (LogScale)
//     logarithmic down to the smallest field but at most three decades
//     below the peak; the largest nodal field is ringed and quoted with
//     its position in a footnote.
//   - Arrows: field vectors drawn from their tail points on a regular
//     lattice over faint equipotentials. ArrowMode sets the length:
//     TrueLength (longest ≈ one lattice spacing, with a key), LogLength
//     (three decades, with a key) or EqualLength (coloured by |E|, with a
//     colour bar). True lengths are faithful but near an electrode edge
//     they leave the rest of the picture as dots; the other modes exist
//     for that.
//   - FieldLines: lines started on the conductor surfaces, one per equal
//     share of surface charge, so that their spacing along a surface
//     follows 1/|σ| and their density shows the flux density εE. Lines
//     leave positively charged surfaces along E and negatively charged
//     ones against E; a line from a negative surface that reaches a
//     conductor retraces flux already drawn and is left out. Each line
//     carries an arrowhead pointing along E. In an axisymmetric problem
//     the shares are of charge per length in the r–z plane, so the
//     spacing shows σ at the surface; away from it, lines in r–z do not
//     keep a density proportional to |E|. Lines start on conductors
//     only: flux that ends on free charge shows as lines ending inside
//     the charge, and flux between charges alone is not drawn.
//
// Equipotentials fall on round values (1, 2, 2.5 or 5 × 10ᵏ) strictly
// between the lowest and highest potential; a level equal to an
// electrode's potential is drawn only where it leaves the electrode.
//
// Every picture draws the conductors filled in a neutral grey with a dark
// outline, dielectric interfaces as dashed lines and charge regions as
// dotted lines (both on a light halo so that they read on any colour),
// conductor sides of the domain as heavy bars, and point or ring charges
// as signed dots. Axes read in the model's length unit (Options.Unit, or
// m, mm or µm by the domain's size), x and y or, in an axisymmetric
// problem, r and z, at equal scale. Options.View limits the picture to
// part of the domain, such as the region of interest of a problem whose
// open sides were moved far out: axes, colour scales, arrows and
// equipotentials then follow what the view shows, and field lines, traced
// through the whole domain from the surfaces in view, end at its frame.
// Colour bars carry their unit, chosen
// so that values read between 1 and 1000: V, kV or MV for potentials;
// V/m, kV/m, and kV/mm (models in mm or smaller) or MV/m (models in
// metres) for fields. Every picture that shows a field strength carries
// Caution as a footnote.
//
// # Colour
//
// Maps use one sequential colour scale made for this package: lightness
// rising linearly from dark blue-violet through teal and green to light
// yellow, resampled to equal CIELAB colour differences, so that it is
// perceptually uniform, prints legibly in greyscale and avoids red–green
// contrasts. colormap.go documents its construction.
//
// # Method
//
// Colour maps are sampled on the picture's own pixel lattice from the
// solution's potential (PotentialAt) and nodal field (NodeFieldTo), so
// non-uniform grids appear at their true coordinates; in cells cut by a
// conductor surface the field is interpolated from the free corners only,
// which keeps the grid's staircase out of the picture. Equipotentials come from marching
// squares on the nodes, taking the conductor potential at the cut point
// of a link cut by a conductor surface rather than at the conductor node.
// Field lines are integrated by fourth-order Runge–Kutta steps on the
// unit direction field, with steps under half a cell and halved where
// the line turns; a line stops on a conductor, where it leaves the domain
// through a side that is not a symmetry plane, where the field vanishes,
// or after three times the domain's perimeter. Their seeds use the
// solution's surface field (field.Solution.SurfaceField).
package plot
