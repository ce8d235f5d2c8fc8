package archive

import (
	"bytes"
	"encoding/json"
	"fmt"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
)

// The JSON forms of the bc types. Fields carry no omitempty: every value,
// including −0, is written and read back as it is.

type problemJSON struct {
	Metric     string          `json:"metric"`
	Domain     rectJSON        `json:"domain"`
	Background float64         `json:"background"`
	Conductors []conductorJSON `json:"conductors"`
	Regions    []regionJSON    `json:"regions"`
	Charges    []chargeJSON    `json:"charges"`
	Sides      [4]sideJSON     `json:"sides"`
	Far        *farJSON        `json:"far"`
}

type farJSON struct {
	X     float64 `json:"x"`
	Y     float64 `json:"y"`
	Decay float64 `json:"decay"`
}

type conductorJSON struct {
	Name      string  `json:"name"`
	Potential float64 `json:"potential"`
	Floating  bool    `json:"floating"`
	Charge    float64 `json:"charge"`
}

type regionJSON struct {
	Name      string          `json:"name"`
	Kind      string          `json:"kind"`
	Conductor string          `json:"conductor"`
	EpsR      float64         `json:"eps_r"`
	Rho       float64         `json:"rho"`
	Shape     json.RawMessage `json:"shape"`
}

type chargeJSON struct {
	Name string  `json:"name"`
	X    float64 `json:"x"`
	Y    float64 `json:"y"`
	Q    float64 `json:"q"`
}

type sideJSON struct {
	Kind      string  `json:"kind"`
	Conductor string  `json:"conductor"`
	Potential float64 `json:"potential"`
	Func      bool    `json:"func"`
}

type rectJSON struct {
	Type string  `json:"type"`
	X0   float64 `json:"x0"`
	Y0   float64 `json:"y0"`
	X1   float64 `json:"x1"`
	Y1   float64 `json:"y1"`
}

type circleJSON struct {
	Type string  `json:"type"`
	X    float64 `json:"x"`
	Y    float64 `json:"y"`
	R    float64 `json:"r"`
}

type annulusJSON struct {
	Type string  `json:"type"`
	X    float64 `json:"x"`
	Y    float64 `json:"y"`
	R0   float64 `json:"r0"`
	R1   float64 `json:"r1"`
}

type polygonJSON struct {
	Type string    `json:"type"`
	X    []float64 `json:"x"`
	Y    []float64 `json:"y"`
}

type stripJSON struct {
	Type      string  `json:"type"`
	X0        float64 `json:"x0"`
	Y0        float64 `json:"y0"`
	X1        float64 `json:"x1"`
	Y1        float64 `json:"y1"`
	Thickness float64 `json:"thickness"`
}

var metricNames = map[grid.Metric]string{grid.Planar: "planar", grid.Axisymmetric: "axisymmetric"}

func parseMetric(s string) (grid.Metric, error) {
	for m, n := range metricNames {
		if n == s {
			return m, nil
		}
	}
	return 0, fmt.Errorf("unknown metric %q", s)
}

var regionKinds = map[bc.Kind]string{bc.Dielectric: "dielectric", bc.ConductorRegion: "conductor", bc.Charge: "charge"}

var sideKinds = map[bc.SideKind]string{bc.ZeroFlux: "zero-flux", bc.Fixed: "fixed", bc.Open: "open"}

// encodeProblem returns the JSON of p.
func encodeProblem(p *bc.Problem) ([]byte, error) {
	mn, ok := metricNames[p.Metric]
	if !ok {
		return nil, invalidf("the problem has unknown metric %d", int(p.Metric))
	}
	d := p.Domain
	pj := problemJSON{
		Metric:     mn,
		Domain:     rectJSON{"rect", d.X0, d.Y0, d.X1, d.Y1},
		Background: p.Background,
		Conductors: encodeConductors(p.Conductors),
	}
	var err error
	if pj.Regions, err = encodeRegions(p.Regions); err != nil {
		return nil, err
	}
	if p.Charges != nil {
		pj.Charges = make([]chargeJSON, len(p.Charges))
		for i, q := range p.Charges {
			pj.Charges[i] = chargeJSON{q.Name, q.X, q.Y, q.Q}
		}
	}
	if pj.Sides, err = encodeSides(p.Sides); err != nil {
		return nil, err
	}
	if f := p.Far; f != nil {
		pj.Far = &farJSON{f.X, f.Y, f.Decay}
	}
	return marshal(pj)
}

func encodeSides(sides [4]bc.Side) (out [4]sideJSON, err error) {
	for s, sd := range sides {
		kn, ok := sideKinds[sd.Kind]
		if !ok {
			return out, invalidf("the %s side has unknown kind %d", bc.SideNames[s], int(sd.Kind))
		}
		out[s] = sideJSON{Kind: kn, Conductor: sd.Conductor, Potential: sd.Potential, Func: sd.Func != nil}
	}
	return out, nil
}

