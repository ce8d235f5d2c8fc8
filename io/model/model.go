package model

import (
	"bytes"
	"errors"
	"fmt"
	"os"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
)

// Unit is a unit of measure a model file states once and uses throughout.
type Unit struct {
	// Name is the unit as written in the file: "mm", "kV".
	Name string
	// Scale is the size of one unit in SI units (metres or volts):
	// 0.001 for "mm", 1000 for "kV".
	Scale float64
}

// Solver is the solver choice of a model. The command layer maps it onto
// the settings of package solve.
type Solver struct {
	// Method is "mg-pcg" (the default), "mg", "cg" or "sor".
	Method string
	// Tol is the relative-residual tolerance, in (0, 1). Default 1e-10.
	Tol float64
	// MaxIter caps the iterations. Zero means the solver's own default.
	MaxIter int
}

// Picture kinds, the values of Picture.Kind.
const (
	PotentialMap = "potential"   // colour map of φ with equipotentials
	FieldMap     = "field"       // colour map of |E|
	FieldArrows  = "arrows"      // arrows of E on a regular lattice
	FieldLines   = "field-lines" // lines of E traced from conductors
)

// Arrow length modes, the values of Picture.ArrowLength.
const (
	ArrowsScaled  = "scaled"  // length proportional to |E|
	ArrowsUniform = "uniform" // all arrows one length; colour shows |E|
	ArrowsLog     = "log"     // length proportional to log |E| over its range
)

// Picture is one requested picture. The fields follow the options of
// package io/plot.
type Picture struct {
	// Kind is PotentialMap, FieldMap, FieldArrows or FieldLines.
	Kind string
	// File is the output file name; its extension (.png or .svg) gives
	// the format. Default "<kind>.png".
	File string
	// Width and Height are the size in pixels (points in an SVG); zero
	// means automatic.
	Width, Height int
	// Contours is the approximate number of equipotentials drawn (≥ 1).
	// Default 10.
	Contours int
	// LogScale shows |E| on a logarithmic colour scale (FieldMap, and the
	// colours of ArrowsUniform arrows).
	LogScale bool
	// ArrowLength is the arrow length mode of FieldArrows (default
	// ArrowsScaled); empty for other kinds.
	ArrowLength string
	// Lines is the approximate number of field lines of FieldLines
	// (default 24); zero for other kinds.
	Lines int
}

// Probe is a point where the potential and field are reported.
type Probe struct {
	Name string
	// X and Y are the probe's position in metres (r and z in an
	// axisymmetric model).
	X, Y float64
}

// Cut is a straight line along which φ and E are sampled into a table.
type Cut struct {
	Name string
	// X0, Y0 and X1, Y1 are the end points in metres.
	X0, Y0, X1, Y1 float64
	// Samples is the number of evenly spaced points, ends included (≥ 2).
	Samples int
}

// Outputs lists the files a model asks for. The command layer writes them.
type Outputs struct {
	// Dir is the output directory as written in the file, relative to the
	// model file's directory; empty means the command's default.
	Dir string
	// Report asks for the JSON report (default true); CSV for the CSV
	// tables; NPY and VTK for array files; Archive for the compressed
	// archive of the whole solution.
	Report, CSV, NPY, VTK, Archive bool
	Pictures                       []Picture
	Probes                         []Probe
	Cuts                           []Cut
}

// Model is a parsed and validated model file.
type Model struct {
	// Name is the file name given to Parse, or the path given to Load.
	Name string
	// Title and Description are free text from the file.
	Title, Description string
	// Unit is the length unit of the file, for axes and tables in the
	// model's own unit; PotentialUnit the potential unit (V or kV).
	Unit, PotentialUnit Unit
	// Problem is the electrostatic problem in SI units. It has passed
	// bc.Problem.Validate. When [boundary] far gives extend > 1, it is the
	// result of bc.ExtendOpen: its open sides lie farther out than the
	// file's domain, and Problem.Far holds the far field they assume.
	Problem *bc.Problem
	// Domain is the domain as the file gives it, in metres: the region
	// of interest, where probes and cuts lie. It equals Problem.Domain
	// unless open sides were extended, so pictures and tables that show
	// the geometry rather than the far region can be limited to it.
	Domain bc.Rect
	// Mesh controls the automatic grid, in SI units, defaults filled in.
	Mesh bc.Mesh
	// Solver is the solver choice, defaults filled in.
	Solver Solver
	// Outputs lists the requested files, defaults filled in.
	Outputs Outputs
	// Materials lists the materials the model uses (background and
	// dielectric and charge regions), in order of first use.
	Materials []Material
	// Background names the domain's material ("air"), or is empty when
	// the domain gives eps_r directly.
	Background string
	// RegionMaterial[n] names the material of Problem.Regions[n], or is
	// empty when the region gives eps_r directly or sets no permittivity.
	RegionMaterial []string
	// Source is the text of the model file, so an archive can store it.
	Source []byte

	ix            *index
	regionKeys    []string // key path of each region, as Problem.Regions
	conductorKeys []string // key path of each conductor, as Problem.Conductors
}

// Parse parses and validates a model file. name is used in error messages
// (normally the file's path). Every error is an *Error.
func Parse(name string, src []byte) (*Model, error) {
	src = bytes.TrimPrefix(src, []byte("\uFEFF"))
	d := &decoder{name: name, ix: buildIndex(src)}
	raw, err := d.decodeTOML(src)
	if err != nil {
		return nil, err
	}
	m, err := d.model(raw)
	if err != nil {
		return nil, err
	}
	m.Source = append([]byte(nil), src...)
	return m, nil
}

// Load reads, parses and validates the model file at path.
func Load(path string) (*Model, error) {
	src, err := os.ReadFile(path)
	if err != nil {
		return nil, &Error{File: path, Msg: fmt.Sprintf("cannot read the model file: %v", errors.Unwrap(err)), Err: errors.Join(ErrInvalid, err)}
	}
	return Parse(path, src)
}

// Grid builds the model's grid with bc.AutoGrid. Its errors are *Error
// values pointing at the [grid] table.
func (m *Model) Grid() (*grid.Grid, error) {
	g, err := bc.AutoGrid(m.Problem, m.Mesh)
	if err != nil {
		p := pos{}
		if m.ix != nil {
			p = m.ix.find("grid")
		}
		return nil, &Error{File: m.Name, Line: p.line, Column: p.col, Key: "grid", Msg: err.Error(), Err: errors.Join(ErrInvalid, err)}
	}
	return g, nil
}

// Position returns the line and column where key (in the form of
// Error.Key, such as "region[2]" or "output.probe[1].at") is defined in the
// model file, or of its nearest enclosing table; zeros when unknown.
func (m *Model) Position(key string) (line, col int) {
	if m.ix == nil {
		return 0, 0
	}
	p := m.ix.find(key)
	return p.line, p.col
}
