package solve

import (
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
)

func TestEntriesAreTheFreeSystem(t *testing.T) {
	for _, c := range mgCases {
		s := c.build(t, 21)
		_, nf := s.FreeIndex()
		type key struct{ i, j int }
		a := map[key]float64{}
		count, lastRow, lastCol := 0, -1, -1
		s.Entries(func(i, j int, v float64) {
			count++
			if i < lastRow || (i == lastRow && j <= lastCol) {
				t.Fatalf("%s: entry (%d, %d) out of order", c.name, i, j)
			}
			lastRow, lastCol = i, j
			if i < 0 || j < 0 || i >= nf || j >= nf {
				t.Fatalf("%s: entry (%d, %d) outside %d free rows", c.name, i, j, nf)
			}
			a[key{i, j}] = v
		})
		if count != s.FreeNonzeros() {
			t.Errorf("%s: %d entries, FreeNonzeros says %d", c.name, count, s.FreeNonzeros())
		}
		for k, v := range a {
			if a[key{k.j, k.i}] != v {
				t.Fatalf("%s: entry (%d, %d) = %g but (%d, %d) = %g", c.name, k.i, k.j, v, k.j, k.i, a[key{k.j, k.i}])
			}
		}
		// The compact product equals the full one with zero fixed values.
		x := make([]float64, s.Len())
		for i := range x {
			if !s.Fixed[i] {
				x[i] = math.Sin(0.3 * float64(i))
			}
		}
		full := make([]float64, s.Len())
		s.Apply(full, x)
		xf := s.FreeVector(nil, x)
		got := make([]float64, nf)
		for k, v := range a {
			got[k.i] += v * xf[k.j]
		}
		if d := cmp.Diff(s.FreeVector(nil, full), got, cmpopts.EquateApprox(0, 1e-12*maxAbs(full))); d != "" {
			t.Errorf("%s: compact product differs:\n%.300s", c.name, d)
		}
		b := caseRHS(s)
		back := s.ExpandFree(nil, s.FreeVector(nil, x), b)
		for i := range back {
			want := x[i]
			if s.Fixed[i] {
				want = b[i]
			}
			if back[i] != want {
				t.Fatalf("%s: ExpandFree node %d = %g, want %g", c.name, i, back[i], want)
			}
		}
	}
}

func TestTimeResidual(t *testing.T) {
	s := mgSquare(t, 65)
	if d := TimeResidual(s, 2, 3); d <= 0 {
		t.Errorf("residual time %v", d)
	}
}
