package solve

import (
	"math"
	"testing"
)

// serial runs a block kernel on the calling goroutine.
func serial(n int, fn func(lo, hi int)) {
	if n > 0 {
		fn(0, n)
	}
}

// pseudo returns a reproducible vector that is zero on the fixed nodes of
// a level.
func pseudo(lv mgLevel, size int, seed float64) []float64 {
	nx, ny := lv.dims()
	v := make([]float64, size)
	for j := 0; j < ny; j++ {
		for i := 0; i < nx; i++ {
			if !lv.isFixed(i, j) {
				v[lv.index(i, j)] = math.Sin(seed*float64(3*i+7*j+1)) + 0.3
			}
		}
	}
	return v
}

// denseOf returns the operator of a level as a dense matrix over its
// nodes in (i, j) order.
func denseOf(lv mgLevel) [][]float64 {
	nx, ny := lv.dims()
	n := nx * ny
	a := make([][]float64, n)
	offs := [9][2]int{{-1, -1}, {0, -1}, {1, -1}, {-1, 0}, {0, 0}, {1, 0}, {-1, 1}, {0, 1}, {1, 1}}
	var row [9]float64
	for j := 0; j < ny; j++ {
		for i := 0; i < nx; i++ {
			a[i+nx*j] = make([]float64, n)
			lv.row(i, j, &row)
			for q, o := range offs {
				ii, jj := i+o[0], j+o[1]
				if ii >= 0 && jj >= 0 && ii < nx && jj < ny {
					a[i+nx*j][ii+nx*jj] += row[q]
				}
			}
		}
	}
	return a
}

// testLevels builds the first two levels below the finest for a system.
func testLevels(t *testing.T, s *System) (*Multigrid, *fineLevel, *coarseLevel, *coarseLevel) {
	t.Helper()
	m := newMultigrid(s, newKernels(s, 1), Settings{Tol: 1e-8, MaxIter: 10})
	if len(m.cs) < 2 {
		t.Fatalf("%d×%d grid has %d coarse levels", s.Nx, s.Ny, len(m.cs))
	}
	return m, m.fine, m.cs[0], m.cs[1]
}

// TestGalerkinIsTripleProduct checks every coarse operator entry against
// Pᵀ·A·P formed densely, with P taken column by column from prolong; it
// also checks that restrict is Pᵀ.
func TestGalerkinIsTripleProduct(t *testing.T) {
	for _, c := range mgCases {
		for _, n := range []int{17, 18} {
			s := c.build(t, n)
			m, f, c1, c2 := testLevels(t, s)
			for li, pair := range [][2]mgLevel{{f, c1}, {c1, c2}} {
				fine, coarse := pair[0], pair[1].(*coarseLevel)
				nx, ny := fine.dims()
				size := nx * ny
				if cl, ok := fine.(*coarseLevel); ok {
					size = len(cl.x)
				}
				a := denseOf(fine)
				// P column by column: prolong a unit coarse vector into zero.
				nc := coarse.nx * coarse.ny
				p := make([][]float64, nc)
				for J := 0; J < coarse.ny; J++ {
					for I := 0; I < coarse.nx; I++ {
						e := make([]float64, len(coarse.x))
						e[coarse.idx(I, J)] = 1
						v := make([]float64, size)
						fine.prolong(v, e)
						col := make([]float64, nx*ny)
						for j := 0; j < ny; j++ {
							for i := 0; i < nx; i++ {
								col[i+nx*j] = v[fine.index(i, j)]
							}
						}
						p[I+coarse.nx*J] = col
					}
				}
				ac := denseOf(coarse)
				var scale float64
				for _, row := range ac {
					for _, v := range row {
						scale = math.Max(scale, math.Abs(v))
					}
				}
				for r := 0; r < nc; r++ {
					// A·P_r, then P_cᵀ·(A·P_r).
					ap := make([]float64, nx*ny)
					for i := range ap {
						for k, v := range a[i] {
							ap[i] += v * p[r][k]
						}
					}
					for q := 0; q < nc; q++ {
						var want float64
						for i, v := range p[q] {
							want += v * ap[i]
						}
						if coarse.fixed[coarse.idx(q%coarse.nx, q/coarse.nx)] || coarse.fixed[coarse.idx(r%coarse.nx, r/coarse.nx)] {
							// Fixed rows are identity rows.
							want = 0
							if q == r {
								want = 1
							}
						}
						if got := ac[q][r]; math.Abs(got-want) > 1e-12*scale {
							t.Fatalf("%s %d level %d: A_c[%d][%d] = %g, Pᵀ·A·P gives %g", c.name, n, li+1, q, r, got, want)
						}
					}
				}
				// restrict is Pᵀ: compare on a pseudo-random fine vector.
				rv := pseudo(fine, size, 0.37)
				dst := make([]float64, len(coarse.x))
				fine.restrict(dst, rv)
				for q := 0; q < nc; q++ {
					var want float64
					for j := 0; j < ny; j++ {
						for i := 0; i < nx; i++ {
							want += p[q][i+nx*j] * rv[fine.index(i, j)]
						}
					}
					if got := dst[coarse.idx(q%coarse.nx, q/coarse.nx)]; math.Abs(got-want) > 1e-12*(1+math.Abs(want)) {
						t.Fatalf("%s %d level %d: restriction %g, Pᵀr gives %g", c.name, n, li+1, got, want)
					}
				}
			}
			m.Close()
		}
	}
}

