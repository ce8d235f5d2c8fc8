package plot

import (
	"math"
	"testing"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
)

// freeMap returns a map of g with every node free and no cuts.
func freeMap(g *grid.Grid) *bc.Map {
	m := &bc.Map{Grid: g, Kind: make([]bc.NodeKind, g.Len()), Cond: make([]int32, g.Len()), CutX: make([]float64, g.Len()), CutY: make([]float64, g.Len())}
	for i := range m.CutX {
		m.CutX[i], m.CutY[i], m.Cond[i] = 1, 1, -1
	}
	return m
}

func TestContourLines(t *testing.T) {
	// A non-uniform grid: the contours must sit at true coordinates.
	xs := []float64{0, 0.1, 0.15, 0.3, 0.55, 0.6, 1}
	ys := []float64{0, 0.2, 0.25, 0.7, 1}
	g, err := grid.New(xs, ys, grid.Planar)
	if err != nil {
		t.Fatal(err)
	}
	m := freeMap(g)
	for _, c := range []struct {
		reason string
		phi    func(x, y float64) float64
		level  float64
		on     func(p pt) float64 // distance of p from the exact contour
		tol    float64
		lines  int
	}{
		{"φ = x: one straight line at x = level", func(x, y float64) float64 { return x }, 0.42,
			func(p pt) float64 { return math.Abs(p.x - 0.42) }, 1e-12, 1},
		{"φ = x + 2y: one straight line", func(x, y float64) float64 { return x + 2*y }, 1.1,
			func(p pt) float64 { return math.Abs(p.x + 2*p.y - 1.1) }, 1e-12, 1},
		{"saddle φ = (x−0.3)(y−0.7) at a non-zero level: two branches", func(x, y float64) float64 { return (x - 0.3) * (y - 0.7) }, 0.05,
			// Every point lies on a grid line, along which φ is linear, so
			// the crossings are exact.
			func(p pt) float64 { return math.Abs((p.x-0.3)*(p.y-0.7) - 0.05) }, 1e-12, 2},
	} {
		phi := make([]float64, g.Len())
		for j, y := range ys {
			for i, x := range xs {
				phi[g.Index(i, j)] = c.phi(x, y)
			}
		}
		lines := contourLines(g, m, phi, c.level)
		if len(lines) != c.lines {
			t.Errorf("%s: %d polylines, want %d", c.reason, len(lines), c.lines)
			continue
		}
		for _, l := range lines {
			for _, p := range l {
				if d := c.on(p); d > c.tol {
					t.Errorf("%s: point (%g, %g) is %g off the contour", c.reason, p.x, p.y, d)
				}
			}
		}
	}
}

// TestContourCutLinks checks that equipotentials of the coax follow the
// analytic radius r = b·(a/b)^(φ/V) closely, which needs the cut-link
// treatment next to the inner conductor.
func TestContourCutLinks(t *testing.T) {
	sol, _ := solvedCoax(t)
	const a, b, v = 1e-3, 3e-3, 1000
	// 0.99 V lies within a cell of the inner conductor, where a plain
	// linear interpolation to the conductor node misses by a fifth of a cell.
	for _, frac := range []float64{0.99, 0.95, 0.5, 0.2} {
		level := frac * v
		want := b * math.Pow(a/b, frac) // source: φ(r) = V·ln(b/r)/ln(b/a), Ramo, Whinnery & Van Duzer, coaxial line
		lines := contourLines(sol.Grid, sol.Map, sol.Phi, level)
		if len(lines) != 1 {
			t.Fatalf("level %g: %d polylines, want one arc", level, len(lines))
		}
		worst := 0.0
		for _, q := range lines[0] {
			worst = math.Max(worst, math.Abs(math.Hypot(q.x, q.y)-want)/want)
		}
		// 81 nodes over 3.15 mm: h = 39 µm; allow 3 % of a cell.
		if worst > 0.03*39e-6/want {
			t.Errorf("level %.0f V: radius off by up to %.3g (relative), want below 3 %% of a cell", level, worst)
		}
	}
}
