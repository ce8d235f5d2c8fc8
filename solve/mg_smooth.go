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
	s := f.sys
	nx, ny := f.nx, f.ny
	x, b, cp := f.opX, f.opB, f.r
	ax, ay, d := s.AX, s.AY, s.Diag
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
			o := j * nx
			for i := i0; i < i1; i += 2 {
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
		}
		for j := ny - 2; j >= 0; j-- {
			o := j * nx
			for i := i0; i < i1; i += 2 {
				n := o + i
				x[n] -= cp[n] * x[n+nx]
			}
		}
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
	x, b, cp := l.opX, l.opB, l.r
	c, w, s, sw, se := l.c, l.w, l.s, l.sw, l.se
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
			o := (j+1)*st + 1
			for i := i0; i < i1; i += 2 {
				n := o + i
				rhs := b[n] - w[n]*x[n-1] - w[n+1]*x[n+1] -
					sw[n]*x[n-st-1] - se[n]*x[n-st+1] - sw[n+st+1]*x[n+st+1] - se[n+st-1]*x[n+st-1]
				sub := s[n]
				// The halo row below holds cp = x = 0.
				inv := 1 / (c[n] - sub*cp[n-st])
				cp[n] = s[n+st] * inv
				x[n] = (rhs - sub*x[n-st]) * inv
			}
		}
		for j := ny - 2; j >= 0; j-- {
			o := (j+1)*st + 1
			for i := i0; i < i1; i += 2 {
				n := o + i
				x[n] -= cp[n] * x[n+st]
			}
		}
	}
}

// xLinePair solves the X lines ja and jb (jb < 0: ja alone) of the finest
// level by the Thomas algorithm, the two recurrences interleaved. Fixed
// nodes have no couplings and come out as x = b.
func (f *fineLevel) xLinePair(ja, jb int) {
	s := f.sys
	nx, ny := f.nx, f.ny
	x, b, cp := f.opX, f.opB, f.r
	ax, ay, d := s.AX, s.AY, s.Diag
	rhs := func(n, j int) float64 {
		v := b[n]
		if j > 0 {
			v += ay[n-nx] * x[n-nx]
		}
		if j+1 < ny {
			v += ay[n] * x[n+nx]
		}
		return v
	}
	oa := ja * nx
	if jb < 0 {
		pc, px := 0.0, 0.0
		for i := 0; i < nx; i++ {
			n := oa + i
			var sub, sup float64
			if i > 0 {
				sub = -ax[n-1]
			}
			if i+1 < nx {
				sup = -ax[n]
			}
			inv := 1 / (d[n] - sub*pc)
			pc = sup * inv
			px = (rhs(n, ja) - sub*px) * inv
			cp[n], x[n] = pc, px
		}
		for n := oa + nx - 2; n >= oa; n-- {
			x[n] -= cp[n] * x[n+1]
		}
		return
	}
	ob := jb * nx
	pa, xa, pb, xb := 0.0, 0.0, 0.0, 0.0
	for i := 0; i < nx; i++ {
		na, nb := oa+i, ob+i
		var suba, supa, subb, supb float64
		if i > 0 {
			suba, subb = -ax[na-1], -ax[nb-1]
		}
		if i+1 < nx {
			supa, supb = -ax[na], -ax[nb]
		}
		inva := 1 / (d[na] - suba*pa)
		invb := 1 / (d[nb] - subb*pb)
		pa, pb = supa*inva, supb*invb
		xa = (rhs(na, ja) - suba*xa) * inva
		xb = (rhs(nb, jb) - subb*xb) * invb
		cp[na], x[na], cp[nb], x[nb] = pa, xa, pb, xb
	}
	for i := nx - 2; i >= 0; i-- {
		na, nb := oa+i, ob+i
		x[na] -= cp[na] * x[na+1]
		x[nb] -= cp[nb] * x[nb+1]
	}
}

// xLinePair solves the X lines ja and jb (jb < 0: ja alone) of a
// nine-point level, the two recurrences interleaved.
func (l *coarseLevel) xLinePair(ja, jb int) {
	st := l.st
	x, b, cp := l.opX, l.opB, l.r
	c, w, s, sw, se := l.c, l.w, l.s, l.sw, l.se
	nx := l.nx
	rhs := func(n int) float64 {
		return b[n] - s[n]*x[n-st] - s[n+st]*x[n+st] -
			sw[n]*x[n-st-1] - se[n]*x[n-st+1] - sw[n+st+1]*x[n+st+1] - se[n+st-1]*x[n+st-1]
	}
	oa := (ja+1)*st + 1
	if jb < 0 {
		pc, px := 0.0, 0.0
		for n := oa; n < oa+nx; n++ {
			sub := w[n]
			inv := 1 / (c[n] - sub*pc)
			pc = w[n+1] * inv
			px = (rhs(n) - sub*px) * inv
			cp[n], x[n] = pc, px
		}
		for n := oa + nx - 2; n >= oa; n-- {
			x[n] -= cp[n] * x[n+1]
		}
		return
	}
	ob := (jb+1)*st + 1
	pa, xa, pb, xb := 0.0, 0.0, 0.0, 0.0
	for i := 0; i < nx; i++ {
		na, nb := oa+i, ob+i
		suba, subb := w[na], w[nb]
		inva := 1 / (c[na] - suba*pa)
		invb := 1 / (c[nb] - subb*pb)
		pa, pb = w[na+1]*inva, w[nb+1]*invb
		xa = (rhs(na) - suba*xa) * inva
		xb = (rhs(nb) - subb*xb) * invb
		cp[na], x[na], cp[nb], x[nb] = pa, xa, pb, xb
	}
	for i := nx - 2; i >= 0; i-- {
		na, nb := oa+i, ob+i
		x[na] -= cp[na] * x[na+1]
		x[nb] -= cp[nb] * x[nb+1]
	}
}
