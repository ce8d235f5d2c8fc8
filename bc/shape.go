package bc

import (
	"fmt"
	"math"
)

// Shape is a closed region of the plane (the r–z half-plane in an
// axisymmetric problem). Implementations in this package are Rect, Circle,
// Ellipse, Annulus, Polygon and Strip.
type Shape interface {
	// Contains reports whether point (x, y) lies inside or on the shape.
	Contains(x, y float64) bool
	// Bounds returns the shape's bounding box.
	Bounds() (x0, y0, x1, y1 float64)
	// Anchor returns a point of the shape; a conductor always claims the
	// grid node nearest its anchor, so a conductor smaller than a cell is
	// not lost.
	Anchor() (x, y float64)
	// Validate reports a malformed shape.
	Validate() error
}

// Rect is the axis-aligned rectangle [X0, X1] × [Y0, Y1].
type Rect struct{ X0, Y0, X1, Y1 float64 }

// Contains implements Shape.
func (r Rect) Contains(x, y float64) bool { return x >= r.X0 && x <= r.X1 && y >= r.Y0 && y <= r.Y1 }

// Bounds implements Shape.
func (r Rect) Bounds() (x0, y0, x1, y1 float64) { return r.X0, r.Y0, r.X1, r.Y1 }

// Anchor implements Shape.
func (r Rect) Anchor() (x, y float64) { return 0.5 * (r.X0 + r.X1), 0.5 * (r.Y0 + r.Y1) }

// Validate implements Shape.
func (r Rect) Validate() error {
	if !finite(r.X0, r.Y0, r.X1, r.Y1) || !(r.X0 <= r.X1) || !(r.Y0 <= r.Y1) {
		return fmt.Errorf("rectangle [%g, %g]×[%g, %g] needs finite corners with x0 ≤ x1 and y0 ≤ y1", r.X0, r.X1, r.Y0, r.Y1)
	}
	return nil
}

// Circle is the disk of radius R centred at (X, Y). In an axisymmetric
// problem a circle off the axis is the cross-section of a torus, and one
// centred on the axis is a sphere.
type Circle struct{ X, Y, R float64 }

// Contains implements Shape.
func (c Circle) Contains(x, y float64) bool {
	dx, dy := x-c.X, y-c.Y
	return dx*dx+dy*dy <= c.R*c.R
}

// Bounds implements Shape.
func (c Circle) Bounds() (x0, y0, x1, y1 float64) { return c.X - c.R, c.Y - c.R, c.X + c.R, c.Y + c.R }

// Anchor implements Shape.
func (c Circle) Anchor() (x, y float64) { return c.X, c.Y }

// Validate implements Shape.
func (c Circle) Validate() error {
	if !finite(c.X, c.Y, c.R) || !(c.R > 0) {
		return fmt.Errorf("circle at (%g, %g) needs a finite positive radius, got %g", c.X, c.Y, c.R)
	}
	return nil
}

// Ellipse is the region ((x−X)/A)² + ((y−Y)/B)² ≤ 1, with semi-axis A
// along X and B along Y. In an axisymmetric problem an ellipse centred on
// the axis is a spheroid: prolate when B > A, oblate when B < A.
type Ellipse struct{ X, Y, A, B float64 }

// Contains implements Shape.
func (e Ellipse) Contains(x, y float64) bool {
	u, v := (x-e.X)/e.A, (y-e.Y)/e.B
	return u*u+v*v <= 1
}

// Bounds implements Shape.
func (e Ellipse) Bounds() (x0, y0, x1, y1 float64) {
	return e.X - e.A, e.Y - e.B, e.X + e.A, e.Y + e.B
}

// Anchor implements Shape.
func (e Ellipse) Anchor() (x, y float64) { return e.X, e.Y }

// Validate implements Shape.
func (e Ellipse) Validate() error {
	if !finite(e.X, e.Y, e.A, e.B) || !(e.A > 0) || !(e.B > 0) {
		return fmt.Errorf("ellipse at (%g, %g) needs finite positive semi-axes, got %g and %g", e.X, e.Y, e.A, e.B)
	}
	return nil
}

// Annulus is the ring R0 ≤ |p − (X, Y)| ≤ R1, for example the outer
// conductor of a coaxial line.
type Annulus struct{ X, Y, R0, R1 float64 }

// Contains implements Shape.
func (a Annulus) Contains(x, y float64) bool {
	dx, dy := x-a.X, y-a.Y
	d2 := dx*dx + dy*dy
	return d2 >= a.R0*a.R0 && d2 <= a.R1*a.R1
}