func TestGalerkinCoarseMatchesGeneral(t *testing.T) {
	for _, c := range mgCases {
		for _, n := range []int{33, 35, 36} {
			s := c.build(t, n)
			m, _, c1, _ := testLevels(t, s)
			a, b := newCoarseLevel(c1.ncx, c1.ncy), newCoarseLevel(c1.ncx, c1.ncy)
			galerkin(c1, a, serial)
			galerkinCoarse(c1, b, serial)
			compareStencils(t, c.name, n, a, b)
			m.Close()
		}
	}
}

func compareStencils(t *testing.T, name string, n int, a, b *coarseLevel) {
	t.Helper()
	for k, pair := range [][2][]float64{{a.c, b.c}, {a.w, b.w}, {a.s, b.s}, {a.sw, b.sw}, {a.se, b.se}} {
		scale := 0.0
		for i := range pair[0] {
			if !a.fixed[i] {
				scale = math.Max(scale, math.Abs(pair[0][i]))
			}
		}
		for i := range pair[0] {
			if math.Abs(pair[0][i]-pair[1][i]) > 1e-11*scale {
				t.Fatalf("%s %d: stencil %d entry %d: %g vs %g", name, n, k, i, pair[0][i], pair[1][i])
			}
		}
	}
}

func TestGalerkinFineMatchesGeneral(t *testing.T) {
	for _, c := range mgCases {
		for _, n := range []int{17, 18, 33} {
			s := c.build(t, n)
			f := newFineLevel(s, newKernels(s, 1))
			f.run = serial
			f.ncx, f.ncy = (f.nx+1)/2, (f.ny+1)/2
			f.prepare()
			a, b := newCoarseLevel(f.ncx, f.ncy), newCoarseLevel(f.ncx, f.ncy)
			galerkin(f, a, serial)
			galerkinFine(f, b, serial)
			for k, pair := range [][2][]float64{{a.c, b.c}, {a.w, b.w}, {a.s, b.s}, {a.sw, b.sw}, {a.se, b.se}} {
				scale := 0.0
				for i := range pair[0] {
					if !a.fixed[i] {
						scale = math.Max(scale, math.Abs(pair[0][i]))
					}
				}
				for i := range pair[0] {
					if math.Abs(pair[0][i]-pair[1][i]) > 1e-11*scale {
						t.Fatalf("%s %d: stencil %d entry %d: %g vs %g", c.name, n, k, i, pair[0][i], pair[1][i])
					}
				}
			}
		}
	}
}

func TestRestrictRedMatchesGeneral(t *testing.T) {
	for _, c := range mgCases {
		for _, n := range []int{33, 34} {
			s := c.build(t, n)
			m, f, c1, _ := testLevels(t, s)
			f.smoother = PointGS
			f.needR()
			b := pseudo(f, s.Len(), 0.3)
			x := make([]float64, s.Len())
			f.smooth(x, b, true, false)
			want, got := make([]float64, len(c1.b)), make([]float64, len(c1.b))
			f.residual(f.r, x, b)
			f.restrict(want, f.r)
			f.restrictRed(got, x, b)
			if d := maxAbs(want); true {
				for i := range want {
					if math.Abs(want[i]-got[i]) > 1e-13*d {
						t.Fatalf("%s %d: coarse entry %d: %g vs %g", c.name, n, i, got[i], want[i])
					}
				}
			}
			m.Close()
		}
	}
}

