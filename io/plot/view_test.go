package plot

import (
	"bytes"
	"encoding/xml"
	"errors"
	"image/png"
	"io"
	"math"
	"strconv"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/phigrid/phigrid/bc"
)

// axisLabels returns the numeric labels of an SVG picture without other
// numeric text (a field-line picture): the horizontal axis's, which share
// one baseline, and the vertical axis's.
func axisLabels(t *testing.T, data []byte) (xs, ys []float64) {
	t.Helper()
	type label struct {
		y string
		v float64
	}
	var labels []label
	d := xml.NewDecoder(bytes.NewReader(data))
	var cur *label
	for {
		tok, err := d.Token()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			t.Fatalf("SVG is not well-formed XML: %v", err)
		}
		switch tok := tok.(type) {
		case xml.StartElement:
			if tok.Name.Local == "text" {
				cur = &label{}
				for _, a := range tok.Attr {
					if a.Name.Local == "y" {
						cur.y = a.Value
					}
				}
			}
		case xml.CharData:
			if cur == nil {
				continue
			}
			s := strings.ReplaceAll(strings.TrimSpace(string(tok)), "−", "-")
			if v, err := strconv.ParseFloat(s, 64); err == nil {
				cur.v = v
				labels = append(labels, *cur)
			}
			cur = nil
		case xml.EndElement:
			cur = nil
		}
	}
	baseline := map[string]int{}
	for _, l := range labels {
		baseline[l.y]++
	}
	for _, l := range labels {
		if baseline[l.y] > 1 {
			xs = append(xs, l.v)
		} else {
			ys = append(ys, l.v)
		}
	}
	return xs, ys
}

