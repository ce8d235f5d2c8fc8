package solve

// Stencil positions of a nine-point row as filled by mgLevel.row: the
// entry A(n, n+d) for the neighbour d.
const (
	sSW = iota
	sS
	sSE
	sW
	sC
	sE
	sNW
	sN
	sNE
)

// Interpolation weights kept per coarse point (I, J), in the order of
// mgLevel.interp: the x-edge point (2I+1, 2J) from its west and east coarse
// points, the y-edge point (2I, 2J+1) from its south and north ones, and
// the cell centre (2I+1, 2J+1) from its four corners.
const (
	pXW = iota
	pXE
	pYS
	pYN
	pSW
	pSE
	pNW
	pNE
	pLen
)

// coarseLevel is a level below the finest: a symmetric nine-point operator
// on an nx×ny grid, stored with a one-node halo of zeros so that no kernel
// needs a bounds test. Index (i, j) is (j+1)·st + i + 1 with st = nx + 2.
//
// Only five entries per row are stored; the other four follow from
// symmetry: A(n, n+1) = w[n+1], A(n, n+st) = s[n+st], A(n, n+st+1) =
// sw[n+st+1] and A(n, n+st−1) = se[n+st−1].
type coarseLevel struct {
	nx, ny, st int
	// c, w, s, sw, se are A(n,n), A(n,n−1), A(n,n−st), A(n,n−st−1) and
	// A(n,n−st+1).
	c, w, s, sw, se []float64
	fixed           []bool
	// x, b and r are the level's correction, right-hand side and residual.
	x, b, r []float64
	// pivX holds the Thomas pivots of the X lines when the smoother
	// relaxes them (see factorLines).
	pivX []float64
	// p holds pLen interpolation weights per point of the next coarser
	// level (compact index I + ncx·J); nil on the coarsest level.
	p        []float64
	ncx, ncy int

	smoother Smoother
	blocks   int
	run      func(n int, fn func(lo, hi int))

	// Operands and prebuilt closures of the parallel kernels.
	opX, opB, opR   []float64
	cx, cb          []float64
	color, lineAxis int

	smoothFn, edgeFn, residualFn, restrictFn, prolongFn, lineFn, clearFn func(lo, hi int)
}

func newCoarseLevel(nx, ny int) *coarseLevel {
	st := nx + 2
	n := st * (ny + 2)
	l := &coarseLevel{nx: nx, ny: ny, st: st}
	l.c = make([]float64, n)
	l.w = make([]float64, n)
	l.s = make([]float64, n)
	l.sw = make([]float64, n)
	l.se = make([]float64, n)
	l.fixed = make([]bool, n)
	l.x = make([]float64, n)
	l.b = make([]float64, n)
	l.r = make([]float64, n)
	l.blocks = min(64, ny)
	l.smoothFn = l.smoothBlocks
	l.clearFn = l.clearBlocks
	l.edgeFn = l.edgeBlocks
	l.residualFn = l.residualBlocks
	l.restrictFn = l.restrictBlocks
	l.prolongFn = l.prolongBlocks
	l.lineFn = l.lineBlocks
	return l
}

// idx returns the padded index of node (i, j).
func (l *coarseLevel) idx(i, j int) int { return (j+1)*l.st + i + 1 }

func (l *coarseLevel) dims() (int, int) { return l.nx, l.ny }

func (l *coarseLevel) isFixed(i, j int) bool { return l.fixed[l.idx(i, j)] }

// row fills a with row (i, j) of the operator.
func (l *coarseLevel) row(i, j int, a *[9]float64) {
	n, st := l.idx(i, j), l.st
	a[sC] = l.c[n]
	a[sW] = l.w[n]
	a[sE] = l.w[n+1]
	a[sS] = l.s[n]
	a[sN] = l.s[n+st]
	a[sSW] = l.sw[n]
	a[sSE] = l.se[n]
	a[sNE] = l.sw[n+st+1]
	a[sNW] = l.se[n+st-1]
}

// interp fills w with the interpolation weights kept at coarse point
// (I, J) of the next coarser level.
func (l *coarseLevel) interp(I, J int, w *[pLen]float64) {
	k := (I + l.ncx*J) * pLen
	copy(w[:], l.p[k:k+pLen])
}

