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
	d := f.window()
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
			for _, line := range f.shownLines(v, b.pts, b.closed) {
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
		}
		// Thin conductor strips show as a line of at least 1.6 points.
		for _, r := range f.p.Regions {
			st, ok := r.Shape.(bc.Strip)
			if !ok || r.Kind != bc.ConductorRegion {
				continue
			}
			w := vg.Length(st.Thickness * math.Min(v.sx(), v.sy()))
			if w < 1.6 {
				for _, line := range f.shownLines(v, []pt{{st.X0, st.Y0}, {st.X1, st.Y1}}, false) {
					v.c.StrokeLines(draw.LineStyle{Color: metalEdge, Width: 1.6}, line)
				}
			}
		}
		// Conductor sides as heavy bars, sides held at a prescribed
		// potential as lighter ones.
		c := v.c
		const bar = 3
		d, w := f.p.Domain, f.window()
		// Only the sides of the domain that are edges of the picture.
		shown := [4]bool{bc.Left: w.X0 == d.X0, bc.Right: w.X1 == d.X1, bc.Bottom: w.Y0 == d.Y0, bc.Top: w.Y1 == d.Y1}
		for s, side := range f.p.Sides {
			if side.Kind != bc.Fixed || !shown[s] {
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
			if !f.inWindow(q.X, q.Y) {
				continue
			}
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

// shownLines returns the polyline pts (closed: back to its first point)
// on the picture: whole when the picture shows the whole domain, else the
// pieces inside the window.
func (f *figure) shownLines(v *view, pts []pt, closed bool) [][]vg.Point {
	if len(pts) == 0 {
		return nil
	}
	if closed {
		pts = append(pts[:len(pts):len(pts)], pts[0])
	}
	var pieces [][]pt
	if f.windowed() {
		pieces = clipLine(pts, f.window())
	} else {
		pieces = [][]pt{pts}
	}
	out := make([][]vg.Point, 0, len(pieces))
	for _, piece := range pieces {
		line := make([]vg.Point, len(piece))
		for i, p := range piece {
			line[i] = v.pt(p)
		}
		out = append(out, line)
	}
	return out
}
