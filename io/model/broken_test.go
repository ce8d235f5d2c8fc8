package model

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/phigrid/phigrid/bc"
)

// base is a valid planar model with two conductors; broken cases append
// to it or edit it.
const base = `[units]
length = "mm"

[domain]
kind = "planar"
x = [0, 10]
y = [0, 10]

[[conductor]]
name = "a"
potential = 1

[[conductor]]
name = "b"
potential = 0

[[region]]
kind = "conductor"
conductor = "a"
circle = { center = [5, 5], radius = 1 }

[[region]]
kind = "conductor"
conductor = "b"
rect = { x = [0, 10], y = [0, 1] }
`

// baseLines is the number of lines of base; appended text starts on line
// baseLines+1.
var baseLines = strings.Count(base, "\n")

func TestBaseIsValid(t *testing.T) {
	if _, err := Parse("base.toml", []byte(base)); err != nil {
		t.Fatalf("the base of the broken cases must be valid: %v", err)
	}
}

func TestParseBroken(t *testing.T) {
	axi := strings.Replace(base, `kind = "planar"`, `kind = "axisymmetric"`, 1)
	tests := []struct {
		name   string
		src    string
		is     error    // sentinel the error must wrap
		key    string   // Error.Key
		line   int      // Error.Line (0: not checked); negative: relative to the end of base
		column int      // Error.Column (0: not checked)
		msg    []string // substrings of the message
	}{
		// Not TOML.
		{name: "syntax", src: base + "[[region]\n", is: ErrSyntax, line: -1, msg: []string{"not valid TOML", "]]"}},
		{name: "duplicate key", src: base + "[units]\nlength = \"m\"\n", is: ErrSyntax, line: -2, msg: []string{"units", "already"}},
		{name: "value missing", src: "title =\n", is: ErrSyntax, line: 1, msg: []string{"not valid TOML"}},

		// Unknown keys.
		{name: "unknown top-level key", src: "colour = 3\n" + base, is: ErrSchema, key: "colour", line: 1, column: 1,
			msg: []string{`unknown key "colour" at the top level`, "expected one of: title, description, units"}},
		{name: "unknown key in a shape", src: base + "[[region]]\nkind = \"dielectric\"\neps_r = 2\ncircle = { center = [5, 5], radus = 1 }\n",
			is: ErrSchema, key: "region[3].circle.radus", line: -1, column: 29, msg: []string{`unknown key "radus" in region[3].circle; expected one of: center, radius`}},
		{name: "unknown table", src: base + "[mesh]\ncell = 1\n", is: ErrSchema, key: "mesh", line: -2,
			msg: []string{`unknown key "mesh"`, "grid"}},
		{name: "several unknown keys", src: base + "[solver]\nmethd = \"cg\"\ntol = 1\n", is: ErrSchema, key: "solver.methd", line: -2,
			msg: []string{`unknown key "methd" in solver`, "(and 1 more unknown key)"}},
		{name: "key of the next table", src: base + "[[conductor]]\nname = \"c\"\nregion = 1\n", is: ErrSchema, key: "conductor[3].region", line: -1,
			msg: []string{`unknown key "region" in conductor[3]`}},

		// Wrong types.
		{name: "string for a number", src: base + "[[region]]\nkind = \"dielectric\"\neps_r = \"2\"\ncircle = { center = [5, 5], radius = 1 }\n",
			is: ErrSchema, key: "region[3].eps_r", line: -2, column: 9, msg: []string{"expected a number, got a string"}},
		{name: "string inside an array", src: base + "[[region]]\nkind = \"dielectric\"\neps_r = 2\npolygon = { points = [[1, 1], [2, \"x\"], [1, 2]] }\n",
			is: ErrSchema, key: "region[3].polygon.points[2][2]", line: -1, msg: []string{"expected a number, got a string"}},
		{name: "number for far", src: base + "[boundary]\nright = { kind = \"open\" }\nfar = 10\n", is: ErrSchema, key: "boundary.far", line: -1,
			msg: []string{"expected a table such as { center = [0, 0], decay = 1, extend = 10 }, got an integer"}},
		{name: "unknown key in far", src: base + "[boundary]\nright = { kind = \"open\" }\nfar = { centre = [0, 0] }\n", is: ErrSchema,
			key: "boundary.far.centre", line: -1, msg: []string{`unknown key "centre" in boundary.far; expected one of: center, decay, extend`}},
		{name: "string for a side", src: base + "[boundary]\nleft = \"zero-flux\"\n", is: ErrSchema, key: "boundary.left", line: -1,
			msg: []string{`expected a table such as { kind = "fixed", potential = 0 }, got a string`}},
		{name: "number for a name", src: base + "[[conductor]]\nname = 3\n", is: ErrSchema, key: "conductor[3].name", line: -1,
			msg: []string{"expected a string, got an integer"}},
		{name: "integer for a bool", src: base + "[output]\ncsv = 1\n", is: ErrSchema, key: "output.csv", line: -1,
			msg: []string{"expected true or false, got an integer"}},
		{name: "number for the title", src: "title = 3\n" + base, is: ErrSchema, key: "title", line: 1, msg: []string{"expected a string, got an integer"}},
		{name: "number for materials", src: "materials = 3\n" + base, is: ErrSchema, key: "materials",
			msg: []string{"expected a table of name = relative permittivity, got an integer"}},
		{name: "string for a material", src: base + "[materials]\nresin = \"4\"\n", is: ErrSchema, key: "materials.resin",
			msg: []string{"expected a relative permittivity (a number), got a string"}},
		{name: "number for an extent", src: strings.Replace(base, "x = [0, 10]", "x = 10", 1), is: ErrSchema, key: "domain.x",
			msg: []string{"expected an array [x0, x1] of two numbers, got an integer"}},
		{name: "number for a vertex", src: base + "[[region]]\nkind = \"dielectric\"\neps_r = 2\npolygon = { points = [1, 2, 3] }\n",
			is: ErrSchema, key: "region[3].polygon.points[1]", msg: []string{"expected a vertex [x, y] of two numbers, got an integer"}},
		{name: "number for a shape", src: base + "[[region]]\nkind = \"dielectric\"\neps_r = 2\ncircle = 3\n",
			is: ErrSchema, key: "region[3].circle", msg: []string{"expected a table such as { center = [0, 0], radius = 1 }, got an integer"}},
		{name: "date for a number", src: base + "[solver]\ntolerance = 2024-01-01\n", is: ErrSchema, key: "solver.tolerance",
			msg: []string{"expected a number, got a local date"}},
		{name: "strings for a point", src: base + "[[output.probe]]\nat = [\"1\", \"2\"]\n", is: ErrSchema, key: "output.probe[1].at[1]",
			msg: []string{"expected a number, got a string"}},
		{name: "single table for an array", src: strings.Replace(base, "[[conductor]]\nname = \"b\"", "[conductorx]\nname = \"b\"", 1), is: ErrSchema,
			msg: []string{`unknown key "conductorx"`}},
		{name: "table instead of array of tables", src: "[units]\nlength = \"mm\"\n[conductor]\nname = \"a\"\npotential = 1\n", is: ErrSchema, key: "conductor", line: 3,
			msg: []string{"[[conductor]] (double brackets)"}},
		{name: "three coordinates", src: base + "[[region]]\nkind = \"dielectric\"\neps_r = 2\ncircle = { center = [5, 5, 5], radius = 1 }\n",
			is: ErrSchema, key: "region[3].circle.center", line: -1, msg: []string{"expected a point [x, y] of two numbers in mm, got 3 numbers"}},

		// Missing values.
		{name: "no units", src: strings.Replace(base, "[units]\nlength = \"mm\"\n", "", 1), is: ErrSchema, key: "units",
			msg: []string{"missing table [units]"}},
		{name: "no length unit", src: strings.Replace(base, "length = \"mm\"\n", "potential = \"V\"\n", 1), is: ErrSchema, key: "units.length", line: 1,
			msg: []string{`missing key "length" in [units]`, "mm"}},
		{name: "no domain", src: "[units]\nlength = \"mm\"\n", is: ErrSchema, key: "domain", msg: []string{"missing table [domain]"}},
		{name: "no domain kind", src: strings.Replace(base, "kind = \"planar\"\n", "", 1), is: ErrSchema, key: "domain.kind", line: 4,
			msg: []string{`missing key "kind" in [domain]`, "axisymmetric"}},
		{name: "no domain y", src: strings.Replace(base, "y = [0, 10]\n", "", 1), is: ErrSchema, key: "domain.y",
			msg: []string{`missing key "y" in [domain]`}},
		{name: "no region kind", src: base + "[[region]]\neps_r = 2\ncircle = { center = [5, 5], radius = 1 }\n",
			is: ErrSchema, key: "region[3].kind", line: -3, msg: []string{`missing key "kind" in region[3]`, `"conductor", "dielectric" or "charge"`}},
		{name: "no shape", src: base + "[[region]]\nkind = \"dielectric\"\neps_r = 2\n", is: ErrSchema, key: "region[3].circle", line: -3,
			msg: []string{"one shape: rect, circle, ellipse, annulus, polygon or strip"}},
		{name: "no radius", src: base + "[[region]]\nkind = \"dielectric\"\neps_r = 2\ncircle = { center = [5, 5] }\n", is: ErrSchema,
			key: "region[3].circle.radius", line: -1, msg: []string{`missing key "radius" in region[3].circle`, "radius in mm"}},
		{name: "no potential", src: base + "[[conductor]]\nname = \"c\"\n", is: ErrSchema, key: "conductor[3].potential", line: -2,
			msg: []string{`missing key "potential"`, "floating = true"}},
		{name: "no conductor name", src: base + "[[conductor]]\npotential = 3\n", is: ErrSchema, key: "conductor[3].name", line: -2,
			msg: []string{"every conductor needs a name"}},
		{name: "no dielectric permittivity", src: base + "[[region]]\nkind = \"dielectric\"\nrect = { x = [0, 1], y = [0, 1] }\n",
			is: ErrSchema, key: "region[3].material", msg: []string{`material = "PTFE"`, "eps_r"}},
		{name: "no charge density", src: base + "[[region]]\nkind = \"charge\"\nrect = { x = [0, 1], y = [0, 1] }\n",
			is: ErrSchema, key: "region[3].charge_density", msg: []string{"C/m³"}},
		{name: "side without kind", src: base + "[boundary]\ntop = { potential = 0 }\n", is: ErrSchema, key: "boundary.top.kind",
			msg: []string{`missing key "kind" in [boundary.top]`, `"open" (unbounded space, φ = 0 at infinity)`}},
		{name: "fixed side without value", src: base + "[boundary]\ntop = { kind = \"fixed\" }\n", is: ErrSchema, key: "boundary.top.potential",
			msg: []string{"a fixed side needs its potential"}},
		{name: "picture without kind", src: base + "[[output.picture]]\nfile = \"x.png\"\n", is: ErrSchema, key: "output.picture[1].kind",
			msg: []string{`"potential", "field", "arrows" or "field-lines"`}},
		{name: "cut without end", src: base + "[[output.cut]]\nfrom = [1, 1]\n", is: ErrSchema, key: "output.cut[1].to",
			msg: []string{"end point [x, y] in mm"}},

		// Keywords and keys that do not belong together.
		{name: "unknown length unit", src: strings.Replace(base, `"mm"`, `"furlong"`, 1), is: ErrSchema, key: "units.length", line: 2,
			msg: []string{`unknown length unit "furlong"`}},
		{name: "unknown potential unit", src: strings.Replace(base, "length = \"mm\"\n", "length = \"mm\"\npotential = \"MV\"\n", 1), is: ErrSchema,
			key: "units.potential", msg: []string{"use V or kV"}},
		{name: "unknown domain kind", src: strings.Replace(base, `"planar"`, `"spherical"`, 1), is: ErrSchema, key: "domain.kind",
			msg: []string{`unknown domain kind "spherical"`}},
		{name: "unknown region kind", src: base + "[[region]]\nkind = \"dilectric\"\n", is: ErrSchema, key: "region[3].kind",
			msg: []string{`unknown region kind "dilectric"`}},
		{name: "two shapes", src: base + "[[region]]\nkind = \"dielectric\"\neps_r = 2\nrect = { x = [0, 1], y = [0, 1] }\ncircle = { center = [5, 5], radius = 1 }\n",
			is: ErrSchema, key: "region[3].circle", msg: []string{"both rect and circle"}},
		{name: "material and eps_r", src: base + "[[region]]\nkind = \"dielectric\"\neps_r = 2\nmaterial = \"PTFE\"\nrect = { x = [0, 1], y = [0, 1] }\n",
			is: ErrInvalid, key: "region[3].eps_r", msg: []string{"either material or eps_r, not both"}},
		{name: "eps_r on a conductor", src: strings.Replace(base, "conductor = \"a\"\n", "conductor = \"a\"\neps_r = 3\n", 1), is: ErrSchema,
			key: "region[1].eps_r", msg: []string{"a conductor region takes no eps_r"}},
		{name: "floating with potential", src: strings.Replace(base, "potential = 1\n", "potential = 1\nfloating = true\n", 1), is: ErrInvalid,
			key: "conductor[1].potential", msg: []string{"floating", "remove potential"}},
		{name: "charge on a fixed conductor", src: strings.Replace(base, "potential = 1\n", "potential = 1\ncharge = 1e-9\n", 1), is: ErrInvalid,
			key: "conductor[1].charge", msg: []string{"give charge only with floating = true"}},
		{name: "open with potential", src: base + "[boundary]\ntop = { kind = \"open\", potential = 0 }\n", is: ErrSchema,
			key: "boundary.top.potential", msg: []string{"an open side takes no potential"}},
		{name: "open with conductor", src: base + "[boundary]\ntop = { kind = \"open\", conductor = \"b\" }\n", is: ErrSchema,
			key: "boundary.top.conductor", msg: []string{"an open side takes no conductor"}},
		{name: "unknown boundary kind", src: base + "[boundary]\ntop = { kind = \"infinite\" }\n", is: ErrSchema,
			key: "boundary.top.kind", msg: []string{`unknown boundary kind "infinite"; use "zero-flux", "fixed" or "open"`}},
		{name: "zero-flux with potential", src: base + "[boundary]\ntop = { kind = \"zero-flux\", potential = 0 }\n", is: ErrSchema,
			key: "boundary.top.potential", msg: []string{"a zero-flux side takes no potential"}},
		{name: "unknown solver", src: base + "[solver]\nmethod = \"gauss-seidel\"\n", is: ErrSchema, key: "solver.method", line: -1,
			msg: []string{`unknown solver "gauss-seidel"`, "mg-pcg"}},
		{name: "picture key of another kind", src: base + "[[output.picture]]\nkind = \"arrows\"\nlines = 3\n", is: ErrSchema,
			key: "output.picture[1].lines", msg: []string{`lines does not apply to pictures of kind "arrows"`}},
		{name: "arrow mode", src: base + "[[output.picture]]\nkind = \"arrows\"\narrow_length = \"long\"\n", is: ErrSchema,
			key: "output.picture[1].arrow_length", msg: []string{`unknown arrow length mode "long"`}},
		{name: "ring charge in planar", src: base + "[[ring_charge]]\nat = [1, 1]\ncharge = 1e-12\n", is: ErrInvalid, key: "ring_charge[1]",
			msg: []string{"a planar model has line charges", "[[line_charge]]"}},
		{name: "line charge in axisymmetric", src: axi + "[[line_charge]]\nat = [1, 1]\ncharge = 1e-12\n", is: ErrInvalid, key: "line_charge[1]",
			msg: []string{"[[ring_charge]]"}},

		// Values out of range.
		{name: "empty domain", src: strings.Replace(base, "x = [0, 10]", "x = [10, 10]", 1), is: ErrInvalid, key: "domain.x",
			msg: []string{"x0 < x1"}},
		{name: "negative radius", src: base + "[[region]]\nkind = \"dielectric\"\neps_r = 2\ncircle = { center = [5, 5], radius = -1 }\n",
			is: ErrInvalid, key: "region[3].circle.radius", line: -1, msg: []string{"radius must be a finite number > 0, got -1 mm"}},
		{name: "not a number", src: base + "[[region]]\nkind = \"dielectric\"\neps_r = 2\ncircle = { center = [nan, 5], radius = 1 }\n",
			is: ErrInvalid, key: "region[3].circle.center", msg: []string{"finite"}},
		{name: "ellipse semi-axis zero", src: base + "[[region]]\nkind = \"dielectric\"\neps_r = 2\nellipse = { center = [5, 5], semi_axes = [2, 0] }\n",
			is: ErrInvalid, key: "region[3].ellipse.semi_axes", line: -1, column: 30, msg: []string{"semi-axes [a, b] must be finite numbers > 0", "got [2, 0] mm"}},
		{name: "ellipse semi-axis negative", src: base + "[[region]]\nkind = \"dielectric\"\neps_r = 2\nellipse = { center = [5, 5], semi_axes = [-1, 2] }\n",
			is: ErrInvalid, key: "region[3].ellipse.semi_axes", msg: []string{"got [-1, 2] mm"}},
		{name: "ellipse semi-axis infinite", src: base + "[[region]]\nkind = \"dielectric\"\neps_r = 2\nellipse = { center = [5, 5], semi_axes = [inf, 2] }\n",
			is: ErrInvalid, key: "region[3].ellipse.semi_axes", msg: []string{"finite numbers > 0"}},
		{name: "ellipse with one semi-axis", src: base + "[[region]]\nkind = \"dielectric\"\neps_r = 2\nellipse = { center = [5, 5], semi_axes = [2] }\n",
			is: ErrSchema, key: "region[3].ellipse.semi_axes", msg: []string{"semi-axes [a, b] as two numbers in mm", "got 1 numbers"}},
		{name: "ellipse without semi-axes", src: base + "[[region]]\nkind = \"dielectric\"\neps_r = 2\nellipse = { center = [5, 5] }\n",
			is: ErrSchema, key: "region[3].ellipse.semi_axes", line: -1, msg: []string{`missing key "semi_axes" in region[3].ellipse`, "a along x and b along y"}},
		{name: "ellipse radius key", src: base + "[[region]]\nkind = \"dielectric\"\neps_r = 2\nellipse = { center = [5, 5], radius = 1 }\n",
			is: ErrSchema, key: "region[3].ellipse.radius", msg: []string{`unknown key "radius" in region[3].ellipse; expected one of: center, semi_axes`}},
		{name: "number for an ellipse", src: base + "[[region]]\nkind = \"dielectric\"\neps_r = 2\nellipse = 3\n",
			is: ErrSchema, key: "region[3].ellipse", msg: []string{"expected a table such as { center = [0, 0], semi_axes = [2, 1] }, got an integer"}},
		{name: "annulus radii", src: base + "[[region]]\nkind = \"dielectric\"\neps_r = 2\nannulus = { center = [5, 5], inner_radius = 2, outer_radius = 1 }\n",
			is: ErrInvalid, key: "region[3].annulus.outer_radius", msg: []string{"larger than the inner radius"}},
		{name: "crossing polygon", src: base + "[[region]]\nkind = \"dielectric\"\neps_r = 2\npolygon = { points = [[1, 1], [3, 3], [3, 1], [1, 3]] }\n",
			is: ErrInvalid, key: "region[3].polygon.points", msg: []string{"cross"}},
		{name: "two-point polygon", src: base + "[[region]]\nkind = \"dielectric\"\neps_r = 2\npolygon = { points = [[1, 1], [3, 3]] }\n",
			is: ErrInvalid, key: "region[3].polygon.points", msg: []string{"at least 3 vertices, got 2"}},
		{name: "reversed rect", src: base + "[[region]]\nkind = \"dielectric\"\neps_r = 2\nrect = { x = [3, 1], y = [0, 1] }\n",
			is: ErrInvalid, key: "region[3].rect.x", msg: []string{"x0 ≤ x1"}},
		{name: "point strip", src: base + "[[region]]\nkind = \"dielectric\"\neps_r = 2\nstrip = { from = [1, 1], to = [1, 1] }\n",
			is: ErrInvalid, key: "region[3].strip.to", msg: []string{"two different end points"}},
		{name: "negative thickness", src: base + "[[region]]\nkind = \"dielectric\"\neps_r = 2\nstrip = { from = [1, 1], to = [2, 1], thickness = -1 }\n",
			is: ErrInvalid, key: "region[3].strip.thickness", msg: []string{"thickness must be a finite number ≥ 0"}},
		{name: "outside the domain", src: base + "[[region]]\nkind = \"dielectric\"\neps_r = 2\ncircle = { center = [50, 5], radius = 1 }\n",
			is: ErrInvalid, key: "region[3]", line: -4, msg: []string{"lies entirely outside the domain [0, 10] × [0, 10] mm"}},
		{name: "r below zero", src: axi + "[[region]]\nkind = \"dielectric\"\neps_r = 2\nrect = { x = [-0.5, 1], y = [0, 1] }\n",
			is: ErrInvalid, key: "region[3]", msg: []string{"reaches r = -0.5 mm < 0", "draw only the half at r ≥ 0"}},
		{name: "centre below zero", src: axi + "[[region]]\nkind = \"dielectric\"\neps_r = 2\ncircle = { center = [-0.5, 5], radius = 1 }\n",
			is: ErrInvalid, key: "region[3]", msg: []string{"centred at r = -0.5 mm < 0"}},
		{name: "ellipse centre below zero", src: axi + "[[region]]\nkind = \"dielectric\"\neps_r = 2\nellipse = { center = [-0.5, 5], semi_axes = [1, 2] }\n",
			is: ErrInvalid, key: "region[3]", msg: []string{"centred at r = -0.5 mm < 0", "circle, ellipse or annulus"}},
		{name: "strip below zero", src: axi + "[[region]]\nkind = \"dielectric\"\neps_r = 2\nstrip = { from = [-1, 5], to = [3, 5] }\n",
			is: ErrInvalid, key: "region[3]", msg: []string{"the strip reaches r = -1 mm < 0"}},
		{name: "axisymmetric domain at r < 0", src: strings.Replace(axi, "x = [0, 10]", "x = [-1, 10]", 1), is: ErrInvalid, key: "domain.x",
			msg: []string{"r ≥ 0", "x starts at -1 mm"}},
		{name: "open axis", src: axi + "[boundary]\nleft = { kind = \"open\" }\n", is: ErrInvalid, key: "boundary.left",
			msg: []string{"the left side is the axis r = 0, which cannot be open", `kind = "zero-flux"`}},
		{name: "far without an open side", src: base + "[boundary]\ntop = { kind = \"fixed\", potential = 0 }\nfar = { extend = 10 }\n", is: ErrInvalid,
			key: "boundary.far", line: -1, column: 1, msg: []string{"no side is open", `make a side kind = "open" or remove far`}},
		{name: "far without boundary sides", src: base + "[boundary.far]\ndecay = 1\n", is: ErrInvalid, key: "boundary.far", msg: []string{"no side is open"}},
		{name: "decay zero", src: base + "[boundary]\nright = { kind = \"open\" }\nfar = { decay = 0 }\n", is: ErrInvalid,
			key: "boundary.far.decay", line: -1, column: 9, msg: []string{"power n of φ ∝ R⁻ⁿ", "(0, 10], got 0", "2 for a body of revolution without net charge"}},
		{name: "decay negative", src: base + "[boundary]\nright = { kind = \"open\" }\nfar = { decay = -1 }\n", is: ErrInvalid,
			key: "boundary.far.decay", msg: []string{"got -1"}},
		{name: "decay too high", src: base + "[boundary]\nright = { kind = \"open\" }\nfar = { decay = 12 }\n", is: ErrInvalid,
			key: "boundary.far.decay", msg: []string{"got 12"}},
		{name: "decay not a number", src: base + "[boundary]\nright = { kind = \"open\" }\nfar = { decay = nan }\n", is: ErrInvalid,
			key: "boundary.far.decay", msg: []string{"got NaN"}},
		{name: "extend below 1", src: base + "[boundary]\nright = { kind = \"open\" }\nfar = { extend = 0.5 }\n", is: ErrInvalid,
			key: "boundary.far.extend", line: -1, msg: []string{"[1, 1000]", "5 to 20 suits most models", "got 0.5"}},
		{name: "extend too far", src: base + "[boundary]\nright = { kind = \"open\" }\nfar = { extend = 1e6 }\n", is: ErrInvalid,
			key: "boundary.far.extend", msg: []string{"got 1e+06"}},
		{name: "far centre off the axis", src: axi + "[boundary]\nright = { kind = \"open\" }\nfar = { center = [2, 0] }\n", is: ErrInvalid,
			key: "boundary.far.center", msg: []string{"far-field centre lies on the axis, but it is at r = 2 mm", "center = [0, z]"}},
		{name: "far centre outside", src: base + "[boundary]\nright = { kind = \"open\" }\nfar = { center = [5, 12] }\n", is: ErrInvalid,
			key: "boundary.far.center", line: -1, msg: []string{"the far-field centre (5, 12) mm lies outside the domain [0, 10] × [0, 10] mm", "middle of the geometry"}},
		{name: "far centre beyond the axial extent", src: axi + "[boundary]\nright = { kind = \"open\" }\nfar = { center = [0, -20] }\n", is: ErrInvalid,
			key: "boundary.far.center", msg: []string{"the far-field centre (0, -20) mm lies outside the domain"}},
		{name: "far centre of three numbers", src: base + "[boundary]\nright = { kind = \"open\" }\nfar = { center = [0, 0, 0] }\n", is: ErrSchema,
			key: "boundary.far.center", msg: []string{"expected a point [x, y] of two numbers in mm, got 3 numbers"}},
		{name: "far centre infinite", src: base + "[boundary]\nright = { kind = \"open\" }\nfar = { center = [inf, 0] }\n", is: ErrInvalid,
			key: "boundary.far.center", msg: []string{"finite"}},
		{name: "fixed axis", src: axi + "[boundary]\nleft = { kind = \"fixed\", potential = 0 }\n", is: ErrInvalid, key: "boundary.left",
			msg: []string{"the left side is the axis r = 0"}},
		{name: "material eps_r zero", src: base + "[materials]\nmud = 0\n", is: ErrInvalid, key: "materials.mud", line: -1,
			msg: []string{`material "mud" needs a relative permittivity eps_r > 0, got 0`}},
		{name: "material twice", src: base + "[materials]\n\"Epoxy-A\" = 4\nepoxy_a = 4.1\n", is: ErrInvalid, key: "materials.epoxy_a",
			msg: []string{"defined twice"}},
		{name: "background eps_r", src: strings.Replace(base, "y = [0, 10]\n", "y = [0, 10]\neps_r = -1\n", 1), is: ErrInvalid, key: "domain.eps_r",
			msg: []string{"eps_r must be a finite number > 0, got -1"}},
		{name: "tolerance", src: base + "[solver]\ntolerance = 2\n", is: ErrInvalid, key: "solver.tolerance", msg: []string{"(0, 1)"}},
		{name: "iterations", src: base + "[solver]\nmax_iterations = 10.5\n", is: ErrInvalid, key: "solver.max_iterations",
			msg: []string{"whole number"}},
		{name: "refine", src: base + "[grid]\nrefine = 0.5\n", is: ErrInvalid, key: "grid.refine", msg: []string{"≥ 1"}},
		{name: "ratio", src: base + "[grid]\nratio = 3\n", is: ErrInvalid, key: "grid.ratio", msg: []string{"(1, 2]"}},
		{name: "cell", src: base + "[grid]\ncell = 0\n", is: ErrInvalid, key: "grid.cell", msg: []string{"cell size must be a finite number > 0"}},
		{name: "gap not whole", src: base + "[grid]\ngap = 2.5\n", is: ErrInvalid, key: "grid.gap", line: -1,
			msg: []string{"cells across a thin gap", "whole number from 1 to 1000, got 2.5"}},
		{name: "gap zero", src: base + "[grid]\ngap = 0\n", is: ErrInvalid, key: "grid.gap", msg: []string{"whole number from 1 to 1000, got 0"}},
		{name: "corner below 1", src: base + "[grid]\ncorner = 0.5\n", is: ErrInvalid, key: "grid.corner", line: -1,
			msg: []string{"conductor corners", "≥ 1 (1 turns it off), got 0.5"}},
		{name: "picture format", src: base + "[[output.picture]]\nkind = \"field\"\nfile = \"field.jpg\"\n", is: ErrInvalid,
			key: "output.picture[1].file", msg: []string{".png or .svg"}},
		{name: "picture path", src: base + "[[output.picture]]\nkind = \"field\"\nfile = \"../field.png\"\n", is: ErrInvalid,
			key: "output.picture[1].file", msg: []string{"plain file name"}},
		{name: "picture file twice", src: base + "[[output.picture]]\nkind = \"field\"\n[[output.picture]]\nkind = \"field\"\n", is: ErrInvalid,
			key: "output.picture[2]", msg: []string{`"field.png" is also written`}},
		{name: "cut samples", src: base + "[[output.cut]]\nfrom = [1, 1]\nto = [2, 2]\nsamples = 1\n", is: ErrInvalid,
			key: "output.cut[1].samples", msg: []string{"whole number from 2 to 1000000"}},
		{name: "probe outside", src: base + "[[output.probe]]\nat = [11, 0]\n", is: ErrInvalid, key: "output.probe[1].at", line: -1,
			msg: []string{"the point (11, 0) mm lies outside the domain"}},
		{name: "probe in the extended far region", src: sphereInSpace + "far = { extend = 10 }\n[[output.probe]]\nat = [100, 0]\n", is: ErrInvalid, key: "output.probe[1].at",
			msg: []string{"the point (100, 0) mm lies outside the domain [0, 30] × [-30, 30] mm"}},
		{name: "charge outside", src: base + "[[line_charge]]\nat = [11, 0]\ncharge = 1e-9\n", is: ErrInvalid, key: "line_charge[1].at",
			msg: []string{"outside the domain"}},

		// Names.
		{name: "unknown conductor", src: strings.Replace(base, "conductor = \"b\"", "conductor = \"c\"", 1), is: ErrInvalid,
			key: "region[2].conductor", msg: []string{`unknown conductor "c"`, `defined conductors: "a", "b"`}},
		{name: "unknown side conductor", src: base + "[boundary]\ntop = { kind = \"fixed\", conductor = \"shield\" }\n", is: ErrInvalid,
			key: "boundary.top.conductor", msg: []string{`unknown conductor "shield"`}},
		{name: "log scale of a potential map", src: base + "[[output.picture]]\nkind = \"potential\"\nlog_scale = true\n", is: ErrSchema,
			key: "output.picture[1].log_scale", msg: []string{`log_scale does not apply to pictures of kind "potential"`}},
		{name: "no equipotentials", src: base + "[[output.picture]]\nkind = \"potential\"\ncontours = 0\n", is: ErrInvalid,
			key: "output.picture[1].contours", msg: []string{"whole number from 1 to 1000"}},
		{name: "picture too wide", src: base + "[[output.picture]]\nkind = \"potential\"\nwidth = 20000\n", is: ErrInvalid,
			key: "output.picture[1].width", msg: []string{"whole number from 0 to 10000"}},
		{name: "unknown material", src: base + "[[region]]\nkind = \"dielectric\"\nmaterial = \"teflon\"\nrect = { x = [0, 1], y = [0, 1] }\n",
			is: ErrInvalid, key: "region[3].material", line: -2, msg: []string{`unknown material "teflon"`, "[materials]", "PTFE"}},
		{name: "duplicate conductor", src: base + "[[conductor]]\nname = \"a\"\npotential = 3\n", is: ErrInvalid, key: "conductor[3].name",
			msg: []string{`conductor "a" is defined twice (first at conductor[1] line 9)`}},
		{name: "duplicate region name", src: strings.Replace(strings.Replace(base, "conductor = \"a\"\n", "name = \"r\"\nconductor = \"a\"\n", 1),
			"conductor = \"b\"\n", "name = \"r\"\nconductor = \"b\"\n", 1), is: ErrInvalid, key: "region[2].name", msg: []string{`region name "r" is used twice`}},
		{name: "duplicate probe name", src: base + "[[output.probe]]\nname = \"p\"\nat = [1, 1]\n[[output.probe]]\nname = \"p\"\nat = [2, 2]\n",
			is: ErrInvalid, key: "output.probe[2].name", msg: []string{`name "p" is used twice`}},
		{name: "unused conductor", src: base + "[[conductor]]\nname = \"c\"\npotential = 3\n", is: ErrInvalid, key: "conductor[3]", line: -3,
			msg: []string{`conductor "c" has no region and no boundary side`}},

		// Physics and geometry.
		{name: "no fixed potential", src: strings.Replace(strings.Replace(base, "potential = 1", "floating = true", 1), "potential = 0", "floating = true", 1),
			is: ErrInvalid, msg: []string{"nothing has a fixed potential"}},
		{name: "overlap", src: base + "[[region]]\nkind = \"conductor\"\nconductor = \"b\"\ncircle = { center = [5, 5.5], radius = 1 }\n", is: ErrInvalid,
			key: "region[3]", line: -4, msg: []string{`conductors "a" (region[1] line 17) and "b" (region[3] line 26) overlap`, "(1 V and 0 V)"}},
		{name: "overlap with a floating conductor", src: base + "[[conductor]]\nname = \"f\"\nfloating = true\n[[region]]\nkind = \"conductor\"\nconductor = \"f\"\nrect = { x = [5.5, 7], y = [4, 6] }\n",
			is: ErrInvalid, key: "region[3]", msg: []string{`conductors "a"`, `"f"`, "floating"}},
		{name: "thin strip across a conductor", src: base + "[[region]]\nkind = \"conductor\"\nconductor = \"b\"\nstrip = { from = [2, 2], to = [8, 8] }\n",
			is: ErrInvalid, key: "region[3]", msg: []string{`conductors "a"`, `and "b"`, "overlap"}},
		{name: "touching conductors", src: base + "[[region]]\nkind = \"conductor\"\nconductor = \"b\"\nrect = { x = [6, 8], y = [4, 6] }\n",
			is: ErrInvalid, key: "region[3]", msg: []string{"overlap near (6, 5) mm"}},
		{name: "conductor on another's side", src: base + "[boundary]\nbottom = { kind = \"fixed\", conductor = \"a\" }\n", is: ErrInvalid,
			key: "region[2]", msg: []string{`conductor "b" (0 V) touches the bottom side, which belongs to conductor "a" (1 V)`}},
		{name: "corner between conductors", src: strings.Replace(base, "x = [0, 10], y = [0, 1]", "x = [2, 8], y = [2, 3]", 1) + "[boundary]\nleft = { kind = \"fixed\", conductor = \"a\" }\nbottom = { kind = \"fixed\", conductor = \"b\" }\n",
			is: ErrInvalid, key: "boundary.bottom", msg: []string{"the left and bottom sides meet at a corner", `"a" and "b"`}},
		{name: "hidden conductor", src: base + "[[region]]\nkind = \"dielectric\"\neps_r = 3\ncircle = { center = [5, 5], radius = 2 }\n", is: ErrInvalid,
			key: "region[1]", msg: []string{`conductor "a" is hidden`, "region[3] line 26 covers it", "later regions override earlier ones"}},
		{name: "too many nodes", src: base + "[grid]\ncell = 0.0001\n", is: bc.ErrTooLarge, key: "grid.cell", line: -1,
			msg: []string{"about 1e+10 nodes", "more than the cap of 16785409 nodes", "make [grid] cell larger", "max_nodes will not help"}},
		{name: "ratio close to 1", src: base + "[grid]\nratio = 1.0001\nrefine = 1000\n", is: bc.ErrTooLarge, key: "grid",
			msg: []string{"ratio 1.0001", "ratio larger"}},
		{name: "over a lowered cap", src: base + "[grid]\ncell = 0.1\nmax_nodes = 1000\n", is: ErrInvalid, key: "grid.cell",
			msg: []string{"more than the cap of 1000 nodes", "raise the cap with [grid] max_nodes ="}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := Parse("m.toml", []byte(tt.src))
			if err == nil {
				t.Fatal("parsed without error")
			}
			var e *Error
			if !errors.As(err, &e) {
				t.Fatalf("error %v is %T, want *Error", err, err)
			}
			if !errors.Is(err, tt.is) {
				t.Errorf("error %q does not wrap %v", err, tt.is)
			}
			if e.File != "m.toml" {
				t.Errorf("File = %q", e.File)
			}
			if tt.key != "" && e.Key != tt.key {
				t.Errorf("Key = %q, want %q (%v)", e.Key, tt.key, err)
			}
			line := tt.line
			if line < 0 {
				line += baseLines + strings.Count(tt.src[len(base):], "\n") + 1
			}
			if line != 0 && e.Line != line {
				t.Errorf("Line = %d, want %d (%v)", e.Line, line, err)
			}
			if tt.column != 0 && e.Column != tt.column {
				t.Errorf("Column = %d, want %d (%v)", e.Column, tt.column, err)
			}
			for _, s := range tt.msg {
				if !strings.Contains(err.Error(), s) {
					t.Errorf("message %q lacks %q", err, s)
				}
			}
		})
	}
}

