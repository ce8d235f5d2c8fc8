package report

import (
	"bytes"
	"context"
	"encoding/csv"
	"errors"
	"flag"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/field"
	"github.com/phigrid/phigrid/grid"
	"github.com/phigrid/phigrid/solve"
)

var update = flag.Bool("update", false, "rewrite golden files")

// settings makes every solve reproducible: one worker, so reductions sum
// in one order, and a tight tolerance.
var settings = solve.Settings{Method: solve.CG, Tol: 1e-12, Workers: 1}

func axis(t testing.TB, lo, hi float64, n int) []float64 {
	t.Helper()
	a, err := grid.Uniform(lo, hi, n)
	if err != nil {
		t.Fatal(err)
	}
	return a
}

// solveCase solves p on the uniform n×m grid over its domain and returns
// the solution with its capacitance matrix.
func solveCase(t testing.TB, p *bc.Problem, n, m int) (*field.Solution, [][]float64) {
	t.Helper()
	d := p.Domain
	g, err := grid.New(axis(t, d.X0, d.X1, n), axis(t, d.Y0, d.Y1, m), p.Metric)
	if err != nil {
		t.Fatal(err)
	}
	sol, err := field.Solve(context.Background(), p, g, &field.Settings{Solver: settings})
	if err != nil {
		t.Fatal(err)
	}
	c, _, err := field.CapacitanceMatrix(context.Background(), sol.Sys, &settings)
	if err != nil {
		t.Fatal(err)
	}
	return sol, c
}

// platesProblem is a parallel-plate capacitor, 10 mm wide with a 1 mm gap:
// 0.6 mm of εr = 4.4 on the 0 V plate and 0.4 mm of air below the 1 V
// plate, zero-flux sides (no fringing).
func platesProblem() *bc.Problem {
	p := &bc.Problem{
		Domain:     bc.Rect{X0: 0, Y0: 0, X1: 0.01, Y1: 0.001},
		Conductors: []bc.Conductor{{Name: "hv", Potential: 1}, {Name: "gnd"}},
		Regions: []bc.Region{
			{Name: "FR-4", Kind: bc.Dielectric, Shape: bc.Rect{X0: 0, Y0: 0, X1: 0.01, Y1: 0.0006}, EpsR: 4.4},
		},
	}
	p.Sides[bc.Top] = bc.Side{Kind: bc.Fixed, Conductor: "hv"}
	p.Sides[bc.Bottom] = bc.Side{Kind: bc.Fixed, Conductor: "gnd"}
	return p
}

// coaxProblem is a quarter of a coaxial line, a = 1 mm at 1 V inside
// b = 3 mm at 0 V, with symmetry planes x = 0 and y = 0.
func coaxProblem() *bc.Problem {
	const a, b, L = 1e-3, 3e-3, 3.15e-3
	return &bc.Problem{
		Domain:     bc.Rect{X0: 0, Y0: 0, X1: L, Y1: L},
		Conductors: []bc.Conductor{{Name: "inner", Potential: 1}, {Name: "outer"}},
		Regions: []bc.Region{
			{Name: "air", Kind: bc.Dielectric, Shape: bc.Circle{R: b}, EpsR: 1},
			{Name: "shield", Kind: bc.ConductorRegion, Conductor: "outer", Shape: bc.Annulus{R0: b, R1: 2 * L}},
			{Name: "centre", Kind: bc.ConductorRegion, Conductor: "inner", Shape: bc.Circle{R: a}},
		},
	}
}

// sphereProblem is the upper half of a spherical capacitor in r–z, inner
// radius 1 mm at 1 V, outer radius 3 mm at 0 V, symmetry plane z = 0.
func sphereProblem() *bc.Problem {
	p := coaxProblem()
	p.Metric = grid.Axisymmetric
	return p
}

// discProblem is platesProblem in r–z: two discs of radius 10 mm, 1 mm
// apart, with the FR-4 layer on the 0 V disc and a zero-flux rim.
func discProblem() *bc.Problem {
	p := platesProblem()
	p.Metric = grid.Axisymmetric
	return p
}

