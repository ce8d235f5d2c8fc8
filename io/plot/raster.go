package plot

import (
	"image"
	"image/color"
	"math"
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
