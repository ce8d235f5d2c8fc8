package plot

import (
	"fmt"
	"image/color"
	"math"
	"strings"
	"unicode"
	"unicode/utf8"

	xfont "golang.org/x/image/font"
	gplot "gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/field"
	"github.com/phigrid/phigrid/grid"
)

// The look of every picture.
var (
	ink        = color.NRGBA{R: 0x1c, G: 0x1c, B: 0x1e, A: 0xff} // text, arrows, field lines
	softInk    = color.NRGBA{R: 0x55, G: 0x58, B: 0x5e, A: 0xff} // subtitles, footnotes
	faint      = color.NRGBA{R: 0xb4, G: 0xb8, B: 0xbe, A: 0xff} // equipotentials behind vectors
	metal      = color.NRGBA{R: 0xc6, G: 0xc6, B: 0xc3, A: 0xff} // conductor fill
	metalEdge  = color.NRGBA{R: 0x2a, G: 0x2a, B: 0x2a, A: 0xff} // conductor outline
	halo       = color.NRGBA{R: 0xff, G: 0xff, B: 0xff, A: 0xd0} // under dashed outlines
	white      = color.NRGBA{R: 0xff, G: 0xff, B: 0xff, A: 0xff}
	clear      = color.NRGBA{}
	fontFamily = font.Font{Typeface: "Liberation", Variant: "Sans"}
)

// vectorScale is the part of the colour scale used for coloured arrows
// on white: its light end would vanish on the background.
const vectorScale = 0.78

// view maps model coordinates onto the data area of the picture.
type view struct {
	c              draw.Canvas
	x0, y0, x1, y1 float64
	density        float64 // raster samples per point
}

func (v *view) pt(p pt) vg.Point {
	return vg.Point{
		X: v.c.Min.X + vg.Length((p.x-v.x0)/(v.x1-v.x0))*(v.c.Max.X-v.c.Min.X),
		Y: v.c.Min.Y + vg.Length((p.y-v.y0)/(v.y1-v.y0))*(v.c.Max.Y-v.c.Min.Y),
	}
}

func (v *view) model(q vg.Point) pt {
	return pt{
		v.x0 + float64((q.X-v.c.Min.X)/(v.c.Max.X-v.c.Min.X))*(v.x1-v.x0),
		v.y0 + float64((q.Y-v.c.Min.Y)/(v.c.Max.Y-v.c.Min.Y))*(v.y1-v.y0),
	}
}

// sx and sy are points per metre along each axis.
func (v *view) sx() float64 { return float64(v.c.Max.X-v.c.Min.X) / (v.x1 - v.x0) }
func (v *view) sy() float64 { return float64(v.c.Max.Y-v.c.Min.Y) / (v.y1 - v.y0) }

// layer draws into the data area.
type layer func(v *view)

// colorBar is the scale beside a colour map, in display units.
type colorBar struct {
	lo, hi float64
	log    bool
	header string
	color  func(t float64) color.Color // t ∈ [0, 1] from lo to hi
	marks  []float64                   // values marked across the bar
}

// arrowKey is the legend of arrow lengths.
type arrowKey struct {
	entries []keyEntry
	spacing *float64 // lattice spacing in points, known once drawn
}

type keyEntry struct {
	frac  float64 // length as a fraction of the longest arrow
	label string
}

// figure is one picture being composed.
type figure struct {
	sol    *field.Solution
	p      *bc.Problem
	o      Options
	format string
	sc     *scene
	unit   Unit
	w, h   float64 // picture size in points
	fs     float64 // base font size in points

	title, subtitle string
	notes           []string
	distorted       bool // axes drawn at different scales

	bar    *colorBar
	key    *arrowKey
	layers []layer
	bounds []boundary  // region boundaries, see boundaries
	lines  []fieldLine // the field lines drawn, in the view
}

