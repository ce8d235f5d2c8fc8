package report

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"time"

	"github.com/phigrid/phigrid/field"
	"github.com/phigrid/phigrid/grid"
	"github.com/phigrid/phigrid/solve"
)

// Format is the value of Report.Format, which marks a JSON document as a
// phigrid report.
const Format = "phigrid-report"

// Version is the major version of the report format this package writes
// and reads.
const Version = 1

// Caution is the safety note every report carries when it shows a field
// strength.
const Caution = "Caution: these field strengths are electrostatic estimates from a numerical model. " +
	"They do not replace testing, the applicable standards and codes, or review by a qualified person; " +
	"the user is responsible for that qualified review."

// MaxCutSamples caps the samples of one line cut.
const MaxCutSamples = 1_000_000

// ErrInvalid is wrapped by every error Build returns because its arguments
// do not fit the solution (a probe outside the domain, a capacitance matrix
// of the wrong size).
var ErrInvalid = errors.New("report: invalid input")

// ErrFormat is wrapped by every error ReadJSON returns for a document that
// is not a readable phigrid report.
var ErrFormat = errors.New("report: not a phigrid report")

// Report is a solve report. Its JSON form is stable: field names change
// only with Version.
type Report struct {
	// Format is always the constant Format; Version the format's major
	// version.
	Format  string `json:"format"`
	Version int    `json:"version"`
	// Title is the model's title; Model the model file's name.
	Title string `json:"title,omitempty"`
	Model string `json:"model,omitempty"`
	Kind  Kind   `json:"kind"`
	Units Units  `json:"units"`
	Grid  Grid   `json:"grid"`
	// Solver sums up every linear solve the solution took.
	Solver     Solver      `json:"solver"`
	Conductors []Conductor `json:"conductors"`
	// Energy is the stored electrostatic energy in Units.Energy.
	Energy float64 `json:"energy"`
	// Regions holds the peak field in every dielectric material, the
	// background first.
	Regions []Peak `json:"regions,omitempty"`
	// Convergence holds the error estimates of a grid-convergence study,
	// when one was run.
	Convergence *Convergence `json:"convergence,omitempty"`
	Probes      []Probe      `json:"probes,omitempty"`
	Cuts        []Cut        `json:"cuts,omitempty"`
	// Caution is the safety note (the constant Caution) whenever the
	// report shows a field strength, and empty otherwise.
	Caution string `json:"caution,omitempty"`
}

// Kind says what the quantities of a report measure.
type Kind struct {
	// Metric is "planar" or "axisymmetric".
	Metric string `json:"metric"`
	// PerMetre is true for a planar cross-section, whose charges,
	// capacitances and energies are per metre of depth.
	PerMetre bool `json:"per_metre"`
}

// Units names the units of a report's numbers.
type Units struct {
	// Length is the model's length unit ("mm") and LengthScale its size in
	// metres (0.001); positions are also given in it.
	Length      string  `json:"length"`
	LengthScale float64 `json:"length_scale_m"`
	// Charge, Capacitance and Energy are "C/m", "F/m" and "J/m" in a
	// planar report and "C", "F" and "J" in an axisymmetric one.
	Charge      string `json:"charge"`
	Capacitance string `json:"capacitance"`
	Energy      string `json:"energy"`
}

// Grid sums up the grid.
type Grid struct {
	Nx    int `json:"nx"`
	Ny    int `json:"ny"`
	Nodes int `json:"nodes"`
	// Free is the number of free nodes (the unknowns).
	Free int `json:"free_nodes"`
	// MinCell and MaxCell are the smallest and largest node spacing in
	// metres.
	MinCell float64 `json:"min_cell_m"`
	MaxCell float64 `json:"max_cell_m"`
	// Snapped counts the nodes moved onto a conductor surface that passed
	// very close to them.
	Snapped int `json:"snapped_nodes"`
}

// Solver sums up the linear solves of a solution.
type Solver struct {
	// Method is the solver's name ("mg-pcg", "cg", "sor").
	Method string `json:"method"`
	// Solves is the number of linear solves (one per conductor for a
	// capacitance matrix, plus the potential); Iterations their total.
	Solves     int `json:"solves"`
	Iterations int `json:"iterations"`
	// Residual is the largest final relative residual of any solve.
	Residual float64 `json:"residual"`
	// Status is "converged" when every solve converged, otherwise the
	// status of the first that did not, and empty when the solution
	// carries no solve statistics (a solution rebuilt from an archive).
	Status string `json:"status"`
	// SetupSeconds and SolveSeconds are the total set-up and iteration
	// times.
	SetupSeconds float64 `json:"setup_s"`
	SolveSeconds float64 `json:"solve_s"`
}