func TestRestrictZeroMatchesSeparate(t *testing.T) {
	for _, c := range mgCases {
		for _, n := range []int{33, 34} {
			s := c.build(t, n)
			for _, w := range []int{1, 3} {
				m := newMultigrid(s, newKernels(s, w), Settings{Tol: 1e-8, MaxIter: 10})
				f, c1 := m.fine, m.cs[0]
				f.smoother = PointGS
				b := pseudo(f, s.Len(), 0.3)
				want, got := make([]float64, len(c1.b)), make([]float64, len(c1.b))
				xw, xg := make([]float64, s.Len()), pseudo(f, s.Len(), 0.9)
				f.smooth(xw, b, true, false)
				f.restrictRed(want, xw, b)
				f.restrictZero(got, xg, b)
				scale := maxAbs(want)
				for i := range want {
					if math.Abs(want[i]-got[i]) > 1e-13*scale {
						t.Fatalf("%s %d workers %d: coarse entry %d: %g vs %g", c.name, n, w, i, got[i], want[i])
					}
				}
				// The red nodes hold the relaxed values; the black ones are
				// left for the backward relaxation to overwrite.
				for j := 0; j < s.Ny; j++ {
					for i := j & 1; i < s.Nx; i += 2 {
						k := j*s.Nx + i
						if xg[k] != xw[k] {
							t.Fatalf("%s %d workers %d: red node (%d, %d): %g vs %g", c.name, n, w, i, j, xg[k], xw[k])
						}
					}
				}
				m.Close()
			}
		}
	}
}

func TestProlongSmoothMatchesSeparate(t *testing.T) {
	for _, c := range mgCases {
		for _, n := range []int{33, 34} {
			s := c.build(t, n)
			for _, w := range []int{1, 3} {
				m := newMultigrid(s, newKernels(s, w), Settings{Tol: 1e-8, MaxIter: 10})
				f, c1 := m.fine, m.cs[0]
				f.smoother = PointGS
				b := pseudo(f, s.Len(), 0.6)
				xc := pseudo(c1, len(c1.x), 0.4)
				want, got := pseudo(f, s.Len(), 0.1), pseudo(f, s.Len(), 0.1)
				f.prolong(want, xc)
				f.smooth(want, b, false, true)
				f.prolongSmooth(got, b, xc)
				for i := range want {
					if want[i] != got[i] {
						t.Fatalf("%s %d workers %d: node %d: %g vs %g", c.name, n, w, i, got[i], want[i])
					}
				}
				m.Close()
			}
		}
	}
}

// TestSmoothersMatchColourSweeps checks the one-pass relaxations against
// plain colour-by-colour sweeps, bit for bit, with several blockings.
func TestSmoothersMatchColourSweeps(t *testing.T) {
	s := mgJump(t, 65)
	for _, w := range []int{1, 3} {
		m := newMultigrid(s, newKernels(s, w), Settings{Tol: 1e-8, MaxIter: 10})
		f := m.fine
		f.smoother = PointGS
		b := pseudo(f, s.Len(), 0.7)
		x, ref := pseudo(f, s.Len(), 0.2), pseudo(f, s.Len(), 0.2)
		for _, post := range []bool{false, true} {
			f.smooth(x, b, false, post)
			order := []int{0, 1}
			if post {
				order = []int{1, 0}
			}
			f.opX, f.opB = ref, b
			for _, col := range order {
				for j := 0; j < s.Ny; j++ {
					f.relaxRow(j, col)
				}
			}
			for i := range x {
				if x[i] != ref[i] {
					t.Fatalf("workers %d post %v: fine node %d: %g vs %g", w, post, i, x[i], ref[i])
				}
			}
		}
		c := m.cs[0]
		c.smoother = PointGS
		cb := pseudo(c, len(c.x), 0.5)
		cx, cref := pseudo(c, len(c.x), 0.9), pseudo(c, len(c.x), 0.9)
		for _, post := range []bool{false, true} {
			c.smooth(cx, cb, false, post)
			st := c.st
			for q := 0; q < 4; q++ {
				col := q
				if post {
					col = 3 - q
				}
				for j := col >> 1; j < c.ny; j += 2 {
					for i := col & 1; i < c.nx; i += 2 {
						n := c.idx(i, j)
						// The same grouping of the sum as relaxRow.
						v0 := cb[n] - c.w[n]*cref[n-1] - c.w[n+1]*cref[n+1]
						v1 := c.s[n]*cref[n-st] + c.s[n+st]*cref[n+st] + c.sw[n]*cref[n-st-1]
						v2 := c.se[n]*cref[n-st+1] + c.sw[n+st+1]*cref[n+st+1] + c.se[n+st-1]*cref[n+st-1]
						cref[n] = (v0 - (v1 + v2)) / c.c[n]
					}
				}
			}
			for i := range cx {
				if cx[i] != cref[i] {
					t.Fatalf("workers %d post %v: coarse node %d: %g vs %g", w, post, i, cx[i], cref[i])
				}
			}
		}
		m.Close()
	}
}