func newFigure(sol *field.Solution, p *bc.Problem, o Options, format string) (*figure, error) {
	if err := check(sol, p, &o); err != nil {
		return nil, err
	}
	if o.Width == 0 {
		o.Width = 900
	}
	if o.Levels == 0 {
		o.Levels = 10
	}
	if o.Lines == 0 {
		o.Lines = 24
	}
	lo, _ := sol.Grid.MinMaxStep()
	f := &figure{
		sol: sol, p: p, o: o, format: format,
		sc: newScene(p, 0.5*lo),
		w:  float64(o.Width),
	}
	if f.o.Unit == (Unit{}) {
		d := f.window()
		f.o.Unit = autoLength(math.Max(d.X1-d.X0, d.Y1-d.Y0))
	}
	f.unit = f.o.Unit
	f.fs = math.Min(15, math.Max(9, f.w/64))
	switch o.Kind {
	case Potential:
		f.preparePotential()
	case FieldMagnitude:
		f.prepareMagnitude()
	case Arrows:
		f.prepareArrows()
	case FieldLines:
		f.prepareLines()
	}
	if o.Kind != Potential {
		f.notes = append(f.notes, Caution)
	}
	if o.Title != "" {
		f.subtitle = f.title + " — " + f.subtitle
		f.title = o.Title
	} else if r, n := utf8.DecodeRuneInString(f.subtitle); n > 0 {
		f.subtitle = string(unicode.ToUpper(r)) + f.subtitle[n:]
	}
	f.h = float64(o.Height)
	if f.h == 0 {
		f.h = f.autoHeight()
	}
	return f, nil
}

// heading sets the title and the line under it.
func (f *figure) heading(title, detail string) {
	f.title, f.subtitle = title, detail
}

// textStyle returns a text style of the picture's family.
func (f *figure) textStyle(scale float64, bold bool, c color.Color) text.Style {
	fn := fontFamily
	if bold {
		fn.Weight = xfont.WeightBold
	}
	return text.Style{
		Color:   c,
		Font:    font.From(fn, vg.Length(scale*f.fs)),
		XAlign:  draw.XLeft,
		YAlign:  draw.YBottom,
		Handler: gplot.DefaultTextHandler,
	}
}

// axisNames returns the names of the horizontal and vertical axes.
func (f *figure) axisNames() (string, string) {
	if f.p.Metric == grid.Axisymmetric {
		return "r", "z"
	}
	return "x", "y"
}

// layout is where the parts of the picture go.
type layout struct {
	plot  draw.Canvas // the gonum plot with its axes
	data  draw.Canvas // the data area inside it
	panel vg.Rectangle
	gp    *gplot.Plot
	notes [][]string  // wrapped footnotes
	sub   []string    // wrapped subtitle
	subY  []vg.Length // baselines of its lines
	// availW and availH are the largest data area the space allows
	// before the aspect ratio is imposed; aspect is the ratio imposed.
	availW, availH vg.Length
	aspect         float64
}

// panelWidth is the width of the right-hand panel (colour bar or key).
func (f *figure) panelWidth() vg.Length {
	fs := vg.Length(f.fs)
	switch {
	case f.bar != nil:
		tl := f.textStyle(0.85, false, ink)
		hs := f.textStyle(0.9, false, ink)
		var lw vg.Length
		for _, t := range f.barTicks(vg.Length(10 * f.fs)) {
			lw = max(lw, tl.Width(t.label))
		}
		return 1.4*fs + max(1.1*fs+0.7*fs+lw, hs.Width(f.bar.header)) + 0.2*fs
	case f.key != nil:
		return 8 * fs
	}
	return 0
}

// barTicks returns the ticks of the colour bar for a bar of height h.
func (f *figure) barTicks(h vg.Length) []tick {
	b := f.bar
	if b.log {
		return logTicks(b.lo, b.hi)
	}
	return linearTicks(b.lo, b.hi, min(10, max(2, int(float64(h)/(3.2*f.fs)))))
}