// Conductor is one conductor's line of the report.
type Conductor struct {
	Name string `json:"name"`
	// Potential is in volts; for a floating conductor, the potential its
	// charge gives it.
	Potential float64 `json:"potential_V"`
	Floating  bool    `json:"floating"`
	// Charge is in Units.Charge.
	Charge float64 `json:"charge"`
	// Capacitance is the conductor's row of the Maxwell capacitance matrix
	// in Units.Capacitance, in conductor order; nil when no matrix was
	// computed.
	Capacitance []float64 `json:"capacitance,omitempty"`
	// PeakField is the largest field on the conductor's surface; nil when
	// the conductor has no surface facing a dielectric.
	PeakField *Peak `json:"peak_field,omitempty"`
}

// Position is a point given in metres and in the model's length unit (r
// and z in an axisymmetric problem).
type Position struct {
	XM float64 `json:"x_m"`
	YM float64 `json:"y_m"`
	X  float64 `json:"x"`
	Y  float64 `json:"y"`
}

// Peak is a largest field magnitude and where it occurs.
type Peak struct {
	// Where names the conductor or dielectric material.
	Where string `json:"where"`
	// Field is |E| in V/m.
	Field float64  `json:"field_V_per_m"`
	At    Position `json:"at"`
	// SharpEdge is set when the peak lies at a sharp edge or corner of a
	// conductor (field.Peak.Sharp), where the field is singular: the
	// value grows with refinement and is not a converged figure.
	SharpEdge bool `json:"sharp_edge"`
}

// Convergence is a grid-convergence study: the problem solved on a
// sequence of refined grids, and the error estimate of every quantity.
type Convergence struct {
	// Levels describes the grids, coarsest first.
	Levels []Level `json:"levels"`
	// Estimates holds one entry per quantity.
	Estimates []Estimate `json:"estimates"`
}

// Level is one grid of a convergence study.
type Level struct {
	Nodes int `json:"nodes"`
	Cells int `json:"cells"`
	// H is the representative cell size in metres (the mean spacing).
	H float64 `json:"h_m"`
}

// Estimate is the error estimate of one quantity from a grid-convergence
// study (see field.Estimate for the method).
type Estimate struct {
	// Quantity names the figure: "C(hv,gnd)", "Q(hv)", "W", "Esurf(hv)",
	// "Emax(oil)".
	Quantity string `json:"quantity"`
	// Unit is the SI unit of the values, the extrapolation and the band.
	Unit string `json:"unit"`
	// Value is the figure on the finest grid; Values on every grid,
	// coarsest first.
	Value  float64   `json:"value"`
	Values []float64 `json:"values"`
	// Observed is the observed order of convergence, or nil when the
	// values showed none (two grids, oscillating or not converging).
	Observed *float64 `json:"observed_order"`
	// Order is the order used for the extrapolation and the band.
	Order float64 `json:"order"`
	// Extrapolated is the Richardson estimate of the grid-independent
	// value.
	Extrapolated float64 `json:"extrapolated"`
	// Band is the half-width of the error band about Value: the exact
	// value is estimated to lie in Value ± Band.
	Band float64 `json:"band"`
	// Note explains a widened band ("two levels", "oscillating", "not
	// converging", "peak value").
	Note string `json:"note,omitempty"`
}

// Probe is the potential and field at one requested point.
type Probe struct {
	Name string   `json:"name"`
	At   Position `json:"at"`
	// Potential is in volts; Ex, Ey and E (|E|) in V/m.
	Potential float64 `json:"potential_V"`
	Ex        float64 `json:"ex_V_per_m"`
	Ey        float64 `json:"ey_V_per_m"`
	E         float64 `json:"e_V_per_m"`
}

// Cut is the potential and field sampled along a straight line.
type Cut struct {
	Name    string   `json:"name"`
	From    Position `json:"from"`
	To      Position `json:"to"`
	Samples []Sample `json:"samples"`
}