// pinFixed makes the rows and columns of fixed nodes identity rows.
func (l *coarseLevel) pinFixed() {
	st := l.st
	for j := 0; j < l.ny; j++ {
		for i := 0; i < l.nx; i++ {
			n := l.idx(i, j)
			if !l.fixed[n] {
				continue
			}
			l.c[n] = 1
			l.w[n], l.s[n], l.sw[n], l.se[n] = 0, 0, 0, 0
			l.w[n+1], l.s[n+st], l.sw[n+st+1], l.se[n+st-1] = 0, 0, 0, 0
		}
	}
}

func (l *coarseLevel) rows(b int) (int, int) { return b * l.ny / l.blocks, (b + 1) * l.ny / l.blocks }

// smooth relaxes A·x = b in place: one symmetric step is pre (forward) or
// post (the reverse order), so that the V-cycle is symmetric. With zero set
// x is taken as zero on entry.
//
// Point relaxation is four-colour Gauss–Seidel, the colours being the
// parities of (i, j): forward (even, even), (odd, even), (even, odd),
// (odd, odd). Nodes of one colour do not couple in a nine-point stencil.
// The two colours of an even row need only that row; those of an odd row
// need the even rows beside it. So one pass relaxes even row j and then
// odd row j−1 (backward: odd row j, then even row j−1), and a second,
// short pass relaxes the rows of the second kind at the edges of each
// block, which need the neighbouring block's rows. Every node sees the
// values of four separate colour sweeps, whatever the blocking.
func (l *coarseLevel) smooth(x, b []float64, zero, post bool) {
	if zero {
		l.clearRows(x)
	}
	l.opX, l.opB = x, b
	switch l.smoother {
	case LineX, LineY, LineXY:
		l.smoothLines(post)
		return
	}
	l.color = 0
	if post {
		l.color = 1
	}
	l.run(l.blocks, l.smoothFn)
	l.run(l.blocks, l.edgeFn)
}

// smoothBlocks is the pipelined pass of smooth: rows of parity l.color
// first.
func (l *coarseLevel) smoothBlocks(lo, hi int) {
	first := l.color
	back := l.color == 1
	for blk := lo; blk < hi; blk++ {
		j0, j1 := l.rows(blk)
		for j := j0; j < j1; j++ {
			if j&1 != first {
				continue
			}
			l.relaxRow(j, back)
			if k := j - 1; k > j0 {
				l.relaxRow(k, back)
			}
		}
	}
}

// edgeBlocks relaxes the rows of the second kind at the first and last
// row of each block.
func (l *coarseLevel) edgeBlocks(lo, hi int) {
	second := 1 - l.color
	back := l.color == 1
	for blk := lo; blk < hi; blk++ {
		j0, j1 := l.rows(blk)
		if j1 > j0 && j0&1 == second {
			l.relaxRow(j0, back)
		}
		if j1-1 > j0 && (j1-1)&1 == second {
			l.relaxRow(j1-1, back)
		}
	}
}

// relaxRow relaxes both colours of row j, even columns first (odd first
// when back is set). Row slices of the padded arrays (padded column i+1 is
// node column i) let the compiler drop the bounds checks.
func (l *coarseLevel) relaxRow(j int, back bool) {
	st := l.st
	o := (j + 1) * st
	x := l.opX
	xs, xr, xn := x[o-st:o:o], x[o:o+st:o+st], x[o+st:o+2*st:o+2*st]
	b := l.opB[o : o+st : o+st]
	c, w, s := l.c[o:o+st:o+st], l.w[o:o+st:o+st], l.s[o:o+st:o+st]
	sw, se := l.sw[o:o+st:o+st], l.se[o:o+st:o+st]
	sN, swN, seN := l.s[o+st:o+2*st:o+2*st], l.sw[o+st:o+2*st:o+2*st], l.se[o+st:o+2*st:o+2*st]
	// All slices have the row's length, and node i = k+1 is reached
	// through unsigned k with k+2 < len: the compiler then drops the
	// bounds checks and keeps fewer values in registers.
	n := len(xr)
	xs, xn, b, c, w, s = xs[:n], xn[:n], b[:n], c[:n], w[:n], s[:n]
	sw, se, sN, swN, seN = sw[:n], se[:n], sN[:n], swN[:n], seN[:n]
	for q := 0; q < 2; q++ {
		pi := q
		if back {
			pi = 1 - q
		}
		for k := uint(pi); k+2 < uint(n); k += 2 {
			// Three partial sums shorten the chain of dependent
			// additions.
			v0 := b[k+1] - w[k+1]*xr[k] - w[k+2]*xr[k+2]
			v1 := s[k+1]*xs[k+1] + sN[k+1]*xn[k+1] + sw[k+1]*xs[k]
			v2 := se[k+1]*xs[k+2] + swN[k+2]*xn[k+2] + seN[k]*xn[k]
			xr[k+1] = (v0 - (v1 + v2)) / c[k+1]
		}
	}
}

