package solve

import "math"

// chooseSmoother picks the relaxation of a level from its couplings:
// lines along an axis when at any free node the couplings along that axis
// exceed those across it by more than LineRatio, point Gauss–Seidel
// otherwise. Point relaxation cannot smooth an error that varies slowly
// along the strong direction, and standard coarsening cannot represent it;
// solving whole lines removes exactly that error. A few such nodes are
// enough to slow a V-cycle: the cells along a dielectric interface that
// the grid does not follow average their permittivities differently along
// and across it, and a few dozen of them at 1000:1 cost PCG four extra
// iterations at 257² nodes. Nodes next to fixed ones, on zero-flux sides
// or on the axis of an axisymmetric grid lose one coupling and stay within
// a ratio of 4.
func chooseSmoother(l mgLevel) Smoother {
	nx, ny := l.dims()
	var a [9]float64
	var all uint8
	for j := 0; j < ny; j++ {
		for i := 0; i < nx; i++ {
			if l.isFixed(i, j) {
				continue
			}
			l.row(i, j, &a)
			all |= strongBits(math.Abs(a[sW])+math.Abs(a[sE]), math.Abs(a[sS])+math.Abs(a[sN]))
		}
	}
	return smootherOf(all)
}

// strongBits returns bit 0 when the X couplings sx of a node exceed its Y
// couplings sy by more than LineRatio, bit 1 for the reverse.
func strongBits(sx, sy float64) uint8 {
	var bits uint8
	if sx > LineRatio*sy && sy > 0 {
		bits |= 1
	}
	if sy > LineRatio*sx && sx > 0 {
		bits |= 2
	}
	return bits
}

// smootherOf returns the smoother for the union of strongBits over a
// level.
func smootherOf(all uint8) Smoother {
	switch all {
	case 3:
		return LineXY
	case 1:
		return LineX
	case 2:
		return LineY
	}
	return PointGS
}

// chooseSmoother is chooseSmoother for a nine-point level, reading the
// stored stencils directly, row by row on the worker pool.
func (l *coarseLevel) chooseSmoother() Smoother {
	st := l.st
	strong := make([]uint8, l.ny)
	forRows(l.run, l.ny, func(j int) {
		o := (j+1)*st + 1
		var bits uint8
		for n := o; n < o+l.nx; n++ {
			if l.fixed[n] {
				continue
			}
			bits |= strongBits(math.Abs(l.w[n])+math.Abs(l.w[n+1]), math.Abs(l.s[n])+math.Abs(l.s[n+st]))
		}
		strong[j] = bits
	})
	var all uint8
	for _, b := range strong {
		all |= b
	}
	return smootherOf(all)
}

// chooseSmoother is chooseSmoother for the finest level, reading the
// System's couplings directly.
func (f *fineLevel) chooseSmoother() Smoother {
	s := f.sys
	nx, ny := f.nx, f.ny
	// Per row: bit 0 for a node strong along X, bit 1 along Y.
	strong := make([]uint8, ny)
	forRows(f.run, ny, func(j int) {
		o := j * nx
		var bits uint8
		for i := 0; i < nx; i++ {
			n := o + i
			if s.Fixed[n] {
				continue
			}
			sx, sy := s.AX[n], s.AY[n]
			if i > 0 {
				sx += s.AX[n-1]
			}
			if j > 0 {
				sy += s.AY[n-nx]
			}
			bits |= strongBits(sx, sy)
		}
		strong[j] = bits
	})
	var all uint8
	for _, b := range strong {
		all |= b
	}
	return smootherOf(all)
}

// columnBlocks is the number of column blocks of Y-line relaxation on a
// level nx nodes wide. Y lines advance row by row through all the columns
// of a block at once; blocks at least 256 columns wide keep every row's
// access long enough for the memory system to stream it.
func columnBlocks(nx int) int { return max(1, min(64, nx/256)) }

// lineSteps lists the zebra half-steps of a line smoother, forward: the
// axis (0 for X lines, 1 for Y lines) and the parity of the lines.
func lineSteps(s Smoother) [][2]int {
	switch s {
	case LineX:
		return [][2]int{{0, 0}, {0, 1}}
	case LineY:
		return [][2]int{{1, 0}, {1, 1}}
	}
	return [][2]int{{0, 0}, {0, 1}, {1, 0}, {1, 1}}
}

var (
	stepsX  = lineSteps(LineX)
	stepsY  = lineSteps(LineY)
	stepsXY = lineSteps(LineXY)
)

