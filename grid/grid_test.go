package grid

import (
	"errors"
	"math"
	"testing"
)

func TestUniform(t *testing.T) {
	x, err := Uniform(0, 1, 11)
	if err != nil {
		t.Fatal(err)
	}
	if len(x) != 11 || x[0] != 0 || x[10] != 1 || math.Abs(x[3]-0.3) > 1e-15 {
		t.Fatalf("bad axis %v", x)
	}
	for _, c := range []struct {
		lo, hi float64
		n      int
		reason string
	}{
		{0, 1, 1, "too few nodes"},
		{1, 0, 5, "reversed range"},
		{0, math.Inf(1), 5, "infinite end"},
	} {
		if _, err := Uniform(c.lo, c.hi, c.n); !errors.Is(err, ErrAxis) {
			t.Errorf("%s: got %v, want ErrAxis", c.reason, err)
		}
	}
}

func TestGraded(t *testing.T) {
	for _, c := range []struct {
		lo, hi float64
		g      Grading
		reason string
	}{
		{0, 1, Grading{Focus: []float64{0.3}, Fine: 1e-3, Max: 0.05, Ratio: 1.2}, "one interior focus"},
		{0, 10, Grading{Focus: []float64{0, 10}, Fine: 0.01, Max: 1, Ratio: 1.5}, "focus on both ends"},
		{-1, 1, Grading{Focus: []float64{-0.5, 0.5, 0.51}, Fine: 0.001, Ratio: 1.1}, "close foci, no max"},
		{0, 1, Grading{Fine: 0.1}, "no focus is uniform"},
	} {
		x, err := Graded(c.lo, c.hi, c.g)
		if err != nil {
			t.Fatalf("%s: %v", c.reason, err)
		}
		if err := checkAxis("x", x); err != nil {
			t.Fatalf("%s: %v", c.reason, err)
		}
		if x[0] != c.lo || x[len(x)-1] != c.hi {
			t.Errorf("%s: ends %g..%g, want %g..%g", c.reason, x[0], x[len(x)-1], c.lo, c.hi)
		}
		maxh := c.g.Max
		if maxh == 0 {
			maxh = c.hi - c.lo
		}
		ratio := c.g.Ratio
		if ratio == 0 {
			ratio = 1.2
		}
		for i := 1; i < len(x); i++ {
			h := x[i] - x[i-1]
			if h > maxh*(1+1e-12) {
				t.Errorf("%s: cell %d size %g above max %g", c.reason, i, h, maxh)
			}
			if i > 1 {
				r := h / (x[i-1] - x[i-2])
				if r < 1 {
					r = 1 / r
				}
				// Cells are scaled together, so ratios hold except where two
				// growth fronts meet; allow one extra factor there.
				if r > ratio*ratio*(1+1e-9) {
					t.Errorf("%s: growth %g at node %d above %g", c.reason, r, i, ratio)
				}
			}
		}
		for _, f := range c.g.Focus {
			found := false
			for i, v := range x {
				if v == f {
					found = true
					if i > 0 && x[i]-x[i-1] > c.g.Fine*(1+1e-12) {
						t.Errorf("%s: cell below focus %g is %g, above fine %g", c.reason, f, x[i]-x[i-1], c.g.Fine)
					}
				}
			}
			if !found {
				t.Errorf("%s: focus %g is not a node", c.reason, f)
			}
		}
	}
	if _, err := Graded(0, 1, Grading{Fine: 0}); !errors.Is(err, ErrAxis) {
		t.Errorf("zero fine size: got %v", err)
	}
	if _, err := Graded(0, 1, Grading{Fine: 0.1, Ratio: 5}); !errors.Is(err, ErrAxis) {
		t.Errorf("ratio 5: got %v", err)
	}
}

// The control volumes tile the domain exactly: their sum is the domain
// area (planar) or the cylinder volume πR²H (axisymmetric).
func TestVolumesTile(t *testing.T) {
	x, _ := Graded(0, 2, Grading{Focus: []float64{0.7}, Fine: 0.01, Max: 0.2})
	y, _ := Uniform(-1, 3, 17)
	for _, c := range []struct {
		m    Metric
		want float64
	}{
		{Planar, 2 * 4},
		{Axisymmetric, math.Pi * 4 * 4}, // common practice: cylinder volume πR²H
	} {
		g, err := New(x, y, c.m)
		if err != nil {
			t.Fatal(err)
		}
		sum, cells := 0.0, 0.0
		for j := 0; j < g.Ny(); j++ {
			for i := 0; i < g.Nx(); i++ {
				sum += g.Volume(i, j)
			}
		}
		for j := 0; j+1 < g.Ny(); j++ {
			for i := 0; i+1 < g.Nx(); i++ {
				cells += g.CellVolume(i, j)
			}
		}
		if math.Abs(sum/c.want-1) > 1e-13 || math.Abs(cells/c.want-1) > 1e-13 {
			t.Errorf("%v: volumes %g and cells %g, want %g", c.m, sum, cells, c.want)
		}
	}
}

func TestAxisymmetricLink(t *testing.T) {
	g, err := New([]float64{0, 1, 3}, []float64{0, 1}, Axisymmetric)
	if err != nil {
		t.Fatal(err)
	}
	// Link 1→2: r_mid = 2, h = 2: 2π·2/2 = 2π.
	if got := g.LinkX(1); math.Abs(got-2*math.Pi) > 1e-14 {
		t.Errorf("LinkX(1) = %g, want 2π", got)
	}
	lo, hi := g.DualX(0)
	if lo != 0 || math.Abs(hi-math.Pi*0.25) > 1e-15 {
		t.Errorf("DualX(0) = %g, %g", lo, hi)
	}
	if _, err := New([]float64{-1, 1}, []float64{0, 1}, Axisymmetric); !errors.Is(err, ErrAxis) {
		t.Errorf("negative radius: got %v", err)
	}
}

func TestLocate(t *testing.T) {
	g, _ := New([]float64{0, 1, 3}, []float64{0, 2}, Planar)
	i, j, s, tt, ok := g.Locate(2, 1)
	if !ok || i != 1 || j != 0 || s != 0.5 || tt != 0.5 {
		t.Errorf("Locate(2,1) = %d %d %g %g %v", i, j, s, tt, ok)
	}
	if _, _, _, _, ok := g.Locate(4, 1); ok {
		t.Error("point outside reported inside")
	}
	i, _, s, _, ok = g.Locate(3, 0)
	if !ok || i != 1 || s != 1 {
		t.Errorf("upper edge: %d %g %v", i, s, ok)
	}
}
