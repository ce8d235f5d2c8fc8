package model

import (
	"bufio"
	"bytes"
	"fmt"
	"math"
	"os"
	"strconv"

	"github.com/phigrid/phigrid/bc"
)

// overlaps finds conductors at different potentials that touch or overlap,
// before any grid exists. Package bc finds the same conflicts node by node
// when it rasterises; this check samples the geometry instead, so it can
// name both conductors and both lines of the file, and it runs before a
// possibly long rasterisation.
//
// For every pair of conductor regions whose conductors are not at one fixed
// potential and whose bounding boxes meet, it samples the common box on a
// lattice (and along the centre line of strips) and walks the region list in
// file order at each sample, so a conductor that an earlier dielectric
// region cut away does not count. It also checks conductors against
// boundary sides that belong to another conductor, and such sides against
// each other at the corners of the domain.
func (d *decoder) overlaps(*rawFile) error {
	p := d.p
	dom := p.Domain
	tol := 1e-9 * math.Max(dom.X1-dom.X0, dom.Y1-dom.Y0)
	shapes := make([]bc.Shape, len(p.Regions))
	condOf := make([]int, len(p.Regions))
	var conds []int
	for n, r := range p.Regions {
		shapes[n] = r.Shape
		if s, ok := r.Shape.(bc.Strip); ok && s.Thickness < 2*tol {
			// Let a zero-thickness strip contain the points of its own
			// centre line despite rounding.
			s.Thickness = 2 * tol
			shapes[n] = s
		}
		condOf[n] = -1
		if r.Kind == bc.ConductorRegion {
			condOf[n] = p.ConductorIndex(r.Conductor)
			conds = append(conds, n)
		}
	}
	conflict := func(a, b int) bool {
		ca, cb := p.Conductors[a], p.Conductors[b]
		return a != b && (ca.Floating || cb.Floating || ca.Potential != cb.Potential)
	}
	// stateBefore returns the conductor at (x, y) after regions [0, n) and
	// the region that put it there, or −1, −1.
	stateBefore := func(x, y float64, n int) (cond, reg int) {
		cond, reg = -1, -1
		for k := 0; k < n; k++ {
			if !shapes[k].Contains(x, y) {
				continue
			}
			switch p.Regions[k].Kind {
			case bc.ConductorRegion:
				cond, reg = condOf[k], k
			default:
				cond, reg = -1, -1
			}
		}
		return cond, reg
	}
	box := func(n int) [4]float64 {
		x0, y0, x1, y1 := shapes[n].Bounds()
		return [4]float64{math.Max(x0, dom.X0), math.Max(y0, dom.Y0), math.Min(x1, dom.X1), math.Min(y1, dom.Y1)}
	}
	type pair struct {
		a, b int
		box  [4]float64
	}
	var pairs []pair
	for j, b := range conds {
		for _, a := range conds[:j] {
			if !conflict(condOf[a], condOf[b]) {
				continue
			}
			ba, bb := box(a), box(b)
			c := [4]float64{math.Max(ba[0], bb[0]), math.Max(ba[1], bb[1]), math.Min(ba[2], bb[2]), math.Min(ba[3], bb[3])}
			if c[0] > c[2]+tol || c[1] > c[3]+tol {
				continue
			}
			pairs = append(pairs, pair{a, b, c})
		}
	}
	// Keep the work bounded for models with many regions: about 4e6 shape
	// tests in all.
	n := 41
	if len(pairs) > 0 {
		n = int(math.Sqrt(4e6 / float64(len(pairs)*(len(p.Regions)+1))))
		n = max(3, min(n, 41))
	}
	if err := d.hidden(shapes, condOf, stateBefore); err != nil {
		return err
	}
	for _, pr := range pairs {
		for _, pt := range samples(pr.box, n, shapes[pr.a], shapes[pr.b]) {
			x, y := pt[0], pt[1]
			if !shapes[pr.b].Contains(x, y) {
				continue
			}
			c, r := stateBefore(x, y, pr.b)
			if c < 0 || !conflict(c, condOf[pr.b]) {
				continue
			}
			ca, cb := p.Conductors[c], p.Conductors[condOf[pr.b]]
			return d.errAt(d.m.regionKeys[pr.b], "conductors %q (%s) and %q (%s) overlap near (%.6g, %.6g) %s but are at different potentials (%s and %s); separate them or give them one potential",
				ca.Name, d.lineOf(d.m.regionKeys[r]), cb.Name, d.lineOf(d.m.regionKeys[pr.b]),
				x/d.lunit.Scale, y/d.lunit.Scale, d.lunit.Name, d.describePotential(ca), d.describePotential(cb))
		}
	}
	// Conductors against sides that belong to another conductor.
	for s, side := range p.Sides {
		if side.Kind != bc.Fixed || side.Conductor == "" {
			continue
		}
		k := p.ConductorIndex(side.Conductor)
		for _, pt := range sidePoints(dom, s, 257) {
			c, r := stateBefore(pt[0], pt[1], len(p.Regions))
			if c < 0 || !conflict(c, k) {
				continue
			}
			return d.errAt(d.m.regionKeys[r], "conductor %q (%s) touches the %s side, which belongs to conductor %q (%s), near (%.6g, %.6g) %s; move it off the side or give both one potential",
				p.Conductors[c].Name, d.describePotential(p.Conductors[c]), bc.SideNames[s], side.Conductor, d.describePotential(p.Conductors[k]),
				pt[0]/d.lunit.Scale, pt[1]/d.lunit.Scale, d.lunit.Name)
		}
	}
	for _, c := range [][2]int{{bc.Left, bc.Bottom}, {bc.Left, bc.Top}, {bc.Right, bc.Bottom}, {bc.Right, bc.Top}} {
		a, b := p.Sides[c[0]], p.Sides[c[1]]
		if a.Kind != bc.Fixed || b.Kind != bc.Fixed || a.Conductor == "" || b.Conductor == "" {
			continue
		}
		ka, kb := p.ConductorIndex(a.Conductor), p.ConductorIndex(b.Conductor)
		if conflict(ka, kb) {
			return d.errAt("boundary."+bc.SideNames[c[1]], "the %s and %s sides meet at a corner but belong to conductors %q and %q at different potentials; let one of them end before the corner, for example with a fixed potential on one side instead of a conductor",
				bc.SideNames[c[0]], bc.SideNames[c[1]], a.Conductor, b.Conductor)
		}
	}
	return nil
}