func stepsOf(s Smoother) [][2]int {
	switch s {
	case LineX:
		return stepsX
	case LineY:
		return stepsY
	}
	return stepsXY
}

// smoothLines runs the zebra line steps forward, or backward for post.
// The residual vector holds the eliminated super-diagonal while it runs.
func (f *fineLevel) smoothLines(post bool) {
	steps := stepsOf(f.smoother)
	for q := range steps {
		st := steps[q]
		if post {
			st = steps[len(steps)-1-q]
		}
		f.lineAxis, f.color = st[0], st[1]
		if st[0] == 0 {
			f.run(f.k.blocks, f.lineFn)
		} else {
			f.run(columnBlocks(f.nx), f.lineFn)
		}
	}
}

// lineBlocks solves the lines of the current axis and parity in its
// blocks (row blocks for X lines, column blocks for Y lines) by the
// Thomas algorithm; lines of one parity do not couple.
func (f *fineLevel) lineBlocks(lo, hi int) {
	nx, ny := f.nx, f.ny
	x, cp := f.opX, f.r
	if f.lineAxis == 0 {
		for blk := lo; blk < hi; blk++ {
			j0, j1 := f.k.rows(blk)
			j := j0
			if j&1 != f.color {
				j++
			}
			// Two lines at a time, so that the two recurrences overlap.
			for ; j+2 < j1; j += 4 {
				f.xLinePair(j, j+2)
			}
			if j < j1 {
				f.xLinePair(j, -1)
			}
		}
		return
	}
	blocks := columnBlocks(nx)
	for blk := lo; blk < hi; blk++ {
		i0, i1 := blk*nx/blocks, (blk+1)*nx/blocks
		if i0&1 != f.color {
			i0++
		}
		for j := 0; j < ny; j++ {
			f.yForwardRow(j, i0, i1)
		}
		for j := ny - 2; j >= 0; j-- {
			o := j * nx
			xr, xn, cr := x[o:o+nx], x[o+nx:o+2*nx], cp[o:o+nx]
			xn, cr = xn[:len(xr)], cr[:len(xr)]
			for i := uint(i0); i < uint(i1); i += 2 {
				xr[i] -= cr[i] * xn[i]
			}
		}
	}
}

// yForwardRow is the forward elimination of the Thomas algorithm on row j
// for the Y lines in the columns i0, i0+2, … below i1: the eliminated
// super-diagonal goes to the residual vector, the eliminated right-hand
// side to x. Interior nodes take a loop without edge tests.
func (f *fineLevel) yForwardRow(j, i0, i1 int) {
	s := f.sys
	nx, ny := f.nx, f.ny
	x, b, cp := f.opX, f.opB, f.r
	ax, ay, d := s.AX, s.AY, s.Diag
	o := j * nx
	node := func(i int) {
		n := o + i
		rhs := b[n]
		if i > 0 {
			rhs += ax[n-1] * x[n-1]
		}
		if i+1 < nx {
			rhs += ax[n] * x[n+1]
		}
		var sub, sup, pc, px float64
		if j > 0 {
			sub = -ay[n-nx]
			pc, px = cp[n-nx], x[n-nx]
		}
		if j+1 < ny {
			sup = -ay[n]
		}
		inv := 1 / (d[n] - sub*pc)
		cp[n] = sup * inv
		x[n] = (rhs - sub*px) * inv
	}
	if j == 0 || j == ny-1 {
		for i := i0; i < i1; i += 2 {
			node(i)
		}
		return
	}
	i := i0
	if i == 0 {
		node(0)
		i = 2
	}
	end := min(i1, nx-1)
	// The right-hand sides first, into x: they need only the other
	// columns. Slices shifted by one column and unsigned indices let the
	// compiler drop most bounds checks.
	xr := x[o : o+nx]
	if i < end {
		m := nx - 2
		xw, xe, xo := xr[:m], xr[2:2+m], xr[1:1+m]
		aw, ae, bb := ax[o:o+m], ax[o+1:o+1+m], b[o+1:o+1+m]
		for k := uint(i - 1); k < uint(end-1); k += 2 {
			rhs := bb[k]
			rhs += aw[k] * xw[k]
			rhs += ae[k] * xe[k]
			xo[k] = rhs
		}
	}
	xs, cr, cs := x[o-nx:o], cp[o:o+nx], cp[o-nx:o]
	dr, ays, ayr := d[o:o+nx], ay[o-nx:o], ay[o:o+nx]
	xs, cr, cs, dr, ays, ayr = xs[:nx], cr[:nx], cs[:nx], dr[:nx], ays[:nx], ayr[:nx]
	k := uint(i)
	for ; k < uint(end); k += 2 {
		// −(−a)·c is a·c exactly, so the signs are folded.
		a := ays[k]
		inv := 1 / (dr[k] + a*cs[k])
		cr[k] = -(ayr[k] * inv)
		xr[k] = (xr[k] + a*xs[k]) * inv
	}
	i = int(k)
	if i < i1 {
		node(i)
	}
}

