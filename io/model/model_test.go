package model

import (
	"errors"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
)

// approx compares SI values that went through a unit conversion.
var approx = cmpopts.EquateApprox(1e-12, 1e-300)

// two plates at y = 0 and y = 10 mm, the usual frame of the small test
// models below.
const plates = `
[units]
length = "mm"

[domain]
kind = "planar"
x = [0, 10]
y = [0, 10]

[boundary]
bottom = { kind = "fixed", potential = 0 }
top = { kind = "fixed", potential = 1 }
`

func platesProblem() *bc.Problem {
	p := &bc.Problem{
		Metric:     grid.Planar,
		Domain:     bc.Rect{X0: 0, Y0: 0, X1: 0.01, Y1: 0.01},
		Background: 1,
	}
	p.Sides[bc.Bottom] = bc.Side{Kind: bc.Fixed, Potential: 0}
	p.Sides[bc.Top] = bc.Side{Kind: bc.Fixed, Potential: 1}
	return p
}

func TestParseProblems(t *testing.T) {
	tests := []struct {
		name   string
		reason string
		src    string
		want   func() *bc.Problem
	}{
		{
			name:   "plates",
			reason: "the smallest model: two fixed sides, vacuum",
			src:    plates,
			want:   platesProblem,
		},
		{
			name:   "every shape in file order",
			reason: "shapes convert to SI and regions keep file order, whatever their kind",
			src: plates + `
[[conductor]]
name = "c"
potential = 0.5
[[region]]
name = "slab"
kind = "dielectric"
eps_r = 4
rect = { x = [0, 10], y = [0, 2] }
[[region]]
kind = "conductor"
conductor = "c"
circle = { center = [5, 5], radius = 1 }
[[region]]
kind = "dielectric"
material = "PTFE"
annulus = { center = [5, 5], inner_radius = 1, outer_radius = 2 }
[[region]]
kind = "charge"
charge_density = 1e-6
polygon = { points = [[1, 7], [3, 7], [2, 9]] }
[[region]]
kind = "conductor"
conductor = "c"
strip = { from = [6, 8], to = [9, 8], thickness = 0.1 }
[[region]]
kind = "charge"
charge_density = -2e-6
eps_r = 3
[region.rect]
x = [8, 9]
y = [2, 3]
`,
			want: func() *bc.Problem {
				p := platesProblem()
				p.Conductors = []bc.Conductor{{Name: "c", Potential: 0.5}}
				p.Regions = []bc.Region{
					{Name: "slab", Kind: bc.Dielectric, EpsR: 4, Shape: bc.Rect{X0: 0, Y0: 0, X1: 0.01, Y1: 0.002}},
					{Kind: bc.ConductorRegion, Conductor: "c", Shape: bc.Circle{X: 0.005, Y: 0.005, R: 0.001}},
					{Kind: bc.Dielectric, EpsR: 2.1, Shape: bc.Annulus{X: 0.005, Y: 0.005, R0: 0.001, R1: 0.002}},
					{Kind: bc.Charge, Rho: 1e-6, Shape: bc.Polygon{X: []float64{0.001, 0.003, 0.002}, Y: []float64{0.007, 0.007, 0.009}}},
					{Kind: bc.ConductorRegion, Conductor: "c", Shape: bc.Strip{X0: 0.006, Y0: 0.008, X1: 0.009, Y1: 0.008, Thickness: 1e-4}},
					{Kind: bc.Charge, Rho: -2e-6, EpsR: 3, Shape: bc.Rect{X0: 0.008, Y0: 0.002, X1: 0.009, Y1: 0.003}},
				}
				return p
			},
		},
		{
			name:   "ellipses",
			reason: "an ellipse converts centre and semi-axes to SI, a along x and b along y; centred on the axis of an r–z model it is a spheroid, and an ellipse reaching r < 0 is allowed when its centre is at r ≥ 0",
			src: `
[units]
length = "cm"
[domain]
kind = "axisymmetric"
x = [0, 5]
y = [-5, 5]
[[conductor]]
name = "tip"
potential = 1
[[region]]
kind = "conductor"
conductor = "tip"
ellipse = { center = [0, 1], semi_axes = [0.5, 2] }
[[region]]
name = "bead"
kind = "dielectric"
eps_r = 3
[region.ellipse]
center = [3, -2]
semi_axes = [1, 0.25]
[boundary]
right = { kind = "fixed", potential = 0 }
`,
			want: func() *bc.Problem {
				p := &bc.Problem{Metric: grid.Axisymmetric, Domain: bc.Rect{X0: 0, Y0: -0.05, X1: 0.05, Y1: 0.05}, Background: 1}
				p.Conductors = []bc.Conductor{{Name: "tip", Potential: 1}}
				p.Regions = []bc.Region{
					{Kind: bc.ConductorRegion, Conductor: "tip", Shape: bc.Ellipse{X: 0, Y: 0.01, A: 0.005, B: 0.02}},
					{Name: "bead", Kind: bc.Dielectric, EpsR: 3, Shape: bc.Ellipse{X: 0.03, Y: -0.02, A: 0.01, B: 0.0025}},
				}
				p.Sides[bc.Right] = bc.Side{Kind: bc.Fixed, Potential: 0}
				return p
			},
		},
		{
			name:   "kilovolts and a floating conductor",
			reason: "potentials scale by the potential unit; a floating conductor keeps its charge in SI",
			src: `
[units]
length = "m"
potential = "kV"
[domain]
kind = "planar"
x = [-1, 1]
y = [-1, 1]
[[conductor]]
name = "hv"
potential = 12.5
[[conductor]]
name = "island"
floating = true
charge = -3e-9
[[region]]
kind = "conductor"
conductor = "hv"
circle = { center = [0, 0], radius = 0.1 }
[[region]]
kind = "conductor"
conductor = "island"
circle = { center = [0.5, 0], radius = 0.1 }
[boundary]
left = { kind = "fixed", potential = -1 }
right = { kind = "fixed", conductor = "hv" }
`,
			want: func() *bc.Problem {
				p := &bc.Problem{Metric: grid.Planar, Domain: bc.Rect{X0: -1, Y0: -1, X1: 1, Y1: 1}, Background: 1}
				p.Conductors = []bc.Conductor{{Name: "hv", Potential: 12500}, {Name: "island", Floating: true, Charge: -3e-9}}
				p.Regions = []bc.Region{
					{Kind: bc.ConductorRegion, Conductor: "hv", Shape: bc.Circle{R: 0.1}},
					{Kind: bc.ConductorRegion, Conductor: "island", Shape: bc.Circle{X: 0.5, R: 0.1}},
				}
				p.Sides[bc.Left] = bc.Side{Kind: bc.Fixed, Potential: -1000}
				p.Sides[bc.Right] = bc.Side{Kind: bc.Fixed, Conductor: "hv"}
				return p
			},
		},
		{
			name:   "axisymmetric with a ring charge",
			reason: "x is r; ring charges only in r–z; background by eps_r",
			src: `
[units]
length = "cm"
[domain]
kind = "axisymmetric"
x = [0, 5]
y = [-5, 5]
eps_r = 2.2
[[conductor]]
name = "ball"
potential = 1
[[region]]
kind = "conductor"
conductor = "ball"
circle = { center = [0, 0], radius = 1 }
[[ring_charge]]
name = "ring"
at = [2, 1]
charge = 1e-12
[boundary]
right = { kind = "fixed", potential = 0 }
`,
			want: func() *bc.Problem {
				p := &bc.Problem{Metric: grid.Axisymmetric, Domain: bc.Rect{X0: 0, Y0: -0.05, X1: 0.05, Y1: 0.05}, Background: 2.2}
				p.Conductors = []bc.Conductor{{Name: "ball", Potential: 1}}
				p.Regions = []bc.Region{{Kind: bc.ConductorRegion, Conductor: "ball", Shape: bc.Circle{R: 0.01}}}
				p.Charges = []bc.PointCharge{{Name: "ring", X: 0.02, Y: 0.01, Q: 1e-12}}
				p.Sides[bc.Right] = bc.Side{Kind: bc.Fixed, Potential: 0}
				return p
			},
		},
		{
			name:   "inline array of regions, own and built-in materials",
			reason: "region = [...] is the same as [[region]]; material names ignore case and punctuation; a file's material overrides a built-in",
			src: `region = [
  { kind = "dielectric", material = "fr4", rect = { x = [0, 1], y = [0, 1] } },
  { kind = "dielectric", material = "Transformer Oil", rect = { x = [0, 1], y = [1, 2] } },
]
[units]
length = "in"
[domain]
kind = "planar"
x = [0, 1]
y = [0, 2]
material = "my_resin"
[materials]
"FR-4" = 4.6
"My Resin" = 3.3
[[line_charge]]
at = [0.5, 0.5]
charge = 2e-10
[boundary]
top = { kind = "fixed", potential = 0 }
`,
			want: func() *bc.Problem {
				p := &bc.Problem{Metric: grid.Planar, Domain: bc.Rect{X1: 0.0254, Y1: 0.0508}, Background: 3.3}
				p.Regions = []bc.Region{
					{Kind: bc.Dielectric, EpsR: 4.6, Shape: bc.Rect{X1: 0.0254, Y1: 0.0254}},
					{Kind: bc.Dielectric, EpsR: 2.2, Shape: bc.Rect{Y0: 0.0254, X1: 0.0254, Y1: 0.0508}},
				}
				p.Charges = []bc.PointCharge{{X: 0.0127, Y: 0.0127, Q: 2e-10}}
				p.Sides[bc.Top] = bc.Side{Kind: bc.Fixed}
				return p
			},
		},
		{
			name:   "CRLF line ends and a byte-order mark",
			reason: "files saved by Windows editors parse the same",
			src:    "\uFEFF" + strings.ReplaceAll(plates, "\n", "\r\n"),
			want:   platesProblem,
		},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			m, err := Parse(tt.name+".toml", []byte(tt.src))
			if err != nil {
				t.Fatalf("%s: %v", tt.reason, err)
			}
			if diff := cmp.Diff(tt.want(), m.Problem, approx, cmpopts.EquateEmpty()); diff != "" {
				t.Errorf("%s: problem mismatch (-want +got):\n%s", tt.reason, diff)
			}
		})
	}
}