// Bounds implements Shape.
func (a Annulus) Bounds() (x0, y0, x1, y1 float64) {
	return a.X - a.R1, a.Y - a.R1, a.X + a.R1, a.Y + a.R1
}

// Anchor implements Shape.
func (a Annulus) Anchor() (x, y float64) { return a.X + 0.5*(a.R0+a.R1), a.Y }

// Validate implements Shape.
func (a Annulus) Validate() error {
	if !finite(a.X, a.Y, a.R0, a.R1) || !(a.R0 >= 0) || !(a.R1 > a.R0) {
		return fmt.Errorf("annulus at (%g, %g) needs 0 ≤ inner radius < outer radius, got %g and %g", a.X, a.Y, a.R0, a.R1)
	}
	return nil
}

// Polygon is a simple polygon given by its vertices in order (either
// orientation); the closing edge from the last vertex to the first is
// implied.
type Polygon struct{ X, Y []float64 }

// Contains implements Shape by the even–odd crossing rule, counting points
// on an edge as inside.
func (p Polygon) Contains(x, y float64) bool {
	n := len(p.X)
	in := false
	for i, j := 0, n-1; i < n; j, i = i, i+1 {
		xi, yi, xj, yj := p.X[i], p.Y[i], p.X[j], p.Y[j]
		if onSegment(x, y, xi, yi, xj, yj) {
			return true
		}
		if (yi > y) != (yj > y) {
			xc := xi + (y-yi)*(xj-xi)/(yj-yi)
			if x < xc {
				in = !in
			}
		}
	}
	return in
}

func onSegment(x, y, x0, y0, x1, y1 float64) bool {
	dx, dy := x1-x0, y1-y0
	cross := (x-x0)*dy - (y-y0)*dx
	l2 := dx*dx + dy*dy
	if math.Abs(cross) > 1e-12*l2 {
		return false
	}
	dot := (x-x0)*dx + (y-y0)*dy
	return dot >= 0 && dot <= l2
}

// Bounds implements Shape.
func (p Polygon) Bounds() (x0, y0, x1, y1 float64) {
	x0, y0, x1, y1 = math.Inf(1), math.Inf(1), math.Inf(-1), math.Inf(-1)
	for i := range p.X {
		x0, x1 = math.Min(x0, p.X[i]), math.Max(x1, p.X[i])
		y0, y1 = math.Min(y0, p.Y[i]), math.Max(y1, p.Y[i])
	}
	return
}

// Anchor implements Shape: the area centroid when it lies inside,
// otherwise the first vertex.
func (p Polygon) Anchor() (x, y float64) {
	var a, cx, cy float64
	n := len(p.X)
	for i, j := 0, n-1; i < n; j, i = i, i+1 {
		c := p.X[j]*p.Y[i] - p.X[i]*p.Y[j]
		a += c
		cx += (p.X[j] + p.X[i]) * c
		cy += (p.Y[j] + p.Y[i]) * c
	}
	if a != 0 {
		cx, cy = cx/(3*a), cy/(3*a)
		if p.Contains(cx, cy) {
			return cx, cy
		}
	}
	return p.X[0], p.Y[0]
}

// Validate implements Shape: at least three finite vertices, no two edges
// crossing.
func (p Polygon) Validate() error {
	n := len(p.X)
	if n != len(p.Y) {
		return fmt.Errorf("polygon has %d x and %d y coordinates; give one pair per vertex", len(p.X), len(p.Y))
	}
	if n < 3 {
		return fmt.Errorf("polygon needs at least 3 vertices, got %d", n)
	}
	if !finite(p.X...) || !finite(p.Y...) {
		return fmt.Errorf("polygon has a vertex that is not finite")
	}
	for i := 0; i < n; i++ {
		a0x, a0y, a1x, a1y := p.X[i], p.Y[i], p.X[(i+1)%n], p.Y[(i+1)%n]
		if a0x == a1x && a0y == a1y {
			return fmt.Errorf("polygon vertices %d and %d coincide at (%g, %g)", i, (i+1)%n, a0x, a0y)
		}
		for j := i + 2; j < n; j++ {
			if i == 0 && j == n-1 {
				continue // adjacent through the closing edge
			}
			b0x, b0y, b1x, b1y := p.X[j], p.Y[j], p.X[(j+1)%n], p.Y[(j+1)%n]
			if segmentsCross(a0x, a0y, a1x, a1y, b0x, b0y, b1x, b1y) {
				return fmt.Errorf("polygon edges %d and %d cross; a polygon must be simple", i, j)
			}
		}
	}
	return nil
}