func TestOverlapAllowed(t *testing.T) {
	for _, tt := range []struct {
		name, extra string
	}{
		{"same potential", "[[conductor]]\nname = \"c\"\npotential = 1\n[[region]]\nkind = \"conductor\"\nconductor = \"c\"\ncircle = { center = [5, 5.5], radius = 1 }\n"},
		{"same conductor", "[[region]]\nkind = \"conductor\"\nconductor = \"a\"\ncircle = { center = [5, 5.5], radius = 1 }\n"},
		{"cut away first", "[[region]]\nkind = \"dielectric\"\neps_r = 3\ncircle = { center = [5, 6], radius = 0.5 }\n" +
			"[[region]]\nkind = \"conductor\"\nconductor = \"b\"\ncircle = { center = [5, 6], radius = 0.4 }\n"},
		{"separate", "[[region]]\nkind = \"conductor\"\nconductor = \"b\"\ncircle = { center = [8, 8], radius = 1 }\n"},
		{"value side under a conductor", "[boundary]\nbottom = { kind = \"fixed\", potential = 5 }\n"},
		{"own side", "[boundary]\nbottom = { kind = \"fixed\", conductor = \"b\" }\nleft = { kind = \"fixed\", conductor = \"b\" }\n"},
	} {
		if _, err := Parse(tt.name+".toml", []byte(base+tt.extra)); err != nil {
			t.Errorf("%s: %v", tt.name, err)
		}
	}
}

