package export

import (
	"bytes"
	"encoding/xml"
	"errors"
	"math"
	"strconv"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/phigrid/phigrid/grid"
)

// vtkFile mirrors the parts of a .vtr file the tests check.
type vtkFile struct {
	XMLName   xml.Name `xml:"VTKFile"`
	Type      string   `xml:"type,attr"`
	Version   string   `xml:"version,attr"`
	ByteOrder string   `xml:"byte_order,attr"`
	Grid      struct {
		WholeExtent string `xml:"WholeExtent,attr"`
		Piece       struct {
			Extent    string `xml:"Extent,attr"`
			PointData struct {
				Scalars string         `xml:"Scalars,attr"`
				Vectors string         `xml:"Vectors,attr"`
				Arrays  []vtkDataArray `xml:"DataArray"`
			} `xml:"PointData"`
			CellData struct {
				Scalars string         `xml:"Scalars,attr"`
				Arrays  []vtkDataArray `xml:"DataArray"`
			} `xml:"CellData"`
			Coordinates struct {
				Arrays []vtkDataArray `xml:"DataArray"`
			} `xml:"Coordinates"`
		} `xml:"Piece"`
	} `xml:"RectilinearGrid"`
}

type vtkDataArray struct {
	Type       string `xml:"type,attr"`
	Name       string `xml:"Name,attr"`
	Components string `xml:"NumberOfComponents,attr"`
	Format     string `xml:"format,attr"`
	Text       string `xml:",chardata"`
}

func (a vtkDataArray) values(t *testing.T) []float64 {
	t.Helper()
	var v []float64
	for _, f := range strings.Fields(a.Text) {
		x, err := strconv.ParseFloat(f, 64)
		if err != nil {
			t.Fatalf("array %s: %v", a.Name, err)
		}
		v = append(v, x)
	}
	return v
}

// testGrid returns a graded 4×3 grid and fields whose values encode their
// position, so that any reordering shows.
func testGrid(t *testing.T, m grid.Metric) (*grid.Grid, Fields) {
	t.Helper()
	g, err := grid.New([]float64{0, 0.1, 0.3, 0.7}, []float64{-1, 0, 2.5}, m)
	if err != nil {
		t.Fatal(err)
	}
	node := func(f func(i, j int) float64) []float64 {
		v := make([]float64, g.Len())
		for j := 0; j < g.Ny(); j++ {
			for i := 0; i < g.Nx(); i++ {
				v[g.Index(i, j)] = f(i, j)
			}
		}
		return v
	}
	cell := make([]float64, g.Cells())
	for j := 0; j < g.Ny()-1; j++ {
		for i := 0; i < g.Nx()-1; i++ {
			cell[g.CellIndex(i, j)] = 1 + float64(i) + 10*float64(j)
		}
	}
	return g, Fields{
		Point: map[string][]float64{
			"phi":  node(func(i, j int) float64 { return float64(i) + 0.01*float64(j) }),
			"emag": node(func(i, j int) float64 { return 1e-7 * float64(i*j) }),
		},
		PointVectors: map[string][2][]float64{
			"e": {node(func(i, j int) float64 { return -float64(i) }), node(func(i, j int) float64 { return 1.0 / 3 * float64(j) })},
		},
		Cell: map[string][]float64{"eps_r": cell},
	}
}

func TestWriteVTR(t *testing.T) {
	for _, m := range []grid.Metric{grid.Planar, grid.Axisymmetric} {
		t.Run(m.String(), func(t *testing.T) {
			g, f := testGrid(t, m)
			var buf bytes.Buffer
			if err := WriteVTR(&buf, g, f); err != nil {
				t.Fatal(err)
			}
			var v vtkFile
			if err := xml.Unmarshal(buf.Bytes(), &v); err != nil {
				t.Fatalf("output is not well-formed XML: %v", err)
			}
			// source: VTK file formats documentation, XML RectilinearGrid
			// (common practice): extents are inclusive node index ranges.
			if v.Type != "RectilinearGrid" || v.Version != "1.0" || v.ByteOrder != "LittleEndian" {
				t.Errorf("VTKFile attributes %q %q %q", v.Type, v.Version, v.ByteOrder)
			}
			if v.Grid.WholeExtent != "0 3 0 2 0 0" || v.Grid.Piece.Extent != "0 3 0 2 0 0" {
				t.Errorf("extents %q, %q, want \"0 3 0 2 0 0\"", v.Grid.WholeExtent, v.Grid.Piece.Extent)
			}
			coords := v.Grid.Piece.Coordinates.Arrays
			if len(coords) != 3 {
				t.Fatalf("%d coordinate arrays, want 3", len(coords))
			}
			for k, want := range [][]float64{g.X(), g.Y(), {0}} {
				if diff := cmp.Diff(want, coords[k].values(t)); diff != "" {
					t.Errorf("coordinate %d (-want +got):\n%s", k, diff)
				}
			}

			pd := v.Grid.Piece.PointData
			if pd.Scalars != "emag" || pd.Vectors != "e" {
				t.Errorf("active point arrays %q, %q, want emag, e", pd.Scalars, pd.Vectors)
			}
			var names []string
			for _, a := range pd.Arrays {
				names = append(names, a.Name)
				if a.Type != "Float64" || a.Format != "ascii" {
					t.Errorf("array %s: type %q format %q", a.Name, a.Type, a.Format)
				}
			}
			if diff := cmp.Diff([]string{"emag", "phi", "e"}, names); diff != "" {
				t.Errorf("point array order (-want +got):\n%s", diff)
			}
			if diff := cmp.Diff(f.Point["phi"], pd.Arrays[1].values(t)); diff != "" {
				t.Errorf("phi (-want +got):\n%s", diff)
			}
			if diff := cmp.Diff(f.Point["emag"], pd.Arrays[0].values(t)); diff != "" {
				t.Errorf("emag (-want +got):\n%s", diff)
			}
			if pd.Arrays[2].Components != "3" {
				t.Errorf("vector has %q components, want 3", pd.Arrays[2].Components)
			}
			var vec []float64
			for k := range f.PointVectors["e"][0] {
				vec = append(vec, f.PointVectors["e"][0][k], f.PointVectors["e"][1][k], 0)
			}
			if diff := cmp.Diff(vec, pd.Arrays[2].values(t)); diff != "" {
				t.Errorf("vector e (-want +got):\n%s", diff)
			}

			cd := v.Grid.Piece.CellData
			if cd.Scalars != "eps_r" || len(cd.Arrays) != 1 {
				t.Fatalf("cell data %q with %d arrays", cd.Scalars, len(cd.Arrays))
			}
			if diff := cmp.Diff(f.Cell["eps_r"], cd.Arrays[0].values(t)); diff != "" {
				t.Errorf("eps_r (-want +got):\n%s", diff)
			}

			axi := strings.Contains(buf.String(), "x is the radius r, y is the axial coordinate z")
			if axi != (m == grid.Axisymmetric) {
				t.Errorf("r–z comment present = %v for a %v grid", axi, m)
			}
		})
	}
}