func TestParseSettings(t *testing.T) {
	m, err := Parse("plates.toml", []byte(plates))
	if err != nil {
		t.Fatal(err)
	}
	got := struct {
		Unit, PotentialUnit Unit
		Mesh                bc.Mesh
		Solver              Solver
		Outputs             Outputs
	}{m.Unit, m.PotentialUnit, m.Mesh, m.Solver, m.Outputs}
	want := got
	want.Unit = Unit{"mm", 1e-3}
	want.PotentialUnit = Unit{"V", 1}
	want.Mesh = bc.Mesh{Cell: 0.01 / DefaultCells, Refine: 4, Ratio: 1.2, Gap: 4, Corner: 2, MaxNodes: bc.DefaultMaxNodes}
	want.Solver = Solver{Method: "mg-pcg", Tol: 1e-10}
	want.Outputs = Outputs{Report: true}
	if diff := cmp.Diff(want, got, approx, cmpopts.EquateEmpty()); diff != "" {
		t.Errorf("defaults (-want +got):\n%s", diff)
	}
	if string(m.Source) != plates || m.Name != "plates.toml" {
		t.Errorf("model keeps name %q and %d bytes of source, want the input", m.Name, len(m.Source))
	}
}

func TestParseFull(t *testing.T) {
	m, err := Load("testdata/full.toml")
	if err != nil {
		t.Fatal(err)
	}
	wantOut := Outputs{
		Dir: "traces-out", Report: true, CSV: true, VTK: true, Archive: true,
		Pictures: []Picture{
			{Kind: PotentialMap, File: "potential.png", Width: 1200, Height: 500, Contours: 20},
			{Kind: FieldMap, File: "field.png", Contours: 10, LogScale: true},
			{Kind: FieldArrows, File: "arrows.svg", Contours: 10, ArrowLength: ArrowsLog},
			{Kind: FieldLines, File: "lines.svg", Contours: 10, Lines: 32},
		},
		Probes: []Probe{{Name: "above trace", X: -0.001, Y: 0.0025}},
		Cuts:   []Cut{{Name: "vertical", X0: -0.001, X1: -0.001, Y1: 0.008, Samples: 161}},
	}
	if diff := cmp.Diff(wantOut, m.Outputs, approx, cmpopts.EquateEmpty()); diff != "" {
		t.Errorf("outputs (-want +got):\n%s", diff)
	}
	wantMesh := bc.Mesh{Cell: 0.25e-3, Refine: 8, Ratio: 1.2, Gap: 6, Corner: 3, MaxNodes: 2000000}
	if diff := cmp.Diff(wantMesh, m.Mesh, approx); diff != "" {
		t.Errorf("mesh (-want +got):\n%s", diff)
	}
	if want := (Solver{Method: "mg-pcg", Tol: 1e-10, MaxIter: 200}); m.Solver != want {
		t.Errorf("solver %+v, want %+v", m.Solver, want)
	}
	if m.Title != "Coupled traces in a shielded box" || m.Description != "The example of the model-file manual." {
		t.Errorf("title %q, description %q", m.Title, m.Description)
	}
	var used []string
	for _, mat := range m.Materials {
		used = append(used, mat.Name)
	}
	if diff := cmp.Diff([]string{"air", "FR-4", "solder mask"}, used); diff != "" {
		t.Errorf("materials used (-want +got):\n%s", diff)
	}
	if diff := cmp.Diff([]string{"FR-4", "solder mask", "", "", "", "", ""}, m.RegionMaterial); diff != "" {
		t.Errorf("region materials (-want +got):\n%s", diff)
	}
	if n := len(m.Problem.Regions); n != 7 {
		t.Fatalf("%d regions, want 7", n)
	}
	g, err := m.Grid()
	if err != nil {
		t.Fatal(err)
	}
	if _, err := bc.Rasterize(m.Problem, g, nil); err != nil {
		t.Errorf("the manual's example does not rasterise: %v", err)
	}
}