// TestLineRelaxationSolvesLines checks that after a zebra step along X the
// residual vanishes on the relaxed rows, and along Y on the relaxed
// columns.
func TestLineRelaxationSolvesLines(t *testing.T) {
	s := mgGraded(t, 33)
	m := newMultigrid(s, newKernels(s, 2), Settings{Tol: 1e-8, MaxIter: 10})
	defer m.Close()
	for li, lv := range []mgLevel{m.fine, m.cs[0]} {
		nx, ny := lv.dims()
		size := nx * ny
		var r []float64
		if c, ok := lv.(*coarseLevel); ok {
			size = len(c.x)
			r = make([]float64, size)
		} else {
			r = make([]float64, size)
		}
		for _, sm := range []Smoother{LineX, LineY} {
			b := pseudo(lv, size, 0.4)
			x := make([]float64, size)
			switch l := lv.(type) {
			case *fineLevel:
				l.smoother, l.opX, l.opB = sm, x, b
				l.factorLines()
				l.lineAxis, l.color = int(sm-LineX), 1
				l.run(map[Smoother]int{LineX: l.k.blocks, LineY: columnBlocks(nx)}[sm], l.lineFn)
			case *coarseLevel:
				l.smoother, l.opX, l.opB = sm, x, b
				l.factorLines()
				l.lineAxis, l.color = int(sm-LineX), 1
				l.run(map[Smoother]int{LineX: l.blocks, LineY: columnBlocks(nx)}[sm], l.lineFn)
			}
			lv.residual(r, x, b)
			for j := 0; j < ny; j++ {
				for i := 0; i < nx; i++ {
					on := j&1 == 1
					if sm == LineY {
						on = i&1 == 1
					}
					if v := r[lv.index(i, j)]; on && math.Abs(v) > 1e-12*maxAbs(b) {
						t.Fatalf("level %d %v: residual %g at (%d, %d) of a relaxed line", li, sm, v, i, j)
					}
				}
			}
		}
	}
}

func TestBandCholeskySolvesCoarsest(t *testing.T) {
	for _, c := range []struct{ nx, ny int }{{3, 3}, {3, 40}, {40, 2}, {5, 7}} {
		l := newCoarseLevel(c.nx, c.ny)
		l.run = serial
		// A nine-point SPD operator: a scaled Laplacian plus diagonal
		// couplings and a shift, with one fixed node.
		for j := 0; j < c.ny; j++ {
			for i := 0; i < c.nx; i++ {
				n := l.idx(i, j)
				l.c[n] = 9 + 0.1*float64(i)
				if i > 0 {
					l.w[n] = -1
				}
				if j > 0 {
					l.s[n] = -1.5
					if i > 0 {
						l.sw[n] = -0.25
					}
					if i+1 < c.nx {
						l.se[n] = -0.3
					}
				}
			}
		}
		l.fixed[l.idx(1, 1)] = true
		l.pinFixed()
		bc := newBandCholesky(l)
		b := pseudo(l, len(l.x), 0.8)
		bc.solve(l.x, b)
		l.residual(l.r, l.x, b)
		if e := maxAbs(l.r); e > 1e-13*maxAbs(b) {
			t.Errorf("%d×%d: residual %g after the exact solve", c.nx, c.ny, e)
		}
	}
}