func TestMemoryCheck(t *testing.T) {
	defer func(f func() uint64) { memTotal = f }(memTotal)
	memTotal = func() uint64 { return 1 << 20 }
	_, err := Parse("m.toml", []byte(base+"[grid]\ncell = 0.1\n"))
	if err == nil {
		t.Fatal("a grid larger than the machine's memory parsed")
	}
	for _, s := range []string{"needs about", "MiB of memory", "200 bytes per node", "1.0 MiB this machine has"} {
		if !strings.Contains(err.Error(), s) {
			t.Errorf("message %q lacks %q", err, s)
		}
	}
	// Over the node cap, and raising the cap would not fit either.
	_, err = Parse("m.toml", []byte(base+"[grid]\ncell = 0.001\n"))
	for _, s := range []string{"more than the cap of 16785409 nodes", "raising the cap with [grid] max_nodes = ", "GiB of memory, more than the 1.0 MiB this machine has"} {
		if err == nil || !strings.Contains(err.Error(), s) || !errors.Is(err, bc.ErrTooLarge) {
			t.Errorf("message %q lacks %q", err, s)
		}
	}
	memTotal = func() uint64 { return 0 } // unknown: skip the check
	if _, err := Parse("m.toml", []byte(base+"[grid]\ncell = 0.1\n")); err != nil {
		t.Errorf("with unknown memory: %v", err)
	}
}

