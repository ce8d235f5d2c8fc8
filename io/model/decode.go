package model

import (
	"fmt"
	"math"
	"path"
	"sort"
	"strconv"
	"strings"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
)

// decoder converts one decoded file into a Model. It stops at the first
// error, which it places with the index.
type decoder struct {
	name  string
	ix    *index
	lunit Unit // length unit
	vunit Unit // potential unit
	mats  *materialTable
	m     *Model
	p     *bc.Problem
	used  map[string]bool // materials already listed in m.Materials
	// extend is the factor of [boundary] far.extend; 1 leaves the open
	// sides where the domain puts them.
	extend float64
}

// Length units a file may state, with their size in metres.
var lengthUnits = map[string]float64{
	"m":   1,
	"cm":  1e-2,
	"mm":  1e-3,
	"um":  1e-6,
	"µm":  1e-6,      // U+00B5 MICRO SIGN
	"μm":  1e-6,      // U+03BC GREEK SMALL LETTER MU
	"in":  0.0254,    // exact by definition (1959)
	"mil": 0.0254e-3, // a thousandth of an inch
}

// Potential units a file may state, with their size in volts.
var potentialUnits = map[string]float64{"V": 1, "kV": 1e3}

// Defaults of the [grid] and [solver] tables.
const (
	// DefaultCells is the number of target cells along the longer side of
	// the domain when [grid] cell is not given.
	DefaultCells = 100
	// DefaultTol is the solver tolerance when [solver] tolerance is not
	// given; it matches the default of package solve.
	DefaultTol = 1e-10
	// BytesPerNode is the memory estimate per grid node used to check a
	// grid against the machine's memory: potential, right-hand sides,
	// operator coefficients, multigrid levels and solver vectors.
	BytesPerNode = 200
)

func (d *decoder) model(raw *rawFile) (*Model, error) {
	d.m = &Model{Name: d.name, Title: raw.Title, Description: raw.Description, ix: d.ix}
	d.p = &bc.Problem{}
	d.m.Problem = d.p
	d.used = map[string]bool{}
	for _, key := range []string{"conductor", "region", "line_charge", "ring_charge", "output.picture", "output.probe", "output.cut"} {
		if d.ix.has(key) && !d.ix.has(key+"[1]") {
			return nil, d.schemaAt(key, "%s must be an array of tables: write [[%s]] (double brackets) before each entry", key, key)
		}
	}
	steps := []func(*rawFile) error{
		d.units, d.domain, d.materials, d.conductors, d.regions, d.pointCharges,
		d.boundary, d.references, d.overlaps, d.solver, d.outputs, d.extendOpen, d.grid,
	}
	for _, step := range steps {
		if err := step(raw); err != nil {
			return nil, err
		}
	}
	if err := d.p.Validate(); err != nil {
		// The checks above should have caught everything; keep package
		// bc's verdict as the last word and point at what it names.
		return nil, d.m.Locate(err)
	}
	return d.m, nil
}

// units reads [units].
func (d *decoder) units(raw *rawFile) error {
	if !d.ix.has("units") {
		return &Error{File: d.name, Key: "units", Err: ErrSchema,
			Msg: `missing table [units]: state the length unit once, for example [units] length = "mm"`}
	}
	if !d.ix.has("units.length") {
		return d.missing("units", "length", "the unit of every length in the file: m, cm, mm, um (or µm), in or mil")
	}
	s, ok := lengthUnits[raw.Units.Length]
	if !ok {
		return d.schemaAt("units.length", "unknown length unit %q; use m, cm, mm, um (or µm), in or mil", raw.Units.Length)
	}
	d.lunit = Unit{raw.Units.Length, s}
	d.vunit = Unit{"V", 1}
	if d.ix.has("units.potential") {
		v, ok := potentialUnits[raw.Units.Potential]
		if !ok {
			return d.schemaAt("units.potential", "unknown potential unit %q; use V or kV", raw.Units.Potential)
		}
		d.vunit = Unit{raw.Units.Potential, v}
	}
	d.m.Unit, d.m.PotentialUnit = d.lunit, d.vunit
	return nil
}

// domain reads [domain].
func (d *decoder) domain(raw *rawFile) error {
	if !d.ix.has("domain") {
		return &Error{File: d.name, Key: "domain", Err: ErrSchema,
			Msg: `missing table [domain]: give its kind ("planar" or "axisymmetric") and its extent x = [x0, x1], y = [y0, y1]`}
	}
	r := &raw.Domain
	if !d.ix.has("domain.kind") {
		return d.missing("domain", "kind", `"planar" for a cross-section per metre of depth, or "axisymmetric" for a body of revolution (x is r, y is z)`)
	}
	switch r.Kind {
	case "planar":
		d.p.Metric = grid.Planar
	case "axisymmetric":
		d.p.Metric = grid.Axisymmetric
	default:
		return d.schemaAt("domain.kind", `unknown domain kind %q; use "planar" or "axisymmetric"`, r.Kind)
	}
	var lo, hi [2]float64
	for a, axis := range []string{"x", "y"} {
		key := "domain." + axis
		if !d.ix.has(key) {
			return d.missing("domain", axis, fmt.Sprintf("the extent [%s0, %s1] of the domain along %s, in %s", axis, axis, axis, d.lunit.Name))
		}
		v := r.X
		if a == 1 {
			v = r.Y
		}
		l, h, err := d.interval(key, v)
		if err != nil {
			return err
		}
		if !(l < h) {
			return d.errAt(key, "the domain needs %s0 < %s1, got [%g, %g] %s", axis, axis, l/d.lunit.Scale, h/d.lunit.Scale, d.lunit.Name)
		}
		lo[a], hi[a] = l, h
	}
	d.p.Domain = bc.Rect{X0: lo[0], Y0: lo[1], X1: hi[0], Y1: hi[1]}
	d.m.Domain = d.p.Domain
	if d.p.Metric == grid.Axisymmetric && lo[0] < 0 {
		return d.errAt("domain.x", "an axisymmetric domain lies at r ≥ 0 (x is the radius and the axis is r = 0), but x starts at %s", d.length(lo[0]))
	}
	return nil
}

