package bc

import (
	"math"
	"testing"
)

func TestShapesContain(t *testing.T) {
	for _, c := range []struct {
		reason string
		s      Shape
		x, y   float64
		want   bool
	}{
		{"rect inside", Rect{0, 0, 2, 1}, 1, 0.5, true},
		{"rect on edge", Rect{0, 0, 2, 1}, 2, 0.5, true},
		{"rect outside", Rect{0, 0, 2, 1}, 2.1, 0.5, false},
		{"circle inside", Circle{1, 1, 0.5}, 1.3, 1.3, true},
		{"circle outside", Circle{1, 1, 0.5}, 1.4, 1.4, false},
		{"annulus hole", Annulus{0, 0, 1, 2}, 0.5, 0, false},
		{"annulus ring", Annulus{0, 0, 1, 2}, 0, 1.5, true},
		{"triangle inside", Polygon{[]float64{0, 2, 0}, []float64{0, 0, 2}}, 0.5, 0.5, true},
		{"triangle outside", Polygon{[]float64{0, 2, 0}, []float64{0, 0, 2}}, 1.5, 1.5, false},
		{"triangle vertex", Polygon{[]float64{0, 2, 0}, []float64{0, 0, 2}}, 2, 0, true},
		{"L-shape notch", Polygon{[]float64{0, 2, 2, 1, 1, 0}, []float64{0, 0, 1, 1, 2, 2}}, 1.5, 1.5, false},
		{"L-shape arm", Polygon{[]float64{0, 2, 2, 1, 1, 0}, []float64{0, 0, 1, 1, 2, 2}}, 0.5, 1.5, true},
		{"strip on line", Strip{0, 0, 1, 1, 0.1}, 0.5, 0.5, true},
		{"strip beside", Strip{0, 0, 1, 1, 0.1}, 0.5, 0.6, false},
		{"strip past end", Strip{0, 0, 1, 0, 0.1}, 1.01, 0, false},
	} {
		if got := c.s.Contains(c.x, c.y); got != c.want {
			t.Errorf("%s: Contains(%g, %g) = %v, want %v", c.reason, c.x, c.y, got, c.want)
		}
	}
}

func TestShapesValidate(t *testing.T) {
	for _, c := range []struct {
		reason string
		s      Shape
		ok     bool
	}{
		{"good rect", Rect{0, 0, 1, 1}, true},
		{"reversed rect", Rect{1, 0, 0, 1}, false},
		{"nan rect", Rect{math.NaN(), 0, 1, 1}, false},
		{"zero radius", Circle{0, 0, 0}, false},
		{"annulus reversed", Annulus{0, 0, 2, 1}, false},
		{"two-vertex polygon", Polygon{[]float64{0, 1}, []float64{0, 1}}, false},
		{"bow tie", Polygon{[]float64{0, 1, 1, 0}, []float64{0, 1, 0, 1}}, false},
		{"mismatched polygon", Polygon{[]float64{0, 1, 1}, []float64{0, 1}}, false},
		{"square", Polygon{[]float64{0, 1, 1, 0}, []float64{0, 0, 1, 1}}, true},
		{"zero strip", Strip{0, 0, 0, 0, 1}, false},
		{"thin strip", Strip{0, 0, 1, 0, 0}, true},
	} {
		err := c.s.Validate()
		if (err == nil) != c.ok {
			t.Errorf("%s: Validate() = %v, want ok = %v", c.reason, err, c.ok)
		}
	}
}

func TestPolygonAnchorInside(t *testing.T) {
	// An L-shape whose centroid lies in the notch falls back to a vertex.
	for _, p := range []Polygon{
		{[]float64{0, 2, 2, 0}, []float64{0, 0, 1, 1}},
		{[]float64{0, 3, 3, 0.2, 0.2, 0}, []float64{0, 0, 0.2, 0.2, 3, 3}},
	} {
		x, y := p.Anchor()
		if !p.Contains(x, y) {
			t.Errorf("anchor (%g, %g) of %v lies outside", x, y, p)
		}
	}
}

func TestStripCrossesRect(t *testing.T) {
	s := Strip{0, 0.5, 1, 0.5, 0}
	for _, c := range []struct {
		reason         string
		x0, y0, x1, y1 float64
		want           bool
	}{
		{"straddles", 0.2, 0.4, 0.3, 0.6, true},
		{"below", 0.2, 0.1, 0.3, 0.4, false},
		{"on lower edge belongs", 0.2, 0.5, 0.3, 0.7, true},
		{"on upper edge does not", 0.2, 0.3, 0.3, 0.5, false},
		{"past the end", 1.1, 0.4, 1.2, 0.6, false},
	} {
		if got := s.crossesRect(c.x0, c.y0, c.x1, c.y1); got != c.want {
			t.Errorf("%s: got %v, want %v", c.reason, got, c.want)
		}
	}
}