// hidden finds a conductor that later regions cover completely, so that no
// grid node would belong to it: a mistake in the region order.
func (d *decoder) hidden(shapes []bc.Shape, condOf []int, stateBefore func(x, y float64, n int) (int, int)) error {
	p := d.p
	dom := p.Domain
	visible := make([]bool, len(p.Conductors))
	for _, s := range p.Sides {
		if s.Kind == bc.Fixed && s.Conductor != "" {
			visible[p.ConductorIndex(s.Conductor)] = true
		}
	}
	last := make([]int, len(p.Conductors)) // last region of each conductor
	nc := 0
	for _, k := range condOf {
		if k >= 0 {
			nc++
		}
	}
	// Sample densely enough to see thin remains, within about 4e6 shape
	// tests in all.
	lattice := max(17, min(129, int(math.Sqrt(4e6/float64(nc*len(p.Regions)+1)))))
	for n, k := range condOf {
		if k < 0 || visible[k] {
			continue
		}
		last[k] = n
		x0, y0, x1, y1 := shapes[n].Bounds()
		box := [4]float64{math.Max(x0, dom.X0), math.Max(y0, dom.Y0), math.Min(x1, dom.X1), math.Min(y1, dom.Y1)}
		ax, ay := shapes[n].Anchor()
		for _, pt := range append(samples(box, lattice, shapes[n]), [2]float64{ax, ay}) {
			if !shapes[n].Contains(pt[0], pt[1]) && pt != [2]float64{ax, ay} {
				continue
			}
			if c, _ := stateBefore(pt[0], pt[1], len(p.Regions)); c == k {
				visible[k] = true
				break
			}
		}
	}
	for k, c := range p.Conductors {
		if visible[k] {
			continue
		}
		n := last[k]
		ax, ay := shapes[n].Anchor()
		by := ""
		for m := len(p.Regions) - 1; m > n; m-- {
			if shapes[m].Contains(ax, ay) {
				by = fmt.Sprintf(" (%s covers it)", d.lineOf(d.m.regionKeys[m]))
				break
			}
		}
		return d.errAt(d.m.regionKeys[n], "conductor %q is hidden: regions later in the file cover all of it%s, and later regions override earlier ones; move its [[region]] after the regions that cover it", c.Name, by)
	}
	return nil
}