// smoothLines runs the zebra line steps forward, or backward for post.
func (l *coarseLevel) smoothLines(post bool) {
	steps := stepsOf(l.smoother)
	for q := range steps {
		st := steps[q]
		if post {
			st = steps[len(steps)-1-q]
		}
		l.lineAxis, l.color = st[0], st[1]
		if st[0] == 0 {
			l.run(l.blocks, l.lineFn)
		} else {
			l.run(columnBlocks(l.nx), l.lineFn)
		}
	}
}

func (l *coarseLevel) lineBlocks(lo, hi int) {
	st := l.st
	x, cp := l.opX, l.r
	nx, ny := l.nx, l.ny
	if l.lineAxis == 0 {
		for blk := lo; blk < hi; blk++ {
			j0, j1 := l.rows(blk)
			j := j0
			if j&1 != l.color {
				j++
			}
			for ; j+2 < j1; j += 4 {
				l.xLinePair(j, j+2)
			}
			if j < j1 {
				l.xLinePair(j, -1)
			}
		}
		return
	}
	blocks := columnBlocks(nx)
	for blk := lo; blk < hi; blk++ {
		i0, i1 := blk*nx/blocks, (blk+1)*nx/blocks
		if i0&1 != l.color {
			i0++
		}
		for j := 0; j < ny; j++ {
			l.yForwardRow(j, i0, i1)
		}
		for j := ny - 2; j >= 0; j-- {
			o := (j+1)*st + 1
			xr, xn, cr := x[o:o+nx], x[o+st:o+st+nx], cp[o:o+nx]
			xn, cr = xn[:len(xr)], cr[:len(xr)]
			for i := uint(i0); i < uint(i1); i += 2 {
				xr[i] -= cr[i] * xn[i]
			}
		}
	}
}

// yForwardRow is the forward elimination of the Thomas algorithm on row j
// of a nine-point level for the Y lines in the columns i0, i0+2, … below
// i1: the eliminated super-diagonal goes to the residual vector, the
// eliminated right-hand side to x. The right-hand sides, which need only
// the other columns, are formed in x first.
func (l *coarseLevel) yForwardRow(j, i0, i1 int) {
	st, nx := l.st, l.nx
	o := (j+1)*st + 1
	x := l.opX
	// x around the node, all slices indexed by the node's column: west,
	// own, east; south-west, south, south-east; north-west, north-east.
	xw, xo, xe := x[o-1:o-1+nx], x[o:o+nx], x[o+1:o+1+nx]
	sw0, ss0, se0 := x[o-st-1:o-st-1+nx], x[o-st:o-st+nx], x[o-st+1:o-st+1+nx]
	nw0, ne0 := x[o+st-1:o+st-1+nx], x[o+st+1:o+st+1+nx]
	b, w, wE := l.opB[o:o+nx], l.w[o:o+nx], l.w[o+1:o+nx+1]
	sw, se := l.sw[o:o+nx], l.se[o:o+nx]
	swN, seN := l.sw[o+st+1:o+st+nx+1], l.se[o+st-1:o+st+nx-1]
	m := len(xo)
	xw, xe, sw0, se0, nw0, ne0 = xw[:m], xe[:m], sw0[:m], se0[:m], nw0[:m], ne0[:m]
	b, w, wE, sw, se, swN, seN = b[:m], w[:m], wE[:m], sw[:m], se[:m], swN[:m], seN[:m]
	if i1 > m {
		panic("solve: column range outside the level")
	}
	for i := uint(i0); i < uint(i1); i += 2 {
		xo[i] = b[i] - w[i]*xw[i] - wE[i]*xe[i] -
			sw[i]*sw0[i] - se[i]*se0[i] - swN[i]*ne0[i] - seN[i]*nw0[i]
	}
	// The halo row below holds cp = x = 0.
	cp := l.r
	c, s, sN := l.c[o:o+nx], l.s[o:o+nx], l.s[o+st:o+st+nx]
	cr, cs := cp[o:o+nx], cp[o-st:o-st+nx]
	c, s, sN, cr, cs, ss0 = c[:m], s[:m], sN[:m], cr[:m], cs[:m], ss0[:m]
	for i := uint(i0); i < uint(i1); i += 2 {
		sub := s[i]
		inv := 1 / (c[i] - sub*cs[i])
		cr[i] = sN[i] * inv
		xo[i] = (xo[i] - sub*ss0[i]) * inv
	}
}

