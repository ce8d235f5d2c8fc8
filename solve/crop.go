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

// newCropped returns a solver on the box around the free nodes of sys, or
// nil when the box holds more than cropShare of the nodes.
func newCropped(sys *System, o Settings, build func(*System, Settings) (Solver, error)) (Solver, error) {
	start := time.Now()
	i0, i1, j0, j1, ok := sys.freeBox()
	nx, ny := i1-i0, j1-j0
	if !ok || float64(nx*ny) > cropShare*float64(sys.Len()) {
		return nil, nil
	}
	sub := &System{Nx: nx, Ny: ny}
	n := nx * ny
	sub.Diag, sub.AX, sub.AY = make([]float64, n), make([]float64, n), make([]float64, n)
	sub.Fixed = make([]bool, n)
	for j := 0; j < ny; j++ {
		src, dst := (j+j0)*sys.Nx+i0, j*nx
		copy(sub.Diag[dst:dst+nx], sys.Diag[src:src+nx])
		copy(sub.AX[dst:dst+nx], sys.AX[src:src+nx])
		copy(sub.AY[dst:dst+nx], sys.AY[src:src+nx])
		copy(sub.Fixed[dst:dst+nx], sys.Fixed[src:src+nx])
	}
	// Every node beyond the box is fixed, so the box's last column and
	// row have no couplings beyond it already; clearing them keeps the
	// convention whatever the System.
	for j := 0; j < ny; j++ {
		sub.AX[j*nx+nx-1] = 0
	}
	clear(sub.AY[(ny-1)*nx:])
	c := &cropped{full: sys, sub: sub, i0: i0, j0: j0, b: make([]float64, n), x: make([]float64, n)}
	inner, err := build(sub, o)
	if err != nil {
		return nil, err
	}
	c.inner = inner
	c.setup = time.Since(start)
	return c, nil
}

// Solve implements Solver.
func (c *cropped) Solve(ctx context.Context, b, x []float64) (*Result, error) {
	if len(b) != c.full.Len() || len(x) != c.full.Len() {
		panic("solve: right-hand side or start vector has the wrong length")
	}
	start := time.Now()
	c.full.setFixed(x, b)
	nx, ny, fx := c.sub.Nx, c.sub.Ny, c.full.Nx
	for j := 0; j < ny; j++ {
		src, dst := (j+c.j0)*fx+c.i0, j*nx
		copy(c.b[dst:dst+nx], b[src:src+nx])
		copy(c.x[dst:dst+nx], x[src:src+nx])
	}
	res, err := c.inner.Solve(ctx, c.b, c.x)
	for j := 0; j < ny; j++ {
		src, dst := (j+c.j0)*fx+c.i0, j*nx
		copy(x[src:src+nx], c.x[dst:dst+nx])
	}
	if res != nil {
		res.Setup = c.setup
		res.Elapsed = time.Since(start)
	}
	return res, err
}

// Close implements Solver.
func (c *cropped) Close() { c.inner.Close() }
