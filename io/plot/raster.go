package plot

import (
	"image"
	"image/color"
	"math"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/field"
	"github.com/phigrid/phigrid/grid"
)

// maxRaster caps the raster size along each side, in samples.
const maxRaster = 3000

func newNRGBA(w, h int) *image.NRGBA { return image.NewNRGBA(image.Rect(0, 0, w, h)) }

// rasterLayer fills the data area with an image whose every sample takes
// the colour of the model point at its centre. Sampling the model on the
// picture's own lattice keeps non-uniform grids at their true coordinates.
func rasterLayer(colour func(x, y float64) color.NRGBA) layer {
	return func(v *view) {
		w := float64(v.c.Max.X - v.c.Min.X)
		h := float64(v.c.Max.Y - v.c.Min.Y)
		nw := min(max(int(math.Ceil(w*v.density)), 1), maxRaster)
		nh := min(max(int(math.Ceil(h*v.density)), 1), maxRaster)
		img := newNRGBA(nw, nh)
		for j := range nh {
			y := v.y1 - (float64(j)+0.5)/float64(nh)*(v.y1-v.y0)
			for i := range nw {
				x := v.x0 + (float64(i)+0.5)/float64(nw)*(v.x1-v.x0)
				img.SetNRGBA(i, j, colour(x, y))
			}
		}
		v.c.DrawImage(v.c.Rectangle, img)
	}
}

// conductorMask returns the colour of conductors at (x, y) and clear
// elsewhere, for drawing conductors over vectors.
func (f *figure) conductorMask(x, y float64) color.NRGBA {
	if f.sc.at(x, y).cond >= 0 {
		return metal
	}
	return clear
}

// fieldSampler evaluates E anywhere from the solution's nodal field.
// Inside a cell whose corners are all free it is the solution's own
// bilinear interpolation. In a cell cut by a conductor surface it
// interpolates from the free corners only, with their bilinear weights
// renormalised: the nodal field there already accounts for the cut links,
// whereas mixing in the zero field of the conductor nodes, or
// differentiating the bilinear potential across the cut, draws the grid's
// staircase into the picture.
type fieldSampler struct {
	g      *grid.Grid
	kind   []bc.NodeKind
	ex, ey []float64
}

func newFieldSampler(sol *field.Solution) *fieldSampler {
	ex, ey := sol.NodeFieldTo(nil, nil)
	return &fieldSampler{g: sol.Grid, kind: sol.Map.Kind, ex: ex, ey: ey}
}

// at returns E at (x, y); ok is false outside the grid.
func (s *fieldSampler) at(x, y float64) (ex, ey float64, ok bool) {
	g := s.g
	i, j, u, v, ok := g.Locate(x, y)
	if !ok {
		return 0, 0, false
	}
	nx, ny := g.Nx(), g.Ny()
	if i >= nx-1 {
		i, u = nx-2, 1
	}
	if j >= ny-1 {
		j, v = ny-2, 1
	}
	n := j*nx + i
	nodes := [4]int{n, n + 1, n + nx, n + nx + 1}
	w := [4]float64{(1 - u) * (1 - v), u * (1 - v), (1 - u) * v, u * v}
	var sw float64
	var free int
	for k, c := range nodes {
		if s.kind[c] == bc.OnConductor {
			continue
		}
		free++
		sw += w[k]
		ex += w[k] * s.ex[c]
		ey += w[k] * s.ey[c]
	}
	switch {
	case sw > 1e-9:
		return ex / sw, ey / sw, true
	case free == 0:
		return 0, 0, true
	}
	// On a conductor corner: the plain mean of the free corners.
	ex, ey = 0, 0
	for _, c := range nodes {
		if s.kind[c] != bc.OnConductor {
			ex += s.ex[c] / float64(free)
			ey += s.ey[c] / float64(free)
		}
	}
	return ex, ey, true
}