// TestManualExample keeps the complete example of the package manual and
// testdata/full.toml identical, so the manual shows a model that parses.
func TestManualExample(t *testing.T) {
	doc, err := os.ReadFile("doc.go")
	if err != nil {
		t.Fatal(err)
	}
	file, err := os.ReadFile("testdata/full.toml")
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(string(doc), "\n")
	start := -1
	for i, l := range lines {
		if l == "// # Complete example" {
			start = i
		}
	}
	if start < 0 {
		t.Fatal("doc.go has no section # Complete example")
	}
	var block []string
	for _, l := range lines[start+1:] {
		if strings.HasPrefix(l, "// # ") {
			break
		}
		switch {
		case strings.HasPrefix(l, "//\t"):
			block = append(block, l[3:])
		case l == "//" && len(block) > 0:
			block = append(block, "")
		}
	}
	got := strings.TrimRight(strings.Join(block, "\n"), "\n") + "\n"
	if diff := cmp.Diff(string(file), got); diff != "" {
		t.Errorf("doc.go's example and testdata/full.toml differ (-file +doc):\n%s", diff)
	}
}

// TestCoaxExample parses the shipped coax example and rasterises it. The
// check value of the example is C' = 2π ε0 / ln 3 = 50.638886 pF/m.
func TestCoaxExample(t *testing.T) {
	m, err := Load("../../examples/coax/coax.toml")
	if err != nil {
		t.Fatal(err)
	}
	want := &bc.Problem{
		Metric:     grid.Planar,
		Domain:     bc.Rect{X0: -0.0035, Y0: -0.0035, X1: 0.0035, Y1: 0.0035},
		Background: 1,
		Conductors: []bc.Conductor{{Name: "inner", Potential: 1}, {Name: "outer", Potential: 0}},
		Regions: []bc.Region{
			{Name: "shield", Kind: bc.ConductorRegion, Conductor: "outer", Shape: bc.Annulus{R0: 0.003, R1: 0.005}},
			{Name: "centre", Kind: bc.ConductorRegion, Conductor: "inner", Shape: bc.Circle{R: 0.001}},
		},
	}
	if diff := cmp.Diff(want, m.Problem, approx, cmpopts.EquateEmpty()); diff != "" {
		t.Errorf("coax problem (-want +got):\n%s", diff)
	}
	g, err := m.Grid()
	if err != nil {
		t.Fatal(err)
	}
	mp, err := bc.Rasterize(m.Problem, g, nil)
	if err != nil {
		t.Fatal(err)
	}
	// Every node at r ≤ a belongs to the inner conductor, every node at
	// r ≥ b to the outer one, and the gap between is free.
	const a, b = 1e-3, 3e-3
	xs, ys := g.X(), g.Y()
	for j, y := range ys {
		for i, x := range xs {
			r := math.Hypot(x, y)
			n := g.Index(i, j)
			switch {
			case r < a*0.999 && mp.Cond[n] != 0:
				t.Fatalf("node (%g, %g) inside the inner conductor has conductor %d", x, y, mp.Cond[n])
			case r > b*1.001 && mp.Cond[n] != 1:
				t.Fatalf("node (%g, %g) inside the outer conductor has conductor %d", x, y, mp.Cond[n])
			case r > a*1.1 && r < b*0.9 && mp.Kind[n] != bc.Free:
				t.Fatalf("node (%g, %g) in the gap is %v, want free", x, y, mp.Kind[n])
			}
		}
	}
}