// residual computes r = b − A·x.
func (l *coarseLevel) residual(r, x, b []float64) {
	l.opR, l.opX, l.opB = r, x, b
	l.run(l.blocks, l.residualFn)
}

func (l *coarseLevel) residualBlocks(lo, hi int) {
	st := l.st
	for blk := lo; blk < hi; blk++ {
		j0, j1 := l.rows(blk)
		for j := j0; j < j1; j++ {
			o := (j + 1) * st
			x := l.opX
			xs, xr, xn := x[o-st:o:o], x[o:o+st:o+st], x[o+st:o+2*st:o+2*st]
			b, r := l.opB[o:o+st:o+st], l.opR[o:o+st:o+st]
			c, w, s := l.c[o:o+st:o+st], l.w[o:o+st:o+st], l.s[o:o+st:o+st]
			sw, se := l.sw[o:o+st:o+st], l.se[o:o+st:o+st]
			sN, swN, seN := l.s[o+st:o+2*st:o+2*st], l.sw[o+st:o+2*st:o+2*st], l.se[o+st:o+2*st:o+2*st]
			n := len(xr)
			xs, xn, b, r, c, w, s = xs[:n], xn[:n], b[:n], r[:n], c[:n], w[:n], s[:n]
			sw, se, sN, swN, seN = sw[:n], se[:n], sN[:n], swN[:n], seN[:n]
			for k := uint(0); k+2 < uint(n); k++ {
				v0 := b[k+1] - c[k+1]*xr[k+1] - w[k+1]*xr[k] - w[k+2]*xr[k+2]
				v1 := s[k+1]*xs[k+1] + sN[k+1]*xn[k+1] + sw[k+1]*xs[k]
				v2 := se[k+1]*xs[k+2] + swN[k+2]*xn[k+2] + seN[k]*xn[k]
				r[k+1] = v0 - (v1 + v2)
			}
		}
	}
}

// restrict writes Pᵀ·r into the padded coarse vector dst (the next
// level's layout, stride ncx+2).
func (l *coarseLevel) restrict(dst, r []float64) {
	l.cb, l.opR = dst, r
	l.run(min(64, l.ncy), l.restrictFn)
}

func (l *coarseLevel) restrictBlocks(lo, hi int) {
	st, cst := l.st, l.ncx+2
	blocks := min(64, l.ncy)
	r, p, dst := l.opR, l.p, l.cb
	ncx := l.ncx
	for blk := lo; blk < hi; blk++ {
		J0, J1 := blk*l.ncy/blocks, (blk+1)*l.ncy/blocks
		for J := J0; J < J1; J++ {
			for I := 0; I < ncx; I++ {
				q := (2*J+1)*st + 2*I + 1
				k := (I + ncx*J) * pLen
				v := r[q] + p[k+pXW]*r[q+1] + p[k+pYS]*r[q+st] + p[k+pSW]*r[q+st+1]
				if I > 0 {
					kw := k - pLen
					v += p[kw+pXE]*r[q-1] + p[kw+pSE]*r[q+st-1]
				}
				if J > 0 {
					ks := k - ncx*pLen
					v += p[ks+pYN]*r[q-st] + p[ks+pNW]*r[q-st+1]
					if I > 0 {
						v += p[ks-pLen+pNE] * r[q-st-1]
					}
				}
				dst[(J+1)*cst+I+1] = v
			}
		}
	}
}

// prolong adds P·xc to x, where xc is in the next level's padded layout.
func (l *coarseLevel) prolong(x, xc []float64) {
	l.opX, l.cx = x, xc
	l.run(min(64, l.ncy), l.prolongFn)
}

func (l *coarseLevel) prolongBlocks(lo, hi int) {
	st, cst := l.st, l.ncx+2
	blocks := min(64, l.ncy)
	x, p, xc := l.opX, l.p, l.cx
	ncx := l.ncx
	for blk := lo; blk < hi; blk++ {
		J0, J1 := blk*l.ncy/blocks, (blk+1)*l.ncy/blocks
		for J := J0; J < J1; J++ {
			hasN := 2*J+1 < l.ny
			for I := 0; I < ncx; I++ {
				q := (2*J+1)*st + 2*I + 1
				k := (I + ncx*J) * pLen
				cn := (J+1)*cst + I + 1
				v, ve, vn, vne := xc[cn], xc[cn+1], xc[cn+cst], xc[cn+cst+1]
				x[q] += v
				hasE := 2*I+1 < l.nx
				if hasE {
					x[q+1] += p[k+pXW]*v + p[k+pXE]*ve
				}
				if hasN {
					x[q+st] += p[k+pYS]*v + p[k+pYN]*vn
					if hasE {
						x[q+st+1] += p[k+pSW]*v + p[k+pSE]*ve + p[k+pNW]*vn + p[k+pNE]*vne
					}
				}
			}
		}
	}
}

