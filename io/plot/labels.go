package plot

import (
	"image/color"
	"math"
	"sort"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// contourSet is the equipotentials of one picture, in model coordinates.
type contourSet struct {
	levels []float64
	lines  [][][]pt // per level
}

func (f *figure) contours(levels []float64) contourSet {
	cs := contourSet{levels: levels, lines: make([][][]pt, len(levels))}
	for i, l := range levels {
		cs.lines[i] = contourLines(f.sol.Grid, f.sol.Map, f.sol.Phi, l)
	}
	return cs
}

// contourLayer draws a contour set. colour gives each level's line colour
// and label its text ("" leaves it unlabelled). Labels sit in gaps of the
// lines, turned along them and upright, on straight stretches away from
// conductors, the frame and each other.
func (f *figure) contourLayer(cs contourSet, width vg.Length, colour func(level float64) color.Color, label func(level float64) string) layer {
	return func(v *view) {
		var placed []circle
		// Every line on the picture, for keeping labels off other lines.
		var all [][]vg.Point
		count := make([]int, len(cs.levels)) // lines of each level on the picture
		for i := range cs.levels {
			for _, line := range cs.lines[i] {
				pieces := f.shownLines(v, line, false)
				all = append(all, pieces...)
				count[i] += len(pieces)
			}
		}
		// Region boundaries too, so that no label sits on an outline.
		for _, b := range f.boundaries() {
			all = append(all, f.shownLines(v, b.pts, b.closed)...)
		}
		idx := newSegIndex(all, 24)
		id := 0
		for i, lv := range cs.levels {
			col := colour(lv)
			txt := label(lv)
			sty := f.textStyle(0.8, false, col)
			sty.XAlign, sty.YAlign = draw.XCenter, draw.YCenter
			ls := draw.LineStyle{Color: col, Width: width}
			for range count[i] {
				pts := all[id]
				id++
				if txt == "" {
					v.c.StrokeLines(ls, pts)
					continue
				}
				cum := arcLengths(pts)
				gaps := f.placeLabels(v, pts, cum, txt, sty, &placed, idx, id-1)
				for _, g := range gaps {
					c := pointAt(pts, cum, g.s)
					st := sty
					st.Rotation = g.angle
					v.c.FillText(st, c, txt)
				}
				for _, piece := range cutGaps(pts, cum, gaps) {
					v.c.StrokeLines(ls, piece)
				}
			}
		}
	}
}

type circle struct {
	c vg.Point
	r vg.Length
}

// gap is a label position on a line: arc length of its centre, half
// length of the gap, and the text angle.
type gap struct {
	s, half vg.Length
	angle   float64
}

// placeLabels chooses where to label one line.
func (f *figure) placeLabels(v *view, pts []vg.Point, cum []vg.Length, txt string, sty draw.TextStyle, placed *[]circle, idx *segIndex, self int) []gap {
	total := cum[len(cum)-1]
	lw := sty.Width(txt)
	pad := 0.25 * vg.Length(f.fs)
	half := lw/2 + pad
	if total < 3*half {
		return nil
	}
	dw, dh := v.c.Max.X-v.c.Min.X, v.c.Max.Y-v.c.Min.Y
	spacing := 0.55 * max(dw, dh)
	n := max(1, int(total/spacing))
	var out []gap
	for i := range n {
		target := (vg.Length(i) + 0.5) * total / vg.Length(n)
		reach := 0.45 * total / vg.Length(n)
		step := lw / 3
		for k := 0; vg.Length(k)*step <= reach; k++ {
			found := false
			for _, sgn := range []vg.Length{1, -1} {
				if k == 0 && sgn < 0 {
					continue
				}
				s := target + sgn*vg.Length(k)*step
				if g, ok := f.labelFits(v, pts, cum, s, half, sty, *placed, idx, self); ok {
					out = append(out, g)
					*placed = append(*placed, circle{pointAt(pts, cum, s), half + pad})
					found = true
					break
				}
			}
			if found {
				break
			}
		}
	}
	return out
}

// labelFits reports whether a label centred at arc length s fits there.
func (f *figure) labelFits(v *view, pts []vg.Point, cum []vg.Length, s, half vg.Length, sty draw.TextStyle, placed []circle, idx *segIndex, self int) (gap, bool) {
	total := cum[len(cum)-1]
	if s-half < 0 || s+half > total {
		return gap{}, false
	}
	a, c, b := pointAt(pts, cum, s-half), pointAt(pts, cum, s), pointAt(pts, cum, s+half)
	// Straight enough: the two halves turn by less than 25°.
	t1 := math.Atan2(float64(c.Y-a.Y), float64(c.X-a.X))
	t2 := math.Atan2(float64(b.Y-c.Y), float64(b.X-c.X))
	turn := math.Abs(math.Remainder(t2-t1, 2*math.Pi))
	if turn > 25*math.Pi/180 {
		return gap{}, false
	}
	// Inside the frame with room for the text.
	h := sty.Height("0")
	m := half + 0.5*h
	if c.X-m < v.c.Min.X || c.X+m > v.c.Max.X || c.Y-m < v.c.Min.Y || c.Y+m > v.c.Max.Y {
		return gap{}, false
	}
	for _, q := range placed {
		if math.Hypot(float64(q.c.X-c.X), float64(q.c.Y-c.Y)) < float64(q.r+half) {
			return gap{}, false
		}
	}
	// Clear of the other lines by most of a text height.
	if idx.near(a, b, 0.75*h, self) {
		return gap{}, false
	}
	// Clear of conductors.
	for _, p := range []vg.Point{a, c, b} {
		mp := v.model(p)
		if f.sc.at(mp.x, mp.y).cond >= 0 {
			return gap{}, false
		}
	}
	// Keep the text upright; near-vertical text reads upwards, as an
	// axis label does.
	ang := math.Atan2(float64(b.Y-a.Y), float64(b.X-a.X))
	const tilt = 5 * math.Pi / 180
	if ang > math.Pi/2+tilt {
		ang -= math.Pi
	} else if ang <= -math.Pi/2+tilt {
		ang += math.Pi
	}
	return gap{s: s, half: half, angle: ang}, true
}

func arcLengths(pts []vg.Point) []vg.Length {
	cum := make([]vg.Length, len(pts))
	for i := 1; i < len(pts); i++ {
		cum[i] = cum[i-1] + vg.Length(math.Hypot(float64(pts[i].X-pts[i-1].X), float64(pts[i].Y-pts[i-1].Y)))
	}
	return cum
}

// pointAt returns the point at arc length s along pts.
func pointAt(pts []vg.Point, cum []vg.Length, s vg.Length) vg.Point {
	k := sort.Search(len(cum), func(i int) bool { return cum[i] >= s })
	if k <= 0 {
		return pts[0]
	}
	if k >= len(cum) {
		return pts[len(pts)-1]
	}
	d := cum[k] - cum[k-1]
	if d == 0 {
		return pts[k]
	}
	t := (s - cum[k-1]) / d
	return vg.Point{X: pts[k-1].X + t*(pts[k].X-pts[k-1].X), Y: pts[k-1].Y + t*(pts[k].Y-pts[k-1].Y)}
}

// cutGaps returns the pieces of pts outside the gaps.
func cutGaps(pts []vg.Point, cum []vg.Length, gaps []gap) [][]vg.Point {
	if len(gaps) == 0 {
		return [][]vg.Point{pts}
	}
	sort.Slice(gaps, func(i, j int) bool { return gaps[i].s < gaps[j].s })
	var out [][]vg.Point
	from := vg.Length(0)
	emit := func(a, b vg.Length) {
		if b <= a {
			return
		}
		piece := []vg.Point{pointAt(pts, cum, a)}
		for k := range pts {
			if cum[k] > a && cum[k] < b {
				piece = append(piece, pts[k])
			}
		}
		piece = append(piece, pointAt(pts, cum, b))
		out = append(out, piece)
	}
	for _, g := range gaps {
		emit(from, g.s-g.half)
		from = g.s + g.half
	}
	emit(from, cum[len(cum)-1])
	return out
}

// segIndex finds the segments of a set of polylines near a point by
// bucketing them on a square lattice of the given cell size.
type segIndex struct {
	lines  [][]vg.Point
	cell   vg.Length
	bucket map[[2]int][][2]int // line, segment
}

func newSegIndex(lines [][]vg.Point, cell vg.Length) *segIndex {
	ix := &segIndex{lines: lines, cell: cell, bucket: map[[2]int][][2]int{}}
	for l, pts := range lines {
		for k := 0; k+1 < len(pts); k++ {
			a, b := pts[k], pts[k+1]
			i0, j0 := ix.key(vg.Point{X: min(a.X, b.X), Y: min(a.Y, b.Y)})
			i1, j1 := ix.key(vg.Point{X: max(a.X, b.X), Y: max(a.Y, b.Y)})
			for i := i0; i <= i1; i++ {
				for j := j0; j <= j1; j++ {
					ix.bucket[[2]int{i, j}] = append(ix.bucket[[2]int{i, j}], [2]int{l, k})
				}
			}
		}
	}
	return ix
}

func (ix *segIndex) key(p vg.Point) (int, int) {
	return int(math.Floor(float64(p.X / ix.cell))), int(math.Floor(float64(p.Y / ix.cell)))
}

// near reports whether a segment of a line other than skip passes within
// r of the segment a–b.
func (ix *segIndex) near(a, b vg.Point, r vg.Length, skip int) bool {
	i0, j0 := ix.key(vg.Point{X: min(a.X, b.X) - r, Y: min(a.Y, b.Y) - r})
	i1, j1 := ix.key(vg.Point{X: max(a.X, b.X) + r, Y: max(a.Y, b.Y) + r})
	for i := i0; i <= i1; i++ {
		for j := j0; j <= j1; j++ {
			for _, s := range ix.bucket[[2]int{i, j}] {
				if s[0] == skip {
					continue
				}
				p, q := ix.lines[s[0]][s[1]], ix.lines[s[0]][s[1]+1]
				if segDist(a, b, p, q) < float64(r) {
					return true
				}
			}
		}
	}
	return false
}

// segDist returns the distance between segments a–b and p–q.
func segDist(a, b, p, q vg.Point) float64 {
	if segmentsCross(a, b, p, q) {
		return 0
	}
	return math.Min(math.Min(pointSeg(a, p, q), pointSeg(b, p, q)), math.Min(pointSeg(p, a, b), pointSeg(q, a, b)))
}

func pointSeg(c, a, b vg.Point) float64 {
	dx, dy := float64(b.X-a.X), float64(b.Y-a.Y)
	l2 := dx*dx + dy*dy
	t := 0.0
	if l2 > 0 {
		t = math.Max(0, math.Min(1, (float64(c.X-a.X)*dx+float64(c.Y-a.Y)*dy)/l2))
	}
	return math.Hypot(float64(a.X)+t*dx-float64(c.X), float64(a.Y)+t*dy-float64(c.Y))
}

func segmentsCross(a, b, p, q vg.Point) bool {
	o := func(a, b, c vg.Point) float64 {
		return float64((b.X-a.X)*(c.Y-a.Y) - (b.Y-a.Y)*(c.X-a.X))
	}
	d1, d2 := o(p, q, a), o(p, q, b)
	d3, d4 := o(a, b, p), o(a, b, q)
	return (d1 > 0) != (d2 > 0) && (d3 > 0) != (d4 > 0) && d1 != 0 && d2 != 0 && d3 != 0 && d4 != 0
}