// xLinePair solves the X lines ja and jb (jb < 0: ja alone) of the finest
// level by the Thomas algorithm with the stored pivots (see factorLines),
// the two recurrences interleaved. The lines' right-hand sides are formed
// in x first: a line's solution does not depend on its own old values.
// Fixed nodes have no couplings and come out as x = b.
func (f *fineLevel) xLinePair(ja, jb int) {
	nx := f.nx
	ax, piv := f.sys.AX[:nx*f.ny], f.pivX
	f.xLineRHS(ja)
	oa := ja * nx
	xa, pa, aa := f.opX[oa:oa+nx], piv[oa:oa+nx], ax[oa:oa+nx]
	if jb < 0 {
		y := xa[0] * pa[0]
		xa[0] = y
		for i := 1; i < len(xa); i++ {
			y = (xa[i] + aa[i-1]*y) * pa[i]
			xa[i] = y
		}
		for i := len(xa) - 2; i >= 0; i-- {
			xa[i] += (aa[i] * pa[i]) * xa[i+1]
		}
		return
	}
	f.xLineRHS(jb)
	ob := jb * nx
	xb, pb, ab := f.opX[ob:ob+nx], piv[ob:ob+nx], ax[ob:ob+nx]
	pa, aa, xb, pb, ab = pa[:len(xa)], aa[:len(xa)], xb[:len(xa)], pb[:len(xa)], ab[:len(xa)]
	ya, yb := xa[0]*pa[0], xb[0]*pb[0]
	xa[0], xb[0] = ya, yb
	for i := 1; i < len(xa); i++ {
		ya = (xa[i] + aa[i-1]*ya) * pa[i]
		yb = (xb[i] + ab[i-1]*yb) * pb[i]
		xa[i], xb[i] = ya, yb
	}
	for i := len(xa) - 2; i >= 0; i-- {
		xa[i] += (aa[i] * pa[i]) * xa[i+1]
		xb[i] += (ab[i] * pb[i]) * xb[i+1]
	}
}

// xLineRHS writes into row j of x the right-hand side of its X line: b
// plus the couplings to the rows beside it.
func (f *fineLevel) xLineRHS(j int) {
	s := f.sys
	nx, ny := f.nx, f.ny
	x, b, ay := f.opX, f.opB, s.AY
	o := j * nx
	xr, br := x[o:o+nx], b[o:o+nx]
	switch {
	case j > 0 && j+1 < ny:
		xs, xn, ays, ayr := x[o-nx:o], x[o+nx:o+2*nx], ay[o-nx:o], ay[o:o+nx]
		xs, xn, ays, ayr, br = xs[:len(xr)], xn[:len(xr)], ays[:len(xr)], ayr[:len(xr)], br[:len(xr)]
		for i := range xr {
			v := br[i]
			v += ays[i] * xs[i]
			v += ayr[i] * xn[i]
			xr[i] = v
		}
	case j > 0:
		xs, ays := x[o-nx:o], ay[o-nx:o]
		for i := range xr {
			xr[i] = br[i] + ays[i]*xs[i]
		}
	case j+1 < ny:
		xn, ayr := x[o+nx:o+2*nx], ay[o:o+nx]
		for i := range xr {
			xr[i] = br[i] + ayr[i]*xn[i]
		}
	default:
		copy(xr, br)
	}
}

