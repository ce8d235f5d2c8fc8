package plot

import (
	"fmt"
	"image/color"
	"math"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/field"
)

// potentialRange returns the smallest and largest potential of the
// nodes in the picture.
func (f *figure) potentialRange() (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	g := f.sol.Grid
	xs, ys := g.X(), g.Y()
	nx := g.Nx()
	all := !f.windowed()
	for n, v := range f.sol.Phi {
		if all || f.inWindow(xs[n%nx], ys[n/nx]) {
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
	}
	if !all {
		// The frame of the picture too: between nodes, a potential free
		// of charge takes its extremes on the frame or on conductors.
		d := f.window()
		const n = 64
		for k := range n + 1 {
			s := float64(k) / n
			x, y := d.X0+s*(d.X1-d.X0), d.Y0+s*(d.Y1-d.Y0)
			for _, q := range [4]pt{{x, d.Y0}, {x, d.Y1}, {d.X0, y}, {d.X1, y}} {
				if v, ok := f.sol.PotentialAt(q.x, q.y); ok {
					lo, hi = math.Min(lo, v), math.Max(hi, v)
				}
			}
		}
	}
	return lo, hi
}

// equipotentials returns round levels strictly inside the potential
// range.
func (f *figure) equipotentials(lo, hi float64) ([]float64, float64) {
	return chooseLevels(lo, hi, f.o.Levels)
}

func (f *figure) preparePotential() {
	lo, hi := f.potentialRange()
	pu := potentialUnit(math.Max(math.Abs(lo), math.Abs(hi)))
	uniform := !(hi > lo)
	if uniform {
		hi = lo + math.Max(1, math.Abs(lo))
	}
	norm := func(v float64) float64 { return (v - lo) / (hi - lo) }
	var levels []float64
	var step float64
	if !uniform {
		levels, step = f.equipotentials(lo, hi)
	}
	cs := f.contours(levels)
	sol := f.sol
	f.layers = append(f.layers,
		rasterLayer(func(x, y float64) color.NRGBA {
			if f.sc.at(x, y).cond >= 0 {
				return metal
			}
			v, _ := sol.PotentialAt(x, y)
			return scaleColor(norm(v))
		}),
		f.contourLayer(cs, 0.8,
			func(l float64) color.Color { return contourStyle(norm(l)) },
			func(l float64) string { return formatNumber(l/pu.Factor, step/pu.Factor) }),
		f.outlineLayer(),
		f.nameLayer(),
	)
	marks := make([]float64, len(levels))
	for i, l := range levels {
		marks[i] = l / pu.Factor
	}
	f.bar = &colorBar{
		lo: lo / pu.Factor, hi: hi / pu.Factor,
		header: fmt.Sprintf("φ (%s)", pu.Name),
		color:  func(t float64) color.Color { return scaleColor(t) },
		marks:  marks,
	}
	detail := "uniform: no field"
	if !uniform {
		detail = fmt.Sprintf("equipotentials every %s %s", formatNumber(step/pu.Factor, step/pu.Factor), pu.Name)
	}
	f.heading("Potential φ", detail)
}

// nodePeak returns the largest |E| at a free node in the picture and
// where it is, and the smallest non-zero |E| at such a node.
func (f *figure) nodePeak() (peak, x, y, least float64) {
	ex, ey := f.sol.NodeFieldTo(nil, nil)
	mag := field.Magnitude(nil, ex, ey)
	g, m := f.sol.Grid, f.sol.Map
	xs, ys := g.X(), g.Y()
	nx := g.Nx()
	least = math.Inf(1)
	for n, v := range mag {
		if m.Kind[n] != bc.Free || !f.inWindow(xs[n%nx], ys[n/nx]) {
			continue
		}
		if v > peak {
			peak, x, y = v, xs[n%nx], ys[n/nx]
		}
		if v > 0 {
			least = math.Min(least, v)
		}
	}
	return peak, x, y, least
}

// magnitudeScale returns the colour-scale position of a field strength:
// linear from 0, or logarithmic from the smallest field (rounded down to
// 1, 2 or 5 × 10ᵏ) but at most three decades below the peak.
func (f *figure) magnitudeScale(peak, least float64) (lo float64, t func(float64) float64) {
	if !(peak > 0) {
		return 0, func(float64) float64 { return 0 }
	}
	if f.o.LogScale {
		lo = peak / 1000
		if least < peak {
			lo = math.Max(lo, roundBelow(least))
		}
		l0, span := math.Log(lo), math.Log(peak/lo)
		return lo, func(v float64) float64 {
			if !(v > lo) {
				return 0
			}
			return (math.Log(v) - l0) / span
		}
	}
	return 0, func(v float64) float64 { return v / peak }
}

func (f *figure) prepareMagnitude() {
	peak, px, py, least := f.nodePeak()
	fu := fieldUnit(peak, f.unit)
	lo, t := f.magnitudeScale(peak, least)
	fs := newFieldSampler(f.sol)
	f.layers = append(f.layers,
		rasterLayer(func(x, y float64) color.NRGBA {
			if f.sc.at(x, y).cond >= 0 {
				return metal
			}
			ex, ey, _ := fs.at(x, y)
			return scaleColor(t(math.Hypot(ex, ey)))
		}),
		f.outlineLayer(),
		f.nameLayer(),
	)
	hi := peak
	if !(hi > lo) {
		hi = lo + 1
	}
	f.bar = &colorBar{
		lo: lo / fu.Factor, hi: hi / fu.Factor, log: f.o.LogScale,
		header: fmt.Sprintf("|E| (%s)", fu.Name),
		color:  func(t float64) color.Color { return scaleColor(t) },
	}
	detail := "linear colour scale"
	if f.o.LogScale {
		detail = "logarithmic colour scale"
	}
	f.heading("Electric field strength |E|", detail)
	if peak > 0 {
		where := "at a grid node"
		if k := f.conductorBeside(px, py); k >= 0 {
			where = "at a grid node beside " + f.p.Conductors[k].Name
		}
		caution := "At sharp edges and corners the field grows without bound as the grid is refined; read such peaks with care."
		if sp, sx, sy, k := f.surfacePeak(); sp >= peak {
			peak, px, py = sp, sx, sy
			where = "on the surface of " + f.p.Conductors[k].Name
			if f.sol.PeakSurfaceField(k).Sharp {
				caution = "It lies at a sharp edge, where the field grows without bound as the grid is refined: not a converged value."
			}
		}
		f.layers = append(f.layers, markLayer(pt{px, py}))
		f.notes = append(f.notes, fmt.Sprintf("Largest |E|: %s %s %s at %s (ringed). %s",
			formatSig(peak/fu.Factor), fu.Name, where, f.lengthLabel(px, py), caution))
	}
}

// conductorBeside returns the conductor of a node next to the node at
// (x, y), or −1.
func (f *figure) conductorBeside(x, y float64) int {
	g, m := f.sol.Grid, f.sol.Map
	i, j, s, t, ok := g.Locate(x, y)
	if !ok {
		return -1
	}
	if s > 0.5 {
		i++
	}
	if t > 0.5 {
		j++
	}
	for _, d := range [][2]int{{1, 0}, {-1, 0}, {0, 1}, {0, -1}} {
		a, b := i+d[0], j+d[1]
		if a >= 0 && b >= 0 && a < g.Nx() && b < g.Ny() {
			if c := m.Cond[g.Index(a, b)]; c >= 0 {
				return int(c)
			}
		}
	}
	return -1
}

// surfacePeak returns the largest normal field on any conductor surface
// in the picture (field.Solution.SurfaceField), where it is and on which
// conductor.
func (f *figure) surfacePeak() (peak, x, y float64, cond int) {
	for k := range f.p.Conductors {
		for _, p := range f.sol.SurfaceField(k) {
			if !f.inWindow(p.X, p.Y) {
				continue
			}
			if v := math.Abs(p.En); v > peak {
				peak, x, y, cond = v, p.X, p.Y, k
			}
		}
	}
	return peak, x, y, cond
}

// markLayer rings a point of the picture.
func markLayer(p pt) layer {
	return func(v *view) {
		c := v.pt(p)
		for _, s := range []struct {
			col color.Color
			w   vg.Length
		}{{white, 3}, {ink, 1.2}} {
			var path vg.Path
			path.Move(vg.Point{X: c.X + 6, Y: c.Y})
			path.Arc(c, 6, 0, 2*math.Pi)
			path.Close()
			v.c.SetLineStyle(draw.LineStyle{Color: s.col, Width: s.w})
			v.c.Stroke(path)
		}
	}
}

// arrowFill is the length of the longest arrow as a fraction of the
// lattice spacing; a little under one, so that it never meets the tail
// of the next arrow.
const arrowFill = 0.92

func (f *figure) prepareArrows() {
	lo, hi := f.potentialRange()
	var cs contourSet
	if hi > lo {
		levels, _ := f.equipotentials(lo, hi)
		cs = f.contours(levels)
	}
	peak, _, _, least := f.nodePeak()
	fu := fieldUnit(peak, f.unit)
	spacing := new(float64)
	mode := f.o.ArrowMode
	var colourT func(float64) float64
	if mode == EqualLength {
		var blo float64
		blo, colourT = f.magnitudeScale(peak, least)
		hi := peak
		if !(hi > blo) {
			hi = blo + 1
		}
		f.bar = &colorBar{
			lo: blo / fu.Factor, hi: hi / fu.Factor, log: f.o.LogScale,
			header: fmt.Sprintf("|E| (%s)", fu.Name),
			color:  func(t float64) color.Color { return scaleColor(vectorScale * t) },
		}
	} else {
		f.key = &arrowKey{spacing: spacing}
	}
	fs := newFieldSampler(f.sol)
	f.layers = append(f.layers,
		func(v *view) {
			v.c.SetColor(white)
			v.c.Fill(v.c.Rectangle.Path())
		},
		f.contourLayer(cs, 0.6, func(float64) color.Color { return faint }, func(float64) string { return "" }),
		func(v *view) {
			dw, dh := v.c.Max.X-v.c.Min.X, v.c.Max.Y-v.c.Min.Y
			sp := max(max(dw, dh)/26, 1.6*vg.Length(f.fs))
			*spacing = float64(sp)
			type sample struct {
				tail   vg.Point
				ux, uy float64 // direction on the picture
				mag    float64
			}
			var ss []sample
			var top float64
			nx, ny := int(dw/sp), int(dh/sp)
			ox, oy := (dw-vg.Length(nx-1)*sp)/2, (dh-vg.Length(ny-1)*sp)/2
			for j := range ny {
				for i := range nx {
					q := vg.Point{X: v.c.Min.X + ox + vg.Length(i)*sp, Y: v.c.Min.Y + oy + vg.Length(j)*sp}
					mp := v.model(q)
					if f.sc.at(mp.x, mp.y).cond >= 0 {
						continue
					}
					ex, ey, ok := fs.at(mp.x, mp.y)
					mag := math.Hypot(ex, ey)
					if !ok || mag == 0 {
						continue
					}
					dx, dy := ex*v.sx(), ey*v.sy()
					l := math.Hypot(dx, dy)
					ss = append(ss, sample{q, dx / l, dy / l, mag})
					top = math.Max(top, mag)
				}
			}
			for _, s := range ss {
				l := arrowLength(mode, s.mag, top) * float64(sp)
				col, w := color.Color(ink), vg.Length(0.9)
				if mode == EqualLength {
					col, w = scaleColor(vectorScale*colourT(s.mag)), 1.5
				}
				head := vg.Point{X: s.tail.X + vg.Length(l*s.ux), Y: s.tail.Y + vg.Length(l*s.uy)}
				drawArrow(v.c, s.tail, head, col, w, float64(sp))
			}
			if f.key != nil && top > 0 {
				// Key arrows at round values: the largest 1, 2 or 5 × 10ᵏ
				// not above the longest arrow, and smaller ones below it.
				fk := fieldUnit(top, f.unit)
				round := roundBelow(top / fk.Factor)
				vals := []float64{round, round / 2}
				if mode == LogLength {
					vals = []float64{round, round / 10, round / 100}
				}
				f.key.entries = f.key.entries[:0]
				for _, d := range vals {
					f.key.entries = append(f.key.entries, keyEntry{
						frac:  arrowLength(mode, d*fk.Factor, top) / arrowFill,
						label: formatNumber(d, d) + " " + fk.Name,
					})
				}
			}
		},
		rasterLayer(f.conductorMask),
		f.outlineLayer(),
		f.nameLayer(),
	)
	var detail string
	switch mode {
	case TrueLength:
		detail = "arrows drawn from their tail points, length proportional to |E|"
	case LogLength:
		detail = "arrows drawn from their tail points, length growing with log |E| over three decades"
	case EqualLength:
		detail = "arrows drawn from their tail points, all of one length, coloured by |E|"
	}
	f.heading("Electric field E", detail)
}

// arrowLength returns the length of an arrow for a field of strength mag
// when the strongest on the lattice is top, in lattice spacings.
func arrowLength(mode ArrowMode, mag, top float64) float64 {
	switch mode {
	case TrueLength:
		return arrowFill * mag / top
	case LogLength:
		return arrowFill * math.Max(0.08, 1+math.Log10(mag/top)/3)
	}
	return 0.75
}

// roundBelow returns the largest 1, 2 or 5 × 10ᵏ not above v > 0.
func roundBelow(v float64) float64 {
	p := math.Pow(10, math.Floor(math.Log10(v)))
	for _, m := range []float64{5, 2, 1} {
		if m*p <= v*(1+1e-12) {
			return m * p
		}
	}
	return p
}

// drawArrow draws an arrow from tail to tip with a shaft of width w and a
// filled head sized for a lattice of the given spacing; arrows too short
// to show a head are drawn as dots.
func drawArrow(c draw.Canvas, tail, tip vg.Point, col color.Color, w vg.Length, spacing float64) {
	dx, dy := float64(tip.X-tail.X), float64(tip.Y-tail.Y)
	l := math.Hypot(dx, dy)
	if l < 1.5 {
		var p vg.Path
		p.Move(vg.Point{X: tail.X + 0.8, Y: tail.Y})
		p.Arc(tail, 0.8, 0, 2*math.Pi)
		p.Close()
		c.SetColor(col)
		c.Fill(p)
		return
	}
	ux, uy := dx/l, dy/l
	hl := math.Min(math.Max(0.32*l, math.Min(l, 3+float64(w))), 0.3*spacing)
	hw := 0.42*hl + 0.3*float64(w)
	base := vg.Point{X: tip.X - vg.Length(hl*ux), Y: tip.Y - vg.Length(hl*uy)}
	c.StrokeLines(draw.LineStyle{Color: col, Width: w}, []vg.Point{tail, base})
	var p vg.Path
	p.Move(tip)
	p.Line(vg.Point{X: base.X - vg.Length(hw*uy), Y: base.Y + vg.Length(hw*ux)})
	p.Line(vg.Point{X: base.X + vg.Length(hw*uy), Y: base.Y - vg.Length(hw*ux)})
	p.Close()
	c.SetColor(col)
	c.Fill(p)
}

// nameLayer writes each conductor's name where its largest visible part
// has room for it.
func (f *figure) nameLayer() layer {
	return func(v *view) {
		sty := f.textStyle(0.8, false, ink)
		sty.XAlign, sty.YAlign = draw.XCenter, draw.YCenter
		lo, hi := f.potentialRange()
		pu := potentialUnit(math.Max(math.Abs(lo), math.Abs(hi)))
		for k, c := range f.p.Conductors {
			p, room, ok := f.roomiest(v, k)
			if !ok {
				continue
			}
			fits := func(txt string) bool {
				return room >= float64(sty.Width(txt))/2+4 && room >= float64(sty.Height(txt))/2+3
			}
			vk := f.sol.V[k] / pu.Factor
			txt := c.Name + ", " + formatSig(vk) + " " + pu.Name
			if !fits(txt) {
				txt = c.Name
			}
			if fits(txt) {
				v.c.FillText(sty, v.pt(p), txt)
			}
		}
	}
}

// roomiest returns the point of conductor k inside the picture farthest
// from the conductor's edge, and that distance in points, from a lattice
// of samples four points apart.
func (f *figure) roomiest(v *view, k int) (pt, float64, bool) {
	const step = 4.0
	w, h := float64(v.c.Max.X-v.c.Min.X), float64(v.c.Max.Y-v.c.Min.Y)
	nx, ny := int(w/step)+1, int(h/step)+1
	in := make([]bool, nx*ny)
	any := false
	for j := range ny {
		for i := range nx {
			mp := v.model(vg.Point{X: v.c.Min.X + vg.Length(float64(i)*step), Y: v.c.Min.Y + vg.Length(float64(j)*step)})
			in[j*nx+i] = f.sc.at(mp.x, mp.y).cond == k
			any = any || in[j*nx+i]
		}
	}
	if !any {
		return pt{}, 0, false
	}
	// Chamfer distance to the nearest sample outside (the frame counts
	// as outside).
	dist := make([]float64, nx*ny)
	inf := math.Inf(1)
	for n := range dist {
		if in[n] {
			dist[n] = inf
		}
	}
	get := func(i, j int) float64 {
		if i < 0 || j < 0 || i >= nx || j >= ny {
			return 0
		}
		return dist[j*nx+i]
	}
	d2 := math.Sqrt2
	for j := range ny {
		for i := range nx {
			n := j*nx + i
			if !in[n] {
				continue
			}
			dist[n] = math.Min(dist[n], math.Min(math.Min(get(i-1, j)+1, get(i, j-1)+1), math.Min(get(i-1, j-1)+d2, get(i+1, j-1)+d2)))
		}
	}
	best, bi, bj := 0.0, 0, 0
	for j := ny - 1; j >= 0; j-- {
		for i := nx - 1; i >= 0; i-- {
			n := j*nx + i
			if !in[n] {
				continue
			}
			dist[n] = math.Min(dist[n], math.Min(math.Min(get(i+1, j)+1, get(i, j+1)+1), math.Min(get(i+1, j+1)+d2, get(i-1, j+1)+d2)))
			if dist[n] > best {
				best, bi, bj = dist[n], i, j
			}
		}
	}
	p := v.model(vg.Point{X: v.c.Min.X + vg.Length(float64(bi)*step), Y: v.c.Min.Y + vg.Length(float64(bj)*step)})
	return p, (best - 0.5) * step, true
}
