package plot

import (
	"math"
	"sort"
	"testing"

	"github.com/phigrid/phigrid/grid"
	"github.com/phigrid/phigrid/solve"
)

// TestLinesParallelPlates: in a uniform field with uniform surface charge
// the lines are straight, run from plate to plate, and are evenly spaced.
func TestLinesParallelPlates(t *testing.T) {
	const w, d = 10e-3, 2e-3
	p := plates(w, d, 1000)
	sol := mustSolve(t, p, mustGrid(t, 0, w, 51, 0, d, 11, grid.Planar))
	f, err := newFigure(sol, p, Options{Kind: FieldLines}, "png")
	if err != nil {
		t.Fatal(err)
	}
	tr := newTracer(sol, p, f.sc)
	elems := tr.surface(f.segment())
	const n = 20
	seeds, counts := tr.seeds(elems, n)
	// hv (top, positive) gets n seeds and gnd the same number (equal and
	// opposite charge).
	if counts[0] != n || counts[1] != n {
		t.Errorf("seeds per plate %v, want [%d %d]", counts, n, n)
	}
	lines := tr.lines(seeds)
	if len(lines) != n {
		t.Fatalf("%d lines drawn, want %d (those from the negative plate retrace them)", len(lines), n)
	}
	var xs []float64
	for _, l := range lines {
		x0 := l.pts[0].x
		for _, q := range l.pts {
			if math.Abs(q.x-x0) > 1e-9*w {
				t.Fatalf("line from x = %g bends to x = %g", x0, q.x)
			}
		}
		if end := l.pts[len(l.pts)-1]; l.end != endConductor || math.Abs(end.y) > 1e-9*d {
			t.Errorf("line from x = %g ends at y = %g (%v), want on the lower plate", x0, end.y, l.end)
		}
		xs = append(xs, x0)
	}
	sort.Float64s(xs)
	for i, x := range xs {
		want := (float64(i) + 0.5) * w / n
		if math.Abs(x-want) > 0.01*w/n {
			t.Errorf("line %d at x = %.5g, want %.5g (even spacing)", i, x, want)
		}
	}
}

// TestLinesCoax: seeds per conductor follow the charge, which is equal
// and opposite on the two conductors of a coaxial line, and the lines are
// radial.
func TestLinesCoax(t *testing.T) {
	sol, p := solvedCoax(t)
	f, err := newFigure(sol, p, Options{Kind: FieldLines}, "png")
	if err != nil {
		t.Fatal(err)
	}
	tr := newTracer(sol, p, f.sc)
	elems := tr.surface(f.segment())
	q := sol.Charges()
	for k, es := range elems {
		var s float64
		for _, e := range es {
			s += e.q
		}
		// The elements carry ε_r·Eₙ·ds = q/ε₀ per unit depth.
		if got, want := s*solve.Eps0, q[k]; math.Abs(got/want-1) > 0.02 {
			t.Errorf("conductor %s: surface charge %.5g C/m, Gauss-law charge %.5g C/m", p.Conductors[k].Name, got, want)
		}
	}
	const n = 30
	seeds, counts := tr.seeds(elems, n)
	if counts[0] != n {
		t.Errorf("inner conductor has %d seeds, want %d", counts[0], n)
	}
	if r := float64(counts[1]) / float64(counts[0]); math.Abs(r-1) > 0.1 {
		t.Errorf("seeds inner/outer %v: |Q| is equal on both, want counts within 10 %%", counts)
	}
	lines := tr.lines(seeds)
	if len(lines) != n {
		t.Errorf("%d lines, want %d", len(lines), n)
	}
	const h = 3.15e-3 / 80 // grid spacing
	for _, l := range lines {
		// In the free space between the conductors a line keeps its
		// angle; within the first cell it may be set aside by the grid
		// field's direction error there, by a fraction of a cell.
		a0 := math.Atan2(l.pts[0].y, l.pts[0].x)
		lo, hi := math.Inf(1), math.Inf(-1)
		for _, p := range l.pts {
			if r := math.Hypot(p.x, p.y); r < 1.1e-3 || r > 2.9e-3 {
				continue
			}
			a := math.Atan2(p.y, p.x)
			lo, hi = math.Min(lo, a), math.Max(hi, a)
		}
		if hi-lo > 5e-4 {
			t.Errorf("line from angle %.4f turns by %.2g rad between the conductors: not radial", a0, hi-lo)
		}
		if off := math.Max(math.Abs(lo-a0), math.Abs(hi-a0)) * 1e-3; off > 0.25*h {
			t.Errorf("line from angle %.4f is set aside by %.3g m near the surface, over a quarter cell", a0, off)
		}
		end := l.pts[len(l.pts)-1]
		if r := math.Hypot(end.x, end.y); l.end != endConductor || math.Abs(r-3e-3) > 1e-6 {
			t.Errorf("line ends at r = %g (%v), want on the outer conductor at 3 mm", r, l.end)
		}
	}
	// Seeds evenly spaced in angle on the inner conductor.
	var angles []float64
	for _, s := range seeds {
		if s.cond == 0 {
			angles = append(angles, math.Atan2(s.p.y, s.p.x))
		}
	}
	sort.Float64s(angles)
	for i, a := range angles {
		want := (float64(i) + 0.5) * math.Pi / 2 / n
		if math.Abs(a-want) > 0.15*math.Pi/2/n {
			t.Errorf("seed %d at %.4f rad, want %.4f (uniform surface charge)", i, a, want)
		}
	}
}