// materials reads [materials] and resolves the background permittivity.
func (d *decoder) materials(raw *rawFile) error {
	d.mats = newMaterialTable()
	names := make([]string, 0, len(raw.Materials))
	for n := range raw.Materials {
		names = append(names, n)
	}
	// Visit in file order, so the first problem in the file is reported.
	sort.Slice(names, func(i, j int) bool {
		return d.ix.find(join("materials", names[i])).before(d.ix.find(join("materials", names[j])))
	})
	mine := map[string]string{}
	for _, n := range names {
		key := join("materials", n)
		eps := raw.Materials[n]
		if strings.TrimSpace(n) == "" {
			return d.errAt(key, "a material needs a name")
		}
		if k := materialKey(n); mine[k] != "" {
			return d.errAt(key, "material %q is defined twice (as %q too); names ignore case, spaces, hyphens and underscores", n, mine[k])
		}
		if !(eps > 0) || math.IsInf(eps, 0) {
			return d.errAt(key, "material %q needs a relative permittivity eps_r > 0, got %g", n, eps)
		}
		mine[materialKey(n)] = n
		d.mats.byKey[materialKey(n)] = Material{Name: n, EpsR: eps, Note: "defined in the model file"}
	}
	eps, _, err := d.permittivity("domain", raw.Domain.Material, raw.Domain.EpsR, false)
	if err != nil {
		return err
	}
	switch {
	case eps == 0:
		m, err := d.material("domain", "vacuum")
		if err != nil {
			return err
		}
		eps = m.EpsR
		d.m.Background = m.Name
	case raw.Domain.Material != "":
		if m, ok := d.mats.lookup(raw.Domain.Material); ok {
			d.m.Background = m.Name
		}
	}
	d.p.Background = eps
	return nil
}

// material looks a material up by name and notes its use.
func (d *decoder) material(key, name string) (Material, error) {
	m, ok := d.mats.lookup(name)
	if !ok {
		return Material{}, d.errAt(key, "unknown material %q; define it under [materials] (for example %q = 2.5) or use one of: %s", name, name, d.mats.names())
	}
	if !d.used[m.Name] {
		d.used[m.Name] = true
		d.m.Materials = append(d.m.Materials, m)
	}
	return m, nil
}

// permittivity reads the material and eps_r keys of table, of which at most
// one may be given (exactly one when required). It returns 0 when neither
// is given, and the material name when a material was named.
func (d *decoder) permittivity(table, material string, epsR float64, required bool) (float64, string, error) {
	hasM, hasE := d.ix.has(join(table, "material")), d.ix.has(join(table, "eps_r"))
	switch {
	case hasM && hasE:
		return 0, "", d.errAt(join(table, "eps_r"), "give either material or eps_r, not both")
	case hasM:
		m, err := d.material(join(table, "material"), material)
		if err != nil {
			return 0, "", err
		}
		return m.EpsR, m.Name, nil
	case hasE:
		if !(epsR > 0) || math.IsInf(epsR, 0) {
			return 0, "", d.errAt(join(table, "eps_r"), "the relative permittivity eps_r must be a finite number > 0, got %g", epsR)
		}
		return epsR, "", nil
	case required:
		return 0, "", d.missing(table, "material", `the dielectric's material by name (for example material = "PTFE"), or its relative permittivity as eps_r = 2.1`)
	}
	return 0, "", nil
}

// conductors reads [[conductor]].
func (d *decoder) conductors(raw *rawFile) error {
	seen := map[string]string{}
	for i, c := range raw.Conductors {
		key := item("conductor", i)
		if !d.ix.has(join(key, "name")) || strings.TrimSpace(c.Name) == "" {
			return d.missing(key, "name", "every conductor needs a name, which regions and boundary sides refer to")
		}
		if prev, ok := seen[c.Name]; ok {
			return d.errAt(join(key, "name"), "conductor %q is defined twice (first at %s); give each conductor its own name", c.Name, d.lineOf(prev))
		}
		seen[c.Name] = key
		bcC := bc.Conductor{Name: c.Name, Floating: c.Floating}
		hasV, hasQ := d.ix.has(join(key, "potential")), d.ix.has(join(key, "charge"))
		if c.Floating {
			if hasV {
				return d.errAt(join(key, "potential"), "conductor %q is floating, so its potential follows from its charge; remove potential or floating", c.Name)
			}
			if !finite(c.Charge) {
				return d.errAt(join(key, "charge"), "the charge of conductor %q must be a finite number", c.Name)
			}
			bcC.Charge = c.Charge
		} else {
			if hasQ {
				return d.errAt(join(key, "charge"), "conductor %q has a fixed potential, so its charge is a result; give charge only with floating = true", c.Name)
			}
			if !hasV {
				return d.missing(key, "potential", fmt.Sprintf("the potential of conductor %q in %s, or floating = true for a conductor whose charge is given", c.Name, d.vunit.Name))
			}
			if !finite(c.Potential) {
				return d.errAt(join(key, "potential"), "the potential of conductor %q must be a finite number", c.Name)
			}
			bcC.Potential = c.Potential * d.vunit.Scale
		}
		d.p.Conductors = append(d.p.Conductors, bcC)
		d.m.conductorKeys = append(d.m.conductorKeys, key)
	}
	return nil
}

