package examples_test

import (
	"math"
	"testing"
)

// TestStripSurfaces checks the surface fields of the examples whose
// electrodes are zero-thickness strips on a board: every conductor's
// surface points carry its Gauss-law charge (Σ σ·Area), to within a few
// per cent on the strips, whose knife edges limit the one-sided
// differences, and closely on the planes; and the strips' peaks, which lie
// at their edges, are marked as not converged.
func TestStripSurfaces(t *testing.T) {
	for _, c := range []struct {
		example string
		strips  []string // conductors that are strips, with a sharp peak
		planes  []string // conductors that are sides of the domain
	}{
		{"microstrip", []string{"trace"}, []string{"ground"}},
		{"touchpad", []string{"pad", "guard"}, []string{"ground", "finger"}},
	} {
		t.Run(c.example, func(t *testing.T) {
			s := load(t, c.example, nil)
			q := s.sol.Charges()
			check := func(name string, tol float64, sharp bool) {
				k := index(t, s.m.Problem, name)
				var sum float64
				for _, p := range s.sol.SurfaceField(k) {
					sum += p.Sigma * p.Area
				}
				t.Logf("%s: Σ σ·Area = %.5g C/m, Gauss-law charge %.5g C/m (ratio %.4f)", name, sum, q[k], sum/q[k])
				if math.Abs(sum/q[k]-1) > tol {
					t.Errorf("%s: Σ σ·Area = %.5g C/m, want the Gauss-law charge %.5g C/m within %g %%", name, sum, q[k], 100*tol)
				}
				if pk := s.sol.PeakSurfaceField(k); pk.Sharp != sharp {
					t.Errorf("%s: peak %.5g V/m at (%.4g, %.4g) mm has Sharp %v, want %v", name, pk.Value, pk.X*1e3, pk.Y*1e3, pk.Sharp, sharp)
				}
			}
			for _, name := range c.strips {
				check(name, 0.05, true)
			}
			for _, name := range c.planes {
				check(name, 1e-3, false)
			}
		})
	}
}