// samples returns an n×n lattice over box, edges included, and points along
// the centre line of any strip among shapes that fall in the box.
func samples(box [4]float64, n int, shapes ...bc.Shape) [][2]float64 {
	pts := make([][2]float64, 0, n*n)
	for j := 0; j < n; j++ {
		y := box[1] + (box[3]-box[1])*float64(j)/float64(n-1)
		for i := 0; i < n; i++ {
			x := box[0] + (box[2]-box[0])*float64(i)/float64(n-1)
			pts = append(pts, [2]float64{x, y})
		}
	}
	for _, s := range shapes {
		st, ok := s.(bc.Strip)
		if !ok {
			continue
		}
		m := 4 * n
		for i := 0; i <= m; i++ {
			t := float64(i) / float64(m)
			x, y := st.X0+t*(st.X1-st.X0), st.Y0+t*(st.Y1-st.Y0)
			if x >= box[0] && x <= box[2] && y >= box[1] && y <= box[3] {
				pts = append(pts, [2]float64{x, y})
			}
		}
	}
	return pts
}

// sidePoints returns n evenly spaced points along side s of the domain.
func sidePoints(dom bc.Rect, s, n int) [][2]float64 {
	pts := make([][2]float64, n)
	for i := range pts {
		t := float64(i) / float64(n-1)
		switch s {
		case bc.Left:
			pts[i] = [2]float64{dom.X0, dom.Y0 + t*(dom.Y1-dom.Y0)}
		case bc.Right:
			pts[i] = [2]float64{dom.X1, dom.Y0 + t*(dom.Y1-dom.Y0)}
		case bc.Bottom:
			pts[i] = [2]float64{dom.X0 + t*(dom.X1-dom.X0), dom.Y0}
		default:
			pts[i] = [2]float64{dom.X0 + t*(dom.X1-dom.X0), dom.Y1}
		}
	}
	return pts
}

// describePotential says a conductor's potential in the file's unit.
func (d *decoder) describePotential(c bc.Conductor) string {
	if c.Floating {
		return "floating"
	}
	return d.potential(c.Potential)
}

// memTotal returns the machine's total memory in bytes, or 0 when unknown.
// It is a variable so tests can pretend to run on a small machine.
var memTotal = func() uint64 {
	b, err := os.ReadFile("/proc/meminfo")
	if err != nil {
		return 0
	}
	return parseMemTotal(b)
}

// parseMemTotal reads the MemTotal line of /proc/meminfo ("MemTotal:
// 16318412 kB").
func parseMemTotal(b []byte) uint64 {
	sc := bufio.NewScanner(bytes.NewReader(b))
	for sc.Scan() {
		f := bytes.Fields(sc.Bytes())
		if len(f) >= 2 && string(f[0]) == "MemTotal:" {
			v, err := strconv.ParseUint(string(f[1]), 10, 64)
			if err != nil {
				return 0
			}
			if len(f) >= 3 && string(f[2]) == "kB" {
				v *= 1024
			}
			return v
		}
	}
	return 0
}