// regions reads [[region]].
func (d *decoder) regions(raw *rawFile) error {
	names := map[string]string{}
	for i := range raw.Regions {
		r := &raw.Regions[i]
		key := item("region", i)
		if r.Name != "" {
			if prev, ok := names[r.Name]; ok {
				return d.errAt(join(key, "name"), "region name %q is used twice (first at %s); region names must be unique", r.Name, d.lineOf(prev))
			}
			names[r.Name] = key
		}
		if !d.ix.has(join(key, "kind")) {
			return d.missing(key, "kind", `what the region is: "conductor", "dielectric" or "charge"`)
		}
		reg := bc.Region{Name: r.Name}
		matName := ""
		switch r.Kind {
		case "conductor":
			reg.Kind = bc.ConductorRegion
			if err := d.absent(key, "a conductor region", "material", "eps_r", "charge_density"); err != nil {
				return err
			}
			if !d.ix.has(join(key, "conductor")) {
				return d.missing(key, "conductor", "the name of the [[conductor]] this region belongs to")
			}
			if d.p.ConductorIndex(r.Conductor) < 0 {
				return d.errAt(join(key, "conductor"), "unknown conductor %q; define it with [[conductor]] name = %q%s", r.Conductor, r.Conductor, d.conductorList())
			}
			reg.Conductor = r.Conductor
		case "dielectric":
			reg.Kind = bc.Dielectric
			if err := d.absent(key, "a dielectric region", "conductor", "charge_density"); err != nil {
				return err
			}
			eps, name, err := d.permittivity(key, r.Material, r.EpsR, true)
			if err != nil {
				return err
			}
			reg.EpsR, matName = eps, name
		case "charge":
			reg.Kind = bc.Charge
			if err := d.absent(key, "a charge region", "conductor"); err != nil {
				return err
			}
			if !d.ix.has(join(key, "charge_density")) {
				return d.missing(key, "charge_density", "the free-charge density in C/m³")
			}
			if !finite(r.ChargeDensity) {
				return d.errAt(join(key, "charge_density"), "the charge density must be a finite number in C/m³")
			}
			eps, name, err := d.permittivity(key, r.Material, r.EpsR, false)
			if err != nil {
				return err
			}
			reg.Rho, reg.EpsR, matName = r.ChargeDensity, eps, name
		default:
			return d.schemaAt(join(key, "kind"), `unknown region kind %q; use "conductor", "dielectric" or "charge"`, r.Kind)
		}
		shape, err := d.shape(key, r)
		if err != nil {
			return err
		}
		reg.Shape = shape
		if err := d.placed(key, shape); err != nil {
			return err
		}
		d.p.Regions = append(d.p.Regions, reg)
		d.m.regionKeys = append(d.m.regionKeys, key)
		d.m.RegionMaterial = append(d.m.RegionMaterial, matName)
	}
	return nil
}

// absent fails if any of keys is given in table.
func (d *decoder) absent(table, what string, keys ...string) error {
	for _, k := range keys {
		if d.ix.has(join(table, k)) {
			return d.schemaAt(join(table, k), "%s takes no %s; remove it or change the region's kind", what, k)
		}
	}
	return nil
}

var shapeKeys = []string{"rect", "circle", "ellipse", "annulus", "polygon", "strip"}

// shape reads the one shape of a region.
func (d *decoder) shape(key string, r *rawRegion) (bc.Shape, error) {
	var given []string
	for _, s := range shapeKeys {
		if d.ix.has(join(key, s)) {
			given = append(given, s)
		}
	}
	if len(given) == 0 {
		return nil, d.missing(key, "circle", "a region needs one shape: rect, circle, ellipse, annulus, polygon or strip")
	}
	if len(given) > 1 {
		return nil, d.schemaAt(join(key, given[1]), "a region has one shape, but this one has both %s and %s; split it into two regions", given[0], given[1])
	}
	sk := join(key, given[0])
	need := func(k, what string) error {
		if !d.ix.has(join(sk, k)) {
			return d.missing(sk, k, what)
		}
		return nil
	}
	u := d.lunit.Name
	switch given[0] {
	case "rect":
		s := r.Rect
		if err := need("x", "the extent [x0, x1] in "+u); err != nil {
			return nil, err
		}
		if err := need("y", "the extent [y0, y1] in "+u); err != nil {
			return nil, err
		}
		x0, x1, err := d.interval(join(sk, "x"), s.X)
		if err != nil {
			return nil, err
		}
		y0, y1, err := d.interval(join(sk, "y"), s.Y)
		if err != nil {
			return nil, err
		}
		if x0 > x1 {
			return nil, d.errAt(join(sk, "x"), "a rect needs x0 ≤ x1, got [%g, %g] %s", s.X[0], s.X[1], u)
		}
		if y0 > y1 {
			return nil, d.errAt(join(sk, "y"), "a rect needs y0 ≤ y1, got [%g, %g] %s", s.Y[0], s.Y[1], u)
		}
		return bc.Rect{X0: x0, Y0: y0, X1: x1, Y1: y1}, nil
	case "circle":
		s := r.Circle
		if err := need("center", "the centre [x, y] in "+u); err != nil {
			return nil, err
		}
		if err := need("radius", "the radius in "+u); err != nil {
			return nil, err
		}
		x, y, err := d.point(join(sk, "center"), s.Center)
		if err != nil {
			return nil, err
		}
		if !(s.Radius > 0) || math.IsInf(s.Radius, 0) {
			return nil, d.errAt(join(sk, "radius"), "the radius must be a finite number > 0, got %g %s", s.Radius, u)
		}
		return bc.Circle{X: x, Y: y, R: s.Radius * d.lunit.Scale}, nil
	case "ellipse":
		s := r.Ellipse
		if err := need("center", "the centre [x, y] in "+u); err != nil {
			return nil, err
		}
		if err := need("semi_axes", "the semi-axes [a, b] in "+u+", a along x and b along y"); err != nil {
			return nil, err
		}
		x, y, err := d.point(join(sk, "center"), s.Center)
		if err != nil {
			return nil, err
		}
		ak := join(sk, "semi_axes")
		if len(s.SemiAxes) != 2 {
			return nil, d.schemaAt(ak, "expected the semi-axes [a, b] as two numbers in %s (a along x, b along y), got %d numbers", u, len(s.SemiAxes))
		}
		a, b := s.SemiAxes[0], s.SemiAxes[1]
		if !(a > 0) || !(b > 0) || math.IsInf(a, 0) || math.IsInf(b, 0) {
			return nil, d.errAt(ak, "the semi-axes [a, b] must be finite numbers > 0 (half the width along x and half the height along y), got [%g, %g] %s", a, b, u)
		}
		return bc.Ellipse{X: x, Y: y, A: a * d.lunit.Scale, B: b * d.lunit.Scale}, nil
	case "annulus":
		s := r.Annulus
		if err := need("center", "the centre [x, y] in "+u); err != nil {
			return nil, err
		}
		if err := need("inner_radius", "the inner radius in "+u+" (0 for a full disk)"); err != nil {
			return nil, err
		}
		if err := need("outer_radius", "the outer radius in "+u); err != nil {
			return nil, err
		}
		x, y, err := d.point(join(sk, "center"), s.Center)
		if err != nil {
			return nil, err
		}
		if !(s.InnerRadius >= 0) || math.IsInf(s.InnerRadius, 0) {
			return nil, d.errAt(join(sk, "inner_radius"), "the inner radius must be a finite number ≥ 0, got %g %s", s.InnerRadius, u)
		}
		if !(s.OuterRadius > s.InnerRadius) || math.IsInf(s.OuterRadius, 0) {
			return nil, d.errAt(join(sk, "outer_radius"), "the outer radius must be finite and larger than the inner radius %g %s, got %g %s", s.InnerRadius, u, s.OuterRadius, u)
		}
		return bc.Annulus{X: x, Y: y, R0: s.InnerRadius * d.lunit.Scale, R1: s.OuterRadius * d.lunit.Scale}, nil
	case "polygon":
		s := r.Polygon
		if err := need("points", "the vertices [[x, y], ...] in order, in "+u); err != nil {
			return nil, err
		}
		pk := join(sk, "points")
		if len(s.Points) < 3 {
			return nil, d.errAt(pk, "a polygon needs at least 3 vertices, got %d", len(s.Points))
		}
		poly := bc.Polygon{X: make([]float64, len(s.Points)), Y: make([]float64, len(s.Points))}
		for n, pt := range s.Points {
			x, y, err := d.point(pk+"["+strconv.Itoa(n+1)+"]", pt)
			if err != nil {
				return nil, err
			}
			poly.X[n], poly.Y[n] = x, y
		}
		if err := poly.Validate(); err != nil {
			return nil, d.errAt(pk, "%v (vertices count from 0 in file order)", err)
		}
		return poly, nil
	case "strip":
		s := r.Strip
		if err := need("from", "the start [x, y] of the strip's centre line in "+u); err != nil {
			return nil, err
		}
		if err := need("to", "the end [x, y] of the strip's centre line in "+u); err != nil {
			return nil, err
		}
		x0, y0, err := d.point(join(sk, "from"), s.From)
		if err != nil {
			return nil, err
		}
		x1, y1, err := d.point(join(sk, "to"), s.To)
		if err != nil {
			return nil, err
		}
		if x0 == x1 && y0 == y1 {
			return nil, d.errAt(join(sk, "to"), "a strip needs two different end points, got (%g, %g) %s twice", s.From[0], s.From[1], u)
		}
		if !(s.Thickness >= 0) || math.IsInf(s.Thickness, 0) {
			return nil, d.errAt(join(sk, "thickness"), "the thickness must be a finite number ≥ 0, got %g %s", s.Thickness, u)
		}
		return bc.Strip{X0: x0, Y0: y0, X1: x1, Y1: y1, Thickness: s.Thickness * d.lunit.Scale}, nil
	}
	return nil, d.schemaAt(sk, "unknown shape") // not reached: shapeKeys is exhaustive
}