// computeWeights fills p with operator-dependent interpolation weights
// from the next coarser level (ncx × ncy points at the even nodes).
//
// An edge point between two coarse points takes the weights of its own
// row collapsed across the edge (the stencil's three columns, or rows, are
// lumped onto the line through the two coarse points), as in the
// black-box multigrid of Alcouffe, Brandt, Dendy and Painter; a cell centre
// solves its own homogeneous equation given its corners and the already
// interpolated edge points. Weights from fixed coarse points and into fixed
// nodes are zero, so corrections vanish on conductors.
func (l *coarseLevel) computeWeights() {
	ncx, ncy := l.ncx, l.ncy
	nx, ny, st := l.nx, l.ny, l.st
	c, w, sa, sw, se, fx := l.c, l.w, l.s, l.sw, l.se, l.fixed
	if len(l.p) != pLen*ncx*ncy {
		l.p = make([]float64, pLen*ncx*ncy)
	}
	p := l.p
	forRows(l.run, ncy, func(J int) {
		for I := 0; I < ncx; I++ {
			k := (I + ncx*J) * pLen
			i, j := 2*I, 2*J
			q := l.idx(i, j)
			if e := q + 1; i+1 < nx && !fx[e] {
				wW, wE := edgeWeights(sw[e]+w[e]+se[e+st-1], se[e]+w[e+1]+sw[e+st+1], sa[e]+c[e]+sa[e+st], c[e])
				if fx[q] {
					wW = 0
				}
				if i+2 >= nx || fx[q+2] {
					wE = 0
				}
				p[k+pXW], p[k+pXE] = wW, wE
			}
			if g := q + st; j+1 < ny && !fx[g] {
				wS, wN := edgeWeights(sw[g]+sa[g]+se[g], se[g+st-1]+sa[g+st]+sw[g+st+1], w[g]+c[g]+w[g+1], c[g])
				if fx[q] {
					wS = 0
				}
				if j+2 >= ny || fx[q+2*st] {
					wN = 0
				}
				p[k+pYS], p[k+pYN] = wS, wN
			}
		}
	})
	// The centres need their neighbours' edge weights: a second pass.
	forRows(l.run, ncy, func(J int) {
		for I := 0; I < ncx; I++ {
			i, j := 2*I, 2*J
			q := l.idx(i, j)
			m := q + st + 1
			if i+1 >= nx || j+1 >= ny || fx[m] {
				continue
			}
			k := (I + ncx*J) * pLen
			// Edge weights of the centre's four neighbours.
			var yE, xN [2]float64
			if I+1 < ncx {
				yE = [2]float64{p[k+pLen+pYS], p[k+pLen+pYN]}
			}
			if J+1 < ncy {
				kn := k + ncx*pLen
				xN = [2]float64{p[kn+pXW], p[kn+pXE]}
			}
			aW, aE, aS, aN := w[m], w[m+1], sa[m], sa[m+st]
			ms := [4]float64{
				sw[m] + aW*p[k+pYS] + aS*p[k+pXW],
				se[m] + aE*yE[0] + aS*p[k+pXE],
				se[m+st-1] + aW*p[k+pYN] + aN*xN[0],
				sw[m+st+1] + aE*yE[1] + aN*xN[1],
			}
			noE, noN := i+2 >= nx, j+2 >= ny
			corner := [4]bool{fx[q], noE || fx[q+2], noN || fx[q+2*st], noE || noN || fx[q+2*st+2]}
			for t := range ms {
				if !corner[t] {
					p[k+pSW+t] = -ms[t] / c[m]
				}
			}
		}
	})
}

// edgeWeights returns the interpolation weights of an edge point from the
// lumped couplings aLo and aHi to its two coarse neighbours and its lumped
// diagonal d (all matrix entries, couplings normally negative); c is the
// plain diagonal, used when lumping leaves no positive diagonal.
func edgeWeights(aLo, aHi, d, c float64) (float64, float64) {
	if !(d > 0) {
		d = c
	}
	return -aLo / d, -aHi / d
}
