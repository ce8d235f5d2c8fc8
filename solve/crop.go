package solve

import (
	"context"
	"time"
)

// cropShare is the share of the grid's nodes above which a solver works on
// the whole grid rather than on the box around the free nodes. The box's
// copy of the operator and two vectors take about 41 bytes per node and
// the solver 110–140 per node, so at this share the box costs about the
// memory of the whole grid (less with line relaxation) and a quarter less
// time.
const cropShare = 0.75

// freeBox returns the smallest box of nodes [i0, i1) × [j0, j1) holding
// every free node; ok is false when there is none.
func (s *System) freeBox() (i0, i1, j0, j1 int, ok bool) {
	i0, j0 = s.Nx, s.Ny
	for j := 0; j < s.Ny; j++ {
		row := s.Fixed[j*s.Nx : (j+1)*s.Nx]
		lo := -1
		for i, f := range row {
			if !f {
				lo = i
				break
			}
		}
		if lo < 0 {
			continue
		}
		hi := lo
		for i := len(row) - 1; i > lo; i-- {
			if !row[i] {
				hi = i
				break
			}
		}
		i0, i1 = min(i0, lo), max(i1, hi+1)
		j0, j1 = min(j0, j), j+1
	}
	return i0, i1, j0, j1, i1 > i0
}

// cropped solves on the box around the free nodes. Every node outside it
// is fixed, and a free node has no coupling to a fixed one (those are on
// the right-hand side), so the box's rows form the same system on fewer
// nodes: conductor interiors and fixed margins at the domain's edges cost
// nothing.
type cropped struct {
	full   *System
	sub    *System
	i0, j0 int
	inner  Solver
	setup  time.Duration
	b, x   []float64
}

// newCropped returns a solver of o.Method on the box around the free
// nodes of sys, or nil when the box holds more than cropShare of the
// nodes. Every node beyond the box is fixed, so the box's last column and
// row couple to nothing beyond it, as a System's must.
func newCropped(sys *System, o Settings) (Solver, error) {
	start := time.Now()
	i0, i1, j0, j1, ok := sys.freeBox()
	nx, ny := i1-i0, j1-j0
	if !ok || float64(nx*ny) > cropShare*float64(sys.Len()) {
		return nil, nil
	}
	n := nx * ny
	sub := &System{Nx: nx, Ny: ny, Diag: make([]float64, n), AX: make([]float64, n), AY: make([]float64, n), Fixed: make([]bool, n)}
	c := &cropped{full: sys, sub: sub, i0: i0, j0: j0, b: make([]float64, n), x: make([]float64, n)}
	c.rows(func(box, grid [2]int) {
		copy(sub.Diag[box[0]:box[1]], sys.Diag[grid[0]:grid[1]])
		copy(sub.AX[box[0]:box[1]], sys.AX[grid[0]:grid[1]])
		copy(sub.AY[box[0]:box[1]], sys.AY[grid[0]:grid[1]])
		copy(sub.Fixed[box[0]:box[1]], sys.Fixed[grid[0]:grid[1]])
	})
	inner, err := newMethod(sub, o)
	if err != nil {
		return nil, err
	}
	c.inner = inner
	c.setup = time.Since(start)
	return c, nil
}

// rows calls fn with the index ranges of every box row in the box's
// vectors and in the whole grid's.
func (c *cropped) rows(fn func(box, grid [2]int)) {
	nx, fx := c.sub.Nx, c.full.Nx
	for j := 0; j < c.sub.Ny; j++ {
		src, dst := (j+c.j0)*fx+c.i0, j*nx
		fn([2]int{dst, dst + nx}, [2]int{src, src + nx})
	}
}

// Solve implements Solver.
func (c *cropped) Solve(ctx context.Context, b, x []float64) (*Result, error) {
	if len(b) != c.full.Len() || len(x) != c.full.Len() {
		panic("solve: right-hand side or start vector has the wrong length")
	}
	start := time.Now()
	c.full.setFixed(x, b)
	c.rows(func(box, grid [2]int) {
		copy(c.b[box[0]:box[1]], b[grid[0]:grid[1]])
		copy(c.x[box[0]:box[1]], x[grid[0]:grid[1]])
	})
	res, err := c.inner.Solve(ctx, c.b, c.x)
	c.rows(func(box, grid [2]int) {
		copy(x[grid[0]:grid[1]], c.x[box[0]:box[1]])
	})
	if res != nil {
		res.Setup = c.setup
		res.Elapsed = time.Since(start)
	}
	return res, err
}

// Close implements Solver.
func (c *cropped) Close() { c.inner.Close() }