func segmentsCross(ax, ay, bx, by, cx, cy, dx, dy float64) bool {
	o := func(px, py, qx, qy, rx, ry float64) float64 { return (qx-px)*(ry-py) - (qy-py)*(rx-px) }
	d1 := o(cx, cy, dx, dy, ax, ay)
	d2 := o(cx, cy, dx, dy, bx, by)
	d3 := o(ax, ay, bx, by, cx, cy)
	d4 := o(ax, ay, bx, by, dx, dy)
	return ((d1 > 0 && d2 < 0) || (d1 < 0 && d2 > 0)) && ((d3 > 0 && d4 < 0) || (d3 < 0 && d4 > 0))
}

// Strip is a straight band from (X0, Y0) to (X1, Y1) with the given
// Thickness across it, such as a board trace or a thin plate. The thickness
// may be zero or smaller than the grid spacing: every grid node whose
// control volume the centre line crosses belongs to a conductor strip, so a
// thin strip is never lost between grid lines.
type Strip struct{ X0, Y0, X1, Y1, Thickness float64 }

// Contains implements Shape.
func (s Strip) Contains(x, y float64) bool {
	return s.distance(x, y) <= 0.5*s.Thickness
}

// distance returns the distance from (x, y) to the centre line if its
// projection falls on the segment, and +Inf otherwise (flat ends).
func (s Strip) distance(x, y float64) float64 {
	dx, dy := s.X1-s.X0, s.Y1-s.Y0
	l2 := dx*dx + dy*dy
	t := ((x-s.X0)*dx + (y-s.Y0)*dy) / l2
	if t < 0 || t > 1 {
		return math.Inf(1)
	}
	return math.Abs((x-s.X0)*dy-(y-s.Y0)*dx) / math.Sqrt(l2)
}

// Bounds implements Shape.
func (s Strip) Bounds() (x0, y0, x1, y1 float64) {
	dx, dy := s.X1-s.X0, s.Y1-s.Y0
	l := math.Hypot(dx, dy)
	ox, oy := 0.5*s.Thickness*math.Abs(dy)/l, 0.5*s.Thickness*math.Abs(dx)/l
	return math.Min(s.X0, s.X1) - ox, math.Min(s.Y0, s.Y1) - oy, math.Max(s.X0, s.X1) + ox, math.Max(s.Y0, s.Y1) + oy
}

// Anchor implements Shape.
func (s Strip) Anchor() (x, y float64) { return 0.5 * (s.X0 + s.X1), 0.5 * (s.Y0 + s.Y1) }

// Validate implements Shape.
func (s Strip) Validate() error {
	if !finite(s.X0, s.Y0, s.X1, s.Y1, s.Thickness) || s.Thickness < 0 {
		return fmt.Errorf("strip needs finite end points and a thickness ≥ 0")
	}
	if s.X0 == s.X1 && s.Y0 == s.Y1 {
		return fmt.Errorf("strip from (%g, %g) has zero length", s.X0, s.Y0)
	}
	return nil
}

// crossesRect reports whether the centre line of s meets the half-open
// rectangle [x0, x1) × [y0, y1) (Liang–Barsky clipping).
func (s Strip) crossesRect(x0, y0, x1, y1 float64) bool {
	t0, t1 := 0.0, 1.0
	dx, dy := s.X1-s.X0, s.Y1-s.Y0
	clip := func(p, q float64) bool {
		if p == 0 {
			return q >= 0
		}
		r := q / p
		if p < 0 {
			if r > t1 {
				return false
			}
			if r > t0 {
				t0 = r
			}
		} else {
			if r < t0 {
				return false
			}
			if r < t1 {
				t1 = r
			}
		}
		return true
	}
	if !clip(-dx, s.X0-x0) || !clip(dx, x1-s.X0) || !clip(-dy, s.Y0-y0) || !clip(dy, y1-s.Y0) {
		return false
	}
	if t0 > t1 {
		return false
	}
	// Exclude the open upper edges: a segment touching only x = x1 or
	// y = y1 belongs to the next control volume.
	mx, my := s.X0+dx*0.5*(t0+t1), s.Y0+dy*0.5*(t0+t1)
	if t0 == t1 {
		return mx < x1 && my < y1
	}
	return !(dx == 0 && s.X0 == x1) && !(dy == 0 && s.Y0 == y1)
}

func finite(v ...float64) bool {
	for _, x := range v {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return false
		}
	}
	return true
}