func TestLengthUnits(t *testing.T) {
	for _, tt := range []struct {
		unit  string
		scale float64
	}{
		{"m", 1},
		{"cm", 0.01},
		{"mm", 1e-3},
		{"um", 1e-6},
		{"\u00b5m", 1e-6}, // micro sign
		{"\u03bcm", 1e-6}, // Greek mu
		{"in", 0.0254},    // exact by definition
		{"mil", 25.4e-6},  // exact by definition
	} {
		src := strings.Replace(plates, `length = "mm"`, `length = "`+tt.unit+`"`, 1)
		m, err := Parse("units.toml", []byte(src))
		if err != nil {
			t.Errorf("unit %q: %v", tt.unit, err)
			continue
		}
		if got := m.Problem.Domain.X1; math.Abs(got-10*tt.scale) > 1e-12*tt.scale {
			t.Errorf("unit %q: x1 = 10 units is %g m, want %g m", tt.unit, got, 10*tt.scale)
		}
		if m.Unit.Name != tt.unit || m.Unit.Scale != tt.scale {
			t.Errorf("unit %q: Model.Unit = %+v", tt.unit, m.Unit)
		}
	}
}

func TestMaterials(t *testing.T) {
	ms := Materials()
	keys := map[string]bool{}
	for _, m := range ms {
		if !(m.EpsR >= 1) || m.Note == "" || m.Name == "" {
			t.Errorf("built-in material %+v needs a name, a note and eps_r ≥ 1", m)
		}
		if keys[materialKey(m.Name)] {
			t.Errorf("built-in material %q appears twice", m.Name)
		}
		keys[materialKey(m.Name)] = true
	}
	ms[0].EpsR = 99
	if Materials()[0].EpsR == 99 {
		t.Error("Materials returns the package's own table, not a copy")
	}
	tab := newMaterialTable()
	for _, tt := range []struct {
		name string
		want float64
	}{
		{"PTFE", 2.1},            // common practice
		{"ptfe", 2.1},            // common practice
		{"fr4", 4.4},             // common practice
		{"Fr_4", 4.4},            // common practice
		{"transformer oil", 2.2}, // common practice
		{"alumina", 9.8},         // common practice
		{"vacuum", 1},            // exact
		{"sf6", 1.002},           // common practice (from memory)
	} {
		m, ok := tab.lookup(tt.name)
		if !ok || m.EpsR != tt.want {
			t.Errorf("material %q: got %v (found %v), want eps_r %g", tt.name, m.EpsR, ok, tt.want)
		}
	}
}