func TestWriteVTRDeterministic(t *testing.T) {
	g, f := testGrid(t, grid.Planar)
	f.Point["a"] = f.Point["phi"]
	f.Point["z"] = f.Point["phi"]
	var first bytes.Buffer
	if err := WriteVTR(&first, g, f); err != nil {
		t.Fatal(err)
	}
	for k := 0; k < 20; k++ {
		var buf bytes.Buffer
		if err := WriteVTR(&buf, g, f); err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(buf.Bytes(), first.Bytes()) {
			t.Fatal("two writes of the same fields differ")
		}
	}
}

func TestWriteVTREmpty(t *testing.T) {
	g, _ := testGrid(t, grid.Planar)
	var buf bytes.Buffer
	if err := WriteVTR(&buf, g, Fields{}); err != nil {
		t.Fatal(err)
	}
	var v vtkFile
	if err := xml.Unmarshal(buf.Bytes(), &v); err != nil {
		t.Fatal(err)
	}
	if len(v.Grid.Piece.PointData.Arrays)+len(v.Grid.Piece.CellData.Arrays) != 0 || len(v.Grid.Piece.Coordinates.Arrays) != 3 {
		t.Errorf("empty fields gave point/cell arrays or lost coordinates: %+v", v.Grid.Piece)
	}
}

func TestWriteVTRInvalid(t *testing.T) {
	g, _ := testGrid(t, grid.Planar)
	short := make([]float64, g.Len()-1)
	nodes := make([]float64, g.Len())
	nan := make([]float64, g.Len())
	nan[5] = math.NaN()
	tests := []struct {
		reason string
		f      Fields
		msg    string
	}{
		{"short point array", Fields{Point: map[string][]float64{"phi": short}}, "11 values"},
		{"point array sized like cells", Fields{Cell: map[string][]float64{"eps_r": nodes}}, "6 cells"},
		{"short vector component", Fields{PointVectors: map[string][2][]float64{"e": {nodes, short}}}, "component 1"},
		{"name with a quote", Fields{Point: map[string][]float64{`a"b`: nodes}}, "character"},
		{"name with a slash", Fields{Point: map[string][]float64{"a/b": nodes}}, "character"},
		{"empty name", Fields{Point: map[string][]float64{"": nodes}}, "1 to 64"},
		{"hidden name", Fields{Point: map[string][]float64{".phi": nodes}}, "'.'"},
		{"scalar and vector share a name", Fields{Point: map[string][]float64{"e": nodes}, PointVectors: map[string][2][]float64{"e": {nodes, nodes}}}, "both"},
		{"NaN", Fields{Point: map[string][]float64{"phi": nan}}, "i=1, j=1"},
		{"infinite vector", Fields{PointVectors: map[string][2][]float64{"e": {nodes, {math.Inf(1), 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0}}}}, "+Inf"},
	}
	for _, tt := range tests {
		t.Run(tt.reason, func(t *testing.T) {
			var buf bytes.Buffer
			err := WriteVTR(&buf, g, tt.f)
			if !errors.Is(err, ErrInvalid) {
				t.Fatalf("error %v, want ErrInvalid", err)
			}
			if !strings.Contains(err.Error(), tt.msg) {
				t.Errorf("error %q does not mention %q", err, tt.msg)
			}
			if buf.Len() != 0 {
				t.Errorf("%d bytes written on invalid input", buf.Len())
			}
		})
	}
	if err := WriteVTR(new(bytes.Buffer), nil, Fields{}); !errors.Is(err, ErrInvalid) {
		t.Errorf("nil grid: error %v, want ErrInvalid", err)
	}
}
