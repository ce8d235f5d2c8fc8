package solve

import "math"

// fineLevel is the finest multigrid level: the assembled five-point
// System itself, read in place. Its interpolation weights are not stored
// but recomputed from the operator wherever they are needed (setup,
// restriction, prolongation), always by the same expressions, so that the
// restriction is exactly the transpose of the prolongation.
type fineLevel struct {
	sys    *System
	nx, ny int
	k      *kernels
	// r is the residual of the finest level, allocated only where it is
	// needed: for line relaxation (whose Y lines also keep their
	// eliminated super-diagonal there) and for stand-alone cycles.
	r []float64
	// pivX holds the Thomas pivots of the X lines when the smoother
	// relaxes them (see factorLines).
	pivX     []float64
	ncx, ncy int
	// ix and iy hold, per coarse point (I, J), the inverse lumped
	// diagonals of the x-edge point (2I+1, 2J) and the y-edge point
	// (2I, 2J+1).
	ix, iy []float64

	smoother Smoother
	run      func(n int, fn func(lo, hi int))

	opX, opB, opR, cx, cb []float64
	color, lineAxis       int
	zero                  bool

	smoothFn, edgeFn, restrictFn, prolongFn, lineFn, redFn func(lo, hi int)
	postFn, postEdgeFn, postRedFn, zeroFn, startFn         func(lo, hi int)
	// mode and nonzero are the operand and per-block results of
	// startFrom.
	mode    int
	nonzero []bool
	// zeroBuf is the per-block row scratch of restrictZero.
	zeroBuf []float64
	// redBuf is the per-block row scratch of restrictRed.
	redBuf []float64
}

func newFineLevel(sys *System, k *kernels) *fineLevel {
	f := &fineLevel{sys: sys, nx: sys.Nx, ny: sys.Ny, k: k}
	f.smoothFn = f.smoothBlocks
	f.edgeFn = f.edgeBlocks
	f.restrictFn = f.restrictBlocks
	f.prolongFn = f.prolongBlocks
	f.lineFn = f.lineBlocks
	f.redFn = f.redBlocks
	f.postFn = f.postBlocks
	f.zeroFn = f.zeroBlocks
	f.startFn = f.startBlocks
	f.nonzero = make([]bool, k.blocks)
	f.postEdgeFn = f.postEdgeBlocks
	f.postRedFn = f.postRedBlocks
	return f
}

func (f *fineLevel) dims() (int, int) { return f.nx, f.ny }

// needR allocates the residual vector.
func (f *fineLevel) needR() {
	if f.r == nil {
		f.r = make([]float64, f.nx*f.ny)
	}
}

func (f *fineLevel) index(i, j int) int { return j*f.nx + i }

func (f *fineLevel) isFixed(i, j int) bool { return f.sys.Fixed[j*f.nx+i] }

// row fills a with row (i, j) of the five-point operator.
func (f *fineLevel) row(i, j int, a *[9]float64) {
	s := f.sys
	n := j*f.nx + i
	*a = [9]float64{}
	a[sC] = s.Diag[n]
	if i > 0 {
		a[sW] = -s.AX[n-1]
	}
	if i+1 < f.nx {
		a[sE] = -s.AX[n]
	}
	if j > 0 {
		a[sS] = -s.AY[n-f.nx]
	}
	if j+1 < f.ny {
		a[sN] = -s.AY[n]
	}
}

// prepare computes the lumped diagonals of the edge points once the
// coarse grid is known; their inverses make the edge weights.
func (f *fineLevel) prepare() {
	s := f.sys
	nx, ny := f.nx, f.ny
	f.redBuf = make([]float64, 4*f.ncx*min(64, f.ncy))
	f.zeroBuf = make([]float64, 9*(f.nx/2+1)*min(64, f.ncy))
	f.ix = make([]float64, f.ncx*f.ncy)
	f.iy = make([]float64, f.ncx*f.ncy)
	prefault(f.run, f.ix, f.iy)
	forRows(f.run, f.ncy, func(J int) {
		for I := 0; I < f.ncx; I++ {
			i, j := 2*I, 2*J
			k := I + f.ncx*J
			if i+1 < nx {
				// x-edge (i+1, j): the row collapsed along Y.
				n := j*nx + i + 1
				d := s.Diag[n]
				if j > 0 {
					d -= s.AY[n-nx]
				}
				if j+1 < ny {
					d -= s.AY[n]
				}
				f.ix[k] = lumpedInverse(d, s.AX[n-1]+s.AX[n])
			}
			if j+1 < ny {
				n := (j+1)*nx + i
				d := s.Diag[n]
				if i > 0 {
					d -= s.AX[n-1]
				}
				if i+1 < nx {
					d -= s.AX[n]
				}
				f.iy[k] = lumpedInverse(d, s.AY[n-nx]+s.AY[n])
			}
		}
	})
}

