package export_test

import (
	"bytes"
	"fmt"
	"io"
	"os"
	"path/filepath"

	"github.com/phigrid/phigrid/grid"
	"github.com/phigrid/phigrid/io/export"
)

// A nodal field on a 3×2 grid goes to NPY with shape (Ny, Nx), so that in
// NumPy phi[j, i] is node (i, j), and reads back unchanged.
func Example() {
	g, _ := grid.New([]float64{0, 1e-3, 3e-3}, []float64{0, 2e-3}, grid.Planar)
	phi := make([]float64, g.Len())
	for j := 0; j < g.Ny(); j++ {
		for i := 0; i < g.Nx(); i++ {
			phi[g.Index(i, j)] = float64(10*j + i)
		}
	}
	var buf bytes.Buffer
	if err := export.WriteNPY(&buf, phi, g.Ny(), g.Nx()); err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("file bytes:", buf.Len())
	data, shape, err := export.ReadNPY(&buf)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("shape:", shape)
	fmt.Println("data:", data)
	// Output:
	// file bytes: 176
	// shape: [2 3]
	// data: [0 1 2 10 11 12]
}

func ExampleWriteNPYSet() {
	dir, err := os.MkdirTemp("", "npyset")
	if err != nil {
		fmt.Println(err)
		return
	}
	defer os.RemoveAll(dir)

	g, _ := grid.New([]float64{0, 0.5, 1}, []float64{0, 1}, grid.Axisymmetric)
	phi := []float64{1, 1, 1, 0, 0, 0}
	paths, err := export.WriteNPYSet(dir, g, export.Fields{
		Point:        map[string][]float64{"phi": phi},
		PointVectors: map[string][2][]float64{"e": {make([]float64, 6), {1, 1, 1, 1, 1, 1}}},
		Cell:         map[string][]float64{"eps_r": {1, 4}},
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, p := range paths {
		fmt.Println(filepath.Base(p))
	}
	// Output:
	// x.npy
	// y.npy
	// phi.npy
	// ex.npy
	// ey.npy
	// eps_r.npy
}

func ExampleWriteVTR() {
	// A graded r–z grid with a potential on the nodes and ε_r on the cell.
	g, _ := grid.New([]float64{0, 0.25}, []float64{0, 0.1}, grid.Axisymmetric)
	err := export.WriteVTR(os.Stdout, g, export.Fields{
		Point: map[string][]float64{"phi": {1, 0.5, 1, 0.5}},
		Cell:  map[string][]float64{"eps_r": {2.1}},
	})
	if err != nil {
		fmt.Println(err)
	}
	// Output:
	// <?xml version="1.0"?>
	// <!-- axisymmetric grid: x is the radius r, y is the axial coordinate z -->
	// <VTKFile type="RectilinearGrid" version="1.0" byte_order="LittleEndian">
	//   <RectilinearGrid WholeExtent="0 1 0 1 0 0">
	//     <Piece Extent="0 1 0 1 0 0">
	//       <PointData Scalars="phi">
	//         <DataArray type="Float64" Name="phi" format="ascii">
	//           1 0.5 1 0.5
	//         </DataArray>
	//       </PointData>
	//       <CellData Scalars="eps_r">
	//         <DataArray type="Float64" Name="eps_r" format="ascii">
	//           2.1
	//         </DataArray>
	//       </CellData>
	//       <Coordinates>
	//         <DataArray type="Float64" Name="x" format="ascii">
	//           0 0.25
	//         </DataArray>
	//         <DataArray type="Float64" Name="y" format="ascii">
	//           0 0.1
	//         </DataArray>
	//         <DataArray type="Float64" Name="z" format="ascii">
	//           0
	//         </DataArray>
	//       </Coordinates>
	//     </Piece>
	//   </RectilinearGrid>
	// </VTKFile>
}

func ExampleWriteMatrixMarket() {
	// The 1-D Laplacian tridiag(−1, 2, −1) of order 3, emitted in full; the
	// symmetric file keeps the lower triangle with 1-based indices.
	n := 3
	entries := func(emit func(i, j int, v float64)) {
		for i := 0; i < n; i++ {
			if i > 0 {
				emit(i, i-1, -1)
			}
			emit(i, i, 2)
			if i < n-1 {
				emit(i, i+1, -1)
			}
		}
	}
	if err := export.WriteMatrixMarket(os.Stdout, n, entries, true, "1-D Laplacian"); err != nil {
		fmt.Println(err)
	}
	// Output:
	// %%MatrixMarket matrix coordinate real symmetric
	// % 1-D Laplacian
	// 3 3 5
	// 1 1 2
	// 2 1 -1
	// 2 2 2
	// 3 2 -1
	// 3 3 2
}

func ExampleWriteCSV() {
	rows := [][]string{
		{"inner", export.FormatFloat(50.638886e-12)},
		{"outer, shield", export.FormatFloat(-50.638886e-12)},
	}
	if err := export.WriteCSV(os.Stdout, []string{"conductor", "C (F/m)"}, rows); err != nil {
		fmt.Println(err)
	}
	// Output:
	// conductor,C (F/m)
	// inner,5.0638886e-11
	// "outer, shield",-5.0638886e-11
}

func ExampleAtomicWriteFile() {
	dir, err := os.MkdirTemp("", "atomic")
	if err != nil {
		fmt.Println(err)
		return
	}
	defer os.RemoveAll(dir)

	path := filepath.Join(dir, "b.mtx")
	err = export.AtomicWriteFile(path, func(w io.Writer) error {
		return export.WriteMatrixMarketVector(w, []float64{0, 1}, "right-hand side")
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	b, _ := os.ReadFile(path)
	fmt.Print(string(b))
	// Output:
	// %%MatrixMarket matrix array real general
	// % right-hand side
	// 2 1
	// 0
	// 1
}