func TestLocate(t *testing.T) {
	m, err := Parse("m.toml", []byte(base+"[boundary]\ntop = { kind = \"fixed\", potential = 0 }\n"))
	if err != nil {
		t.Fatal(err)
	}
	for _, tt := range []struct {
		err  error
		key  string
		line int
	}{
		{fmtErr(`conductor "b" covers no grid node`), "conductor[2]", 13},
		{fmtErr(`region 1 lies entirely outside the domain`), "region[2]", 22},
		{fmtErr(`the top side has a potential that is not finite`), "boundary.top", baseLines + 2},
		{fmtErr(`something else`), "", 0},
	} {
		got := m.Locate(tt.err)
		var e *Error
		if !errors.As(got, &e) {
			t.Fatalf("Locate(%v) = %T", tt.err, got)
		}
		if e.Key != tt.key || e.Line != tt.line || !errors.Is(got, bc.ErrProblem) || !errors.Is(got, ErrInvalid) {
			t.Errorf("Locate(%v) = %q (key %q line %d), want key %q line %d", tt.err, got, e.Key, e.Line, tt.key, tt.line)
		}
	}
	if m.Locate(nil) != nil {
		t.Error("Locate(nil) is not nil")
	}
	if line, _ := m.Position("region[2].rect"); line != 25 {
		t.Errorf("Position(region[2].rect) = line %d, want 25", line)
	}
}