// newAxes returns the gonum plot that draws the axes in the model's unit.
func (f *figure) newAxes(xlen, ylen *vg.Length) *gplot.Plot {
	gp := gplot.New()
	gp.BackgroundColor = nil
	d := f.window()
	s := f.unit.Scale
	gp.X.Min, gp.X.Max = d.X0/s, d.X1/s
	gp.Y.Min, gp.Y.Max = d.Y0/s, d.Y1/s
	xn, yn := f.axisNames()
	gp.X.Label.Text = fmt.Sprintf("%s (%s)", xn, f.unit.Name)
	gp.Y.Label.Text = fmt.Sprintf("%s (%s)", yn, f.unit.Name)
	fs := vg.Length(f.fs)
	for _, a := range []*gplot.Axis{&gp.X, &gp.Y} {
		a.Padding = 0
		a.Label.TextStyle = f.textStyle(0.95, false, ink)
		a.Label.Padding = 0.35 * fs
		a.Tick.Label = f.textStyle(0.85, false, ink)
		a.Tick.Length = 0.35 * fs
		a.Tick.LineStyle = draw.LineStyle{Color: ink, Width: 0.6}
		a.LineStyle = draw.LineStyle{Color: ink, Width: 0.8}
	}
	gp.X.Tick.Label.XAlign, gp.X.Tick.Label.YAlign = draw.XCenter, draw.YTop
	gp.Y.Tick.Label.XAlign, gp.Y.Tick.Label.YAlign = draw.XRight, draw.YCenter
	gp.X.Label.TextStyle.XAlign = draw.XCenter
	gp.Y.Label.TextStyle.XAlign = draw.XCenter
	ticker := func(length *vg.Length) gplot.Ticker {
		return gplot.TickerFunc(func(lo, hi float64) []gplot.Tick {
			n := max(2, int(float64(*length)/(5.5*f.fs)))
			var out []gplot.Tick
			for _, t := range linearTicks(lo, hi, n) {
				out = append(out, gplot.Tick{Value: t.v, Label: t.label})
			}
			return out
		})
	}
	gp.X.Tick.Marker = ticker(xlen)
	gp.Y.Tick.Marker = ticker(ylen)
	return gp
}

// arrange lays the picture out on a canvas of the figure's size.
func (f *figure) arrange(c draw.Canvas) *layout {
	fs := vg.Length(f.fs)
	m := 0.9 * fs
	ly := &layout{}
	top := c.Max.Y - m
	top -= f.textStyle(1.3, true, ink).Height("Ag")
	top -= 0.2 * fs
	d := f.window()
	aspect := (d.Y1 - d.Y0) / (d.X1 - d.X0)
	if aspect > 6 || aspect < 1.0/6 {
		f.distorted = true
		aspect = math.Min(6, math.Max(1.0/6, aspect))
	}
	sub := f.subtitle
	if f.distorted {
		sub += " (axes not to the same scale)"
	}
	ss := f.textStyle(1, false, softInk)
	for i, line := range wrap(sub, ss, c.Max.X-c.Min.X-2*m) {
		if i > 0 {
			top -= 0.15 * fs
		}
		top -= ss.Height("Ag")
		ly.sub = append(ly.sub, line)
		ly.subY = append(ly.subY, top)
	}
	top -= 0.9 * fs
	bottom := c.Min.Y + m
	ns := f.textStyle(0.75, false, softInk)
	for _, n := range f.notes {
		lines := wrap(n, ns, c.Max.X-c.Min.X-2*m)
		ly.notes = append(ly.notes, lines)
		bottom += vg.Length(len(lines)) * ns.Height("Ag") * 1.15
	}
	if len(f.notes) > 0 {
		bottom += 0.5 * fs
	}
	pw := f.panelWidth()
	area := vg.Rectangle{Min: vg.Point{X: c.Min.X + m, Y: bottom}, Max: vg.Point{X: c.Max.X - m - pw, Y: top}}

	var xlen, ylen vg.Length = area.Size().X, area.Size().Y
	gp := f.newAxes(&xlen, &ylen)
	ly.gp = gp
	pc := draw.Canvas{Canvas: c.Canvas, Rectangle: area}
	for range 4 {
		dc := gp.DataCanvas(pc)
		l, r := dc.Min.X-pc.Min.X, pc.Max.X-dc.Max.X
		b, t := dc.Min.Y-pc.Min.Y, pc.Max.Y-dc.Max.Y
		aw := area.Size().X - l - r
		ah := area.Size().Y - b - t
		ly.availW, ly.availH, ly.aspect = aw, ah, aspect
		dw, dh := aw, aw*vg.Length(aspect)
		if dh > ah {
			dh, dw = ah, ah/vg.Length(aspect)
		}
		xlen, ylen = dw, dh
		pw := dw + l + r
		ph := dh + b + t
		// Centre the plot and the panel together.
		x0 := c.Min.X + m + (area.Size().X-pw)/2
		y0 := area.Min.Y + (area.Size().Y-ph)/2
		pc = draw.Canvas{Canvas: c.Canvas, Rectangle: vg.Rectangle{Min: vg.Point{X: x0, Y: y0}, Max: vg.Point{X: x0 + pw, Y: y0 + ph}}}
	}
	ly.plot = pc
	ly.data = gp.DataCanvas(pc)
	ly.panel = vg.Rectangle{Min: vg.Point{X: ly.data.Max.X, Y: ly.data.Min.Y}, Max: vg.Point{X: ly.data.Max.X + pw, Y: ly.data.Max.Y}}
	return ly
}