// study is a convergence study as field.ConvergeGrids returns it, made up
// so that the golden files do not follow the numerics of package field.
var study = &field.Convergence{
	Levels: []field.Level{{Nodes: 121, Cells: 100, H: 3.16e-4}, {Nodes: 441, Cells: 400, H: 1.58e-4}, {Nodes: 1681, Cells: 1600, H: 7.9e-5}},
	Estimates: []field.Estimate{
		{Name: "C(hv,hv)", Unit: "F/m", Values: []float64{165.2e-12, 165.11e-12, 165.085e-12}, Observed: 1.85, Order: 1.85, Extrapolated: 165.0755e-12, Band: 0.0119e-12, Safety: 1.25},
		{Name: "Esurf(hv)", Unit: "V/m", Values: []float64{1850, 1861, 1863.6}, Observed: math.NaN(), Order: 2, Extrapolated: 1864.47, Band: 2.6, Safety: 3, Note: "peak value"},
	},
}

type golden struct {
	name   string
	reason string
	build  func(t testing.TB) *Report
}

// The golden cases are problems whose discrete solution is exact (a
// potential linear in y, which the scheme reproduces to round-off), so the
// golden files change only when the report's content or layout does, not
// when the numerics of other packages improve. The coax and sphere cases
// below check Build on curved conductors against closed forms instead.
var goldens = []golden{
	{
		name:   "plates",
		reason: "planar series layers: exact fields, probes and a cut in both layers, estimates copied through",
		build: func(t testing.TB) *Report {
			sol, c := solveCase(t, platesProblem(), 11, 11)
			r, err := Build(sol, c, BuildOptions{
				Title:       "Parallel plates with an FR-4 layer",
				Source:      "plates.toml",
				Unit:        Unit{"mm", 1e-3},
				Probes:      []Point{{Name: "air", X: 0.005, Y: 0.0008}, {Name: "laminate", X: 0.005, Y: 0.0003}},
				Cuts:        []Line{{Name: "across", X0: 0.005, Y0: 0, X1: 0.005, Y1: 0.001, Samples: 11}},
				Convergence: study,
			})
			if err != nil {
				t.Fatal(err)
			}
			return r
		},
	},
	{
		name:   "disc",
		reason: "axisymmetric units (C, F, J) and r–z labels on an exact case",
		build: func(t testing.TB) *Report {
			sol, c := solveCase(t, discProblem(), 11, 11)
			r, err := Build(sol, c, BuildOptions{
				Title:      "Disc capacitor with an FR-4 layer",
				Background: "air",
				Unit:       Unit{"mm", 1e-3},
				Probes:     []Point{{Name: "axis", X: 0, Y: 0.0008}},
			})
			if err != nil {
				t.Fatal(err)
			}
			return r
		},
	},
}

func coaxReport(t testing.TB) *Report {
	sol, c := solveCase(t, coaxProblem(), 85, 85)
	r, err := Build(sol, c, BuildOptions{
		Title:  "Coaxial line quarter, 1 mm / 3 mm",
		Unit:   Unit{"mm", 1e-3},
		Probes: []Point{{Name: "midgap", X: 0.002, Y: 0}},
		Cuts:   []Line{{Name: "radial", X0: 0.001, Y0: 0, X1: 0.003, Y1: 0, Samples: 21}},
	})
	if err != nil {
		t.Fatal(err)
	}
	return r
}