func TestGridError(t *testing.T) {
	m, err := Parse("m.toml", []byte(base+"[grid]\ncell = 0.5\n"))
	if err != nil {
		t.Fatal(err)
	}
	if _, err := m.Grid(); err != nil {
		t.Fatal(err)
	}
	m.Mesh.MaxNodes = 10
	_, err = m.Grid()
	var e *Error
	if !errors.As(err, &e) || e.Key != "grid" || e.Line != baseLines+1 || !errors.Is(err, bc.ErrTooLarge) {
		t.Errorf("Grid over the cap: %v", err)
	}
}

func fmtErr(msg string) error { return errors.Join(bc.ErrProblem, errors.New(msg)) }

// wantBroken is the distinctive part of the message of each shared broken
// model under testdata/broken, which the command-line tests use too.
var wantBroken = map[string]string{
	"axis-fixed.toml":        "boundary.left: the left side is the axis r = 0",
	"bad-eps.toml":           "region[2].eps_r: the relative permittivity eps_r must be a finite number > 0, got -2.1",
	"duplicate-name.toml":    `conductor[3].name: conductor "hv" is defined twice`,
	"far-without-open.toml":  "boundary.far: far describes the far field that open sides assume, but no side is open",
	"hidden-conductor.toml":  `region[1]: conductor "hv" is hidden`,
	"missing-value.toml":     `conductor[3].potential: missing key "potential" in conductor[3]`,
	"negative-r.toml":        "region[1]: the shape reaches r = -2 mm < 0",
	"negative-radius.toml":   "region[1].circle.radius: the radius must be a finite number > 0, got -1 mm",
	"no-fixed.toml":          "nothing has a fixed potential",
	"open-on-axis.toml":      "boundary.left: the left side is the axis r = 0, which cannot be open",
	"outside-domain.toml":    "region[1]: the shape, spanning [19, 21] × [-1, 1] mm, lies entirely outside the domain",
	"overlap.toml":           `region[2]: conductors "hv" (region[1] line 22) and "ground" (region[2] line 27) overlap`,
	"syntax.toml":            "not valid TOML",
	"too-many-nodes.toml":    "grid.cell: the grid would need about 1e+10 nodes",
	"unknown-conductor.toml": `region[1].conductor: unknown conductor "shield"`,
	"unknown-key.toml":       `region[1].circle.radus: unknown key "radus"`,
	"unknown-material.toml":  `region[2].material: unknown material "teflon"`,
	"wrong-type.toml":        "region[1].circle.radius: expected a number, got a string",
}