// lumpedInverse returns 1/d for the lumped diagonal d of an edge point
// whose two couplings along the edge sum to t. d equals t plus the
// couplings to fixed nodes, so it is kept at least t against round-off; a
// point without couplings along the edge gets zero weights.
func lumpedInverse(d, t float64) float64 {
	d = math.Max(d, t)
	if !(d > 0) || t == 0 {
		return 0
	}
	return 1 / d
}

// xEdge returns the weights of x-edge point (i, j) (i odd, j even) from
// its west and east coarse neighbours: its X couplings over its row's
// diagonal collapsed along Y, w = a/(d − a_S − a_N) (in the sign convention
// of the couplings, which are positive).
func (f *fineLevel) xEdge(i, j int) (float64, float64) {
	n := j*f.nx + i
	inv := f.ix[i>>1+f.ncx*(j>>1)]
	return f.sys.AX[n-1] * inv, f.sys.AX[n] * inv
}

// yEdge returns the weights of y-edge point (i, j) (i even, j odd) from
// its south and north coarse neighbours.
func (f *fineLevel) yEdge(i, j int) (float64, float64) {
	n := j*f.nx + i
	inv := f.iy[i>>1+f.ncx*(j>>1)]
	return f.sys.AY[n-f.nx] * inv, f.sys.AY[n] * inv
}

// centre returns the factors by which the cell centre (i, j) (both odd)
// takes the interpolated values of its west, east, south and north edge
// neighbours: its couplings over its diagonal.
func (f *fineLevel) centre(i, j int) (vw, ve, vs, vn float64) {
	s := f.sys
	n := j*f.nx + i
	inv := f.k.invDiag[n]
	vw = s.AX[n-1] * inv
	vs = s.AY[n-f.nx] * inv
	if i+1 < f.nx {
		ve = s.AX[n] * inv
	}
	if j+1 < f.ny {
		vn = s.AY[n] * inv
	}
	return
}

// interp fills w with the interpolation weights of the fine points
// attached to coarse point (I, J).
func (f *fineLevel) interp(I, J int, w *[pLen]float64) {
	*w = [pLen]float64{}
	i, j := 2*I, 2*J
	if i+1 < f.nx {
		w[pXW], w[pXE] = f.xEdge(i+1, j)
	}
	if j+1 < f.ny {
		w[pYS], w[pYN] = f.yEdge(i, j+1)
	}
	if i+1 >= f.nx || j+1 >= f.ny {
		return
	}
	vw, ve, vs, vn := f.centre(i+1, j+1)
	var eS, eN, nW, nE float64
	if i+2 < f.nx {
		eS, eN = f.yEdge(i+2, j+1)
	}
	if j+2 < f.ny {
		nW, nE = f.xEdge(i+1, j+2)
	}
	w[pSW] = vw*w[pYS] + vs*w[pXW]
	w[pSE] = ve*eS + vs*w[pXE]
	w[pNW] = vw*w[pYN] + vn*nW
	w[pNE] = ve*eN + vn*nE
}

// smooth is red-black Gauss–Seidel: red (i+j even) then black forward,
// black then red backward. With zero set x is taken as zero on entry, so
// the first red half-sweep is x = D⁻¹b.
//
// Both half-sweeps run in one pass over memory: a block relaxes the first
// colour on row j and then the second colour on row j−1, whose first-colour
// neighbours are then final. The second colour on a block's first and
// last rows needs the neighbouring blocks' first colour and follows in a
// second, short pass. Every node sees exactly the values of two separate
// half-sweeps, so the result does not depend on the blocking.
func (f *fineLevel) smooth(x, b []float64, zero, post bool) {
	f.opX, f.opB = x, b
	k := f.k
	switch f.smoother {
	case LineX, LineY, LineXY:
		if zero {
			f.startFrom(x, b, startZero)
		}
		f.smoothLines(post)
		return
	}
	f.color, f.zero = 0, zero
	if post {
		f.color, f.zero = 1, false
	}
	f.run(k.blocks, f.smoothFn)
	f.run(k.blocks, f.edgeFn)
}