// Sample is one point of a line cut.
type Sample struct {
	// S is the distance from the start of the cut in metres.
	S  float64  `json:"s_m"`
	At Position `json:"at"`
	// Potential is in volts; Ex, Ey and E (|E|) in V/m.
	Potential float64 `json:"potential_V"`
	Ex        float64 `json:"ex_V_per_m"`
	Ey        float64 `json:"ey_V_per_m"`
	E         float64 `json:"e_V_per_m"`
}

// Unit is a length unit: its name and its size in metres.
type Unit struct {
	Name  string
	Scale float64
}

// Point is a requested probe point, in metres.
type Point struct {
	Name string
	X, Y float64
}

// Line is a requested line cut from (X0, Y0) to (X1, Y1) in metres with
// Samples evenly spaced points, ends included.
type Line struct {
	Name           string
	X0, Y0, X1, Y1 float64
	Samples        int
}

// BuildOptions controls Build. Zero fields mean: no title, no model name,
// lengths in metres, no probes, no cuts and no error estimates.
type BuildOptions struct {
	// Title is the model's title; Source the model file's name.
	Title, Source string
	// Unit is the model's length unit. A zero Unit means metres.
	Unit Unit
	// Probes and Cuts are the points and lines to sample, in metres.
	Probes []Point
	Cuts   []Line
	// Background names the material where no region sets a permittivity
	// (the model's domain material, such as "air"), for the table of peak
	// fields by material. Empty means "background".
	Background string
	// Convergence is a grid-convergence study of the problem (from
	// field.Converge or field.ConvergeGrids), whose estimates the report
	// lists; nil means none was run.
	Convergence *field.Convergence
}

// Build makes the report of a solution. c is the Maxwell capacitance matrix
// (as field.CapacitanceMatrix returns it); when nil, the matrix the
// solution computed for floating conductors is used if there is one, and
// the report has no capacitance rows otherwise.
func Build(sol *field.Solution, c [][]float64, opts BuildOptions) (*Report, error) {
	if sol == nil || sol.Grid == nil || sol.Map == nil || sol.Sys == nil {
		return nil, fmt.Errorf("%w: the solution is incomplete; build the report from a solved field.Solution", ErrInvalid)
	}
	g, m := sol.Grid, sol.Map
	nc := len(m.Conductors)
	if len(sol.Phi) != g.Len() || len(sol.V) != nc {
		return nil, fmt.Errorf("%w: the solution has %d potentials for %d nodes and %d conductor potentials for %d conductors; build the report from a solved field.Solution",
			ErrInvalid, len(sol.Phi), g.Len(), len(sol.V), nc)
	}
	if c == nil {
		c = sol.Capacitance
	}
	if c != nil {
		if len(c) != nc {
			return nil, fmt.Errorf("%w: the capacitance matrix has %d rows but the problem has %d conductors", ErrInvalid, len(c), nc)
		}
		for i, row := range c {
			if len(row) != nc {
				return nil, fmt.Errorf("%w: row %d of the capacitance matrix has %d entries but the problem has %d conductors", ErrInvalid, i, len(row), nc)
			}
		}
	}
	u := opts.Unit
	if u.Name == "" && u.Scale == 0 {
		u = Unit{Name: "m", Scale: 1}
	}
	if !(u.Scale > 0) || math.IsInf(u.Scale, 0) || u.Name == "" {
		return nil, fmt.Errorf("%w: length unit %q has scale %g; give a name and its size in metres (mm = 0.001)", ErrInvalid, u.Name, u.Scale)
	}
	b := builder{sol: sol, unit: u}
	r := &Report{
		Format:  Format,
		Version: Version,
		Title:   opts.Title,
		Model:   opts.Source,
		Kind:    Kind{Metric: g.Metric().String(), PerMetre: g.Metric() == grid.Planar},
		Units:   units(g.Metric(), u),
		Grid:    gridSummary(sol),
		Solver:  solverSummary(sol.Results),
		Energy:  sol.Energy(),
	}
	q := sol.Charges()
	r.Conductors = []Conductor{}
	for k, cd := range m.Conductors {
		rc := Conductor{Name: cd.Name, Potential: sol.V[k], Floating: cd.Floating, Charge: q[k]}
		if c != nil {
			rc.Capacitance = append([]float64(nil), c[k]...)
		}
		if pk, ok := b.surfacePeak(k); ok {
			rc.PeakField = &pk
		}
		r.Conductors = append(r.Conductors, rc)
	}
	r.Regions = b.regionPeaks(opts.Background)
	r.Convergence = convergence(opts.Convergence, opts.Background)
	for n, p := range opts.Probes {
		pr, err := b.probe(n, p)
		if err != nil {
			return nil, err
		}
		r.Probes = append(r.Probes, pr)
	}
	for n, l := range opts.Cuts {
		ct, err := b.cut(n, l)
		if err != nil {
			return nil, err
		}
		r.Cuts = append(r.Cuts, ct)
	}
	if r.ShowsField() {
		r.Caution = Caution
	}
	return r, nil
}