func sphereReport(t testing.TB) *Report {
	sol, c := solveCase(t, sphereProblem(), 85, 85)
	r, err := Build(sol, c, BuildOptions{Title: "Spherical capacitor, upper half", Unit: Unit{"mm", 1e-3}})
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// masks hide what is not the report's own doing: timings, and the
// iteration count and final residual, which belong to the solver.
var masks = []struct {
	re   *regexp.Regexp
	with string
}{
	{regexp.MustCompile(`(?m)^Time:.*$`), "Time: (masked)"},
	{regexp.MustCompile(`\d+ iterations, largest residual \S+,`), "(masked) iterations, largest residual (masked),"},
}

// positionRE matches a position in the text.
var positionRE = regexp.MustCompile(`\([^()]*\)`)

var numberRE = regexp.MustCompile(`[-+]?\d+(\.\d+)?([eE][-+]?\d+)?`)

// compareText compares two text reports line by line after masking; numbers
// within a line compare with a relative tolerance of 2e-4 (the text shows
// five significant digits) and the rest exactly.
func compareText(t *testing.T, got, want string) {
	t.Helper()
	for _, m := range masks {
		got = m.re.ReplaceAllString(got, m.with)
		want = m.re.ReplaceAllString(want, m.with)
	}
	gl, wl := strings.Split(got, "\n"), strings.Split(want, "\n")
	if len(gl) != len(wl) {
		t.Errorf("text report has %d lines, golden %d:\n%s", len(gl), len(wl), cmp.Diff(wl, gl))
		return
	}
	section := ""
	for i := range gl {
		if wl[i] != "" && !strings.HasPrefix(wl[i], " ") {
			section = wl[i]
		}
		if section == "Peak field by material" {
			// Where a uniform field peaks within a material is a tie
			// that round-off breaks; see approx.
			gl[i] = positionRE.ReplaceAllString(gl[i], "(…)")
			wl[i] = positionRE.ReplaceAllString(wl[i], "(…)")
		}
		gs, ws := numberRE.ReplaceAllString(gl[i], "#"), numberRE.ReplaceAllString(wl[i], "#")
		if gs != ws {
			t.Errorf("line %d:\n got %q\nwant %q", i+1, gl[i], wl[i])
			continue
		}
		gn, wn := numberRE.FindAllString(gl[i], -1), numberRE.FindAllString(wl[i], -1)
		for k := range gn {
			a, _ := strconv.ParseFloat(gn[k], 64)
			b, _ := strconv.ParseFloat(wn[k], 64)
			if math.Abs(a-b) > 2e-4*math.Max(math.Abs(a), math.Abs(b)) {
				t.Errorf("line %d: number %d is %s, golden %s:\n got %q\nwant %q", i+1, k+1, gn[k], wn[k], gl[i], wl[i])
			}
		}
	}
}

// approx compares reports: relative 1e-6 on every number, with absolute
// margins fitted to the size of each kind of figure (charges and
// capacitances are of order 1e-11, fields and potentials of order 1). The
// timings, iteration count and residual belong to the solver and are
// ignored, and so is where a material's peak lies: in a uniform field every
// cell ties, and field.PeakRegionFields breaks the tie by round-off. (The
// conductor peaks break ties by rule and are compared.)
var approx = cmp.Options{
	cmpopts.IgnoreFields(Solver{}, "SetupSeconds", "SolveSeconds", "Residual", "Iterations"),
	cmp.FilterPath(func(p cmp.Path) bool {
		for _, s := range p {
			if f, ok := s.(cmp.StructField); ok && f.Name() == "Regions" {
				return strings.HasSuffix(p.String(), ".At")
			}
		}
		return false
	}, cmp.Ignore()),
	cmp.FilterPath(smallScale, cmpopts.EquateApprox(1e-6, 1e-22)),
	cmp.FilterPath(func(p cmp.Path) bool { return !smallScale(p) }, cmpopts.EquateApprox(1e-6, 1e-9)),
}

func smallScale(p cmp.Path) bool {
	for _, s := range p {
		if f, ok := s.(cmp.StructField); ok {
			switch f.Name() {
			case "Charge", "Capacitance", "Energy", "Value", "Extrapolated", "Band":
				return true
			}
		}
	}
	return false
}

func TestGolden(t *testing.T) {
	for _, gc := range goldens {
		t.Run(gc.name, func(t *testing.T) {
			r := gc.build(t)
			// Timings differ from run to run; zero keeps the golden
			// files from changing on every -update.
			r.Solver.SetupSeconds, r.Solver.SolveSeconds = 0, 0
			var txt, js bytes.Buffer
			if err := r.WriteText(&txt); err != nil {
				t.Fatal(err)
			}
			if err := r.WriteJSON(&js); err != nil {
				t.Fatal(err)
			}
			tf := filepath.Join("testdata", gc.name+".txt")
			jf := filepath.Join("testdata", gc.name+".json")
			if *update {
				if err := os.WriteFile(tf, txt.Bytes(), 0o644); err != nil {
					t.Fatal(err)
				}
				if err := os.WriteFile(jf, js.Bytes(), 0o644); err != nil {
					t.Fatal(err)
				}
				return
			}
			wantTxt, err := os.ReadFile(tf)
			if err != nil {
				t.Fatalf("%v (run go test -update to create the golden files)", err)
			}
			compareText(t, txt.String(), string(wantTxt))
			wantJS, err := os.ReadFile(jf)
			if err != nil {
				t.Fatal(err)
			}
			want, err := ReadJSON(bytes.NewReader(wantJS))
			if err != nil {
				t.Fatal(err)
			}
			got, err := ReadJSON(&js)
			if err != nil {
				t.Fatal(err)
			}
			if d := cmp.Diff(want, got, approx); d != "" {
				t.Errorf("JSON report differs from %s (-golden +got):\n%s", jf, d)
			}
		})
	}
}

func TestJSONRoundTrip(t *testing.T) {
	for _, gc := range goldens {
		t.Run(gc.name, func(t *testing.T) {
			r := gc.build(t)
			var buf bytes.Buffer
			if err := r.WriteJSON(&buf); err != nil {
				t.Fatal(err)
			}
			back, err := ReadJSON(&buf)
			if err != nil {
				t.Fatal(err)
			}
			// Exact: JSON carries the shortest decimal that reads back to
			// the same float64.
			if d := cmp.Diff(r, back); d != "" {
				t.Errorf("round trip changed the report (-wrote +read):\n%s", d)
			}
		})
	}
}

func within(t *testing.T, what string, got, want, rel float64) {
	t.Helper()
	if e := math.Abs(got/want - 1); !(e <= rel) {
		t.Errorf("%s = %.9g, want %.9g (relative error %.2g > %.2g)", what, got, want, e, rel)
	}
}

// TestPlatesClosedForm checks the plates report against the series-layer
// closed form, which the finite-volume scheme reproduces to round-off when
// the interface lies on a grid line.
func TestPlatesClosedForm(t *testing.T) {
	r := goldens[0].build(t)
	// source: Griffiths, Introduction to Electrodynamics (Gauss's law, D_n continuous): C' = ε0 w/(d1/εr1 + d2/εr2) = 165.07808 pF/m
	const wantC = 165.07808e-12
	hv, gnd := r.Conductors[0], r.Conductors[1]
	within(t, "C[hv,hv]", hv.Capacitance[0], wantC, 1e-7)
	within(t, "-C[hv,gnd]", -hv.Capacitance[1], wantC, 1e-7)
	within(t, "Q[hv]", hv.Charge, wantC, 1e-7)
	within(t, "-Q[gnd]", -gnd.Charge, wantC, 1e-7)
	// source: Griffiths, Introduction to Electrodynamics: W' = C'V²/2
	within(t, "W'", r.Energy, wantC/2, 1e-7)
	// source: Griffiths, Introduction to Electrodynamics (D_n and E_t continuity) [case P02a] (series layers): E_air = 1864.4068 V/m, E_diel = 423.72881 V/m
	within(t, "peak |E| on hv", hv.PeakField.Field, 1864.4068, 1e-7)
	within(t, "peak |E| on gnd", gnd.PeakField.Field, 423.72881, 1e-7)
	// The field is uniform, so the peak is the first surface point in
	// grid order.
	if at := hv.PeakField.At; at != (Position{XM: 0, YM: 1e-3, X: 0, Y: 1}) {
		t.Errorf("peak on hv at %+v, want (0, 1) mm", at)
	}
	if at := gnd.PeakField.At; at != (Position{XM: 0, YM: 0, X: 0, Y: 0}) {
		t.Errorf("peak on gnd at %+v, want (0, 0) mm", at)
	}
	regions := map[string]float64{}
	for _, p := range r.Regions {
		regions[p.Where] = p.Field
	}
	within(t, "peak |E| in air", regions["background"], 1864.4068, 1e-7)
	within(t, "peak |E| in FR-4", regions["FR-4"], 423.72881, 1e-7)
	// source: Griffiths, Introduction to Electrodynamics (D_n and E_t continuity) [case P02a]: φ(interface) = 0.25423729 V, so φ(0.8 mm) = 0.25423729 + 1864.4068·0.2e-3
	within(t, "φ(probe air)", r.Probes[0].Potential, 0.25423729+1864.4068*0.2e-3, 1e-7)
	within(t, "|E|(probe laminate)", r.Probes[1].E, 423.72881, 1e-6)
	cut := r.Cuts[0].Samples
	within(t, "φ(interface) on the cut", cut[6].Potential, 0.25423729, 1e-7)
	within(t, "cut length", cut[len(cut)-1].S, 1e-3, 1e-12)
	if r.Caution != Caution {
		t.Errorf("a report with field strengths must carry the caution, got %q", r.Caution)
	}
	if r.Kind != (Kind{"planar", true}) || r.Units.Charge != "C/m" || r.Units.Capacitance != "F/m" || r.Units.Energy != "J/m" {
		t.Errorf("planar kind and units wrong: %+v %+v", r.Kind, r.Units)
	}
	if r.Grid.Nodes != 121 || r.Grid.Free != 99 || math.Abs(r.Grid.MinCell-1e-4) > 1e-15 || math.Abs(r.Grid.MaxCell-1e-3) > 1e-15 {
		t.Errorf("grid summary %+v, want 121 nodes, 99 free, cells 0.1 mm to 1 mm", r.Grid)
	}
	// One solve for the potential; the capacitance matrix came from a
	// separate call and is not in the solution's statistics.
	if r.Solver.Solves != 1 || r.Solver.Method != "cg" || r.Solver.Status != "converged" {
		t.Errorf("solver summary %+v, want one converged cg solve", r.Solver)
	}
}

// TestCoaxClosedForm checks the coax report against C' = 2πε0/ln(b/a) and
// E(a) = V/(a ln(b/a)). The grid has cells of a/27; the capacitance is
// good to a few 1e-4, while the peak surface field is the largest of the
// pointwise surface estimates and carries their scatter (about 1.5 % here).
func TestCoaxClosedForm(t *testing.T) {
	r := coaxReport(t)
	// source: Ramo, Whinnery & Van Duzer, Fields and Waves in Communication Electronics, 1994: C' = 2πε0/ln(b/a) = 50.638886 pF/m; a quarter holds a quarter
	within(t, "C[inner,inner]", r.Conductors[0].Capacitance[0], 50.638886e-12/4, 2e-3)
	// source: Ramo, Whinnery & Van Duzer, 1994: E(a) = V/(a ln(b/a)) = 910.23923 V/m
	within(t, "peak |E| on inner", r.Conductors[0].PeakField.Field, 910.23923, 2.5e-2)
	// source: Ramo, Whinnery & Van Duzer, 1994: E(b) = 303.41308 V/m
	within(t, "peak |E| on outer", r.Conductors[1].PeakField.Field, 303.41308, 1e-2)
	// source: Ramo, Whinnery & Van Duzer, Fields and Waves in Communication Electronics, 1994 [case P04a]: φ(r = 2 mm) = ln(b/r)/ln(b/a) = 0.36907025 V
	within(t, "φ(midgap)", r.Probes[0].Potential, 0.36907025, 2e-3)
	if r.Cuts[0].Samples[20].S != 0.002 {
		t.Errorf("the radial cut ends at s = %g m, want 0.002", r.Cuts[0].Samples[20].S)
	}
}

// TestSphereClosedForm checks the axisymmetric report: C = 4πε0·ab/(b−a)
// for the whole sphere, half of it in the upper half-space. As in the coax,
// the peak surface field carries the scatter of the pointwise estimates
// (3 % at cells of a/27).
func TestSphereClosedForm(t *testing.T) {
	r := sphereReport(t)
	const a, b = 1e-3, 3e-3
	// source: Griffiths, Introduction to Electrodynamics (spherical capacitor): C = 4πε0·ab/(b−a)
	want := 4 * math.Pi * solve.Eps0 * a * b / (b - a) / 2
	within(t, "C[inner,inner]", r.Conductors[0].Capacitance[0], want, 5e-3)
	// source: Griffiths, Introduction to Electrodynamics: E(a) = V·b/(a(b−a)) = 1500 V/m
	within(t, "peak |E| on inner", r.Conductors[0].PeakField.Field, 1500, 4e-2)
}

// TestDiscClosedForm checks the axisymmetric plates: C = ε0·πR²/(d1/εr1 +
// d2/εr2), exact because the potential is linear in z.
func TestDiscClosedForm(t *testing.T) {
	r := goldens[1].build(t)
	// source: Griffiths, Introduction to Electrodynamics (series capacitors, D_n continuous): C = ε0·A/(d1/εr1 + d2/εr2) with A = πR²
	want := solve.Eps0 * math.Pi * 1e-4 / (0.4e-3/1 + 0.6e-3/4.4)
	within(t, "C[hv,hv]", r.Conductors[0].Capacitance[0], want, 1e-7)
	within(t, "W", r.Energy, want/2, 1e-7)
	// source: Griffiths, Introduction to Electrodynamics (D_n and E_t continuity) [case P02a]: E_air = 1864.4068 V/m
	within(t, "peak |E| on hv", r.Conductors[0].PeakField.Field, 1864.4068, 1e-7)
	within(t, "|E| on the axis", r.Probes[0].E, 1864.4068, 1e-7)
	if r.Kind != (Kind{"axisymmetric", false}) || r.Units.Charge != "C" || r.Units.Capacitance != "F" || r.Units.Energy != "J" {
		t.Errorf("axisymmetric kind and units wrong: %+v %+v", r.Kind, r.Units)
	}
	if r.Regions[0].Where != "air" || r.Regions[1].Where != "FR-4" {
		t.Errorf("materials %q and %q, want the background named air, then FR-4", r.Regions[0].Where, r.Regions[1].Where)
	}
	if r.Conductors[0].PeakField.At != (Position{XM: 0, YM: 1e-3, X: 0, Y: 1}) {
		t.Errorf("a uniform field's peak lies at the first surface point, (0, 1) mm; got %+v", r.Conductors[0].PeakField.At)
	}
}

// TestConvergenceStudy runs a real study on the coax quarter and checks
// that the report carries it and that its band holds the closed form.
func TestConvergenceStudy(t *testing.T) {
	if testing.Short() {
		t.Skip("solves three grids")
	}
	p := coaxProblem()
	var grids []*grid.Grid
	for _, n := range []int{22, 43, 85} {
		g, err := grid.New(axis(t, 0, p.Domain.X1, n), axis(t, 0, p.Domain.Y1, n), grid.Planar)
		if err != nil {
			t.Fatal(err)
		}
		grids = append(grids, g)
	}
	st, err := field.ConvergeGrids(context.Background(), p, grids, &field.Settings{Solver: settings})
	if err != nil {
		t.Fatal(err)
	}
	r, err := Build(st.Finest, nil, BuildOptions{Unit: Unit{"mm", 1e-3}, Convergence: st})
	if err != nil {
		t.Fatal(err)
	}
	if len(r.Convergence.Levels) != 3 || len(r.Convergence.Estimates) != len(st.Estimates) {
		t.Fatalf("the report has %d levels and %d estimates, the study %d and %d", len(r.Convergence.Levels), len(r.Convergence.Estimates), len(st.Levels), len(st.Estimates))
	}
	var c Estimate
	for i, e := range r.Convergence.Estimates {
		fe := st.Estimates[i]
		if e.Quantity != fe.Name || e.Unit != fe.Unit || e.Value != fe.Finest() || e.Band != fe.Band || e.Order != fe.Order || e.Extrapolated != fe.Extrapolated || e.Note != fe.Note {
			t.Errorf("estimate %d is %+v in the report but %+v in the study", i, e, fe)
		}
		if (e.Observed == nil) != math.IsNaN(fe.Observed) || (e.Observed != nil && *e.Observed != fe.Observed) {
			t.Errorf("estimate %d: observed order %v in the report, %v in the study", i, e.Observed, fe.Observed)
		}
		if e.Quantity == "C(inner,inner)" {
			c = e
		}
	}
	// source: Ramo, Whinnery & Van Duzer, Fields and Waves in Communication Electronics, 1994: C' = 2πε0/ln(b/a) = 50.638886 pF/m; a quarter holds a quarter
	want := 50.638886e-12 / 4
	// The band is a grid convergence index, a band of about 95 %
	// confidence; allow twice it. The extrapolation must come closer.
	if c.Quantity == "" || math.Abs(c.Value-want) > 2*c.Band || math.Abs(c.Extrapolated-want) > math.Abs(c.Value-want) {
		t.Errorf("C(inner,inner) = %g ± %g F/m, extrapolated %g, against the closed form %g", c.Value, c.Band, c.Extrapolated, want)
	}
	var buf bytes.Buffer
	if err := r.WriteJSON(&buf); err != nil {
		t.Fatalf("a report with a study must encode (no NaN orders): %v", err)
	}
	back, err := ReadJSON(&buf)
	if err != nil {
		t.Fatal(err)
	}
	if d := cmp.Diff(r, back); d != "" {
		t.Errorf("round trip changed the study:\n%s", d)
	}
}

// TestNoStatistics builds a report from a solution without solve
// statistics, as one rebuilt from an archive is.
func TestNoStatistics(t *testing.T) {
	sol, c := solveCase(t, platesProblem(), 11, 11)
	sol.Results = nil
	r, err := Build(sol, c, BuildOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if r.Solver != (Solver{}) {
		t.Errorf("solver summary %+v, want zero", r.Solver)
	}
	var buf bytes.Buffer
	if err := r.WriteText(&buf); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(buf.String(), "Solver:   no statistics") || strings.Contains(buf.String(), "Time:") {
		t.Errorf("text without statistics:\n%s", buf.String())
	}
}

func TestCSV(t *testing.T) {
	r := goldens[0].build(t)
	for _, c := range []struct {
		name   string
		write  func(*bytes.Buffer) error
		rows   int
		header []string
	}{
		{"conductors", func(b *bytes.Buffer) error { return r.WriteConductorsCSV(b) }, 3,
			[]string{"name", "potential_V", "floating", "charge_C_per_m", "C_hv_F_per_m", "C_gnd_F_per_m", "peak_field_V_per_m", "x_mm", "y_mm", "x_m", "y_m", "sharp_edge"}},
		{"probes", func(b *bytes.Buffer) error { return r.WriteProbesCSV(b) }, 3,
			[]string{"name", "x_mm", "y_mm", "x_m", "y_m", "potential_V", "ex_V_per_m", "ey_V_per_m", "e_V_per_m"}},
		{"cuts", func(b *bytes.Buffer) error { return r.WriteCutsCSV(b) }, 12,
			[]string{"cut", "index", "s_m", "x_mm", "y_mm", "x_m", "y_m", "potential_V", "ex_V_per_m", "ey_V_per_m", "e_V_per_m"}},
	} {
		t.Run(c.name, func(t *testing.T) {
			var buf bytes.Buffer
			if err := c.write(&buf); err != nil {
				t.Fatal(err)
			}
			rows, err := csv.NewReader(&buf).ReadAll()
			if err != nil {
				t.Fatal(err)
			}
			if len(rows) != c.rows {
				t.Fatalf("%d rows, want %d", len(rows), c.rows)
			}
			if d := cmp.Diff(c.header, rows[0]); d != "" {
				t.Errorf("header (-want +got):\n%s", d)
			}
		})
	}
	// The numbers read back exactly.
	var buf bytes.Buffer
	if err := r.WriteConductorsCSV(&buf); err != nil {
		t.Fatal(err)
	}
	rows, _ := csv.NewReader(&buf).ReadAll()
	q, _ := strconv.ParseFloat(rows[1][3], 64)
	c01, _ := strconv.ParseFloat(rows[1][5], 64)
	if q != r.Conductors[0].Charge || c01 != r.Conductors[0].Capacitance[1] {
		t.Errorf("CSV numbers do not read back exactly: %v", rows[1])
	}
}

func TestBuildErrors(t *testing.T) {
	sol, c := solveCase(t, platesProblem(), 11, 11)
	for _, tc := range []struct {
		name, reason string
		c            [][]float64
		opts         BuildOptions
		want         string
	}{
		{"probe outside", "a probe must lie in the domain", c, BuildOptions{Unit: Unit{"mm", 1e-3}, Probes: []Point{{Name: "far", X: 0.02, Y: 0}}}, `probe "far": the point (20, 0) mm lies outside the domain [0, 10]×[0, 1] mm`},
		{"cut outside", "every cut sample must lie in the domain", c, BuildOptions{Cuts: []Line{{Name: "long", X0: 0, Y0: 0, X1: 0, Y1: 0.002, Samples: 3}}}, `line cut "long"`},
		{"cut samples", "a cut needs two samples", c, BuildOptions{Cuts: []Line{{X0: 0, Y0: 0, X1: 0, Y1: 0.001, Samples: 1}}}, "give between 2 and"},
		{"cut length", "a cut needs two end points", c, BuildOptions{Cuts: []Line{{X1: 0, Samples: 5}}}, "two different finite end points"},
		{"matrix size", "the matrix must fit the conductors", [][]float64{{1}}, BuildOptions{}, "1 rows but the problem has 2 conductors"},
		{"ragged matrix", "every row must fit", [][]float64{{1, 2}, {3}}, BuildOptions{}, "row 1 of the capacitance matrix has 1 entries"},
		{"unit", "a unit needs a positive scale", c, BuildOptions{Unit: Unit{"mm", 0}}, "give a name and its size in metres"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Build(sol, tc.c, tc.opts)
			if !errors.Is(err, ErrInvalid) || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("%s: got %v, want an ErrInvalid error containing %q", tc.reason, err, tc.want)
			}
		})
	}
	if _, err := Build(&field.Solution{}, nil, BuildOptions{}); !errors.Is(err, ErrInvalid) {
		t.Errorf("an empty solution gave %v, want ErrInvalid", err)
	}
}