// smoothBlocks is the pipelined pass of smooth.
func (f *fineLevel) smoothBlocks(lo, hi int) {
	first, second := f.color, 1-f.color
	for blk := lo; blk < hi; blk++ {
		j0, j1 := f.k.rows(blk)
		for j := j0; j < j1; j++ {
			if f.zero {
				f.zeroRow(j)
			} else {
				f.relaxRow(j, first)
			}
			if j-1 > j0 {
				f.relaxRow(j-1, second)
			}
		}
	}
}

// edgeBlocks relaxes the second colour on the first and last row of each
// block.
func (f *fineLevel) edgeBlocks(lo, hi int) {
	second := 1 - f.color
	for blk := lo; blk < hi; blk++ {
		j0, j1 := f.k.rows(blk)
		if j1 > j0 {
			f.relaxRow(j0, second)
		}
		if j1-1 > j0 {
			f.relaxRow(j1-1, second)
		}
	}
}

// zeroRow sets the red nodes of row j to D⁻¹b (a red half-sweep from
// zero).
func (f *fineLevel) zeroRow(j int) {
	nx := f.nx
	x, b, inv := f.opX, f.opB, f.k.invDiag
	o := j * nx
	for i := j & 1; i < nx; i += 2 {
		x[o+i] = b[o+i] * inv[o+i]
	}
}

// relaxRow relaxes the nodes of the given colour on row j. Fixed rows have
// no couplings, so they take x = b without a test.
func (f *fineLevel) relaxRow(j, color int) {
	s := f.sys
	nx, ny := f.nx, f.ny
	x, b, inv := f.opX, f.opB, f.k.invDiag
	ax, ay := s.AX, s.AY
	o := j * nx
	i0 := (j + color) & 1
	if j == 0 || j == ny-1 || nx < 3 {
		for i := i0; i < nx; i += 2 {
			n := o + i
			v := b[n]
			if i > 0 {
				v += ax[n-1] * x[n-1]
			}
			if i+1 < nx {
				v += ax[n] * x[n+1]
			}
			if j > 0 {
				v += ay[n-nx] * x[n-nx]
			}
			if j+1 < ny {
				v += ay[n] * x[n+nx]
			}
			x[n] = v * inv[n]
		}
		return
	}
	i := i0
	if i == 0 {
		n := o
		x[n] = (b[n] + ax[n]*x[n+1] + ay[n-nx]*x[n-nx] + ay[n]*x[n+nx]) * inv[n]
		i = 2
	}
	// Row slices of one length, and node i = k+1 reached through unsigned
	// k with k+2 < nx, let the compiler drop the bounds checks.
	xr, xs, xn := x[o:o+nx], x[o-nx:o], x[o+nx:o+2*nx]
	br, ir, axr, ays, ayr := b[o:o+nx], inv[o:o+nx], ax[o:o+nx], ay[o-nx:o], ay[o:o+nx]
	m := len(xr)
	xs, xn, br, ir, axr, ays, ayr = xs[:m], xn[:m], br[:m], ir[:m], axr[:m], ays[:m], ayr[:m]
	k := uint(i - 1)
	for ; k+2 < uint(m); k += 2 {
		xr[k+1] = ((br[k+1] + axr[k]*xr[k] + axr[k+1]*xr[k+2]) + (ays[k+1]*xs[k+1] + ayr[k+1]*xn[k+1])) * ir[k+1]
	}
	i = int(k) + 1
	if i == nx-1 {
		n := o + i
		x[n] = (b[n] + ax[n-1]*x[n-1] + ay[n-nx]*x[n-nx] + ay[n]*x[n+nx]) * inv[n]
	}
}

// residual computes r = b − A·x.
func (f *fineLevel) residual(r, x, b []float64) { f.k.residual(r, b, x, nil) }

// restrict writes Pᵀ·r into the padded coarse vector dst.
func (f *fineLevel) restrict(dst, r []float64) {
	f.cb, f.opR = dst, r
	f.run(min(64, f.ncy), f.restrictFn)
}