// placed checks a shape against the domain.
func (d *decoder) placed(key string, s bc.Shape) error {
	x0, y0, x1, y1 := s.Bounds()
	dom := d.p.Domain
	if d.p.Metric == grid.Axisymmetric {
		// The rule of bc.Problem.Validate: a circle, ellipse or annulus
		// needs its centre at r ≥ 0 (centred on the axis it is a sphere,
		// a spheroid or a spherical shell), a strip its centre line, any
		// other shape all of itself.
		tol := -1e-12 * (dom.X1 - dom.X0)
		switch c := s.(type) {
		case bc.Circle, bc.Ellipse, bc.Annulus:
			var cx float64
			switch c := c.(type) {
			case bc.Circle:
				cx = c.X
			case bc.Ellipse:
				cx = c.X
			case bc.Annulus:
				cx = c.X
			}
			if cx < tol {
				return d.errAt(key, "the shape is centred at r = %s < 0; in an axisymmetric model x is the radius, so a circle, ellipse or annulus must be centred at r ≥ 0 (on the axis it is a sphere or a spheroid)", d.length(cx))
			}
		case bc.Strip:
			if r0 := math.Min(c.X0, c.X1); r0 < tol {
				return d.errAt(key, "the strip reaches r = %s < 0; in an axisymmetric model x is the radius, so its centre line must lie at r ≥ 0", d.length(r0))
			}
		default:
			if x0 < tol {
				return d.errAt(key, "the shape reaches r = %s < 0; in an axisymmetric model x is the radius, so the shape must lie at r ≥ 0: draw only the half at r ≥ 0", d.length(x0))
			}
		}
	}
	if x1 < dom.X0 || x0 > dom.X1 || y1 < dom.Y0 || y0 > dom.Y1 {
		return d.errAt(key, "the shape, spanning [%g, %g] × [%g, %g] %s, lies entirely outside the domain [%g, %g] × [%g, %g] %s",
			x0/d.lunit.Scale, x1/d.lunit.Scale, y0/d.lunit.Scale, y1/d.lunit.Scale, d.lunit.Name,
			dom.X0/d.lunit.Scale, dom.X1/d.lunit.Scale, dom.Y0/d.lunit.Scale, dom.Y1/d.lunit.Scale, d.lunit.Name)
	}
	return nil
}