func TestReadJSONErrors(t *testing.T) {
	for _, tc := range []struct{ name, in, want string }{
		{"not JSON", "phigrid", "invalid character"},
		{"other format", `{"format":"x","version":1}`, `format is "x"`},
		{"newer version", `{"format":"phigrid-report","version":2}`, "report version 2"},
		{"two documents", `{"format":"phigrid-report","version":1} {}`, "data follows"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ReadJSON(strings.NewReader(tc.in))
			if !errors.Is(err, ErrFormat) || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("got %v, want ErrFormat containing %q", err, tc.want)
			}
		})
	}
}

func TestCautionBesideFields(t *testing.T) {
	r := goldens[0].build(t)
	var buf bytes.Buffer
	if err := r.WriteText(&buf); err != nil {
		t.Fatal(err)
	}
	txt := buf.String()
	// One caution after each table with field strengths: conductors,
	// materials, error estimates, probes, cuts.
	if n := strings.Count(txt, "Caution:"); n != 5 {
		t.Errorf("the text shows the caution %d times, want 5 (after every field table):\n%s", n, txt)
	}
	// A report without field strengths carries none.
	bare := &Report{Format: Format, Version: Version, Conductors: []Conductor{{Name: "a"}}}
	if bare.ShowsField() {
		t.Error("a report without peaks, probes or cuts claims to show a field")
	}
	buf.Reset()
	if err := bare.WriteText(&buf); err != nil {
		t.Fatal(err)
	}
	if strings.Contains(buf.String(), "Caution") {
		t.Errorf("caution printed without any field strength:\n%s", buf.String())
	}
}

