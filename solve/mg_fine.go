package solve

// fineLevel is the finest multigrid level: the assembled five-point
// System itself, read in place. Its interpolation weights are not stored
// but recomputed from the operator wherever they are needed (setup,
// restriction, prolongation), always by the same expressions, so that the
// restriction is exactly the transpose of the prolongation.
type fineLevel struct {
	sys    *System
	nx, ny int
	k      *kernels
	// r is the residual of the finest level.
	r        []float64
	ncx, ncy int

	smoother Smoother
	run      func(n int, fn func(lo, hi int))

	opX, opB, opR, cx, cb []float64
	color, lineAxis       int

	smoothFn, zeroFn, restrictFn, prolongFn, lineFn func(lo, hi int)
}

func newFineLevel(sys *System, k *kernels) *fineLevel {
	f := &fineLevel{sys: sys, nx: sys.Nx, ny: sys.Ny, k: k}
	f.r = make([]float64, sys.Len())
	f.smoothFn = f.smoothBlocks
	f.zeroFn = f.zeroBlocks
	f.restrictFn = f.restrictBlocks
	f.prolongFn = f.prolongBlocks
	f.lineFn = f.lineBlocks
	return f
}

func (f *fineLevel) dims() (int, int) { return f.nx, f.ny }

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

// xEdge returns the weights of x-edge point (i, j) (i odd, j even) from
// its west and east coarse neighbours: the row collapsed along Y,
// w = a/(d − a_S − a_N). The lumped diagonal is kept at least the sum of
// the two X couplings, which it equals up to round-off when the row has no
// coupling to a fixed node.
func (f *fineLevel) xEdge(i, j int) (float64, float64) {
	s := f.sys
	n := j*f.nx + i
	d := s.Diag[n]
	if j > 0 {
		d -= s.AY[n-f.nx]
	}
	if j+1 < f.ny {
		d -= s.AY[n]
	}
	aw, ae := s.AX[n-1], 0.0
	if i+1 < f.nx {
		ae = s.AX[n]
	}
	if t := aw + ae; d < t {
		d = t
	}
	if !(d > 0) {
		return 0, 0
	}
	return aw / d, ae / d
}