// pointCharges reads [[line_charge]] and [[ring_charge]].
func (d *decoder) pointCharges(raw *rawFile) error {
	axi := d.p.Metric == grid.Axisymmetric
	if axi && len(raw.LineCharges) > 0 {
		return d.errAt(item("line_charge", 0), "an axisymmetric model has ring charges, not line charges; write [[ring_charge]] with the total charge in C")
	}
	if !axi && len(raw.RingCharges) > 0 {
		return d.errAt(item("ring_charge", 0), "a planar model has line charges, not ring charges; write [[line_charge]] with the charge per length in C/m")
	}
	table, list, unit := "line_charge", raw.LineCharges, "C/m"
	if axi {
		table, list, unit = "ring_charge", raw.RingCharges, "C"
	}
	names := map[string]string{}
	for i, q := range list {
		key := item(table, i)
		if q.Name != "" {
			if prev, ok := names[q.Name]; ok {
				return d.errAt(join(key, "name"), "charge name %q is used twice (first at %s)", q.Name, d.lineOf(prev))
			}
			names[q.Name] = key
		}
		if !d.ix.has(join(key, "at")) {
			return d.missing(key, "at", "the position [x, y] in "+d.lunit.Name)
		}
		if !d.ix.has(join(key, "charge")) {
			return d.missing(key, "charge", "the charge in "+unit)
		}
		x, y, err := d.inside(join(key, "at"), q.At)
		if err != nil {
			return err
		}
		if !finite(q.Charge) {
			return d.errAt(join(key, "charge"), "the charge must be a finite number in %s", unit)
		}
		d.p.Charges = append(d.p.Charges, bc.PointCharge{Name: q.Name, X: x, Y: y, Q: q.Charge})
	}
	return nil
}

// boundary reads [boundary].
func (d *decoder) boundary(raw *rawFile) error {
	sides := [4]*rawSide{raw.Boundary.Left, raw.Boundary.Right, raw.Boundary.Bottom, raw.Boundary.Top}
	for s, side := range sides {
		key := "boundary." + bc.SideNames[s]
		if side == nil || !d.ix.has(key) {
			continue
		}
		if !d.ix.has(join(key, "kind")) {
			return d.missing(key, "kind", `"zero-flux" (∂φ/∂n = 0: a symmetry plane or insulating wall), "fixed" (with potential or conductor) or "open" (unbounded space, φ = 0 at infinity)`)
		}
		hasV, hasC := d.ix.has(join(key, "potential")), d.ix.has(join(key, "conductor"))
		onAxis := d.p.Metric == grid.Axisymmetric && s == bc.Left && d.p.Domain.X0 == 0
		switch side.Kind {
		case "zero-flux", "open":
			if hasV || hasC {
				k := "potential"
				if hasC {
					k = "conductor"
				}
				article := "a"
				if side.Kind == "open" {
					article = "an"
				}
				return d.schemaAt(join(key, k), `%s %s side takes no %s; use kind = "fixed" to hold the side at a potential`, article, side.Kind, k)
			}
			if side.Kind == "open" {
				if onAxis {
					return d.errAt(key, `the left side is the axis r = 0, which cannot be open: no space lies beyond it, only the body's other half; make it kind = "zero-flux" or leave it out`)
				}
				d.p.Sides[s] = bc.Side{Kind: bc.Open}
			}
		case "fixed":
			if onAxis {
				return d.errAt(key, `the left side is the axis r = 0, where no condition can be imposed; make it kind = "zero-flux" or leave it out`)
			}
			switch {
			case hasV && hasC:
				return d.schemaAt(join(key, "conductor"), "a fixed side takes either potential or conductor, not both")
			case hasC:
				if d.p.ConductorIndex(side.Conductor) < 0 {
					return d.errAt(join(key, "conductor"), "unknown conductor %q; define it with [[conductor]]%s", side.Conductor, d.conductorList())
				}
				d.p.Sides[s] = bc.Side{Kind: bc.Fixed, Conductor: side.Conductor}
			case hasV:
				if !finite(side.Potential) {
					return d.errAt(join(key, "potential"), "the potential must be a finite number in %s", d.vunit.Name)
				}
				d.p.Sides[s] = bc.Side{Kind: bc.Fixed, Potential: side.Potential * d.vunit.Scale}
			default:
				return d.missing(key, "potential", "a fixed side needs its potential in "+d.vunit.Name+", or the name of the conductor it belongs to as conductor = \"...\"")
			}
		default:
			return d.schemaAt(join(key, "kind"), `unknown boundary kind %q; use "zero-flux", "fixed" or "open"`, side.Kind)
		}
	}
	return d.far(raw.Boundary.Far)
}

// MaxDecay and MaxExtend bound [boundary] far.decay and far.extend. A
// decay beyond a few is a high multipole that no open side needs, and an
// extension beyond some hundreds gains nothing, as the error of the open
// condition then lies far below that of the grid.
const (
	MaxDecay  = 10
	MaxExtend = 1000
)

// far reads [boundary] far, after the sides.
func (d *decoder) far(f *rawFar) error {
	d.extend = 1
	const key = "boundary.far"
	if f == nil || !d.ix.has(key) {
		return nil
	}
	open := false
	for _, s := range d.p.Sides {
		open = open || s.Kind == bc.Open
	}
	if !open {
		return d.errAt(key, `far describes the far field that open sides assume, but no side is open; make a side kind = "open" or remove far`)
	}
	ff := d.p.DefaultFar()
	given := false
	if d.ix.has(join(key, "center")) {
		x, y, err := d.point(join(key, "center"), f.Center)
		if err != nil {
			return err
		}
		axi := d.p.Metric == grid.Axisymmetric
		if axi && x != 0 {
			return d.errAt(join(key, "center"), "in an axisymmetric model the far-field centre lies on the axis, but it is at r = %s; give center = [0, z]", d.length(x))
		}
		// On the axis the centre may lie short of a domain that starts at
		// r > 0; otherwise it belongs in the domain, at the middle of the
		// geometry or on a symmetry plane (a side).
		if dom := d.m.Domain; y < dom.Y0 || y > dom.Y1 || !axi && (x < dom.X0 || x > dom.X1) {
			sc := d.lunit.Scale
			return d.errAt(join(key, "center"), "the far-field centre (%g, %g) %s lies outside the domain [%g, %g] × [%g, %g] %s; put it at the middle of the geometry, or on the symmetry plane the geometry is mirrored across",
				f.Center[0], f.Center[1], d.lunit.Name, dom.X0/sc, dom.X1/sc, dom.Y0/sc, dom.Y1/sc, d.lunit.Name)
		}
		ff.X, ff.Y, given = x, y, true
	}
	if d.ix.has(join(key, "decay")) {
		if !(f.Decay > 0 && f.Decay <= MaxDecay) {
			return d.errAt(join(key, "decay"), "decay is the power n of φ ∝ R⁻ⁿ far away and must lie in (0, %d], got %g: 1 for a body of revolution with net charge or a planar system without, 2 for a body of revolution without net charge", MaxDecay, f.Decay)
		}
		ff.Decay, given = f.Decay, true
	}
	if given {
		d.p.Far = &ff
	}
	if d.ix.has(join(key, "extend")) {
		if !(f.Extend >= 1 && f.Extend <= MaxExtend) {
			return d.errAt(join(key, "extend"), "extend moves the open sides that many times farther from the far-field centre and must lie in [1, %d] (1 leaves them in place; 5 to 20 suits most models), got %g", MaxExtend, f.Extend)
		}
		d.extend = f.Extend
	}
	return nil
}