func TestParseMemTotal(t *testing.T) {
	for _, tt := range []struct {
		in   string
		want uint64
	}{
		{"MemTotal:       24684084 kB\nMemFree: 1 kB\n", 24684084 * 1024},
		{"MemFree: 1 kB\nMemTotal: 2048\n", 2048},
		{"MemFree: 1 kB\n", 0},
		{"MemTotal: lots kB\n", 0},
	} {
		if got := parseMemTotal([]byte(tt.in)); got != tt.want {
			t.Errorf("parseMemTotal(%q) = %d, want %d", tt.in, got, tt.want)
		}
	}
}

func TestIndex(t *testing.T) {
	src := []byte(`a = 1
[t]
b = { c = [1, { d = 2 }] }
[[arr]]
x = 1
[[arr]]
[arr.sub]
y = 2
[[arr.list]]
z = 3
`)
	ix := buildIndex(src)
	for _, tt := range []struct {
		path string
		want pos
	}{
		{"a", pos{1, 1}},
		{"t", pos{2, 2}},
		{"t.b", pos{3, 1}},
		{"t.b.c", pos{3, 7}},
		{"t.b.c[1]", pos{3, 12}},
		{"t.b.c[2].d", pos{3, 17}},
		{"arr[1]", pos{4, 3}},
		{"arr[1].x", pos{5, 1}},
		{"arr[2]", pos{6, 3}},
		{"arr[2].sub", pos{7, 2}},
		{"arr[2].sub.y", pos{8, 1}},
		{"arr[2].list[1].z", pos{10, 1}},
		{"arr[2].missing", pos{6, 3}}, // falls back to the table
		{"nothing", pos{}},
	} {
		if got := ix.find(tt.path); got != tt.want {
			t.Errorf("find(%q) = %v, want %v", tt.path, got, tt.want)
		}
	}
	if got := ix.near(pos{3, 20}); got != "t.b.c[2].d" {
		t.Errorf("near(3:20) = %q, want t.b.c[2].d", got)
	}
	if ix.has("arr[3]") || !ix.has("arr[2].list") {
		t.Error("has reports arrays wrongly")
	}
}

