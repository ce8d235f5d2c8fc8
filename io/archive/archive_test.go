package archive

import (
	"bytes"
	"context"
	"encoding/binary"
	"errors"
	"flag"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/klauspost/compress/zstd"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/field"
	"github.com/phigrid/phigrid/grid"
	"github.com/phigrid/phigrid/solve"
)

var update = flag.Bool("update", false, "rewrite the seed corpus in testdata")

const mm = 1e-3

// planarProblem uses every shape type, a floating conductor, a charge
// region, a line charge, a prescribed side, a conductor side and an open
// side with the default far field.
func planarProblem() *bc.Problem {
	p := &bc.Problem{
		Metric:     grid.Planar,
		Domain:     bc.Rect{X0: 0, Y0: 0, X1: 10 * mm, Y1: 8 * mm},
		Background: 1,
		Conductors: []bc.Conductor{
			{Name: "hv", Potential: 1},
			{Name: "gnd"},
			{Name: "ring", Floating: true, Charge: 1e-12},
		},
		Regions: []bc.Region{
			{Name: "FR-4", Kind: bc.Dielectric, Shape: bc.Rect{X0: 0, Y0: 0, X1: 10 * mm, Y1: 2 * mm}, EpsR: 4.4},
			{Name: "PTFE", Kind: bc.Dielectric, Shape: bc.Polygon{X: []float64{3 * mm, 6 * mm, 4.5 * mm}, Y: []float64{3 * mm, 3 * mm, 5.5 * mm}}, EpsR: 2.1},
			{Name: "space charge", Kind: bc.Charge, Shape: bc.Circle{X: 7 * mm, Y: 5 * mm, R: 0.8 * mm}, EpsR: 3, Rho: 1e-6},
			{Name: "trace", Kind: bc.ConductorRegion, Conductor: "hv", Shape: bc.Strip{X0: 2 * mm, Y0: 2.2 * mm, X1: 5 * mm, Y1: 2.2 * mm, Thickness: 0.1 * mm}},
			{Name: "wire", Kind: bc.ConductorRegion, Conductor: "hv", Shape: bc.Circle{X: 2 * mm, Y: 6 * mm, R: 0.6 * mm}},
			{Name: "ring", Kind: bc.ConductorRegion, Conductor: "ring", Shape: bc.Annulus{X: 7 * mm, Y: 5 * mm, R0: 1.2 * mm, R1: 1.5 * mm}},
		},
		Charges: []bc.PointCharge{{Name: "line", X: 8.5 * mm, Y: 1.5 * mm, Q: 1e-12}},
	}
	p.Sides[bc.Bottom] = bc.Side{Kind: bc.Fixed, Conductor: "gnd"}
	p.Sides[bc.Top] = bc.Side{Kind: bc.Fixed, Potential: 0.5}
	p.Sides[bc.Right] = bc.Side{Kind: bc.Open}
	return p
}

// axiProblem is an r–z electrode with every shape type: a sphere on the
// axis, a toroidal grading ring, a disc, an insulator polygon, a charge
// region and a ring charge, inside a grounded can open at the top, with
// a far field given explicitly.
func axiProblem() *bc.Problem {
	p := &bc.Problem{
		Metric: grid.Axisymmetric,
		Domain: bc.Rect{X0: 0, Y0: 0, X1: 10 * mm, Y1: 10 * mm},
		Conductors: []bc.Conductor{
			{Name: "electrode", Potential: 1000},
			{Name: "can"},
			{Name: "grading", Floating: true},
		},
		Regions: []bc.Region{
			{Name: "oil", Kind: bc.Dielectric, Shape: bc.Rect{X0: 0, Y0: 0, X1: 10 * mm, Y1: 3 * mm}, EpsR: 2.2},
			{Name: "insulator", Kind: bc.Dielectric, Shape: bc.Polygon{X: []float64{0, 3 * mm, 3 * mm, 0}, Y: []float64{0, 0, 3.5 * mm, 3.5 * mm}}, EpsR: 4},
			{Name: "cloud", Kind: bc.Charge, Shape: bc.Circle{X: 7 * mm, Y: 8 * mm, R: 0.7 * mm}, Rho: -2e-6},
			{Name: "sphere", Kind: bc.ConductorRegion, Conductor: "electrode", Shape: bc.Circle{X: 0, Y: 5 * mm, R: 1.5 * mm}},
			{Name: "torus", Kind: bc.ConductorRegion, Conductor: "grading", Shape: bc.Annulus{X: 5 * mm, Y: 5 * mm, R0: 0.3 * mm, R1: 0.7 * mm}},
			{Name: "disc", Kind: bc.ConductorRegion, Conductor: "can", Shape: bc.Strip{X0: 0, Y0: 8.5 * mm, X1: 4 * mm, Y1: 8.5 * mm, Thickness: 0.2 * mm}},
		},
		Charges: []bc.PointCharge{{Name: "ring", X: 8 * mm, Y: 2 * mm, Q: -1e-13}},
	}
	p.Sides[bc.Right] = bc.Side{Kind: bc.Fixed, Conductor: "can"}
	p.Sides[bc.Top] = bc.Side{Kind: bc.Open}
	p.Far = &bc.FarField{X: 0, Y: 5 * mm, Decay: 2}
	return p
}

