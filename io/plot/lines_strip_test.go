package plot

import (
	"math"
	"testing"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/solve"
)

// TestLinesThinStrip: a zero-thickness trace on a laminate, half of it
// modelled beside a symmetry plane, inside a grounded box. The trace has
// no outline of its own, yet its faces carry the charge of the Gauss law
// (within the error its knife edge leaves), lines start on both faces and
// every one of them ends on the ground.
func TestLinesThinStrip(t *testing.T) {
	const mm = 1e-3
	p := &bc.Problem{
		Domain:     bc.Rect{X0: 0, Y0: 0, X1: 4 * mm, Y1: 4 * mm},
		Conductors: []bc.Conductor{{Name: "ground"}, {Name: "trace", Potential: 1}},
		Regions: []bc.Region{
			{Name: "FR-4", Kind: bc.Dielectric, Shape: bc.Rect{X0: 0, Y0: 0, X1: 4 * mm, Y1: 0.5 * mm}, EpsR: 4.4},
			{Kind: bc.ConductorRegion, Conductor: "trace", Shape: bc.Strip{X0: 0, Y0: 0.5 * mm, X1: 0.5 * mm, Y1: 0.5 * mm}},
		},
	}
	for _, s := range []int{bc.Bottom, bc.Right, bc.Top} {
		p.Sides[s] = bc.Side{Kind: bc.Fixed, Conductor: "ground"}
	}
	g, err := bc.AutoGrid(p, bc.Mesh{Cell: 0.1 * mm, Refine: 4})
	if err != nil {
		t.Fatal(err)
	}
	sol := mustSolve(t, p, g)
	f, err := newFigure(sol, p, Options{Kind: FieldLines}, "png")
	if err != nil {
		t.Fatal(err)
	}
	tr := newTracer(sol, p, f.sc)
	elems := tr.surface(f.segment())
	q := sol.Charges()
	var s float64
	for _, e := range elems[1] {
		s += e.q
	}
	// The elements carry ε_r·Eₙ·ds = q/ε₀ per unit depth.
	if got := s * solve.Eps0; math.Abs(got/q[1]-1) > 0.05 {
		t.Errorf("trace: surface charge %.5g C/m, Gauss-law charge %.5g C/m", got, q[1])
	}
	const n = 24
	seeds, counts := tr.seeds(elems, n)
	if counts[1] != n {
		t.Errorf("the trace has %d seeds, want %d", counts[1], n)
	}
	var up, down int
	for _, sd := range seeds {
		if sd.cond != 1 {
			continue
		}
		switch {
		case sd.ny > 0.5:
			up++
		case sd.ny < -0.5:
			down++
		}
	}
	// Most of the flux runs through the laminate, some through the air.
	if !(up > 0 && down > up) {
		t.Errorf("trace seeds: %d on the upper face, %d on the lower; want some above and most below", up, down)
	}
	lines := tr.lines(seeds)
	if len(lines) != n {
		t.Errorf("%d lines, want %d (the trace's)", len(lines), n)
	}
	for _, l := range lines {
		if l.end != endConductor {
			start, end := l.pts[0], l.pts[len(l.pts)-1]
			t.Errorf("line from (%.3g, %.3g) mm stops at (%.3g, %.3g) mm (%v), want it to reach the ground", start.x/mm, start.y/mm, end.x/mm, end.y/mm, l.end)
		}
	}
}