// TestNodeCapExact checks that the node cap is tested against the grid
// that will be built, not an overestimate: a cap of exactly the grid's
// node count passes and one node less fails.
func TestNodeCapExact(t *testing.T) {
	src, err := os.ReadFile("testdata/full.toml")
	if err != nil {
		t.Fatal(err)
	}
	for _, ratio := range []string{"1.05", "1.2", "1.5"} {
		s := strings.Replace(string(src), "ratio = 1.2 ", "ratio = "+ratio+" ", 1)
		if !strings.Contains(s, "ratio = "+ratio+" ") || !strings.Contains(s, "max_nodes = 2_000_000") {
			t.Fatal("testdata/full.toml no longer has the [grid] lines this test edits")
		}
		m, err := Parse("full.toml", []byte(s))
		if err != nil {
			t.Fatal(err)
		}
		g, err := m.Grid()
		if err != nil {
			t.Fatal(err)
		}
		n := g.Len()
		for _, tt := range []struct {
			cap int
			ok  bool
		}{{n, true}, {n - 1, false}} {
			capped := strings.Replace(s, "max_nodes = 2_000_000", "max_nodes = "+strconv.Itoa(tt.cap), 1)
			_, err := Parse("full.toml", []byte(capped))
			if (err == nil) != tt.ok || err != nil && !errors.Is(err, bc.ErrTooLarge) {
				t.Errorf("ratio %s: grid of %d nodes with max_nodes = %d: %v", ratio, n, tt.cap, err)
			}
		}
	}
}

// sphereInSpace is an isolated sphere of radius 10 mm at 1 kV in r–z with
// open outer sides; tests append [boundary] far.
const sphereInSpace = `
[units]
length = "mm"
potential = "kV"
[domain]
kind = "axisymmetric"
x = [0, 30]
y = [-30, 30]
[[conductor]]
name = "sphere"
potential = 1
[[region]]
kind = "conductor"
conductor = "sphere"
circle = { center = [0, 0], radius = 10 }
[boundary]
right = { kind = "open" }
bottom = { kind = "open" }
top = { kind = "open" }
`

func sphereProblem() *bc.Problem {
	p := &bc.Problem{Metric: grid.Axisymmetric, Domain: bc.Rect{X0: 0, Y0: -0.03, X1: 0.03, Y1: 0.03}, Background: 1}
	p.Conductors = []bc.Conductor{{Name: "sphere", Potential: 1000}}
	p.Regions = []bc.Region{{Kind: bc.ConductorRegion, Conductor: "sphere", Shape: bc.Circle{R: 0.01}}}
	for _, s := range []int{bc.Right, bc.Bottom, bc.Top} {
		p.Sides[s] = bc.Side{Kind: bc.Open}
	}
	return p
}

// twoWire is the quarter x ≥ 0 of a two-wire line in a planar model: the
// plane x = 0 at 0 V, the wire at +1 V, open sides elsewhere; tests append
// [boundary] far.
const twoWire = `
[units]
length = "mm"
[domain]
kind = "planar"
x = [0, 10]
y = [0, 10]
[[conductor]]
name = "wire"
potential = 1
[[region]]
kind = "conductor"
conductor = "wire"
circle = { center = [5, 5], radius = 1 }
[boundary]
left = { kind = "fixed", potential = 0 }
right = { kind = "open" }
bottom = { kind = "open" }
top = { kind = "open" }
`

func twoWireProblem() *bc.Problem {
	p := &bc.Problem{Metric: grid.Planar, Domain: bc.Rect{X1: 0.01, Y1: 0.01}, Background: 1}
	p.Conductors = []bc.Conductor{{Name: "wire", Potential: 1}}
	p.Regions = []bc.Region{{Kind: bc.ConductorRegion, Conductor: "wire", Shape: bc.Circle{X: 0.005, Y: 0.005, R: 0.001}}}
	p.Sides[bc.Left] = bc.Side{Kind: bc.Fixed}
	for _, s := range []int{bc.Right, bc.Bottom, bc.Top} {
		p.Sides[s] = bc.Side{Kind: bc.Open}
	}
	return p
}