func uniformGrid(t testing.TB, p *bc.Problem, nx, ny int) *grid.Grid {
	t.Helper()
	d := p.Domain
	x, err := grid.Uniform(d.X0, d.X1, nx)
	if err != nil {
		t.Fatal(err)
	}
	y, err := grid.Uniform(d.Y0, d.Y1, ny)
	if err != nil {
		t.Fatal(err)
	}
	g, err := grid.New(x, y, p.Metric)
	if err != nil {
		t.Fatal(err)
	}
	return g
}

func solveProblem(t testing.TB, p *bc.Problem, nx, ny int) *field.Solution {
	t.Helper()
	sol, err := field.Solve(context.Background(), p, uniformGrid(t, p, nx, ny), &field.Settings{Solver: solve.Settings{Tol: 1e-11}})
	if err != nil {
		t.Fatal(err)
	}
	return sol
}

// archiveOf wraps a solution with every optional part filled in.
func archiveOf(sol *field.Solution, p *bc.Problem, name string) *Archive {
	a := FromSolution(sol)
	a.ModelName = name
	a.ModelSource = []byte("# model text\ntitle = \"" + name + "\"\n")
	a.Problem = p
	a.Unit = Unit{Name: "mm", Scale: mm}
	a.Report = []byte(`{"format":"phigrid-report","version":1}`)
	return a
}

// exact compares floats by their bits and grids by metric and axes.
var exact = cmp.Options{
	cmp.Comparer(func(a, b float64) bool { return math.Float64bits(a) == math.Float64bits(b) }),
	cmp.Comparer(func(a, b *grid.Grid) bool {
		if a == nil || b == nil {
			return a == b
		}
		bits := func(x []float64) []uint64 {
			out := make([]uint64, len(x))
			for i, v := range x {
				out[i] = math.Float64bits(v)
			}
			return out
		}
		return a.Metric() == b.Metric() && cmp.Equal(bits(a.X()), bits(b.X())) && cmp.Equal(bits(a.Y()), bits(b.Y()))
	}),
}

