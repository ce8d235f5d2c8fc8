package plot

import (
	"math"

	"github.com/phigrid/phigrid/bc"
)

// window returns the part of the domain the picture shows: Options.View
// cut to the domain, or the whole domain when View is zero. Everything
// that decides what is drawn, and at what scale, asks here.
func (f *figure) window() bc.Rect {
	if f.o.View == (bc.Rect{}) {
		return f.p.Domain
	}
	return clipRect(f.o.View, f.p.Domain)
}

// windowed reports whether the picture shows less than the whole domain.
func (f *figure) windowed() bool {
	return f.window() != f.p.Domain
}

// inWindow reports whether (x, y) is shown.
func (f *figure) inWindow(x, y float64) bool {
	return f.window().Contains(x, y)
}

// clipLine returns the pieces of the polyline pts inside the rectangle r.
// A line wholly inside comes back as it is.
func clipLine(pts []pt, r bc.Rect) [][]pt {
	var out [][]pt
	var cur []pt
	flush := func() {
		if len(cur) >= 2 {
			out = append(out, cur)
		}
		cur = nil
	}
	for i := 0; i+1 < len(pts); i++ {
		a, b := pts[i], pts[i+1]
		ca, cb, ok := clipSegment(a, b, r)
		if !ok {
			flush()
			continue
		}
		if len(cur) == 0 || cur[len(cur)-1] != ca {
			flush()
			cur = append(cur, ca)
		}
		cur = append(cur, cb)
		if cb != b {
			flush()
		}
	}
	flush()
	return out
}

// clipLineToExit returns the polyline pts up to where it first leaves the
// rectangle r, and nothing if it starts outside.
func clipLineToExit(pts []pt, r bc.Rect) []pt {
	if len(pts) == 0 || !r.Contains(pts[0].x, pts[0].y) {
		return nil
	}
	for i := 1; i < len(pts); i++ {
		if !r.Contains(pts[i].x, pts[i].y) {
			out := append([]pt(nil), pts[:i]...)
			return append(out, clipToDomain(pts[i-1], pts[i], r))
		}
	}
	return pts
}

// clipSegment clips the segment a–b to the rectangle r by the
// Liang–Barsky method; ok is false when nothing of it lies inside.
func clipSegment(a, b pt, r bc.Rect) (pt, pt, bool) {
	if r.Contains(a.x, a.y) && r.Contains(b.x, b.y) {
		return a, b, true
	}
	t0, t1 := 0.0, 1.0
	dx, dy := b.x-a.x, b.y-a.y
	for _, c := range [4][2]float64{{-dx, a.x - r.X0}, {dx, r.X1 - a.x}, {-dy, a.y - r.Y0}, {dy, r.Y1 - a.y}} {
		p, q := c[0], c[1]
		if p == 0 {
			if q < 0 {
				return a, b, false
			}
			continue
		}
		t := q / p
		if p < 0 {
			t0 = math.Max(t0, t)
		} else {
			t1 = math.Min(t1, t)
		}
	}
	if t0 > t1 {
		return a, b, false
	}
	ca, cb := a, b
	if t0 > 0 {
		ca = pt{a.x + t0*dx, a.y + t0*dy}
	}
	if t1 < 1 {
		cb = pt{a.x + t1*dx, a.y + t1*dy}
	}
	return ca, cb, true
}