// autoHeight returns the picture height that fits the domain at the
// figure's width.
func (f *figure) autoHeight() float64 {
	f.h = f.w
	c := draw.Canvas{Rectangle: vg.Rectangle{Max: vg.Point{X: vg.Length(f.w), Y: vg.Length(f.h)}}}
	ly := f.arrange(c)
	// Make the height available to the data area what the full width
	// needs.
	h := f.h + float64(ly.availW)*ly.aspect - float64(ly.availH)
	return math.Round(math.Min(1.6*f.w, math.Max(0.3*f.w, h)))
}

// render draws the whole picture.
func (f *figure) render(c draw.Canvas) (err error) {
	defer func() {
		// gonum/plot reports some drawing failures by panicking; turn
		// them into errors so that a bad picture never stops a program.
		if r := recover(); r != nil {
			err = fmt.Errorf("plot: drawing failed: %v", r)
		}
	}()
	c.SetColor(white)
	c.Fill(c.Rectangle.Path())
	ly := f.arrange(c)
	fs := vg.Length(f.fs)
	m := 0.9 * fs

	// Headings.
	ts := f.textStyle(1.3, true, ink)
	ts.YAlign = draw.YTop
	c.FillText(ts, vg.Point{X: c.Min.X + m, Y: c.Max.Y - m}, f.title)
	ss := f.textStyle(1, false, softInk)
	for i, line := range ly.sub {
		c.FillText(ss, vg.Point{X: c.Min.X + m, Y: ly.subY[i]}, line)
	}

	// Footnotes.
	ns := f.textStyle(0.75, false, softInk)
	y := c.Min.Y + m
	for i := len(ly.notes) - 1; i >= 0; i-- {
		for k := len(ly.notes[i]) - 1; k >= 0; k-- {
			c.FillText(ns, vg.Point{X: c.Min.X + m, Y: y}, ly.notes[i][k])
			y += ns.Height("Ag") * 1.15
		}
	}

	// Axes and data.
	d := f.window()
	v := &view{c: ly.data, x0: d.X0, y0: d.Y0, x1: d.X1, y1: d.Y1, density: 1}
	if f.format == "svg" {
		v.density = 1.5
	}
	ly.gp.Add(plotterFunc(func(draw.Canvas, *gplot.Plot) {
		for _, l := range f.layers {
			l(v)
		}
	}))
	ly.gp.Draw(ly.plot)
	frame := ly.data.Rectangle.Path()
	ly.data.SetLineStyle(draw.LineStyle{Color: ink, Width: 0.8})
	ly.data.Stroke(frame)

	if f.bar != nil {
		f.drawBar(c, ly.panel)
	}
	if f.key != nil {
		f.drawKey(c, ly.panel)
	}
	return nil
}

// plotterFunc adapts a function to gplot.Plotter.
type plotterFunc func(draw.Canvas, *gplot.Plot)

func (p plotterFunc) Plot(c draw.Canvas, gp *gplot.Plot) { p(c, gp) }

