package export

import (
	"fmt"
	"io"
	"os"
	"path/filepath"

	"github.com/phigrid/phigrid/grid"
)

// WriteNPYSet writes the node axes and every array of f into dir, one .npy
// file each, and returns the paths written in the order they were written.
// dir is created if it does not exist.
//
// The files are:
//
//	x.npy          node coordinates along X, shape (Nx,)  (r in an axisymmetric grid)
//	y.npy          node coordinates along Y, shape (Ny,)  (z in an axisymmetric grid)
//	NAME.npy       each point array, shape (Ny, Nx)
//	NAMEx.npy      component 0 (along X) of each point vector, shape (Ny, Nx)
//	NAMEy.npy      component 1 (along Y) of each point vector, shape (Ny, Nx)
//	NAME.npy       each cell array, shape (Ny−1, Nx−1)
//
// so that with phi = np.load("phi.npy") the value phi[j, i] belongs to the
// node at (x[i], y[j]), and a vector named "e" gives ex.npy and ey.npy.
// Arrays are written in sorted name order: point arrays, point vectors,
// then cell arrays.
//
// Every name is checked before the first file is written, so invalid input
// writes nothing. File names must differ other than in letter case and may
// not be x or y. Each file is written with AtomicWriteFile, so a failure
// part-way leaves complete files only; the error says which file failed.
func WriteNPYSet(dir string, g *grid.Grid, f Fields) ([]string, error) {
	if err := f.check(g); err != nil {
		return nil, err
	}
	type item struct {
		file  string
		data  []float64
		shape []int
		from  string
	}
	nodes := []int{g.Ny(), g.Nx()}
	cells := []int{g.Ny() - 1, g.Nx() - 1}
	items := []item{
		{"x", g.X(), []int{g.Nx()}, "the X axis"},
		{"y", g.Y(), []int{g.Ny()}, "the Y axis"},
	}
	for _, name := range sortedKeys(f.Point) {
		items = append(items, item{name, f.Point[name], nodes, "point array " + name})
	}
	for _, name := range sortedKeys(f.PointVectors) {
		v := f.PointVectors[name]
		items = append(items,
			item{name + "x", v[0], nodes, "point vector " + name},
			item{name + "y", v[1], nodes, "point vector " + name})
	}
	for _, name := range sortedKeys(f.Cell) {
		items = append(items, item{name, f.Cell[name], cells, "cell array " + name})
	}
	seen := map[string]string{}
	for _, it := range items {
		key := foldName(it.file)
		if prev, dup := seen[key]; dup {
			return nil, invalidf("%s and %s would both be written to %s.npy; rename one", prev, it.from, it.file)
		}
		seen[key] = it.from
	}

	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, fmt.Errorf("export: creating the output directory: %w", err)
	}
	paths := make([]string, 0, len(items))
	for _, it := range items {
		p := filepath.Join(dir, it.file+".npy")
		err := AtomicWriteFile(p, func(w io.Writer) error {
			return WriteNPY(w, it.data, it.shape...)
		})
		if err != nil {
			return paths, err
		}
		paths = append(paths, p)
	}
	return paths, nil
}