// TestCoarseSmootherChoiceMatchesGeneral checks the nine-point levels'
// direct smoother choice against the one made through mgLevel.row, on
// every level of every case.
func TestCoarseSmootherChoiceMatchesGeneral(t *testing.T) {
	lines := 0
	for _, c := range mgCases {
		s := c.build(t, 65)
		m := newMultigrid(s, newKernels(s, 2), Settings{Tol: 1e-8, MaxIter: 10})
		for li, l := range m.cs {
			got, want := l.chooseSmoother(), chooseSmoother(l)
			if got != want {
				t.Errorf("%s level %d: %v, through the rows %v", c.name, li+1, got, want)
			}
			if got != PointGS {
				lines++
			}
		}
		m.Close()
	}
	if lines == 0 {
		t.Error("no case chose line relaxation on a coarse level; the test compares only point choices")
	}
}

// TestLinePivotsMatchFreshThomas checks that X-line relaxation with the
// pivots stored at set-up gives, bit for bit, what the Thomas algorithm
// gives when it factorises every line afresh, on the finest level and on
// a nine-point level.
func TestLinePivotsMatchFreshThomas(t *testing.T) {
	s := mgGraded(t, 33)
	m := newMultigrid(s, newKernels(s, 2), Settings{Tol: 1e-8, MaxIter: 10})
	defer m.Close()

	// Finest level.
	f := m.fine
	f.smoother = LineX
	f.needR()
	f.factorLines()
	nx, ny := f.nx, f.ny
	b := pseudo(f, nx*ny, 0.4)
	x0 := pseudo(f, nx*ny, 0.9)
	want := append([]float64(nil), x0...)
	for j := 1; j < ny; j += 2 {
		// Reference: Thomas algorithm with its own factorisation.
		cp := make([]float64, nx)
		var pc, px float64
		for i := 0; i < nx; i++ {
			n := j*nx + i
			rhs := b[n]
			if j > 0 {
				rhs += s.AY[n-nx] * x0[n-nx]
			}
			if j+1 < ny {
				rhs += s.AY[n] * x0[n+nx]
			}
			var sub, sup float64
			if i > 0 {
				sub = -s.AX[n-1]
			}
			if i+1 < nx {
				sup = -s.AX[n]
			}
			inv := 1 / (s.Diag[n] - sub*pc)
			pc = sup * inv
			px = (rhs - sub*px) * inv
			cp[i], want[n] = pc, px
		}
		for i := nx - 2; i >= 0; i-- {
			n := j*nx + i
			want[n] -= cp[i] * want[n+1]
		}
	}
	got := append([]float64(nil), x0...)
	f.opX, f.opB = got, b
	f.lineAxis, f.color = 0, 1
	f.run(f.k.blocks, f.lineFn)
	for i := range got {
		if got[i] != want[i] {
			t.Fatalf("finest level node %d: %v with stored pivots, %v factorised afresh", i, got[i], want[i])
		}
	}

	// A nine-point level.
	c := m.cs[0]
	c.smoother = LineX
	c.factorLines()
	st := c.st
	cb := pseudo(c, len(c.x), 0.4)
	cx0 := pseudo(c, len(c.x), 0.9)
	cwant := append([]float64(nil), cx0...)
	for j := 1; j < c.ny; j += 2 {
		o := (j+1)*st + 1
		cp := make([]float64, len(c.x))
		var pc, px float64
		for n := o; n < o+c.nx; n++ {
			rhs := cb[n] - c.s[n]*cx0[n-st] - c.s[n+st]*cx0[n+st] -
				c.sw[n]*cx0[n-st-1] - c.se[n]*cx0[n-st+1] - c.sw[n+st+1]*cx0[n+st+1] - c.se[n+st-1]*cx0[n+st-1]
			sub := c.w[n]
			inv := 1 / (c.c[n] - sub*pc)
			pc = c.w[n+1] * inv
			px = (rhs - sub*px) * inv
			cp[n], cwant[n] = pc, px
		}
		for n := o + c.nx - 2; n >= o; n-- {
			cwant[n] -= cp[n] * cwant[n+1]
		}
	}
	cgot := append([]float64(nil), cx0...)
	c.opX, c.opB = cgot, cb
	c.lineAxis, c.color = 0, 1
	c.run(c.blocks, c.lineFn)
	for i := range cgot {
		if cgot[i] != cwant[i] {
			t.Fatalf("nine-point level node %d: %v with stored pivots, %v factorised afresh", i, cgot[i], cwant[i])
		}
	}
}