// drawBar draws the colour bar in the panel r.
func (f *figure) drawBar(c draw.Canvas, r vg.Rectangle) {
	b := f.bar
	fs := vg.Length(f.fs)
	x0 := r.Min.X + 1.4*fs
	bw := 1.1 * fs
	y0, y1 := r.Min.Y, r.Max.Y
	hs := f.textStyle(0.9, false, ink)
	// Room above the bar for the header and half a tick label.
	header := hs.Height("Ag") + 0.9*fs
	y1 -= header
	if y1-y0 < 2*fs {
		return
	}
	c.FillText(hs, vg.Point{X: x0, Y: y1 + 0.8*fs}, b.header)
	n := max(2, int(float64(y1-y0)))
	img := newNRGBA(1, n)
	for k := range n {
		t := (float64(n-1-k) + 0.5) / float64(n)
		img.Set(0, k, b.color(t))
	}
	c.DrawImage(vg.Rectangle{Min: vg.Point{X: x0, Y: y0}, Max: vg.Point{X: x0 + bw, Y: y1}}, img)
	pos := func(v float64) vg.Length {
		var t float64
		if b.log {
			t = math.Log(v/b.lo) / math.Log(b.hi/b.lo)
		} else {
			t = (v - b.lo) / (b.hi - b.lo)
		}
		return y0 + vg.Length(t)*(y1-y0)
	}
	ms := draw.LineStyle{Color: color.NRGBA{A: 0x90}, Width: 0.5}
	for _, mv := range b.marks {
		y := pos(mv)
		c.StrokeLine2(ms, x0, y, x0+bw, y)
	}
	c.SetLineStyle(draw.LineStyle{Color: ink, Width: 0.6})
	c.Stroke(vg.Rectangle{Min: vg.Point{X: x0, Y: y0}, Max: vg.Point{X: x0 + bw, Y: y1}}.Path())
	tl := f.textStyle(0.85, false, ink)
	tl.YAlign = draw.YCenter
	ls := draw.LineStyle{Color: ink, Width: 0.6}
	for _, t := range f.barTicks(y1 - y0) {
		y := pos(t.v)
		if y < y0-0.01 || y > y1+0.01 {
			continue
		}
		c.StrokeLine2(ls, x0+bw, y, x0+bw+0.35*fs, y)
		c.FillText(tl, vg.Point{X: x0 + bw + 0.6*fs, Y: y}, t.label)
	}
}

// drawKey draws the arrow-length legend in the panel r.
func (f *figure) drawKey(c draw.Canvas, r vg.Rectangle) {
	k := f.key
	if k.spacing == nil || *k.spacing <= 0 {
		return
	}
	fs := vg.Length(f.fs)
	x0 := r.Min.X + 1.4*fs
	hs := f.textStyle(0.9, false, ink)
	hs.YAlign = draw.YTop
	y := r.Max.Y
	c.FillText(hs, vg.Point{X: x0, Y: y}, "Arrow scale")
	y -= hs.Height("Ag") + 0.9*fs
	ls := f.textStyle(0.85, false, ink)
	ls.YAlign = draw.YTop
	full := vg.Length(arrowFill * *k.spacing)
	for _, e := range k.entries {
		l := vg.Length(e.frac) * full
		drawArrow(c, vg.Point{X: x0, Y: y}, vg.Point{X: x0 + l, Y: y}, ink, 0.9, *k.spacing)
		y -= 0.5 * fs
		c.FillText(ls, vg.Point{X: x0, Y: y}, e.label)
		y -= ls.Height("Ag") + 0.9*fs
	}
}

// wrap breaks s into lines no wider than w.
func wrap(s string, sty text.Style, w vg.Length) []string {
	var lines []string
	cur := ""
	for _, word := range strings.Fields(s) {
		next := word
		if cur != "" {
			next = cur + " " + word
		}
		if cur != "" && sty.Width(next) > w {
			lines = append(lines, cur)
			next = word
		}
		cur = next
	}
	if cur != "" {
		lines = append(lines, cur)
	}
	return lines
}

// lengthLabel formats a model length in the picture's unit.
func (f *figure) lengthLabel(x, y float64) string {
	s := f.unit.Scale
	prec := f.lengthStep()
	xn, yn := f.axisNames()
	return fmt.Sprintf("%s = %s %s, %s = %s %s", xn, formatNumber(x/s, prec), f.unit.Name, yn, formatNumber(y/s, prec), f.unit.Name)
}

// lengthStep is a display step fine enough to place a point on the
// picture: about a thousandth of the domain, rounded.
func (f *figure) lengthStep() float64 {
	d := f.window()
	e := math.Max(d.X1-d.X0, d.Y1-d.Y0) / f.unit.Scale / 1000
	return math.Pow(10, math.Floor(math.Log10(e)))
}
