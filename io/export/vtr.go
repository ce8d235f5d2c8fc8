package export

import (
	"bufio"
	"io"
	"strconv"

	"github.com/phigrid/phigrid/grid"
)

// vtrPerLine is the number of values on one line of a data array.
const vtrPerLine = 6

// WriteVTR writes g and the arrays of f as a VTK XML RectilinearGrid file
// (.vtr, file version 1.0), readable by ParaView, VisIt and the VTK
// libraries. The node axes are written as they are, so graded spacing is
// kept.
//
// The grid is one plane: the extent is 0..Nx−1 along x, 0..Ny−1 along y and
// 0..0 along z, with z = 0. In an axisymmetric grid x is r and y is z, and
// the file says so in a comment. Point arrays go to PointData, point
// vectors to PointData with three components (z component 0), cell arrays
// to CellData, each group in sorted name order; the first name of each kind
// is marked as the active scalar or vector. Point and cell order is VTK's
// (x fastest), which is grid.Index and grid.CellIndex order.
//
// Data are inline ASCII ("format=ascii") with the shortest decimal form
// that reads back to the same float64 (strconv 'g', precision −1), so
// values round-trip exactly and the file is plain, valid XML. ASCII is
// about two to three times the size of binary; use NPY or the result
// archive for very large grids. VTK cannot parse NaN or infinities in ASCII
// data, so arrays holding them are refused with an error wrapping
// ErrInvalid; mask such values first.
//
// Nothing is written when the input is invalid.
func WriteVTR(w io.Writer, g *grid.Grid, f Fields) error {
	if err := f.check(g); err != nil {
		return err
	}
	for _, name := range sortedKeys(f.Point) {
		if k := firstNonFinite(f.Point[name]); k >= 0 {
			return nonFinite("point array", name, k, f.Point[name][k], g.Nx())
		}
	}
	for _, name := range sortedKeys(f.PointVectors) {
		for c, v := range f.PointVectors[name] {
			if k := firstNonFinite(v); k >= 0 {
				return nonFinite("component "+strconv.Itoa(c)+" of point vector", name, k, v[k], g.Nx())
			}
		}
	}
	for _, name := range sortedKeys(f.Cell) {
		if k := firstNonFinite(f.Cell[name]); k >= 0 {
			return nonFinite("cell array", name, k, f.Cell[name][k], g.Nx()-1)
		}
	}

	vw := &vtrWriter{w: bufio.NewWriterSize(w, 64<<10)}
	ext := "0 " + strconv.Itoa(g.Nx()-1) + " 0 " + strconv.Itoa(g.Ny()-1) + " 0 0"
	vw.str("<?xml version=\"1.0\"?>\n")
	if g.Metric() == grid.Axisymmetric {
		vw.str("<!-- axisymmetric grid: x is the radius r, y is the axial coordinate z -->\n")
	} else {
		vw.str("<!-- planar grid: x and y are the cross-section coordinates -->\n")
	}
	vw.str("<VTKFile type=\"RectilinearGrid\" version=\"1.0\" byte_order=\"LittleEndian\">\n")
	vw.str("  <RectilinearGrid WholeExtent=\"" + ext + "\">\n")
	vw.str("    <Piece Extent=\"" + ext + "\">\n")

	points, vectors, cellNames := sortedKeys(f.Point), sortedKeys(f.PointVectors), sortedKeys(f.Cell)
	vw.str("      <PointData")
	if len(points) > 0 {
		vw.str(" Scalars=\"" + points[0] + "\"")
	}
	if len(vectors) > 0 {
		vw.str(" Vectors=\"" + vectors[0] + "\"")
	}
	vw.str(">\n")
	for _, name := range points {
		vw.array(name, 1, f.Point[name], nil)
	}
	for _, name := range vectors {
		v := f.PointVectors[name]
		vw.array(name, 3, v[0], v[1])
	}
	vw.str("      </PointData>\n")
	vw.str("      <CellData")
	if len(cellNames) > 0 {
		vw.str(" Scalars=\"" + cellNames[0] + "\"")
	}
	vw.str(">\n")
	for _, name := range cellNames {
		vw.array(name, 1, f.Cell[name], nil)
	}
	vw.str("      </CellData>\n")
	vw.str("      <Coordinates>\n")
	vw.array("x", 1, g.X(), nil)
	vw.array("y", 1, g.Y(), nil)
	vw.array("z", 1, []float64{0}, nil)
	vw.str("      </Coordinates>\n")
	vw.str("    </Piece>\n")
	vw.str("  </RectilinearGrid>\n")
	vw.str("</VTKFile>\n")
	return vw.w.Flush()
}

func nonFinite(kind, name string, k int, v float64, nx int) error {
	return invalidf("%s %q has the value %g at index %d (i=%d, j=%d); VTK cannot read NaN or infinities in ASCII files, so replace them (for example with 0) before writing", kind, name, v, k, k%nx, k/nx)
}

// vtrWriter writes the text of a .vtr file. bufio.Writer keeps the first
// error, so the caller checks it once at Flush.
type vtrWriter struct {
	w   *bufio.Writer
	num []byte
}

func (vw *vtrWriter) str(s string) { vw.w.WriteString(s) }

// array writes one DataArray. With ncomp 3, a and b are the x and y
// components and z is written as 0.
func (vw *vtrWriter) array(name string, ncomp int, a, b []float64) {
	vw.str("        <DataArray type=\"Float64\" Name=\"" + name + "\"")
	if ncomp > 1 {
		vw.str(" NumberOfComponents=\"" + strconv.Itoa(ncomp) + "\"")
	}
	vw.str(" format=\"ascii\">\n")
	col := 0
	put := func(v float64) {
		if col == 0 {
			vw.str("          ")
		} else {
			vw.w.WriteByte(' ')
		}
		vw.num = strconv.AppendFloat(vw.num[:0], v, 'g', -1, 64)
		vw.w.Write(vw.num)
		col++
		if col == vtrPerLine {
			vw.w.WriteByte('\n')
			col = 0
		}
	}
	for k, v := range a {
		put(v)
		if ncomp == 3 {
			put(b[k])
			put(0)
		}
	}
	if col != 0 {
		vw.w.WriteByte('\n')
	}
	vw.str("        </DataArray>\n")
}