// decodeSides returns the sides; fn[s] is set for sides whose potential
// was a function, for the caller to restore.
func decodeSides(sj [4]sideJSON) (sides [4]bc.Side, fn [4]bool, err error) {
	for s, sd := range sj {
		kind, ok := bc.SideKind(-1), false
		for k, n := range sideKinds {
			if n == sd.Kind {
				kind, ok = k, true
			}
		}
		if !ok {
			return sides, fn, fmt.Errorf("the %s side has unknown kind %q", bc.SideNames[s], sd.Kind)
		}
		sides[s] = bc.Side{Kind: kind, Conductor: sd.Conductor, Potential: sd.Potential}
		fn[s] = sd.Func
	}
	return sides, fn, nil
}

func marshal(v any) ([]byte, error) {
	b, err := json.Marshal(v)
	if err != nil {
		return nil, invalidf("encoding JSON (is a number infinite or NaN?): %v", err)
	}
	return b, nil
}

func encodeConductors(cs []bc.Conductor) []conductorJSON {
	if cs == nil {
		return nil
	}
	out := make([]conductorJSON, len(cs))
	for i, c := range cs {
		out[i] = conductorJSON{c.Name, c.Potential, c.Floating, c.Charge}
	}
	return out
}

func decodeConductors(cs []conductorJSON) []bc.Conductor {
	if cs == nil {
		return nil
	}
	out := make([]bc.Conductor, len(cs))
	for i, c := range cs {
		out[i] = bc.Conductor{Name: c.Name, Potential: c.Potential, Floating: c.Floating, Charge: c.Charge}
	}
	return out
}

func encodeRegions(rs []bc.Region) ([]regionJSON, error) {
	if rs == nil {
		return nil, nil
	}
	out := make([]regionJSON, len(rs))
	for i, r := range rs {
		kn, ok := regionKinds[r.Kind]
		if !ok {
			return nil, invalidf("region %d has unknown kind %d", i, int(r.Kind))
		}
		sh, err := encodeShape(r.Shape)
		if err != nil {
			return nil, invalidf("region %d: %v", i, err)
		}
		out[i] = regionJSON{Name: r.Name, Kind: kn, Conductor: r.Conductor, EpsR: r.EpsR, Rho: r.Rho, Shape: sh}
	}
	return out, nil
}

func decodeRegions(rs []regionJSON) ([]bc.Region, error) {
	if rs == nil {
		return nil, nil
	}
	out := make([]bc.Region, len(rs))
	for i, r := range rs {
		kind, ok := bc.Kind(-1), false
		for k, n := range regionKinds {
			if n == r.Kind {
				kind, ok = k, true
			}
		}
		if !ok {
			return nil, fmt.Errorf("region %d has unknown kind %q", i, r.Kind)
		}
		sh, err := decodeShape(r.Shape)
		if err != nil {
			return nil, fmt.Errorf("region %d: %v", i, err)
		}
		out[i] = bc.Region{Name: r.Name, Kind: kind, Conductor: r.Conductor, EpsR: r.EpsR, Rho: r.Rho, Shape: sh}
	}
	return out, nil
}

func encodeShape(s bc.Shape) (json.RawMessage, error) {
	var v any
	switch t := s.(type) {
	case bc.Rect:
		v = rectJSON{"rect", t.X0, t.Y0, t.X1, t.Y1}
	case bc.Circle:
		v = circleJSON{"circle", t.X, t.Y, t.R}
	case bc.Annulus:
		v = annulusJSON{"annulus", t.X, t.Y, t.R0, t.R1}
	case bc.Polygon:
		v = polygonJSON{"polygon", t.X, t.Y}
	case bc.Strip:
		v = stripJSON{"strip", t.X0, t.Y0, t.X1, t.Y1, t.Thickness}
	case nil:
		return nil, fmt.Errorf("the region has no shape")
	default:
		return nil, fmt.Errorf("shape type %T cannot be archived; use the shapes of package bc", s)
	}
	b, err := json.Marshal(v)
	if err != nil {
		return nil, fmt.Errorf("encoding the shape (is a number infinite or NaN?): %v", err)
	}
	return b, nil
}