func roundTrip(t *testing.T, a *Archive) *Archive {
	t.Helper()
	var buf bytes.Buffer
	if err := Write(&buf, a); err != nil {
		t.Fatal(err)
	}
	b, err := Read(&buf)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

func TestRoundTrip(t *testing.T) {
	for _, c := range []struct {
		name   string
		reason string
		p      *bc.Problem
		nx, ny int
	}{
		{"planar", "every shape, floating conductor, charges, prescribed side", planarProblem(), 41, 33},
		{"axisymmetric", "every shape in r–z, ring charge, floating ring", axiProblem(), 41, 41},
	} {
		t.Run(c.name, func(t *testing.T) {
			sol := solveProblem(t, c.p, c.nx, c.ny)
			m := sol.Map
			if m.Rho == nil || m.Point == nil || len(m.Surface) == 0 || m.CellRegion == nil || m.EpsX == nil || sol.Sys.Far == nil {
				t.Fatalf("%s: the case must exercise every optional map part", c.reason)
			}
			a := archiveOf(sol, c.p, c.name+".toml")
			b := roundTrip(t, a)
			want := *a
			want.Version = Version{Major, Minor}
			if d := cmp.Diff(&want, b, exact); d != "" {
				t.Errorf("%s: round trip changed the archive (-wrote +read):\n%s", c.reason, d)
			}
			// Recomputed quantities equal the originals bit for bit.
			sol2, err := b.Solution()
			if err != nil {
				t.Fatal(err)
			}
			if d := cmp.Diff(sol.Charges(), sol2.Charges(), exact); d != "" {
				t.Errorf("charges differ (-original +reloaded):\n%s", d)
			}
			if e1, e2 := sol.Energy(), sol2.Energy(); math.Float64bits(e1) != math.Float64bits(e2) {
				t.Errorf("energy %v, reloaded %v", e1, e2)
			}
			for k := range sol.Map.Conductors {
				if d := cmp.Diff(sol.SurfaceField(k), sol2.SurfaceField(k), exact); d != "" {
					t.Errorf("surface field of conductor %d differs:\n%s", k, d)
				}
			}
			if d := cmp.Diff(sol.PeakRegionFields(), sol2.PeakRegionFields(), exact); d != "" {
				t.Errorf("peak region fields differ:\n%s", d)
			}
			ex1, ey1 := sol.NodeFieldTo(nil, nil)
			ex2, ey2 := sol2.NodeFieldTo(nil, nil)
			if d := cmp.Diff([][]float64{ex1, ey1}, [][]float64{ex2, ey2}, exact); d != "" {
				t.Errorf("nodal field differs:\n%s", d)
			}
			// The problem rasterises again to the same map.
			m2, err := bc.Rasterize(b.Problem, b.Grid, nil)
			if err != nil {
				t.Fatal(err)
			}
			if d := cmp.Diff(sol.Map, m2, exact); d != "" {
				t.Errorf("re-rasterised map differs:\n%s", d)
			}
		})
	}
}

// TestMinimal checks an archive without any optional part: nil slices
// stay nil and empty ones stay empty.
func TestMinimal(t *testing.T) {
	p := planarProblem()
	sol := solveProblem(t, p, 21, 17)
	a := FromSolution(sol)
	a.Map.Regions = []bc.Region{}
	a.Map.CellRegion = nil
	a.Map.Surface = []bc.Crossing{}
	b := roundTrip(t, a)
	if b.Problem != nil || b.ModelSource != nil || b.Report != nil || b.Map.CellRegion != nil {
		t.Errorf("absent parts came back: problem %v, model %q, report %q, cell regions %d", b.Problem, b.ModelSource, b.Report, len(b.Map.CellRegion))
	}
	if b.Map.Regions == nil || len(b.Map.Regions) != 0 || b.Map.Surface == nil || len(b.Map.Surface) != 0 {
		t.Errorf("empty parts did not come back empty: regions %#v, surface %#v", b.Map.Regions, b.Map.Surface)
	}
}

// TestFuncSide checks a side prescribed by a function: the archive keeps
// the node values and Read gives the side a function that reproduces them.
func TestFuncSide(t *testing.T) {
	p := planarProblem()
	p.Sides[bc.Top] = bc.Side{Kind: bc.Fixed, Func: func(x, y float64) float64 { return math.Sin(300 * x) }}
	sol := solveProblem(t, p, 41, 33)
	b := roundTrip(t, archiveOf(sol, p, "func.toml"))
	if b.Problem.Sides[bc.Top].Func == nil {
		t.Fatal("the function side came back without a function")
	}
	m2, err := bc.Rasterize(b.Problem, b.Grid, nil)
	if err != nil {
		t.Fatal(err)
	}
	if d := cmp.Diff(sol.Map.Value, m2.Value, exact); d != "" {
		t.Errorf("re-rasterised prescribed values differ:\n%s", d)
	}
	f := b.Problem.Sides[bc.Top].Func
	// Halfway between two nodes the function is the mean of their values.
	xs := b.Grid.X()
	top := (b.Grid.Ny() - 1) * b.Grid.Nx()
	mid := 0.5 * (xs[3] + xs[4])
	want := 0.5 * (sol.Map.Value[top+3] + sol.Map.Value[top+4])
	if got := f(mid, 8*mm); math.Abs(got-want) > 1e-15 {
		t.Errorf("interpolated side value %g, want %g", got, want)
	}
	if d := cmp.Diff(sol.Charges(), mustSolution(t, b).Charges(), exact); d != "" {
		t.Errorf("charges differ:\n%s", d)
	}
}

func mustSolution(t *testing.T, a *Archive) *field.Solution {
	t.Helper()
	s, err := a.Solution()
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// customShape is a shape the archive cannot store.
type customShape struct{ bc.Rect }

func TestWriteInvalid(t *testing.T) {
	p := planarProblem()
	sol := solveProblem(t, p, 21, 17)
	for _, c := range []struct {
		name   string
		reason string
		edit   func(a *Archive)
		want   string
	}{
		{"no map", "a map is required", func(a *Archive) { a.Map = nil }, "no map"},
		{"short phi", "phi must have one value per node", func(a *Archive) { a.Phi = a.Phi[:10] }, "Phi has 10 entries"},
		{"nan phi", "potentials must be finite", func(a *Archive) { a.Phi = append([]float64(nil), a.Phi...); a.Phi[3] = math.NaN() }, "Phi[3] = NaN"},
		{"other grid", "grid and map must agree", func(a *Archive) { a.Grid = uniformGrid(t, p, 21, 17) }, "not its map's grid"},
		{"bad report", "the report must be JSON", func(a *Archive) { a.Report = []byte("{") }, "not valid JSON"},
		{"custom shape", "only bc shapes can be stored", func(a *Archive) {
			q := *p
			q.Regions = append([]bc.Region(nil), p.Regions...)
			q.Regions[0].Shape = customShape{q.Regions[0].Shape.(bc.Rect)}
			a.Problem = &q
		}, "cannot be archived"},
		{"problem mismatch", "the problem must belong to the map", func(a *Archive) { a.Problem = axiProblem() }, "the problem is axisymmetric but the grid is planar"},
	} {
		t.Run(c.name, func(t *testing.T) {
			a := archiveOf(sol, p, "x.toml")
			c.edit(a)
			var buf bytes.Buffer
			err := Write(&buf, a)
			if !errors.Is(err, ErrInvalid) || !strings.Contains(err.Error(), c.want) {
				t.Errorf("%s: got %v, want ErrInvalid containing %q", c.reason, err, c.want)
			}
			if buf.Len() != 0 {
				t.Errorf("%s: %d bytes written despite the error", c.reason, buf.Len())
			}
		})
	}
}

func TestSaveLoad(t *testing.T) {
	p := planarProblem()
	sol := solveProblem(t, p, 21, 17)
	a := archiveOf(sol, p, "plates.toml")
	dir := t.TempDir()
	path := filepath.Join(dir, "result.pga")
	if err := Save(path, a); err != nil {
		t.Fatal(err)
	}
	b, err := Load(path)
	if err != nil {
		t.Fatal(err)
	}
	want := *a
	want.Version = Version{Major, Minor}
	if d := cmp.Diff(&want, b, exact); d != "" {
		t.Errorf("Save then Load changed the archive:\n%s", d)
	}
	// A failed save leaves the old file and no temporary file.
	bad := *a
	bad.Phi = nil
	if err := Save(path, &bad); !errors.Is(err, ErrInvalid) {
		t.Errorf("saving an invalid archive gave %v, want ErrInvalid", err)
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 1 || entries[0].Name() != "result.pga" {
		t.Errorf("directory holds %v after a failed save, want only result.pga", entries)
	}
	if _, err := Load(path); err != nil {
		t.Errorf("the old archive no longer loads after a failed save: %v", err)
	}
	if err := Save(filepath.Join(dir, "missing", "r.pga"), a); err == nil {
		t.Error("saving into a missing directory succeeded")
	}
	if _, err := Load(filepath.Join(dir, "none.pga")); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("loading a missing file gave %v, want os.ErrNotExist", err)
	}
}

// rawSection is a section written by hand, for tests of the reader.
type rawSection struct {
	name string
	typ  byte
	data []byte
	// length overrides the declared length when not zero.
	length uint64
}

// rawArchive builds an archive file from hand-made sections.
func rawArchive(t testing.TB, major, minor uint16, secs []rawSection) []byte {
	t.Helper()
	var payload bytes.Buffer
	for _, s := range secs {
		payload.WriteByte(byte(len(s.name)))
		payload.WriteString(s.name)
		payload.WriteByte(s.typ)
		l := uint64(len(s.data))
		if s.length != 0 {
			l = s.length
		}
		payload.Write(binary.LittleEndian.AppendUint64(nil, l))
		payload.Write(s.data)
	}
	var out bytes.Buffer
	out.Write(magic[:])
	out.Write(binary.LittleEndian.AppendUint16(nil, major))
	out.Write(binary.LittleEndian.AppendUint16(nil, minor))
	enc, err := zstd.NewWriter(&out)
	if err != nil {
		t.Fatal(err)
	}
	enc.Write(payload.Bytes())
	enc.Close()
	return out.Bytes()
}

// sectionsOf decodes a valid archive into its raw sections.
func sectionsOf(t testing.TB, file []byte) []rawSection {
	t.Helper()
	dec, err := zstd.NewReader(bytes.NewReader(file[headerSize:]))
	if err != nil {
		t.Fatal(err)
	}
	defer dec.Close()
	var p []byte
	if p, err = dec.DecodeAll(file[headerSize:], nil); err != nil {
		t.Fatal(err)
	}
	var secs []rawSection
	for len(p) > 0 {
		n := int(p[0])
		s := rawSection{name: string(p[1 : 1+n]), typ: p[1+n]}
		l := binary.LittleEndian.Uint64(p[2+n:])
		s.data = p[10+n : 10+n+int(l)]
		secs = append(secs, s)
		p = p[10+n+int(l):]
	}
	return secs
}

func f64bytes(v ...float64) []byte {
	var b []byte
	for _, x := range v {
		b = binary.LittleEndian.AppendUint64(b, math.Float64bits(x))
	}
	return b
}

func TestReadErrors(t *testing.T) {
	p := planarProblem()
	sol := solveProblem(t, p, 5, 4)
	var good bytes.Buffer
	if err := Write(&good, archiveOf(sol, p, "small.toml")); err != nil {
		t.Fatal(err)
	}
	secs := sectionsOf(t, good.Bytes())
	// edit returns the sections with f applied to the named one.
	edit := func(name string, f func(s *rawSection)) []rawSection {
		out := make([]rawSection, len(secs))
		copy(out, secs)
		for i := range out {
			if out[i].name == name {
				f(&out[i])
			}
		}
		return out
	}
	drop := func(name string) []rawSection {
		var out []rawSection
		for _, s := range secs {
			if s.name != name {
				out = append(out, s)
			}
		}
		return out
	}
	insert := func(at int, s rawSection) []rawSection {
		out := append([]rawSection(nil), secs[:at]...)
		out = append(out, s)
		return append(out, secs[at:]...)
	}
	flipped := append([]byte(nil), good.Bytes()...)
	flipped[len(flipped)/2] ^= 0x40
	for _, c := range []struct {
		name    string
		reason  string
		file    []byte
		version bool
		want    string
	}{
		{"empty", "an empty file has no header", nil, false, "shorter than the 12-byte"},
		{"magic", "the signature must match", append([]byte("PK\x03\x04"), good.Bytes()[4:]...), false, "signature"},
		{"major", "another major version is refused before decompressing", rawArchive(t, 2, 0, secs), true, "format 2.0"},
		{"truncated", "a cut file is corrupt", good.Bytes()[:good.Len()-20], false, "truncated"},
		{"flipped", "the zstd checksum catches a changed byte", flipped, false, "damaged"},
		{"trailing", "nothing may follow the frame", append(append([]byte(nil), good.Bytes()...), 0, 1, 2, 3), false, ""},
		{"no end", "the payload must close with end", rawArchive(t, 1, 0, secs[:len(secs)-1]), false, "needs an end section"},
		{"after end", "nothing may follow end", rawArchive(t, 1, 0, append(append([]rawSection(nil), secs...), secs[0])), false, "does not end cleanly"},
		{"meta first", "meta must come first", rawArchive(t, 1, 0, append([]rawSection{secs[1]}, secs...)), false, "want meta"},
		{"twice", "a section may appear once", rawArchive(t, 1, 0, insert(2, secs[1])), false, "appears twice"},
		{"missing phi", "phi is required", rawArchive(t, 1, 0, drop("phi")), false, "section phi"},
		{"huge length", "a declared length beyond the data is caught without allocating it", rawArchive(t, 1, 0, edit("model", func(s *rawSection) { s.length = 1 << 62 })), false, "more than the limit"},
		{"huge array", "an array longer than the grid is refused", rawArchive(t, 1, 0, edit("phi", func(s *rawSection) { s.length = 8 << 40 })), false, "elements, want 20"},
		{"odd length", "a length must fit the element size", rawArchive(t, 1, 0, edit("phi", func(s *rawSection) { s.data = s.data[:7] })), false, "not a multiple"},
		{"bad type", "phi must be float64", rawArchive(t, 1, 0, edit("phi", func(s *rawSection) { s.typ = typeInt32 })), false, "want float64"},
		{"unknown type", "element types are known", rawArchive(t, 1, 0, edit("phi", func(s *rawSection) { s.typ = 99 })), false, "unknown element type"},
		{"name byte", "names are lower-case ASCII", rawArchive(t, 1, 0, edit("model", func(s *rawSection) { s.name = "Model" })), false, "outside a–z"},
		{"big grid", "the node cap is checked", rawArchive(t, 1, 0, edit("meta", func(s *rawSection) {
			s.data = []byte(`{"metric":"planar","nx":100000,"ny":100000,"conductors":3,"snapped":0,"model_name":"","unit":{"name":"","scale":0}}`)
		})), false, "outside 2 × 2"},
		{"meta metric", "meta names a known metric", rawArchive(t, 1, 0, edit("meta", func(s *rawSection) { s.data = []byte(`{"nx":5,"ny":4,"extra":1}`) })), false, `unknown metric ""`},
		{"meta json", "meta is JSON", rawArchive(t, 1, 0, edit("meta", func(s *rawSection) { s.data = []byte(`{"nx":5,`) })), false, "decoding the metadata"},
		{"cond range", "conductor indices are checked", rawArchive(t, 1, 0, edit("map.cond", func(s *rawSection) {
			s.data = append([]byte(nil), s.data...)
			binary.LittleEndian.PutUint32(s.data, 7)
		})), false, "conductor 7 of 3"},
		{"cut range", "cut fractions lie in (0, 1]", rawArchive(t, 1, 0, edit("map.cutx", func(s *rawSection) {
			s.data = append(f64bytes(0), s.data[8:]...)
		})), false, "cut fraction 0"},
		{"bad axis", "grid axes must increase", rawArchive(t, 1, 0, edit("grid.x", func(s *rawSection) {
			s.data = f64bytes(0, 1, 1, 2, 3)
		})), false, "do not make a grid"},
		{"bad shape", "shapes are tagged", rawArchive(t, 1, 0, edit("problem", func(s *rawSection) {
			s.data = bytes.Replace(s.data, []byte(`"type":"circle"`), []byte(`"type":"blob"`), 1)
		})), false, `unknown shape type "blob"`},
	} {
		t.Run(c.name, func(t *testing.T) {
			a, err := Read(bytes.NewReader(c.file))
			if a != nil {
				t.Errorf("%s: Read returned an archive with error %v", c.reason, err)
			}
			if c.version {
				var ve *VersionError
				if !errors.As(err, &ve) || !errors.Is(err, ErrVersion) {
					t.Errorf("%s: got %v, want a *VersionError", c.reason, err)
				}
			} else {
				var fe *FormatError
				if !errors.As(err, &fe) || !errors.Is(err, ErrFormat) {
					t.Errorf("%s: got %v, want a *FormatError", c.reason, err)
				}
			}
			if err != nil && !strings.Contains(err.Error(), c.want) {
				t.Errorf("%s: error %q does not contain %q", c.reason, err, c.want)
			}
		})
	}
	// A later minor version with an unknown section and an unknown meta
	// field still reads.
	extra := insert(1, rawSection{name: "future.thing", typ: typeFloat64, data: f64bytes(1, 2, 3)})
	extra[0].data = append(bytes.TrimSuffix(extra[0].data, []byte("}")), []byte(`,"future":true}`)...)
	a, err := Read(bytes.NewReader(rawArchive(t, 1, 7, extra)))
	if err != nil {
		t.Fatalf("a minor-version archive with an unknown section: %v", err)
	}
	if a.Version != (Version{1, 7}) {
		t.Errorf("version %v, want 1.7", a.Version)
	}
}

// TestSeedCorpus keeps testdata/ in step with the format: a small valid
// archive and damaged variants, which FuzzRead starts from. Run with
// -update to write them again.
func TestSeedCorpus(t *testing.T) {
	files := seedFiles(t)
	for name, want := range map[string]bool{"small.pga": true, "truncated.pga": false, "flipped.pga": false, "badmagic.pga": false, "version2.pga": false, "trailing.pga": false, "hugesection.pga": false} {
		path := filepath.Join("testdata", name)
		if *update {
			if err := os.WriteFile(path, files[name], 0o644); err != nil {
				t.Fatal(err)
			}
		}
		b, err := os.ReadFile(path)
		if err != nil {
			t.Fatalf("%v (run go test -update to write the seed corpus)", err)
		}
		_, err = Read(bytes.NewReader(b))
		if (err == nil) != want {
			t.Errorf("%s: Read error %v, want success %v", name, err, want)
		}
	}
}

func seedFiles(t testing.TB) map[string][]byte {
	p := &bc.Problem{
		Domain:     bc.Rect{X0: 0, Y0: 0, X1: 4 * mm, Y1: 3 * mm},
		Conductors: []bc.Conductor{{Name: "a", Potential: 1}, {Name: "b"}},
		Regions: []bc.Region{
			{Name: "wire", Kind: bc.ConductorRegion, Conductor: "a", Shape: bc.Circle{X: 2 * mm, Y: 1.5 * mm, R: 0.6 * mm}},
			{Name: "glass", Kind: bc.Dielectric, Shape: bc.Rect{X0: 0, Y0: 0, X1: 4 * mm, Y1: 1 * mm}, EpsR: 5},
		},
	}
	p.Sides[bc.Bottom] = bc.Side{Kind: bc.Fixed, Conductor: "b"}
	sol := solveProblem(t, p, 6, 5)
	var buf bytes.Buffer
	if err := Write(&buf, archiveOf(sol, p, "seed.toml")); err != nil {
		t.Fatal(err)
	}
	good := buf.Bytes()
	flipped := append([]byte(nil), good...)
	flipped[len(flipped)*2/3] ^= 0x08
	v2 := append([]byte(nil), good...)
	v2[8] = 2
	secs := sectionsOf(t, good)
	secs[1].length = 1 << 40
	return map[string][]byte{
		"small.pga":       good,
		"truncated.pga":   good[:len(good)/2],
		"flipped.pga":     flipped,
		"badmagic.pga":    append([]byte("\x89PNG"), good[4:]...),
		"version2.pga":    v2,
		"trailing.pga":    append(append([]byte(nil), good...), good[:16]...),
		"hugesection.pga": rawArchive(t, 1, 0, secs),
	}
}

func TestSolutionRejectsInconsistent(t *testing.T) {
	sol := solveProblem(t, planarProblem(), 21, 17)
	a := FromSolution(sol)
	a.V = a.V[:1]
	if _, err := a.Solution(); !errors.Is(err, ErrInvalid) {
		t.Errorf("Solution of an inconsistent archive gave %v, want ErrInvalid", err)
	}
}

func TestFormatErrorText(t *testing.T) {
	e := &FormatError{Section: "phi", Offset: 12, Msg: "bad", Err: errors.New("cause")}
	want := "archive: section phi at byte 12: bad: cause (the file is damaged or not a phigrid archive; write it again from the model)"
	if e.Error() != want {
		t.Errorf("got %q, want %q", e.Error(), want)
	}
	if (&FormatError{Offset: -1, Msg: "x"}).Error() != "archive: header: x (the file is damaged or not a phigrid archive; write it again from the model)" {
		t.Errorf("header error text wrong: %q", (&FormatError{Offset: -1, Msg: "x"}).Error())
	}
}