// extendOpen moves the open sides outward by [boundary] far.extend, once
// everything else is read: the model's problem becomes that of
// bc.ExtendOpen, with the file's domain kept in Model.Domain.
func (d *decoder) extendOpen(*rawFile) error {
	if d.extend == 1 {
		return nil
	}
	q, err := bc.ExtendOpen(d.p, d.extend)
	if err != nil {
		e := d.errAt("boundary.far.extend", "cannot extend the open sides: %v", err)
		e.Err = fmt.Errorf("%w: %w", ErrInvalid, err)
		return e
	}
	d.p, d.m.Problem = q, q
	return nil
}

// references checks that every conductor is used and that something has a
// fixed potential.
func (d *decoder) references(*rawFile) error {
	used := make([]bool, len(d.p.Conductors))
	for _, r := range d.p.Regions {
		if r.Kind == bc.ConductorRegion {
			used[d.p.ConductorIndex(r.Conductor)] = true
		}
	}
	fixed := false
	for _, s := range d.p.Sides {
		if s.Kind == bc.Open {
			fixed = true // zero at infinity
		}
		if s.Kind != bc.Fixed {
			continue
		}
		if s.Conductor != "" {
			used[d.p.ConductorIndex(s.Conductor)] = true
		} else {
			fixed = true
		}
	}
	for k, c := range d.p.Conductors {
		if !used[k] {
			return d.errAt(d.m.conductorKeys[k], `conductor %q has no region and no boundary side; give it a [[region]] with kind = "conductor", conductor = %q, or remove it`, c.Name, c.Name)
		}
		if !c.Floating {
			fixed = true
		}
	}
	if !fixed {
		return &Error{File: d.name, Err: ErrInvalid,
			Msg: "nothing has a fixed potential, so the potential is undetermined; give a conductor a potential or make a [boundary] side kind = \"fixed\" (or \"open\", zero at infinity)"}
	}
	return nil
}

// grid reads [grid] and checks the grid it gives against the node cap and
// the machine's memory.
func (d *decoder) grid(raw *rawFile) error {
	g := raw.Grid
	dom := d.m.Domain // as written: an extended far region does not coarsen the default
	mesh := bc.Mesh{Cell: math.Max(dom.X1-dom.X0, dom.Y1-dom.Y0) / DefaultCells, Refine: 4, Ratio: 1.2, Gap: 4, Corner: 2, MaxNodes: bc.DefaultMaxNodes}
	if d.ix.has("grid.cell") {
		if !(g.Cell > 0) || math.IsInf(g.Cell, 0) {
			return d.errAt("grid.cell", "the target cell size must be a finite number > 0, got %g %s", g.Cell, d.lunit.Name)
		}
		mesh.Cell = g.Cell * d.lunit.Scale
	}
	if d.ix.has("grid.refine") {
		if !(g.Refine >= 1) || g.Refine > 1e6 {
			return d.errAt("grid.refine", "refine divides the cell size near edges and must be ≥ 1 (1 gives a uniform grid), got %g", g.Refine)
		}
		mesh.Refine = g.Refine
	}
	if d.ix.has("grid.ratio") {
		if !(g.Ratio > 1) || g.Ratio > 2 {
			return d.errAt("grid.ratio", "ratio bounds the growth of neighbouring cells and must lie in (1, 2], got %g", g.Ratio)
		}
		mesh.Ratio = g.Ratio
	}
	if d.ix.has("grid.gap") {
		if g.Gap != math.Trunc(g.Gap) || !(g.Gap >= 1 && g.Gap <= 1000) {
			return d.errAt("grid.gap", "gap is the smallest number of cells across a thin gap and must be a whole number from 1 to 1000, got %g", g.Gap)
		}
		mesh.Gap = int(g.Gap)
	}
	if d.ix.has("grid.corner") {
		if !(g.Corner >= 1) || g.Corner > 1e6 {
			return d.errAt("grid.corner", "corner divides the cell size once more at conductor corners and strip ends and must be ≥ 1 (1 turns it off), got %g", g.Corner)
		}
		mesh.Corner = g.Corner
	}
	if d.ix.has("grid.max_nodes") {
		n, err := d.whole("grid.max_nodes", g.MaxNodes, 4, math.MaxInt32)
		if err != nil {
			return err
		}
		mesh.MaxNodes = n
	}
	d.m.Mesh = mesh
	key := "grid"
	if d.ix.has("grid.cell") {
		key = "grid.cell"
	}
	if est := bc.EstimateNodes(d.p, mesh); !(est <= float64(mesh.MaxNodes)) {
		e := d.errAt(key, "the grid would need about %.3g nodes (cell %s, refine %g, ratio %g), more than the cap of %d nodes; make [grid] cell larger, refine smaller or ratio larger",
			est, d.length(mesh.Cell), mesh.Refine, mesh.Ratio, mesh.MaxNodes)
		need := math.Ceil(est * 1.1)
		switch total := memTotal(); {
		case need > math.MaxInt32:
			e.Msg += fmt.Sprintf("; raising the cap with [grid] max_nodes will not help, as it cannot exceed %d", math.MaxInt32)
		case total > 0 && need*BytesPerNode > float64(total):
			e.Msg += fmt.Sprintf("; raising the cap with [grid] max_nodes = %.0f would need about %s of memory, more than the %s this machine has",
				need, bytesString(need*BytesPerNode), bytesString(float64(total)))
		default:
			e.Msg += fmt.Sprintf(", or raise the cap with [grid] max_nodes = %.0f (about %s of memory)", need, bytesString(need*BytesPerNode))
		}
		e.Err = fmt.Errorf("%w: %w", ErrInvalid, bc.ErrTooLarge)
		return e
	}
	gr, err := bc.AutoGrid(d.p, mesh)
	if err != nil {
		e := d.errAt(key, "cannot build the grid: %v", err)
		e.Err = fmt.Errorf("%w: %w", ErrInvalid, err)
		return e
	}
	n := gr.Len()
	if total := memTotal(); total > 0 && float64(n)*BytesPerNode > float64(total) {
		return d.errAt(key, "the grid has %d × %d = %d nodes and needs about %s of memory (%d bytes per node), more than the %s this machine has; make [grid] cell larger or refine smaller",
			gr.Nx(), gr.Ny(), n, bytesString(float64(n)*BytesPerNode), BytesPerNode, bytesString(float64(total)))
	}
	return nil
}