func decodeShape(b json.RawMessage) (bc.Shape, error) {
	var tag struct {
		Type string `json:"type"`
	}
	if err := json.Unmarshal(b, &tag); err != nil {
		return nil, fmt.Errorf("shape: %v", err)
	}
	decode := func(v any) error {
		if err := json.Unmarshal(b, v); err != nil {
			return fmt.Errorf("%s shape: %v", tag.Type, err)
		}
		return nil
	}
	switch tag.Type {
	case "rect":
		var v rectJSON
		if err := decode(&v); err != nil {
			return nil, err
		}
		return bc.Rect{X0: v.X0, Y0: v.Y0, X1: v.X1, Y1: v.Y1}, nil
	case "circle":
		var v circleJSON
		if err := decode(&v); err != nil {
			return nil, err
		}
		return bc.Circle{X: v.X, Y: v.Y, R: v.R}, nil
	case "annulus":
		var v annulusJSON
		if err := decode(&v); err != nil {
			return nil, err
		}
		return bc.Annulus{X: v.X, Y: v.Y, R0: v.R0, R1: v.R1}, nil
	case "polygon":
		var v polygonJSON
		if err := decode(&v); err != nil {
			return nil, err
		}
		return bc.Polygon{X: v.X, Y: v.Y}, nil
	case "strip":
		var v stripJSON
		if err := decode(&v); err != nil {
			return nil, err
		}
		return bc.Strip{X0: v.X0, Y0: v.Y0, X1: v.X1, Y1: v.Y1, Thickness: v.Thickness}, nil
	}
	return nil, fmt.Errorf("unknown shape type %q", tag.Type)
}

// decodeProblem parses the problem section. Sides whose potential was a
// function come back with fn[s] set, for the caller to restore.
func decodeProblem(b []byte) (p *bc.Problem, fn [4]bool, err error) {
	var pj problemJSON
	if err := decodeJSON(b, &pj); err != nil {
		return nil, fn, err
	}
	m, err := parseMetric(pj.Metric)
	if err != nil {
		return nil, fn, err
	}
	if pj.Domain.Type != "rect" {
		return nil, fn, fmt.Errorf("the domain must be a rect, got %q", pj.Domain.Type)
	}
	d := pj.Domain
	p = &bc.Problem{
		Metric:     m,
		Domain:     bc.Rect{X0: d.X0, Y0: d.Y0, X1: d.X1, Y1: d.Y1},
		Background: pj.Background,
		Conductors: decodeConductors(pj.Conductors),
	}
	if p.Regions, err = decodeRegions(pj.Regions); err != nil {
		return nil, fn, err
	}
	if pj.Charges != nil {
		p.Charges = make([]bc.PointCharge, len(pj.Charges))
		for i, q := range pj.Charges {
			p.Charges[i] = bc.PointCharge{Name: q.Name, X: q.X, Y: q.Y, Q: q.Q}
		}
	}
	if p.Sides, fn, err = decodeSides(pj.Sides); err != nil {
		return nil, fn, err
	}
	if f := pj.Far; f != nil {
		p.Far = &bc.FarField{X: f.X, Y: f.Y, Decay: f.Decay}
	}
	return p, fn, nil
}

// decodeJSON decodes one JSON value into v and rejects trailing data.
// Unknown object fields are ignored, so that a later minor version may add
// fields.
func decodeJSON(b []byte, v any) error {
	d := json.NewDecoder(bytes.NewReader(b))
	if err := d.Decode(v); err != nil {
		return err
	}
	if d.More() {
		return fmt.Errorf("data after the JSON value")
	}
	return nil
}

// sideFunc returns a function that interpolates the prescribed node values
// of side s of map m linearly along the side; it reproduces them exactly
// at the nodes.
func sideFunc(m *bc.Map, s int) func(x, y float64) float64 {
	g := m.Grid
	nx, ny := g.Nx(), g.Ny()
	var coord []float64
	var vals []float64
	switch s {
	case bc.Left, bc.Right:
		i := 0
		if s == bc.Right {
			i = nx - 1
		}
		coord = g.Y()
		for j := 0; j < ny; j++ {
			vals = append(vals, m.Value[g.Index(i, j)])
		}
	default:
		j := 0
		if s == bc.Top {
			j = ny - 1
		}
		coord = g.X()
		for i := 0; i < nx; i++ {
			vals = append(vals, m.Value[g.Index(i, j)])
		}
	}
	vertical := s == bc.Left || s == bc.Right
	return func(x, y float64) float64 {
		t := x
		if vertical {
			t = y
		}
		return interp(coord, vals, t)
	}
}

// interp interpolates vals given at the increasing coordinates a linearly
// at t, holding the end values outside.
func interp(a, vals []float64, t float64) float64 {
	n := len(a)
	if !(t > a[0]) {
		return vals[0]
	}
	if t >= a[n-1] {
		return vals[n-1]
	}
	lo, hi := 0, n-1
	for hi-lo > 1 {
		m := (lo + hi) / 2
		if a[m] <= t {
			lo = m
		} else {
			hi = m
		}
	}
	if t == a[lo] {
		return vals[lo]
	}
	s := (t - a[lo]) / (a[hi] - a[lo])
	return vals[lo] + s*(vals[hi]-vals[lo])
}