func TestBrokenFiles(t *testing.T) {
	files, err := filepath.Glob("../../testdata/broken/*.toml")
	if err != nil {
		t.Fatal(err)
	}
	if len(files) != len(wantBroken) {
		t.Errorf("%d broken models in testdata/broken, %d expected; keep wantBroken up to date", len(files), len(wantBroken))
	}
	seen := map[string]string{}
	for _, f := range files {
		base := filepath.Base(f)
		_, err := Load(f)
		if err == nil {
			t.Errorf("%s parsed without error", base)
			continue
		}
		want, ok := wantBroken[base]
		if !ok {
			t.Errorf("%s: no expected message in wantBroken (got %v)", base, err)
			continue
		}
		if !strings.Contains(err.Error(), want) || !strings.HasPrefix(err.Error(), f+":") {
			t.Errorf("%s: error %q, want it to start with the path and contain %q", base, err, want)
		}
		var e *Error
		if errors.As(err, &e) {
			if prev, ok := seen[e.Msg]; ok {
				t.Errorf("%s fails with the same message as %s", base, prev)
			}
			seen[e.Msg] = base
		}
		// Each file says what it expects on its second line.
		src, _ := os.ReadFile(f)
		lines := strings.SplitN(string(src), "\n", 3)
		if len(lines) < 2 || !strings.HasPrefix(lines[1], "# Expected: ") {
			t.Errorf("%s: second line should be '# Expected: ...'", base)
		}
	}
	if _, err := Load("testdata/does-not-exist.toml"); err == nil || !strings.Contains(err.Error(), "cannot read the model file") {
		t.Errorf("Load of a missing file: %v", err)
	}
}