func span(vs []float64) [2]float64 {
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, v := range vs {
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	return [2]float64{lo, hi}
}

// TestViewAxes: the axes of a picture with a view run over the view, and
// without one over the whole domain.
func TestViewAxes(t *testing.T) {
	sol, p := solvedCoax(t) // domain 0 to 3.15 mm each way
	for _, c := range []struct {
		name   string
		view   bc.Rect
		xs, ys [2]float64 // axis ranges, mm
	}{
		{"whole domain", bc.Rect{}, [2]float64{0, 3.15}, [2]float64{0, 3.15}},
		{"lower left", bc.Rect{X0: 0, Y0: 0, X1: 1.5e-3, Y1: 1e-3}, [2]float64{0, 1.5}, [2]float64{0, 1}},
		{"middle", bc.Rect{X0: 0.5e-3, Y0: 1e-3, X1: 2e-3, Y1: 2e-3}, [2]float64{0.5, 2}, [2]float64{1, 2}},
		// Cut to the domain.
		{"reaching past the domain", bc.Rect{X0: -1, Y0: 2e-3, X1: 1, Y1: 1}, [2]float64{0, 3.15}, [2]float64{2, 3.15}},
	} {
		var buf bytes.Buffer
		if err := Draw(&buf, "svg", sol, p, Options{Kind: FieldLines, View: c.view, Unit: Unit{Name: "mm", Scale: 1e-3}}); err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		save(t, "view-"+strings.ReplaceAll(c.name, " ", "-")+".svg", buf.Bytes())
		xs, ys := axisLabels(t, buf.Bytes())
		for _, a := range []struct {
			name   string
			labels []float64
			want   [2]float64
		}{{"horizontal", xs, c.xs}, {"vertical", ys, c.ys}} {
			if len(a.labels) < 2 {
				t.Fatalf("%s: %s axis labels %v; want at least two", c.name, a.name, a.labels)
			}
			// Round labels inside the range, from within one step of
			// its start to within one step of its end.
			step := a.labels[1] - a.labels[0]
			got := span(a.labels)
			const tol = 1e-9
			if got[0] < a.want[0]-tol || got[1] > a.want[1]+tol || got[0] >= a.want[0]+step-tol || got[1] <= a.want[1]-step+tol {
				t.Errorf("%s: %s axis labels %v, want them to span %g to %g mm", c.name, a.name, a.labels, a.want[0], a.want[1])
			}
		}
	}
}

// TestViewAspect: a view twice as wide as tall draws a data area of that
// shape, in a picture lower than the square domain's; and every kind of
// picture of it has content.
func TestViewAspect(t *testing.T) {
	sol, p := solvedCoax(t)
	view := bc.Rect{X0: 0.5e-3, Y0: 0, X1: 2.5e-3, Y1: 1e-3}
	for _, pc := range pictureCases {
		o := pc.o
		o.View = view
		f, err := newFigure(sol, p, o, "png")
		if err != nil {
			t.Fatalf("%s: %v", pc.name, err)
		}
		var buf bytes.Buffer
		if err := Draw(&buf, "png", sol, p, o); err != nil {
			t.Fatalf("%s: %v", pc.name, err)
		}
		save(t, "view-"+pc.name+".png", buf.Bytes())
		img, err := png.Decode(&buf)
		if err != nil {
			t.Fatalf("%s: %v", pc.name, err)
		}
		ly := f.arrange(newCanvasForTest(f))
		dw, dh := ly.data.Max.X-ly.data.Min.X, ly.data.Max.Y-ly.data.Min.Y
		if got := float64(dh / dw); math.Abs(got-0.5) > 0.01 {
			t.Errorf("%s: data area %.1f × %.1f, aspect %.3f; want 0.5, the view's", pc.name, dw, dh, got)
		}
		o.View = bc.Rect{}
		whole, err := newFigure(sol, p, o, "png")
		if err != nil {
			t.Fatal(err)
		}
		if b := img.Bounds(); b.Dx() != 900 || float64(b.Dy()) != f.h || !(f.h < whole.h-100) {
			t.Errorf("%s: picture %d × %d, the whole domain's %.0f high; want 900 wide, %.0f high, well under the whole domain's", pc.name, b.Dx(), b.Dy(), whole.h, f.h)
		}
		if n := distinctColours(img, 12); n < 12 {
			t.Errorf("%s: only %d colours; the picture looks blank", pc.name, n)
		}
	}
}

// TestViewScales: colour scales and equipotential levels come from what
// the view shows.
func TestViewScales(t *testing.T) {
	sol, p := solvedCoax(t) // 1000 V on r = 1 mm, 0 V on r = 3 mm
	// A corner near the outer conductor, r from 2.40 mm to 3 mm: φ there
	// is 1000·ln(3/r)/ln 3, from 0 to about 202 V.
	// source: common practice (the coaxial line's logarithmic potential)
	view := bc.Rect{X0: 1.7e-3, Y0: 1.7e-3, X1: 2.3e-3, Y1: 2.3e-3}
	whole, err := newFigure(sol, p, Options{Kind: Potential}, "svg")
	if err != nil {
		t.Fatal(err)
	}
	part, err := newFigure(sol, p, Options{Kind: Potential, View: view}, "svg")
	if err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff([2]float64{0, 1}, [2]float64{whole.bar.lo, whole.bar.hi}, cmpopts.EquateApprox(0, 1e-6)); diff != "" {
		t.Errorf("whole domain: colour bar (-want +got):\n%s", diff)
	}
	// The bar is in kV for the whole domain, in V for the view.
	wantHi := 1000 * math.Log(3/math.Hypot(1.7, 1.7)) / math.Log(3)
	if !(part.bar.lo >= -1e-9 && part.bar.lo < 10 && math.Abs(part.bar.hi-wantHi) < 5) {
		t.Errorf("view: colour bar %g to %g V; want about 0 to %.0f V, what the view shows", part.bar.lo, part.bar.hi, wantHi)
	}
	for _, m := range part.bar.marks {
		if m <= part.bar.lo || m >= part.bar.hi {
			t.Errorf("view: equipotential %g V outside the view's range %g to %g V", m, part.bar.lo, part.bar.hi)
		}
	}
	if len(part.bar.marks) < 5 {
		t.Errorf("view: %d equipotentials, want about 10 over the view's range", len(part.bar.marks))
	}
	// The field peak of the view is far below the inner conductor's.
	wf, err := newFigure(sol, p, Options{Kind: FieldMagnitude}, "svg")
	if err != nil {
		t.Fatal(err)
	}
	pf, err := newFigure(sol, p, Options{Kind: FieldMagnitude, View: view}, "svg")
	if err != nil {
		t.Fatal(err)
	}
	if !(pf.bar.hi < 0.6*wf.bar.hi) {
		t.Errorf("view: |E| scale up to %g, whole domain %g; want the view's far lower", pf.bar.hi, wf.bar.hi)
	}
}

// TestViewWhole: a view of the whole domain draws exactly the picture of
// the zero view.
func TestViewWhole(t *testing.T) {
	sol, p := solvedCoax(t)
	for _, pc := range pictureCases {
		var a, b bytes.Buffer
		o := pc.o
		if err := Draw(&a, "svg", sol, p, o); err != nil {
			t.Fatal(err)
		}
		o.View = p.Domain
		if err := Draw(&b, "svg", sol, p, o); err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(a.Bytes(), b.Bytes()) {
			t.Errorf("%s: the view of the whole domain differs from the zero view", pc.name)
		}
		o.View = bc.Rect{X0: -1, Y0: -1, X1: 1, Y1: 1}
		var c bytes.Buffer
		if err := Draw(&c, "svg", sol, p, o); err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(a.Bytes(), c.Bytes()) {
			t.Errorf("%s: a view around the whole domain differs from the zero view", pc.name)
		}
	}
}

// TestClipLine: lines are cut to the view: every piece inside for
// outlines and equipotentials, up to the first exit for field lines.
func TestClipLine(t *testing.T) {
	r := bc.Rect{X0: 0, Y0: 0, X1: 2, Y1: 1}
	for _, c := range []struct {
		name   string
		line   []pt
		pieces [][]pt
		exit   []pt
	}{
		{"inside", []pt{{0.5, 0.5}, {1.5, 0.5}}, [][]pt{{{0.5, 0.5}, {1.5, 0.5}}}, []pt{{0.5, 0.5}, {1.5, 0.5}}},
		{"outside", []pt{{3, 3}, {4, 3}}, nil, nil},
		{"out and back", []pt{{1, 0.5}, {1, 1.5}, {1.5, 1.5}, {1.5, 0.5}},
			[][]pt{{{1, 0.5}, {1, 1}}, {{1.5, 1}, {1.5, 0.5}}},
			[]pt{{1, 0.5}, {1, 1}}},
		{"across", []pt{{-1, 0.5}, {3, 0.5}}, [][]pt{{{0, 0.5}, {2, 0.5}}}, nil},
		{"along an edge", []pt{{0, 0}, {2, 0}}, [][]pt{{{0, 0}, {2, 0}}}, []pt{{0, 0}, {2, 0}}},
	} {
		if diff := cmp.Diff(c.pieces, clipLine(c.line, r), cmp.AllowUnexported(pt{}), cmpopts.EquateApprox(0, 1e-12)); diff != "" {
			t.Errorf("%s: clipLine (-want +got):\n%s", c.name, diff)
		}
		if diff := cmp.Diff(c.exit, clipLineToExit(c.line, r), cmp.AllowUnexported(pt{}), cmpopts.EquateApprox(0, 1e-12)); diff != "" {
			t.Errorf("%s: clipLineToExit (-want +got):\n%s", c.name, diff)
		}
	}
}

// TestViewFieldLines: a field-line picture of part of the domain starts
// lines on the surfaces it shows and draws them only inside it, also
// where the view shows only the negative conductor.
func TestViewFieldLines(t *testing.T) {
	sol, p := solvedCoax(t) // inner r = 1 mm positive, outer r = 3 mm
	for _, c := range []struct {
		view bc.Rect
		on   float64 // radius of the surface the lines start on
	}{
		{bc.Rect{X0: 0, Y0: 0, X1: 2e-3, Y1: 1e-3}, 1e-3},
		{bc.Rect{X0: 1.8e-3, Y0: 1.8e-3, X1: 3.15e-3, Y1: 3.15e-3}, 3e-3},
	} {
		f, err := newFigure(sol, p, Options{Kind: FieldLines, View: c.view}, "svg")
		if err != nil {
			t.Fatal(err)
		}
		if len(f.lines) < 4 {
			t.Errorf("view %v: %d field lines, want several", c.view, len(f.lines))
		}
		tol := 1e-9
		grown := bc.Rect{X0: c.view.X0 - tol, Y0: c.view.Y0 - tol, X1: c.view.X1 + tol, Y1: c.view.Y1 + tol}
		for n, l := range f.lines {
			if r := math.Hypot(l.pts[0].x, l.pts[0].y); math.Abs(r-c.on) > 0.05e-3 {
				t.Errorf("view %v: line %d starts at r = %g mm, want %g mm", c.view, n, r*1e3, c.on*1e3)
			}
			for _, q := range l.pts {
				if !grown.Contains(q.x, q.y) {
					t.Errorf("view %v: line %d reaches (%g, %g), outside the view", c.view, n, q.x, q.y)
					break
				}
			}
		}
	}
}

func newCanvasForTest(f *figure) draw.Canvas {
	return draw.Canvas{Rectangle: vg.Rectangle{Max: vg.Point{X: vg.Length(f.w), Y: vg.Length(f.h)}}}
}
