package grid

import (
	"errors"
	"fmt"
	"math"
	"sort"
)

// ErrAxis is wrapped by every error that reports a bad axis description.
var ErrAxis = errors.New("grid: invalid axis")

// Uniform returns n nodes evenly spaced from lo to hi inclusive.
// It needs n ≥ 2 and lo < hi.
func Uniform(lo, hi float64, n int) ([]float64, error) {
	if n < 2 {
		return nil, fmt.Errorf("%w: uniform axis needs at least 2 nodes, got %d", ErrAxis, n)
	}
	if !(lo < hi) || math.IsInf(lo, 0) || math.IsInf(hi, 0) {
		return nil, fmt.Errorf("%w: uniform axis needs finite lo < hi, got [%g, %g]", ErrAxis, lo, hi)
	}
	x := make([]float64, n)
	h := (hi - lo) / float64(n-1)
	for i := range x {
		x[i] = lo + float64(i)*h
	}
	x[n-1] = hi
	return x, nil
}

// Grading describes a graded axis: cells of size Fine at each point of
// Focus, growing geometrically by at most Ratio from one cell to the next,
// and never larger than Max.
type Grading struct {
	// Focus lists the coordinates where the axis should be fine, for
	// example conductor edges or dielectric interfaces. Points outside
	// [lo, hi] are ignored.
	Focus []float64
	// Fine is the cell size at the focus points. It must be positive.
	Fine float64
	// Max caps the cell size away from the focus points. Zero means no cap
	// beyond the axis length.
	Max float64
	// Ratio bounds the size ratio of neighbouring cells. Zero means 1.2;
	// values must lie in [1, 3].
	Ratio float64
}

// Graded returns an axis from lo to hi following g. The node set always
// contains lo, hi and every focus point inside the range. The local cell size
// at coordinate x is min(Max, Fine·Ratio^k) where k counts the cells between
// x and the nearest focus point, so sizes change smoothly by at most Ratio.
func Graded(lo, hi float64, g Grading) ([]float64, error) {
	if !(lo < hi) || math.IsInf(lo, 0) || math.IsInf(hi, 0) || math.IsNaN(lo) || math.IsNaN(hi) {
		return nil, fmt.Errorf("%w: graded axis needs finite lo < hi, got [%g, %g]", ErrAxis, lo, hi)
	}
	if !(g.Fine > 0) || math.IsInf(g.Fine, 0) {
		return nil, fmt.Errorf("%w: graded axis needs a positive fine cell size, got %g", ErrAxis, g.Fine)
	}
	ratio := g.Ratio
	if ratio == 0 {
		ratio = 1.2
	}
	if !(ratio >= 1 && ratio <= 3) {
		return nil, fmt.Errorf("%w: growth ratio must lie in [1, 3], got %g", ErrAxis, g.Ratio)
	}
	maxh := g.Max
	if maxh == 0 || maxh > hi-lo {
		maxh = hi - lo
	}
	if maxh < g.Fine {
		return nil, fmt.Errorf("%w: maximum cell size %g is below the fine size %g", ErrAxis, g.Max, g.Fine)
	}
	// Anchor points: range ends and focus points, sorted and de-duplicated.
	pts := []float64{lo, hi}
	for _, f := range g.Focus {
		if f > lo && f < hi && !math.IsNaN(f) {
			pts = append(pts, f)
		}
	}
	sort.Float64s(pts)
	anchors := pts[:1]
	for _, p := range pts[1:] {
		if p-anchors[len(anchors)-1] > 1e-12*(hi-lo) {
			anchors = append(anchors, p)
		}
	}
	hasFocus := len(anchors) > 2 || len(g.Focus) > 0
	// Sizes grow away from anchors that are focus points. Range ends are
	// fine only if they are themselves focus points.
	isFocus := func(p float64) bool {
		for _, f := range g.Focus {
			if math.Abs(f-p) <= 1e-12*(hi-lo) {
				return true
			}
		}
		return false
	}
	out := []float64{anchors[0]}
	for s := 0; s+1 < len(anchors); s++ {
		a, b := anchors[s], anchors[s+1]
		fa, fb := isFocus(a), isFocus(b)
		if !hasFocus {
			fa, fb = true, true
		}
		seg := fillSegment(a, b, fa, fb, g.Fine, maxh, ratio)
		out = append(out, seg...)
	}
	return out, nil
}

// fillSegment returns the interior nodes of (a, b] with sizes starting at
// fine at focused ends and growing by ratio up to maxh. The last node is b.
func fillSegment(a, b float64, fa, fb bool, fine, maxh, ratio float64) []float64 {
	L := b - a
	// Build a size sequence from each focused end; unfocused ends start at maxh.
	var left, right []float64
	grow := func(start float64) func(k int) float64 {
		return func(k int) float64 {
			h := start * math.Pow(ratio, float64(k))
			if h > maxh {
				h = maxh
			}
			return h
		}
	}
	startA, startB := maxh, maxh
	if fa {
		startA = fine
	}
	if fb {
		startB = fine
	}
	ga, gb := grow(startA), grow(startB)
	sumL, sumR := 0.0, 0.0
	ka, kb := 0, 0
	for sumL+sumR < L {
		ha, hb := ga(ka), gb(kb)
		if ha <= hb {
			left = append(left, ha)
			sumL += ha
			ka++
		} else {
			right = append(right, hb)
			sumR += hb
			kb++
		}
	}
	sizes := append(left, reverse(right)...)
	// The sizes overshoot L by less than one cell; shrinking them all by the
	// same factor keeps every cell at or below the requested sizes and keeps
	// the growth ratios.
	total := sumL + sumR
	scale := L / total
	out := make([]float64, 0, len(sizes))
	x := a
	for k, h := range sizes {
		x += h * scale
		if k == len(sizes)-1 {
			x = b
		}
		out = append(out, x)
	}
	return out
}

func reverse(s []float64) []float64 {
	r := make([]float64, len(s))
	for i, v := range s {
		r[len(s)-1-i] = v
	}
	return r
}

// checkAxis reports whether x is a usable node axis.
func checkAxis(name string, x []float64) error {
	if len(x) < 2 {
		return fmt.Errorf("%w: axis %s needs at least 2 nodes, got %d", ErrAxis, name, len(x))
	}
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("%w: axis %s node %d is not finite (%g)", ErrAxis, name, i, v)
		}
		if i > 0 && !(v > x[i-1]) {
			return fmt.Errorf("%w: axis %s is not strictly increasing at node %d (%g after %g)", ErrAxis, name, i, v, x[i-1])
		}
	}
	return nil
}