func TestFormatting(t *testing.T) {
	for _, c := range []struct {
		v    float64
		unit string
		want string
	}{
		{165.07808e-12, "F/m", "165.08 pF/m"},
		{-165.07808e-12, "C/m", "-165.08 pC/m"},
		{1, "V", "1.0000 V"},
		{0, "J", "0 J"},
		{999.9996e-12, "F", "1.0000 nF"},
		{12.5e3, "V", "12.500 kV"},
		{3.2e-6, "s", "3.2000 µs"},
		{1e-21, "F", "1.0000e-21 F"},
	} {
		if got := eng(c.v, c.unit); got != c.want {
			t.Errorf("eng(%g, %q) = %q, want %q", c.v, c.unit, got, c.want)
		}
	}
	for _, c := range []struct {
		v    float64
		want string
	}{
		{423.72881, "423.73 V/m"},
		{1864.4068, "1.8644 V/mm"},
		{3e6, "3.0000 kV/mm"},
		{-2.5e9, "-2.5000 MV/mm"},
		{0.5, "500.00 mV/m"},
	} {
		if got := fieldStrength(c.v); got != c.want {
			t.Errorf("fieldStrength(%g) = %q, want %q", c.v, got, c.want)
		}
	}
	rep := &Report{Grid: Grid{MaxCell: 1e-4}}
	if got := rep.at(Position{XM: -3.5e-20, X: -3.5e-17, YM: 3e-3, Y: 3}); got != "(0, 3)" {
		t.Errorf("a coordinate within round-off of 0 prints as %s, want (0, 3)", got)
	}
	if got := wrap("aa bb cc dd", 5); !cmp.Equal(got, []string{"aa bb", "cc dd"}) {
		t.Errorf("wrap = %q", got)
	}
}