// solver reads [solver].
func (d *decoder) solver(raw *rawFile) error {
	s := raw.Solver
	d.m.Solver = Solver{Method: "mg-pcg", Tol: DefaultTol}
	if d.ix.has("solver.method") {
		switch s.Method {
		case "mg-pcg", "mg", "cg", "sor":
			d.m.Solver.Method = s.Method
		default:
			return d.schemaAt("solver.method", `unknown solver %q; use "mg-pcg" (multigrid-preconditioned conjugate gradients, the default), "mg" (multigrid cycles), "cg" or "sor"`, s.Method)
		}
	}
	if d.ix.has("solver.tolerance") {
		if !(s.Tolerance > 0 && s.Tolerance < 1) {
			return d.errAt("solver.tolerance", "the tolerance is a relative residual and must lie in (0, 1), got %g", s.Tolerance)
		}
		d.m.Solver.Tol = s.Tolerance
	}
	if d.ix.has("solver.max_iterations") {
		n, err := d.whole("solver.max_iterations", s.MaxIterations, 1, 1e9)
		if err != nil {
			return err
		}
		d.m.Solver.MaxIter = n
	}
	return nil
}

// outputs reads [output].
func (d *decoder) outputs(raw *rawFile) error {
	o := raw.Output
	out := Outputs{Dir: o.Directory, Report: true, CSV: o.CSV, NPY: o.NPY, VTK: o.VTK, Archive: o.Archive}
	if d.ix.has("output.report") {
		out.Report = o.Report
	}
	files := map[string]string{}
	for i, p := range o.Pictures {
		key := item("output.picture", i)
		pic, err := d.picture(key, p)
		if err != nil {
			return err
		}
		f := strings.ToLower(pic.File)
		if prev, ok := files[f]; ok {
			return d.errAt(key, "picture file %q is also written by the picture at %s; give each picture its own file", pic.File, d.lineOf(prev))
		}
		files[f] = key
		out.Pictures = append(out.Pictures, pic)
	}
	names := map[string]string{}
	unique := func(key, name string) error {
		if prev, ok := names[name]; ok {
			return d.errAt(join(key, "name"), "name %q is used twice (first at %s); probes and cuts need distinct names", name, d.lineOf(prev))
		}
		names[name] = key
		return nil
	}
	for i, p := range o.Probes {
		key := item("output.probe", i)
		if !d.ix.has(join(key, "at")) {
			return d.missing(key, "at", "the probe's position [x, y] in "+d.lunit.Name)
		}
		x, y, err := d.inside(join(key, "at"), p.At)
		if err != nil {
			return err
		}
		name := p.Name
		if name == "" {
			name = "probe" + strconv.Itoa(i+1)
		}
		if err := unique(key, name); err != nil {
			return err
		}
		out.Probes = append(out.Probes, Probe{Name: name, X: x, Y: y})
	}
	for i, c := range o.Cuts {
		key := item("output.cut", i)
		for _, k := range []string{"from", "to"} {
			if !d.ix.has(join(key, k)) {
				return d.missing(key, k, "the cut's "+map[string]string{"from": "start", "to": "end"}[k]+" point [x, y] in "+d.lunit.Name)
			}
		}
		x0, y0, err := d.inside(join(key, "from"), c.From)
		if err != nil {
			return err
		}
		x1, y1, err := d.inside(join(key, "to"), c.To)
		if err != nil {
			return err
		}
		if x0 == x1 && y0 == y1 {
			return d.errAt(join(key, "to"), "a cut needs two different end points")
		}
		n := 101
		if d.ix.has(join(key, "samples")) {
			if n, err = d.whole(join(key, "samples"), c.Samples, 2, 1e6); err != nil {
				return err
			}
		}
		name := c.Name
		if name == "" {
			name = "cut" + strconv.Itoa(i+1)
		}
		if err := unique(key, name); err != nil {
			return err
		}
		out.Cuts = append(out.Cuts, Cut{Name: name, X0: x0, Y0: y0, X1: x1, Y1: y1, Samples: n})
	}
	d.m.Outputs = out
	return nil
}

