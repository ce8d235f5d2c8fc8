package solve

import "math"

// bandCholesky is the exact solver of the coarsest level: a banded
// Cholesky factorisation L·Lᵀ of its operator, numbered along the shorter
// side so that the band is at most that side plus one (the coarsest level
// is at most three nodes across).
type bandCholesky struct {
	lv     mgLevel
	nx, ny int
	// alongX is set when nodes are numbered i + nx·j (nx ≤ ny).
	alongX bool
	bw     int
	// l[k·(bw+1)+d] is L(k, k−d).
	l []float64
	y []float64
}

func newBandCholesky(lv mgLevel) *bandCholesky {
	nx, ny := lv.dims()
	c := &bandCholesky{lv: lv, nx: nx, ny: ny, alongX: nx <= ny}
	short := ny
	if c.alongX {
		short = nx
	}
	c.bw = short + 1
	n := nx * ny
	w := c.bw + 1
	c.l = make([]float64, n*w)
	c.y = make([]float64, n)
	// Lower band of A.
	var a [9]float64
	offs := [9][2]int{{-1, -1}, {0, -1}, {1, -1}, {-1, 0}, {0, 0}, {1, 0}, {-1, 1}, {0, 1}, {1, 1}}
	for j := 0; j < ny; j++ {
		for i := 0; i < nx; i++ {
			lv.row(i, j, &a)
			k := c.num(i, j)
			for q, o := range offs {
				ii, jj := i+o[0], j+o[1]
				if a[q] == 0 || ii < 0 || jj < 0 || ii >= nx || jj >= ny {
					continue
				}
				if kk := c.num(ii, jj); kk <= k {
					c.l[k*w+k-kk] = a[q]
				}
			}
		}
	}
	// In-place factorisation.
	for k := 0; k < n; k++ {
		for d := min(c.bw, k); d >= 1; d-- {
			j := k - d
			s := c.l[k*w+d]
			// Σ over m < j within both bands: L(k,m)·L(j,m).
			for m := max(k-c.bw, j-c.bw, 0); m < j; m++ {
				s -= c.l[k*w+k-m] * c.l[j*w+j-m]
			}
			c.l[k*w+d] = s / c.l[j*w]
		}
		s := c.l[k*w]
		for m := max(k-c.bw, 0); m < k; m++ {
			v := c.l[k*w+k-m]
			s -= v * v
		}
		if !(s > 0) {
			// Not positive definite to working precision: keep the
			// factorisation finite; the Krylov iteration absorbs it.
			s = math.Max(math.Abs(c.l[k*w]), math.SmallestNonzeroFloat64)
		}
		c.l[k*w] = math.Sqrt(s)
	}
	return c
}

func (c *bandCholesky) num(i, j int) int {
	if c.alongX {
		return i + c.nx*j
	}
	return j + c.ny*i
}

// solve writes A⁻¹·b into x, both in the level's own layout.
func (c *bandCholesky) solve(x, b []float64) {
	w := c.bw + 1
	y := c.y
	n := c.nx * c.ny
	lv := c.lv
	for j := 0; j < c.ny; j++ {
		for i := 0; i < c.nx; i++ {
			y[c.num(i, j)] = b[lv.index(i, j)]
		}
	}
	for k := 0; k < n; k++ {
		s := y[k]
		for m := max(k-c.bw, 0); m < k; m++ {
			s -= c.l[k*w+k-m] * y[m]
		}
		y[k] = s / c.l[k*w]
	}
	for k := n - 1; k >= 0; k-- {
		s := y[k]
		for m := k + 1; m <= min(k+c.bw, n-1); m++ {
			s -= c.l[m*w+m-k] * y[m]
		}
		y[k] = s / c.l[k*w]
	}
	for j := 0; j < c.ny; j++ {
		for i := 0; i < c.nx; i++ {
			x[lv.index(i, j)] = y[c.num(i, j)]
		}
	}
}