// xLinePair solves the X lines ja and jb (jb < 0: ja alone) of a
// nine-point level by the Thomas algorithm with the stored pivots, the
// two recurrences interleaved, after forming their right-hand sides in x.
func (l *coarseLevel) xLinePair(ja, jb int) {
	st := l.st
	l.xLineRHS(ja)
	oa := (ja+1)*st + 1
	n := l.nx
	xa, pa, wa, we := l.opX[oa:oa+n], l.pivX[oa:oa+n], l.w[oa:oa+n], l.w[oa+1:oa+1+n]
	if jb < 0 {
		y := xa[0] * pa[0]
		xa[0] = y
		for i := 1; i < len(xa); i++ {
			y = (xa[i] - wa[i]*y) * pa[i]
			xa[i] = y
		}
		for i := len(xa) - 2; i >= 0; i-- {
			xa[i] -= (we[i] * pa[i]) * xa[i+1]
		}
		return
	}
	l.xLineRHS(jb)
	ob := (jb+1)*st + 1
	xb, pb, wb, wf := l.opX[ob:ob+n], l.pivX[ob:ob+n], l.w[ob:ob+n], l.w[ob+1:ob+1+n]
	pa, wa, we = pa[:len(xa)], wa[:len(xa)], we[:len(xa)]
	xb, pb, wb, wf = xb[:len(xa)], pb[:len(xa)], wb[:len(xa)], wf[:len(xa)]
	ya, yb := xa[0]*pa[0], xb[0]*pb[0]
	xa[0], xb[0] = ya, yb
	for i := 1; i < len(xa); i++ {
		ya = (xa[i] - wa[i]*ya) * pa[i]
		yb = (xb[i] - wb[i]*yb) * pb[i]
		xa[i], xb[i] = ya, yb
	}
	for i := len(xa) - 2; i >= 0; i-- {
		xa[i] -= (we[i] * pa[i]) * xa[i+1]
		xb[i] -= (wf[i] * pb[i]) * xb[i+1]
	}
}

// xLineRHS writes into row j of x the right-hand side of its X line: b
// minus the couplings to the rows beside it.
func (l *coarseLevel) xLineRHS(j int) {
	st := l.st
	o := (j+1)*st + 1
	n := l.nx
	x, b := l.opX, l.opB
	xr, br := x[o:o+n], b[o:o+n]
	// Rows below and above, from one column left to one right.
	xs, xn := x[o-st-1:o-st+n+1], x[o+st-1:o+st+n+1]
	s, sN := l.s[o:o+n], l.s[o+st:o+st+n]
	sw, se := l.sw[o:o+n], l.se[o:o+n]
	swN, seN := l.sw[o+st+1:o+st+1+n], l.se[o+st-1:o+st-1+n]
	br, s, sN, sw, se, swN, seN = br[:len(xr)], s[:len(xr)], sN[:len(xr)], sw[:len(xr)], se[:len(xr)], swN[:len(xr)], seN[:len(xr)]
	xs, xn = xs[:len(xr)+2], xn[:len(xr)+2]
	for i := range xr {
		xr[i] = br[i] - s[i]*xs[i+1] - sN[i]*xn[i+1] -
			sw[i]*xs[i] - se[i]*xs[i+2] - swN[i]*xn[i+2] - seN[i]*xn[i]
	}
}

// factorLines computes, once at set-up, the Thomas pivots of the finest
// level's X lines when its smoother relaxes them. For a line with
// diagonal d and couplings a to the next node, pivot k is
// 1/(d_k − a_{k−1}·c_{k−1}) with c_k = a_k·pivot_k; the sweeps then carry
// no division, and form the same products as a factorisation done afresh
// would, so the results are the same bit for bit.
func (f *fineLevel) factorLines() {
	if f.smoother != LineX && f.smoother != LineXY {
		return
	}
	s := f.sys
	nx := f.nx
	ax, d := s.AX, s.Diag
	f.pivX = make([]float64, nx*f.ny)
	piv := f.pivX
	forRows(f.run, f.ny, func(j int) {
		o := j * nx
		pc := 0.0
		for i := 0; i < nx; i++ {
			n := o + i
			var sub, sup float64
			if i > 0 {
				sub = -ax[n-1]
			}
			if i+1 < nx {
				sup = -ax[n]
			}
			inv := 1 / (d[n] - sub*pc)
			pc = sup * inv
			piv[n] = inv
		}
	})
}

// factorLines computes the pivots of a nine-point level's X lines when
// its smoother relaxes them, as the finest level's factorLines does.
func (l *coarseLevel) factorLines() {
	if l.smoother != LineX && l.smoother != LineXY {
		return
	}
	st := l.st
	c, w := l.c, l.w
	l.pivX = make([]float64, len(c))
	piv := l.pivX
	forRows(l.run, l.ny, func(j int) {
		o := (j+1)*st + 1
		pc := 0.0
		for n := o; n < o+l.nx; n++ {
			inv := 1 / (c[n] - w[n]*pc)
			pc = w[n+1] * inv
			piv[n] = inv
		}
	})
}
