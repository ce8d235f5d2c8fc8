package plot

import (
	"image/color"
	"math"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/phigrid/phigrid/bc"
)

// segment returns the outline resolution: the longest straight piece
// used for curves, in metres.
func (f *figure) segment() float64 {
	d := f.p.Domain
	return math.Max(d.X1-d.X0, d.Y1-d.Y0) / 900
}

// boundaries returns the region boundaries of the problem, computed once.
func (f *figure) boundaries() []boundary {
	if f.bounds == nil {
		f.bounds = f.sc.boundaries(f.segment())
	}
	return f.bounds
}

// outlineLayer draws the boundaries of every region: conductors solid,
// dielectric interfaces dashed, charge regions dotted, each dashed line on
// a light halo so that it reads on dark and light colours alike; then
// conductor sides of the domain as heavy bars and point charges as signed
// dots.
func (f *figure) outlineLayer() layer {
	bs := f.boundaries()
	return func(v *view) {
		fs := vg.Length(f.fs)
		for _, b := range bs {
			line := make([]vg.Point, 0, len(b.pts)+1)
			for _, p := range b.pts {
				line = append(line, v.pt(p))
			}
			if b.closed {
				line = append(line, line[0])
			}
			switch b.kind {
			case edgeConductor:
				v.c.StrokeLines(draw.LineStyle{Color: metalEdge, Width: 1}, line)
			case edgeDielectric:
				v.c.StrokeLines(draw.LineStyle{Color: halo, Width: 2}, line)
				v.c.StrokeLines(draw.LineStyle{Color: ink, Width: 0.9, Dashes: []vg.Length{5, 3}}, line)
			case edgeCharge:
				v.c.StrokeLines(draw.LineStyle{Color: halo, Width: 2}, line)
				v.c.StrokeLines(draw.LineStyle{Color: ink, Width: 1, Dashes: []vg.Length{1, 2.5}}, line)
			}
		}
		// Thin conductor strips show as a line of at least 1.6 points.
		for _, r := range f.p.Regions {
			st, ok := r.Shape.(bc.Strip)
			if !ok || r.Kind != bc.ConductorRegion {
				continue
			}
			w := vg.Length(st.Thickness * math.Min(v.sx(), v.sy()))
			if w < 1.6 {
				v.c.StrokeLines(draw.LineStyle{Color: metalEdge, Width: 1.6}, []vg.Point{v.pt(pt{st.X0, st.Y0}), v.pt(pt{st.X1, st.Y1})})
			}
		}
		// Conductor sides as heavy bars, sides held at a prescribed
		// potential as lighter ones.
		c := v.c
		const bar = 3
		for s, side := range f.p.Sides {
			if side.Kind != bc.Fixed {
				continue
			}
			col := metalEdge
			if side.Conductor == "" {
				col = softInk
			}
			var a, b vg.Point
			switch s {
			case bc.Left:
				a, b = vg.Point{X: c.Min.X + bar/2, Y: c.Min.Y}, vg.Point{X: c.Min.X + bar/2, Y: c.Max.Y}
			case bc.Right:
				a, b = vg.Point{X: c.Max.X - bar/2, Y: c.Min.Y}, vg.Point{X: c.Max.X - bar/2, Y: c.Max.Y}
			case bc.Bottom:
				a, b = vg.Point{X: c.Min.X, Y: c.Min.Y + bar/2}, vg.Point{X: c.Max.X, Y: c.Min.Y + bar/2}
			case bc.Top:
				a, b = vg.Point{X: c.Min.X, Y: c.Max.Y - bar/2}, vg.Point{X: c.Max.X, Y: c.Max.Y - bar/2}
			}
			c.StrokeLine2(draw.LineStyle{Color: col, Width: bar, Dashes: dashesFor(side.Conductor == "")}, a.X, a.Y, b.X, b.Y)
		}
		// Point and ring charges.
		for _, q := range f.p.Charges {
			p := v.pt(pt{q.X, q.Y})
			r := 0.4 * fs
			var path vg.Path
			path.Move(vg.Point{X: p.X + r, Y: p.Y})
			path.Arc(p, r, 0, 2*math.Pi)
			path.Close()
			c.SetColor(ink)
			c.Fill(path)
			ls := draw.LineStyle{Color: white, Width: 1}
			c.StrokeLine2(ls, p.X-0.6*r, p.Y, p.X+0.6*r, p.Y)
			if q.Q > 0 {
				c.StrokeLine2(ls, p.X, p.Y-0.6*r, p.X, p.Y+0.6*r)
			}
		}
	}
}

// contourStyle returns the colour of an equipotential at level t ∈ [0, 1]
// of the colour scale: dark ink over the light part, white over the dark
// part.
func contourStyle(t float64) color.NRGBA {
	if scaleLightness(t) > 58 {
		return color.NRGBA{R: 0x10, G: 0x10, B: 0x14, A: 0xd8}
	}
	return color.NRGBA{R: 0xff, G: 0xff, B: 0xff, A: 0xe0}
}

// dashesFor returns the dash pattern of a fixed side: solid for a
// conductor, dashed for a prescribed potential.
func dashesFor(prescribed bool) []vg.Length {
	if prescribed {
		return []vg.Length{6, 3}
	}
	return nil
}