// picture reads one [[output.picture]].
func (d *decoder) picture(key string, p rawPicture) (Picture, error) {
	if !d.ix.has(join(key, "kind")) {
		return Picture{}, d.missing(key, "kind", `what to draw: "potential", "field", "arrows" or "field-lines"`)
	}
	pic := Picture{Kind: p.Kind, Contours: 10}
	var only []string // keys that belong to other kinds
	switch p.Kind {
	case PotentialMap:
		only = []string{"arrow_length", "lines", "log_scale"}
	case FieldMap:
		only = []string{"arrow_length", "lines"}
	case FieldArrows:
		pic.ArrowLength = ArrowsScaled
		only = []string{"lines"}
	case FieldLines:
		pic.Lines = 24
		only = []string{"arrow_length", "log_scale"}
	default:
		return Picture{}, d.schemaAt(join(key, "kind"), `unknown picture kind %q; use "potential", "field", "arrows" or "field-lines"`, p.Kind)
	}
	for _, k := range only {
		if d.ix.has(join(key, k)) {
			return Picture{}, d.schemaAt(join(key, k), "%s does not apply to pictures of kind %q", k, p.Kind)
		}
	}
	pic.File = p.Kind + ".png"
	if d.ix.has(join(key, "file")) {
		ext := strings.ToLower(path.Ext(p.File))
		if ext != ".png" && ext != ".svg" {
			return Picture{}, d.errAt(join(key, "file"), "picture file %q needs the extension .png or .svg, which gives its format", p.File)
		}
		if strings.ContainsAny(p.File, `/\`) || strings.HasPrefix(p.File, ".") {
			return Picture{}, d.errAt(join(key, "file"), "picture file %q must be a plain file name; it is written to the output directory", p.File)
		}
		pic.File = p.File
	}
	var err error
	for _, f := range []struct {
		k      string
		v      float64
		lo, hi float64
		dst    *int
	}{
		{"width", p.Width, 0, MaxPictureSize, &pic.Width},
		{"height", p.Height, 0, MaxPictureSize, &pic.Height},
		{"contours", p.Contours, 1, 1000, &pic.Contours},
		{"lines", p.Lines, 1, 10000, &pic.Lines},
	} {
		if d.ix.has(join(key, f.k)) {
			if *f.dst, err = d.whole(join(key, f.k), f.v, f.lo, f.hi); err != nil {
				return Picture{}, err
			}
		}
	}
	pic.LogScale = p.LogScale
	if d.ix.has(join(key, "arrow_length")) {
		switch p.ArrowLength {
		case ArrowsScaled, ArrowsUniform, ArrowsLog:
			pic.ArrowLength = p.ArrowLength
		default:
			return Picture{}, d.schemaAt(join(key, "arrow_length"), `unknown arrow length mode %q; use "scaled" (length ∝ |E|), "uniform" (one length, colour shows |E|) or "log"`, p.ArrowLength)
		}
	}
	return pic, nil
}

// MaxPictureSize is the largest picture width or height a model may ask
// for, the limit of package io/plot.
const MaxPictureSize = 10000

// interval reads a [lo, hi] pair of lengths.
func (d *decoder) interval(key string, v []float64) (float64, float64, error) {
	if len(v) != 2 {
		return 0, 0, d.schemaAt(key, "expected two numbers [lo, hi] in %s, got %d", d.lunit.Name, len(v))
	}
	if !finite(v...) {
		return 0, 0, d.errAt(key, "the values must be finite numbers")
	}
	return v[0] * d.lunit.Scale, v[1] * d.lunit.Scale, nil
}

// point reads an [x, y] pair of lengths.
func (d *decoder) point(key string, v []float64) (float64, float64, error) {
	if len(v) != 2 {
		return 0, 0, d.schemaAt(key, "expected a point [x, y] of two numbers in %s, got %d numbers", d.lunit.Name, len(v))
	}
	if !finite(v...) {
		return 0, 0, d.errAt(key, "the coordinates must be finite numbers")
	}
	return v[0] * d.lunit.Scale, v[1] * d.lunit.Scale, nil
}

// inside reads a point that must lie in the domain.
func (d *decoder) inside(key string, v []float64) (float64, float64, error) {
	x, y, err := d.point(key, v)
	if err != nil {
		return 0, 0, err
	}
	if dom := d.m.Domain; !dom.Contains(x, y) {
		s := d.lunit.Scale
		return 0, 0, d.errAt(key, "the point (%g, %g) %s lies outside the domain [%g, %g] × [%g, %g] %s",
			v[0], v[1], d.lunit.Name, dom.X0/s, dom.X1/s, dom.Y0/s, dom.Y1/s, d.lunit.Name)
	}
	return x, y, nil
}

// whole reads a number that must be a whole number in [lo, hi].
func (d *decoder) whole(key string, v, lo, hi float64) (int, error) {
	if v != math.Trunc(v) || !(v >= lo && v <= hi) {
		return 0, d.errAt(key, "expected a whole number from %.0f to %.0f, got %g", lo, hi, v)
	}
	return int(v), nil
}

// length formats an SI length in the file's unit.
func (d *decoder) length(v float64) string {
	return fmt.Sprintf("%g %s", v/d.lunit.Scale, d.lunit.Name)
}

// potential formats an SI potential in the file's unit.
func (d *decoder) potential(v float64) string {
	return fmt.Sprintf("%g %s", v/d.vunit.Scale, d.vunit.Name)
}

// lineOf names the line of a key for messages that point at two places.
func (d *decoder) lineOf(key string) string {
	if p := d.ix.find(key); p.line > 0 {
		return fmt.Sprintf("%s line %d", key, p.line)
	}
	return key
}

// conductorList suggests the defined conductors.
func (d *decoder) conductorList() string {
	if len(d.p.Conductors) == 0 {
		return "; the model defines no conductors yet"
	}
	var s []string
	for _, c := range d.p.Conductors {
		s = append(s, strconv.Quote(c.Name))
	}
	return "; defined conductors: " + strings.Join(s, ", ")
}

// item returns the key path of entry i (0-based) of an array of tables.
func item(table string, i int) string { return table + "[" + strconv.Itoa(i+1) + "]" }

func finite(v ...float64) bool {
	for _, x := range v {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return false
		}
	}
	return true
}

// bytesString formats a byte count for people.
func bytesString(b float64) string {
	switch {
	case b >= 1<<30:
		return fmt.Sprintf("%.1f GiB", b/(1<<30))
	case b >= 1<<20:
		return fmt.Sprintf("%.1f MiB", b/(1<<20))
	}
	return fmt.Sprintf("%.0f KiB", b/(1<<10))
}