func TestParseOpen(t *testing.T) {
	tests := []struct {
		name   string
		reason string
		src    string
		want   func() *bc.Problem
		domain bc.Rect // Model.Domain, the file's domain
		cell   float64 // the default Mesh.Cell
	}{
		{
			name:   "open sides",
			reason: "open sides without far keep bc's default far field (Far nil) and the domain",
			src:    sphereInSpace,
			want:   sphereProblem,
			domain: bc.Rect{Y0: -0.03, X1: 0.03, Y1: 0.03},
			cell:   0.06 / DefaultCells,
		},
		{
			name:   "decay and centre",
			reason: "far.center and far.decay map to Problem.Far in SI; the domain stays",
			src:    sphereInSpace + "far = { center = [0, 5], decay = 2 }\n",
			want: func() *bc.Problem {
				p := sphereProblem()
				p.Far = &bc.FarField{X: 0, Y: 0.005, Decay: 2}
				return p
			},
			domain: bc.Rect{Y0: -0.03, X1: 0.03, Y1: 0.03},
			cell:   0.06 / DefaultCells,
		},
		{
			name:   "extended tenfold",
			reason: "far.extend moves every open side ten times as far from the centre (0, 0), pins the centre, keeps the axis; the default cell follows the file's domain",
			src:    sphereInSpace + "far = { extend = 10 }\n",
			want: func() *bc.Problem {
				p := sphereProblem()
				p.Domain = bc.Rect{X0: 0, Y0: -0.3, X1: 0.3, Y1: 0.3}
				p.Far = &bc.FarField{Decay: 1}
				return p
			},
			domain: bc.Rect{Y0: -0.03, X1: 0.03, Y1: 0.03},
			cell:   0.06 / DefaultCells,
		},
		{
			name:   "extend 1",
			reason: "extend = 1 leaves the problem as it is",
			src:    sphereInSpace + "[boundary.far]\nextend = 1\n",
			want:   sphereProblem,
			domain: bc.Rect{Y0: -0.03, X1: 0.03, Y1: 0.03},
			cell:   0.06 / DefaultCells,
		},
		{
			name:   "centre on the axis, short of the domain",
			reason: "in r–z the centre lies on the axis even when the domain starts at r > 0; the left side, nearer the axis than the centre is not, stays",
			src: strings.Replace(strings.Replace(sphereInSpace, "x = [0, 30]", "x = [5, 30]", 1), "center = [0, 0], radius = 10", "center = [10, 0], radius = 2", 1) +
				"far = { center = [0, 0], extend = 2 }\n",
			want: func() *bc.Problem {
				p := sphereProblem()
				p.Regions[0].Shape = bc.Circle{X: 0.01, R: 0.002}
				p.Domain = bc.Rect{X0: 0.005, Y0: -0.06, X1: 0.06, Y1: 0.06}
				p.Far = &bc.FarField{Decay: 1}
				return p
			},
			domain: bc.Rect{X0: 0.005, Y0: -0.03, X1: 0.03, Y1: 0.03},
			cell:   0.06 / DefaultCells,
		},
		{
			name:   "planar, centre given and extended",
			reason: "open sides move from the given centre (0, 5) mm, the fixed side stays; decay defaults to 1",
			src:    twoWire + "far = { center = [0, 5], extend = 4 }\n",
			want: func() *bc.Problem {
				p := twoWireProblem()
				p.Domain = bc.Rect{X0: 0, Y0: -0.015, X1: 0.04, Y1: 0.025}
				p.Far = &bc.FarField{X: 0, Y: 0.005, Decay: 1}
				return p
			},
			domain: bc.Rect{X1: 0.01, Y1: 0.01},
			cell:   0.01 / DefaultCells,
		},
		{
			name:   "planar, decay only",
			reason: "with decay alone the centre is bc's default: the middle of the geometry",
			src:    twoWire + "far = { decay = 1.5 }\n",
			want: func() *bc.Problem {
				p := twoWireProblem()
				p.Far = &bc.FarField{X: 0.005, Y: 0.005, Decay: 1.5}
				return p
			},
			domain: bc.Rect{X1: 0.01, Y1: 0.01},
			cell:   0.01 / DefaultCells,
		},
		{
			name:   "default centre mirrored",
			reason: "geometry touching a zero-flux side is mirrored across it for the default centre, here onto the symmetry plane x = 0",
			src:    strings.Replace(strings.Replace(twoWire, "center = [5, 5]", "center = [0, 5]", 1), `left = { kind = "fixed", potential = 0 }`, "", 1) + "far = { decay = 1 }\n",
			want: func() *bc.Problem {
				p := twoWireProblem()
				p.Regions[0].Shape = bc.Circle{X: 0, Y: 0.005, R: 0.001}
				p.Sides[bc.Left] = bc.Side{}
				p.Far = &bc.FarField{X: 0, Y: 0.005, Decay: 1}
				return p
			},
			domain: bc.Rect{X1: 0.01, Y1: 0.01},
			cell:   0.01 / DefaultCells,
		},
		{
			name:   "floating conductors in open space",
			reason: "an open side fixes the potential (zero at infinity), so a model of floating conductors only is determined",
			src: strings.Replace(strings.Replace(twoWire, "potential = 1\n", "floating = true\ncharge = 1e-9\n", 1),
				`left = { kind = "fixed", potential = 0 }`, "", 1),
			want: func() *bc.Problem {
				p := twoWireProblem()
				p.Conductors = []bc.Conductor{{Name: "wire", Floating: true, Charge: 1e-9}}
				p.Sides[bc.Left] = bc.Side{}
				return p
			},
			domain: bc.Rect{X1: 0.01, Y1: 0.01},
			cell:   0.01 / DefaultCells,
		},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			m, err := Parse(tt.name+".toml", []byte(tt.src))
			if err != nil {
				t.Fatalf("%s: %v", tt.reason, err)
			}
			if diff := cmp.Diff(tt.want(), m.Problem, approx, cmpopts.EquateEmpty()); diff != "" {
				t.Errorf("%s: problem mismatch (-want +got):\n%s", tt.reason, diff)
			}
			if diff := cmp.Diff(tt.domain, m.Domain, approx); diff != "" {
				t.Errorf("%s: Model.Domain (-want +got):\n%s", tt.reason, diff)
			}
			if diff := cmp.Diff(tt.cell, m.Mesh.Cell, approx); diff != "" {
				t.Errorf("%s: default cell (-want +got):\n%s", tt.reason, diff)
			}
		})
	}
}