// yEdge returns the weights of y-edge point (i, j) (i even, j odd) from
// its south and north coarse neighbours.
func (f *fineLevel) yEdge(i, j int) (float64, float64) {
	s := f.sys
	n := j*f.nx + i
	d := s.Diag[n]
	if i > 0 {
		d -= s.AX[n-1]
	}
	if i+1 < f.nx {
		d -= s.AX[n]
	}
	as, an := s.AY[n-f.nx], 0.0
	if j+1 < f.ny {
		an = s.AY[n]
	}
	if t := as + an; d < t {
		d = t
	}
	if !(d > 0) {
		return 0, 0
	}
	return as / d, an / d
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
func (f *fineLevel) smooth(x, b []float64, zero, post bool) {
	f.opX, f.opB = x, b
	k := f.k
	switch f.smoother {
	case LineX, LineY, LineXY:
		if zero {
			clear(x)
		}
		f.smoothLines(post)
		return
	}
	if post {
		f.color = 1
		f.run(k.blocks, f.smoothFn)
		f.color = 0
		f.run(k.blocks, f.smoothFn)
		return
	}
	f.color = 0
	if zero {
		f.run(k.blocks, f.zeroFn)
	} else {
		f.run(k.blocks, f.smoothFn)
	}
	f.color = 1
	f.run(k.blocks, f.smoothFn)
}

// zeroBlocks sets the red nodes to D⁻¹b (a red half-sweep from zero).
func (f *fineLevel) zeroBlocks(lo, hi int) {
	nx := f.nx
	x, b, inv := f.opX, f.opB, f.k.invDiag
	for blk := lo; blk < hi; blk++ {
		j0, j1 := f.k.rows(blk)
		for j := j0; j < j1; j++ {
			o := j * nx
			for i := j & 1; i < nx; i += 2 {
				x[o+i] = b[o+i] * inv[o+i]
			}
		}
	}
}

// smoothBlocks relaxes the nodes of colour f.color. Fixed rows have no
// couplings, so they take x = b without a test.
func (f *fineLevel) smoothBlocks(lo, hi int) {
	s := f.sys
	nx, ny := f.nx, f.ny
	x, b, inv := f.opX, f.opB, f.k.invDiag
	ax, ay := s.AX, s.AY
	for blk := lo; blk < hi; blk++ {
		j0, j1 := f.k.rows(blk)
		for j := j0; j < j1; j++ {
			o := j * nx
			i0 := (j + f.color) & 1
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
				continue
			}
			i := i0
			if i == 0 {
				n := o
				x[n] = (b[n] + ax[n]*x[n+1] + ay[n-nx]*x[n-nx] + ay[n]*x[n+nx]) * inv[n]
				i = 2
			}
			for ; i < nx-1; i += 2 {
				n := o + i
				x[n] = (b[n] + ax[n-1]*x[n-1] + ax[n]*x[n+1] + ay[n-nx]*x[n-nx] + ay[n]*x[n+nx]) * inv[n]
			}
			if i == nx-1 {
				n := o + i
				x[n] = (b[n] + ax[n-1]*x[n-1] + ay[n-nx]*x[n-nx] + ay[n]*x[n+nx]) * inv[n]
			}
		}
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
	ax, ay := s.AX, s.AY
	cst := f.ncx + 2
	blocks := min(64, f.ncy)
	// xt and yt are an edge point's residual plus what its centre
	// neighbours pass on to it.
	xt := func(e, j int) float64 {
		t := r[e]
		if j > 0 {
			t += ay[e-nx] * inv[e-nx] * r[e-nx]
		}
		if j+1 < ny {
			t += ay[e] * inv[e+nx] * r[e+nx]
		}
		return t
	}
	yt := func(e, i int) float64 {
		t := r[e]
		if i > 0 {
			t += ax[e-1] * inv[e-1] * r[e-1]
		}
		if i+1 < nx {
			t += ax[e] * inv[e+1] * r[e+1]
		}
		return t
	}
	for blk := lo; blk < hi; blk++ {
		J0, J1 := blk*f.ncy/blocks, (blk+1)*f.ncy/blocks
		for J := J0; J < J1; J++ {
			j := 2 * J
			for I := 0; I < f.ncx; I++ {
				i := 2 * I
				q := j*nx + i
				v := r[q]
				if i+1 < nx {
					wW, _ := f.xEdge(i+1, j)
					v += wW * xt(q+1, j)
				}
				if I > 0 {
					_, wE := f.xEdge(i-1, j)
					v += wE * xt(q-1, j)
				}
				if j+1 < ny {
					wS, _ := f.yEdge(i, j+1)
					v += wS * yt(q+nx, i)
				}
				if J > 0 {
					_, wN := f.yEdge(i, j-1)
					v += wN * yt(q-nx, i)
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
	nx, ny := f.nx, f.ny
	x, xc := f.opX, f.cx
	cst := f.ncx + 2
	blocks := min(64, f.ncy)
	// Interpolated values of the edge points.
	ux := func(i, j, cn int) float64 {
		wW, wE := f.xEdge(i, j)
		return wW*xc[cn] + wE*xc[cn+1]
	}
	uy := func(i, j, cn int) float64 {
		wS, wN := f.yEdge(i, j)
		return wS*xc[cn] + wN*xc[cn+cst]
	}
	for blk := lo; blk < hi; blk++ {
		J0, J1 := blk*f.ncy/blocks, (blk+1)*f.ncy/blocks
		for J := J0; J < J1; J++ {
			j := 2 * J
			for I := 0; I < f.ncx; I++ {
				i := 2 * I
				q := j*nx + i
				cn := (J+1)*cst + I + 1
				x[q] += xc[cn]
				if i+1 < nx {
					x[q+1] += ux(i+1, j, cn)
				}
				if j+1 >= ny {
					continue
				}
				uw := uy(i, j+1, cn)
				x[q+nx] += uw
				if i+1 >= nx {
					continue
				}
				vw, ve, vs, vn := f.centre(i+1, j+1)
				v := vw*uw + vs*ux(i+1, j, cn)
				if i+2 < nx {
					v += ve * uy(i+2, j+1, cn+1)
				}
				if j+2 < ny {
					v += vn * ux(i+1, j+2, cn+cst)
				}
				x[q+nx+1] += v
			}
		}
	}
}