// ShowsField reports whether the report holds any field strength: a peak
// field, an error estimate of one, a probe or a line cut.
func (r *Report) ShowsField() bool {
	for _, c := range r.Conductors {
		if c.PeakField != nil {
			return true
		}
	}
	if r.Convergence != nil {
		for _, e := range r.Convergence.Estimates {
			if e.Unit == "V/m" {
				return true
			}
		}
	}
	return len(r.Regions) > 0 || len(r.Probes) > 0 || len(r.Cuts) > 0
}

// convergence copies a study into the report's form.
// convergence copies a study into the report, naming the background by
// its material when bg is set.
func convergence(c *field.Convergence, bg string) *Convergence {
	if c == nil {
		return nil
	}
	out := &Convergence{Levels: []Level{}, Estimates: []Estimate{}}
	for _, l := range c.Levels {
		out.Levels = append(out.Levels, Level{Nodes: l.Nodes, Cells: l.Cells, H: l.H})
	}
	for _, e := range c.Estimates {
		name := e.Name
		if bg != "" {
			name = strings.Replace(name, "(background)", "("+bg+")", 1)
		}
		re := Estimate{
			Quantity: name, Unit: e.Unit, Values: append([]float64{}, e.Values...),
			Order: e.Order, Extrapolated: e.Extrapolated, Band: e.Band, Note: e.Note,
		}
		if len(e.Values) > 0 {
			re.Value = e.Finest()
		}
		if !math.IsNaN(e.Observed) && !math.IsInf(e.Observed, 0) {
			o := e.Observed
			re.Observed = &o
		}
		out.Estimates = append(out.Estimates, re)
	}
	return out
}

func units(m grid.Metric, u Unit) Units {
	us := Units{Length: u.Name, LengthScale: u.Scale, Charge: "C", Capacitance: "F", Energy: "J"}
	if m == grid.Planar {
		us.Charge, us.Capacitance, us.Energy = "C/m", "F/m", "J/m"
	}
	return us
}

func gridSummary(sol *field.Solution) Grid {
	g, m := sol.Grid, sol.Map
	lo, hi := g.MinMaxStep()
	return Grid{Nx: g.Nx(), Ny: g.Ny(), Nodes: g.Len(), Free: m.FreeNodes(), MinCell: lo, MaxCell: hi, Snapped: m.Snapped}
}

func solverSummary(rs []*solve.Result) Solver {
	var s Solver
	var setup, elapsed time.Duration
	bad := false
	for _, r := range rs {
		if r == nil {
			continue
		}
		if s.Solves == 0 {
			s.Method = r.Method.String()
		}
		s.Solves++
		s.Iterations += r.Iterations
		s.Residual = math.Max(s.Residual, r.Residual)
		setup += r.Setup
		elapsed += r.Elapsed
		if r.Status != solve.Converged && !bad {
			s.Status = r.Status.String()
			bad = true
		}
	}
	if s.Solves > 0 && !bad {
		s.Status = solve.Converged.String()
	}
	s.SetupSeconds = setup.Seconds()
	s.SolveSeconds = elapsed.Seconds()
	return s
}

// builder evaluates the parts of a report that sample the solution.
type builder struct {
	sol  *field.Solution
	unit Unit
}

func (b *builder) pos(x, y float64) Position {
	return Position{XM: x, YM: y, X: x / b.unit.Scale, Y: y / b.unit.Scale}
}