// TestSeedModels checks that every model under testdata, the valid part
// of the fuzz corpus, parses and builds its grid.
func TestSeedModels(t *testing.T) {
	files, err := filepath.Glob("testdata/*.toml")
	if err != nil || len(files) < 5 {
		t.Fatalf("found %d models under testdata (%v)", len(files), err)
	}
	for _, f := range files {
		m, err := Load(f)
		if err != nil {
			t.Errorf("%v", err)
			continue
		}
		if _, err := m.Grid(); err != nil {
			t.Errorf("%s: %v", f, err)
		}
	}
}

// TestOpenSeed checks what testdata/open.toml is in the corpus for: open
// sides pushed out eightfold from the given centre, an ellipse, and the
// [grid] keys gap and corner.
func TestOpenSeed(t *testing.T) {
	m, err := Load("testdata/open.toml")
	if err != nil {
		t.Fatal(err)
	}
	got := struct {
		Domain, FileDomain bc.Rect
		Far                *bc.FarField
		Shape              bc.Shape
		Mesh               bc.Mesh
	}{m.Problem.Domain, m.Domain, m.Problem.Far, m.Problem.Regions[0].Shape, m.Mesh}
	want := got
	want.Domain = bc.Rect{X0: 0, Y0: -0.08, X1: 0.096, Y1: 0.08}
	want.FileDomain = bc.Rect{X0: 0, Y0: -0.01, X1: 0.012, Y1: 0.01}
	want.Far = &bc.FarField{Decay: 1}
	want.Shape = bc.Ellipse{X: 0.004, A: 0.002, B: 0.001}
	want.Mesh = bc.Mesh{Cell: 0.5e-3, Refine: 4, Ratio: 1.2, Gap: 6, Corner: 1.5, MaxNodes: bc.DefaultMaxNodes}
	if diff := cmp.Diff(want, got, approx); diff != "" {
		t.Errorf("open.toml (-want +got):\n%s", diff)
	}
}

// TestSphereExample parses the shipped example of an isolated sphere in
// open space: the model file's open sides, moved tenfold outward.
func TestSphereExample(t *testing.T) {
	m, err := Load("../../examples/sphere/sphere.toml")
	if err != nil {
		t.Fatal(err)
	}
	want := sphereProblem()
	want.Regions[0].Name = "sphere"
	want.Domain = bc.Rect{X0: 0, Y0: -0.3, X1: 0.3, Y1: 0.3}
	want.Far = &bc.FarField{Decay: 1}
	if diff := cmp.Diff(want, m.Problem, approx, cmpopts.EquateEmpty()); diff != "" {
		t.Errorf("sphere problem (-want +got):\n%s", diff)
	}
	if diff := cmp.Diff(bc.Rect{Y0: -0.03, X1: 0.03, Y1: 0.03}, m.Domain, approx); diff != "" {
		t.Errorf("file domain (-want +got):\n%s", diff)
	}
}