func (f *fineLevel) restrictBlocks(lo, hi int) {
	s := f.sys
	nx, ny := f.nx, f.ny
	r, dst, inv := f.opR, f.cb, f.k.invDiag
	ax, ay, ix, iy := s.AX, s.AY, f.ix, f.iy
	ncx, cst := f.ncx, f.ncx+2
	blocks := min(64, f.ncy)
	for blk := lo; blk < hi; blk++ {
		J0, J1 := blk*f.ncy/blocks, (blk+1)*f.ncy/blocks
		for J := J0; J < J1; J++ {
			j := 2 * J
			hasN := j+1 < ny
			for I := 0; I < ncx; I++ {
				i := 2 * I
				q := j*nx + i
				k := I + ncx*J
				v := r[q]
				// An edge point passes on its residual plus what its two
				// centre neighbours pass to it.
				if i+1 < nx {
					e := q + 1
					t := r[e]
					if J > 0 {
						t += ay[e-nx] * inv[e-nx] * r[e-nx]
					}
					if hasN {
						t += ay[e] * inv[e+nx] * r[e+nx]
					}
					v += ax[q] * ix[k] * t
				}
				if I > 0 {
					e := q - 1
					t := r[e]
					if J > 0 {
						t += ay[e-nx] * inv[e-nx] * r[e-nx]
					}
					if hasN {
						t += ay[e] * inv[e+nx] * r[e+nx]
					}
					v += ax[e] * ix[k-1] * t
				}
				if hasN {
					e := q + nx
					t := r[e]
					if i > 0 {
						t += ax[e-1] * inv[e-1] * r[e-1]
					}
					if i+1 < nx {
						t += ax[e] * inv[e+1] * r[e+1]
					}
					v += ay[q] * iy[k] * t
				}
				if J > 0 {
					e := q - nx
					t := r[e]
					if i > 0 {
						t += ax[e-1] * inv[e-1] * r[e-1]
					}
					if i+1 < nx {
						t += ax[e] * inv[e+1] * r[e+1]
					}
					v += ay[e] * iy[k-ncx] * t
				}
				dst[(J+1)*cst+I+1] = v
			}
		}
	}
}

// prolong adds P·xc to x, where xc is in the next level's padded layout.
func (f *fineLevel) prolong(x, xc []float64) {
	f.opX, f.cx = x, xc
	f.run(min(64, f.ncy), f.prolongFn)
}

func (f *fineLevel) prolongBlocks(lo, hi int) {
	s := f.sys
	nx, ny := f.nx, f.ny
	x, xc, inv := f.opX, f.cx, f.k.invDiag
	ax, ay, ix, iy := s.AX, s.AY, f.ix, f.iy
	ncx, cst := f.ncx, f.ncx+2
	blocks := min(64, f.ncy)
	for blk := lo; blk < hi; blk++ {
		J0, J1 := blk*f.ncy/blocks, (blk+1)*f.ncy/blocks
		for J := J0; J < J1; J++ {
			j := 2 * J
			hasN, hasNN := j+1 < ny, j+2 < ny
			q0 := j * nx
			c0 := (J+1)*cst + 1
			k0 := ncx * J
			// uw is the interpolated value of the y-edge point west of
			// the current cell centre.
			var uw float64
			if hasN {
				uw = (ay[q0]*xc[c0] + ay[q0+nx]*xc[c0+cst]) * iy[k0]
			}
			for I := 0; I < ncx; I++ {
				i := 2 * I
				q, cn, k := q0+i, c0+I, k0+I
				v, ve := xc[cn], xc[cn+1]
				x[q] += v
				var us float64
				if i+1 < nx {
					us = (ax[q]*v + ax[q+1]*ve) * ix[k]
					x[q+1] += us
				}
				if !hasN {
					continue
				}
				e := q + nx
				x[e] += uw
				if i+1 >= nx {
					continue
				}
				m := e + 1
				var ue, un float64
				if i+2 < nx {
					ue = (ay[q+2]*ve + ay[e+2]*xc[cn+cst+1]) * iy[k+1]
				}
				if hasNN {
					qn := q + 2*nx
					un = (ax[qn]*xc[cn+cst] + ax[qn+1]*xc[cn+cst+1]) * ix[k+ncx]
				}
				x[m] += (ax[e]*uw + ax[m]*ue + ay[m-nx]*us + ay[m]*un) * inv[m]
				uw = ue
			}
		}
	}
}
