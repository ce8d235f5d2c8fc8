package export

import (
	"errors"
	"os"
	"path/filepath"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/phigrid/phigrid/grid"
)

func readNPYFile(t *testing.T, path string) ([]float64, []int) {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	data, shape, err := ReadNPY(f)
	if err != nil {
		t.Fatalf("%s: %v", path, err)
	}
	return data, shape
}

func TestWriteNPYSet(t *testing.T) {
	g, f := testGrid(t, grid.Axisymmetric)
	dir := filepath.Join(t.TempDir(), "out") // created by WriteNPYSet
	paths, err := WriteNPYSet(dir, g, f)
	if err != nil {
		t.Fatal(err)
	}
	var files []string
	for _, p := range paths {
		if filepath.Dir(p) != dir {
			t.Errorf("path %s not in %s", p, dir)
		}
		files = append(files, filepath.Base(p))
	}
	want := []string{"x.npy", "y.npy", "emag.npy", "phi.npy", "ex.npy", "ey.npy", "eps_r.npy"}
	if diff := cmp.Diff(want, files); diff != "" {
		t.Errorf("files (-want +got):\n%s", diff)
	}
	if diff := cmp.Diff(want, dirNames(t, dir), cmpopts.SortSlices(func(a, b string) bool { return a < b })); diff != "" {
		t.Errorf("directory content (-want +got):\n%s", diff)
	}

	tests := []struct {
		file  string
		shape []int
		data  []float64
	}{
		{"x.npy", []int{4}, g.X()},
		{"y.npy", []int{3}, g.Y()},
		{"phi.npy", []int{3, 4}, f.Point["phi"]},
		{"emag.npy", []int{3, 4}, f.Point["emag"]},
		{"ex.npy", []int{3, 4}, f.PointVectors["e"][0]},
		{"ey.npy", []int{3, 4}, f.PointVectors["e"][1]},
		{"eps_r.npy", []int{2, 3}, f.Cell["eps_r"]},
	}
	for _, tt := range tests {
		data, shape := readNPYFile(t, filepath.Join(dir, tt.file))
		if diff := cmp.Diff(tt.shape, shape); diff != "" {
			t.Errorf("%s shape (-want +got):\n%s", tt.file, diff)
		}
		if diff := cmp.Diff(tt.data, data); diff != "" {
			t.Errorf("%s data (-want +got):\n%s", tt.file, diff)
		}
	}
	// Row j of phi.npy is y index j: phi[j, i] = i + 0.01 j by construction.
	phi, _ := readNPYFile(t, filepath.Join(dir, "phi.npy"))
	if got := phi[2*4+3]; got != 3.02 {
		t.Errorf("phi[2, 3] = %g, want 3.02 (node i=3, j=2)", got)
	}
}

func TestWriteNPYSetInvalid(t *testing.T) {
	g, _ := testGrid(t, grid.Planar)
	nodes := make([]float64, g.Len())
	cells := make([]float64, g.Cells())
	tests := []struct {
		reason string
		f      Fields
	}{
		{"point array named like an axis", Fields{Point: map[string][]float64{"x": nodes}}},
		{"point array differs from an axis only in case", Fields{Point: map[string][]float64{"Y": nodes}}},
		{"vector component named like a point array", Fields{Point: map[string][]float64{"ex": nodes}, PointVectors: map[string][2][]float64{"e": {nodes, nodes}}}},
		{"cell and point array share a file", Fields{Point: map[string][]float64{"eps": nodes}, Cell: map[string][]float64{"EPS": cells}}},
		{"wrong length", Fields{Cell: map[string][]float64{"eps_r": nodes}}},
		{"path separator in a name", Fields{Point: map[string][]float64{"../phi": nodes}}},
	}
	for _, tt := range tests {
		t.Run(tt.reason, func(t *testing.T) {
			dir := t.TempDir()
			paths, err := WriteNPYSet(dir, g, tt.f)
			if !errors.Is(err, ErrInvalid) {
				t.Fatalf("error %v, want ErrInvalid", err)
			}
			if len(paths) != 0 || len(dirNames(t, dir)) != 0 {
				t.Errorf("invalid input wrote %v", dirNames(t, dir))
			}
		})
	}
}