// surfacePeak returns the peak surface field of conductor k, and false
// when the conductor has no surface point facing a dielectric. Its value
// and position are those of field.PeakSurfaceField, except that where
// several surface points tie for the largest |En| within round-off
// (tieTol), as in a uniform field, the position is the first of them in
// grid order, so that it does not depend on the order of floating-point
// sums.
// SharpEdge comes from field.PeakSurfaceField.
func (b *builder) surfacePeak(k int) (Peak, bool) {
	pts := b.sol.SurfaceField(k)
	if len(pts) == 0 {
		return Peak{}, false
	}
	var top float64
	for _, p := range pts {
		top = math.Max(top, math.Abs(p.En))
	}
	fp := b.sol.PeakSurfaceField(k)
	pk := Peak{Where: b.sol.Map.Conductors[k].Name, Field: fp.Value, At: b.pos(fp.X, fp.Y), SharpEdge: fp.Sharp}
	ties := 0
	first := -1
	for i, p := range pts {
		if math.Abs(p.En) >= top*(1-tieTol) {
			ties++
			if first < 0 {
				first = i
			}
		}
	}
	if ties > 1 {
		pk.At = b.pos(pts[first].X, pts[first].Y)
	}
	return pk, true
}

// tieTol is the relative difference below which two field magnitudes count
// as equal when choosing where a peak lies.
const tieTol = 1e-9

// regionPeaks returns the peak field per material, the background (which
// field.PeakRegionFields puts first) named bg when bg is set.
func (b *builder) regionPeaks(bg string) []Peak {
	var out []Peak
	for i, p := range b.sol.PeakRegionFields() {
		if i == 0 && p.Where == "background" && bg != "" {
			p.Where = bg
		}
		out = append(out, Peak{Where: p.Where, Field: p.Value, At: b.pos(p.X, p.Y), SharpEdge: p.Sharp})
	}
	return out
}

func (b *builder) probe(n int, p Point) (Probe, error) {
	name := p.Name
	if name == "" {
		name = fmt.Sprintf("probe %d", n+1)
	}
	phi, ex, ey, err := b.sample(p.X, p.Y)
	if err != nil {
		return Probe{}, fmt.Errorf("%w: probe %q: %v", ErrInvalid, name, err)
	}
	return Probe{Name: name, At: b.pos(p.X, p.Y), Potential: phi, Ex: ex, Ey: ey, E: math.Hypot(ex, ey)}, nil
}

func (b *builder) cut(n int, l Line) (Cut, error) {
	name := l.Name
	if name == "" {
		name = fmt.Sprintf("cut %d", n+1)
	}
	if l.Samples < 2 || l.Samples > MaxCutSamples {
		return Cut{}, fmt.Errorf("%w: line cut %q asks for %d samples; give between 2 and %d", ErrInvalid, name, l.Samples, MaxCutSamples)
	}
	length := math.Hypot(l.X1-l.X0, l.Y1-l.Y0)
	if !(length > 0) || math.IsInf(length, 0) {
		return Cut{}, fmt.Errorf("%w: line cut %q from (%g, %g) to (%g, %g) m needs two different finite end points", ErrInvalid, name, l.X0, l.Y0, l.X1, l.Y1)
	}
	ct := Cut{Name: name, From: b.pos(l.X0, l.Y0), To: b.pos(l.X1, l.Y1), Samples: make([]Sample, l.Samples)}
	last := float64(l.Samples - 1)
	for i := range ct.Samples {
		t := float64(i) / last
		x, y := l.X0+t*(l.X1-l.X0), l.Y0+t*(l.Y1-l.Y0)
		if i == l.Samples-1 {
			x, y = l.X1, l.Y1
		}
		phi, ex, ey, err := b.sample(x, y)
		if err != nil {
			return Cut{}, fmt.Errorf("%w: line cut %q: %v", ErrInvalid, name, err)
		}
		ct.Samples[i] = Sample{S: t * length, At: b.pos(x, y), Potential: phi, Ex: ex, Ey: ey, E: math.Hypot(ex, ey)}
	}
	return ct, nil
}

// sample returns φ and E at (x, y) or an error saying where the domain is.
func (b *builder) sample(x, y float64) (phi, ex, ey float64, err error) {
	phi, ok := b.sol.PotentialAt(x, y)
	if ok {
		ex, ey, ok = b.sol.FieldAt(x, y)
	}
	if !ok {
		x0, y0, x1, y1 := b.sol.Grid.Bounds()
		s := b.unit.Scale
		return 0, 0, 0, fmt.Errorf("the point (%g, %g) %s lies outside the domain [%g, %g]×[%g, %g] %s; move it inside",
			x/s, y/s, b.unit.Name, x0/s, x1/s, y0/s, y1/s, b.unit.Name)
	}
	return phi, ex, ey, nil
}
