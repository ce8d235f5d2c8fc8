package solve

// restrictRed computes the residual b − A·x and restricts it in one pass
// for the case that the residual vanishes at every black node (i+j odd),
// as it does right after a red-black relaxation that ended black. Only the
// coarse points and cell centres (the red nodes) carry a residual then,
// and the edge points pass on only what their centre neighbours give
// them. Centre residuals of the rows below and above a coarse row are kept
// in per-block buffers, and the y-edge contributions to the next coarse
// row are carried over, so every residual is evaluated once.
func (f *fineLevel) restrictRed(dst, x, b []float64) {
	f.cb, f.opX, f.opB = dst, x, b
	f.run(min(64, f.ncy), f.redFn)
}

// redResidual returns the residual at node (i, j).
func (f *fineLevel) redResidual(i, j int) float64 {
	s := f.sys
	nx, ny := f.nx, f.ny
	x := f.opX
	n := j*nx + i
	v := f.opB[n] - s.Diag[n]*x[n]
	if i > 0 {
		v += s.AX[n-1] * x[n-1]
	}
	if i+1 < nx {
		v += s.AX[n] * x[n+1]
	}
	if j > 0 {
		v += s.AY[n-nx] * x[n-nx]
	}
	if j+1 < ny {
		v += s.AY[n] * x[n+nx]
	}
	return v
}

// residualRow writes into out[I] the residual at (i0 + 2I, j) for every I
// with i0 + 2I < nx.
func (f *fineLevel) residualRow(j, i0 int, out []float64) {
	s := f.sys
	nx, ny := f.nx, f.ny
	if j == 0 || j == ny-1 || nx < 3 {
		for i, I := i0, 0; i < nx; i, I = i+2, I+1 {
			out[I] = f.redResidual(i, j)
		}
		return
	}
	o := j * nx
	x, b := f.opX, f.opB
	xr, xs, xn := x[o:o+nx], x[o-nx:o], x[o+nx:o+2*nx]
	br, dr, axr, ays, ayr := b[o:o+nx], s.Diag[o:o+nx], s.AX[o:o+nx], s.AY[o-nx:o], s.AY[o:o+nx]
	i, I := i0, 0
	if i == 0 {
		out[0] = f.redResidual(0, j)
		i, I = 2, 1
	}
	for ; i < nx-1; i, I = i+2, I+1 {
		out[I] = (br[i] - dr[i]*xr[i] + axr[i-1]*xr[i-1]) + (axr[i]*xr[i+1] + ays[i]*xs[i] + ayr[i]*xn[i])
	}
	if i == nx-1 {
		out[I] = f.redResidual(i, j)
	}
}

func (f *fineLevel) redBlocks(lo, hi int) {
	s := f.sys
	nx, ny := f.nx, f.ny
	inv := f.k.invDiag
	ax, ay, iy := s.AX, s.AY, f.iy
	ncx, cst := f.ncx, f.ncx+2
	blocks := min(64, f.ncy)
	for blk := lo; blk < hi; blk++ {
		buf := f.redBuf[blk*4*ncx : (blk+1)*4*ncx]
		prev, next, carry, rc := buf[:ncx], buf[ncx:2*ncx], buf[2*ncx:3*ncx], buf[3*ncx:]
		J0, J1 := blk*f.ncy/blocks, (blk+1)*f.ncy/blocks
		for J := J0; J < J1; J++ {
			j := 2 * J
			hasN := j+1 < ny
			if J == J0 && J > 0 {
				f.residualRow(j-1, 1, prev)
			}
			if hasN {
				f.residualRow(j+1, 1, next)
			}
			f.residualRow(j, 0, rc)
			d := f.cb[(J+1)*cst+1 : (J+1)*cst+1+ncx]
			copy(d, rc)
			q0, k0 := j*nx, ncx*J
			ayR, iyR := ay[q0:q0+nx], iy[k0:k0+ncx]
			// South y-edges: carried from the row below, or computed
			// afresh at the block's first row by the same expression.
			if J > 0 {
				if J == J0 {
					qs := q0 - nx
					axS, ayS, invS, iyS := ax[qs:qs+nx], ay[qs:qs+nx], inv[qs:qs+nx], iy[k0-ncx:k0]
					for I := range carry {
						carry[I] = ayS[2*I] * iyS[I] * yEdgeT(axS, invS, prev, 2*I, nx, I)
					}
				}
				for I, v := range carry {
					d[I] += v
				}
			}
			f.addXEdges(J, prev, next, d)
			// North y-edges, to this row and carried to the next.
			if hasN {
				qn := q0 + nx
				axN, ayN, invN := ax[qn:qn+nx], ay[qn:qn+nx], inv[qn:qn+nx]
				for I := range carry {
					t := yEdgeT(axN, invN, next, 2*I, nx, I)
					d[I] += ayR[2*I] * iyR[I] * t
					carry[I] = ayN[2*I] * iyR[I] * t
				}
			}
			prev, next = next, prev
		}
	}
}

// yEdgeT is what the centre neighbours of the y-edge point in column i
// pass on to it; ax and inv are the couplings and inverse diagonals of its
// row, cr the residuals of the row's centres.
func yEdgeT(ax, inv, cr []float64, i, nx, I int) float64 {
	var t float64
	if i > 0 {
		t = ax[i-1] * inv[i-1] * cr[I-1]
	}
	if i+1 < nx {
		t += ax[i] * inv[i+1] * cr[I]
	}
	return t
}

// prolongSmooth adds the interpolated correction xc to x and relaxes
// backward (black, then red) in one pass over memory, for red-black
// relaxation: the same result as prolong followed by smooth(post), bit for
// bit. The correction is added only at the red nodes, because the black
// half-sweep that follows overwrites the black ones without reading them.
//
// A block corrects row j, relaxes black on row j−1 and red on row j−2;
// the black rows at its edges need the neighbouring blocks' corrections
// and follow in a second pass, the red rows next to those in a third.
func (f *fineLevel) prolongSmooth(x, b, xc []float64) {
	f.opX, f.opB, f.cx = x, b, xc
	f.run(f.k.blocks, f.postFn)
	f.run(f.k.blocks, f.postEdgeFn)
	f.run(f.k.blocks, f.postRedFn)
}

func (f *fineLevel) postBlocks(lo, hi int) {
	for blk := lo; blk < hi; blk++ {
		j0, j1 := f.k.rows(blk)
		for j := j0; j < j1; j++ {
			f.prolongRedRow(j)
			if k := j - 1; k >= j0+1 {
				f.relaxRow(k, 1)
			}
			if k := j - 2; k >= j0+2 {
				f.relaxRow(k, 0)
			}
		}
	}
}

func (f *fineLevel) postEdgeBlocks(lo, hi int) {
	for blk := lo; blk < hi; blk++ {
		j0, j1 := f.k.rows(blk)
		if j1 > j0 {
			f.relaxRow(j0, 1)
		}
		if j1-1 > j0 {
			f.relaxRow(j1-1, 1)
		}
	}
}

func (f *fineLevel) postRedBlocks(lo, hi int) {
	for blk := lo; blk < hi; blk++ {
		j0, j1 := f.k.rows(blk)
		for k := j0; k < j1; k++ {
			// Rows j0+2 … j1−3 were relaxed in the first pass.
			if k < j0+2 || k > j1-3 {
				f.relaxRow(k, 0)
			}
		}
	}
}

// prolongRedRow adds the interpolated correction at the red nodes of row
// j: the coarse points of an even row, the cell centres of an odd one.
func (f *fineLevel) prolongRedRow(j int) {
	s := f.sys
	nx, ny, ncx := f.nx, f.ny, f.ncx
	x, xc, inv := f.opX, f.cx, f.k.invDiag
	ax, ay, ix, iy := s.AX, s.AY, f.ix, f.iy
	cst := ncx + 2
	if j&1 == 0 {
		J := j / 2
		c0, q0 := (J+1)*cst+1, j*nx
		for I, v := range xc[c0 : c0+ncx] {
			x[q0+2*I] += v
		}
		return
	}
	J := (j - 1) / 2
	q0, k0, c0 := (j-1)*nx, ncx*J, (J+1)*cst+1
	hasNN := j+1 < ny
	uw := (ay[q0]*xc[c0] + ay[q0+nx]*xc[c0+cst]) * iy[k0]
	// Row slices: S is fine row j−1 (a coarse row), C row j, N row j+1;
	// the coarse rows J and J+1 of xc; the weights of coarse row J (and
	// of J+1 for the x-edges above).
	axS, ayS := ax[q0:q0+nx], ay[q0:q0+nx]
	axC, ayC, invC, xC := ax[q0+nx:q0+2*nx], ay[q0+nx:q0+2*nx], inv[q0+nx:q0+2*nx], x[q0+nx:q0+2*nx]
	var axN, ixN []float64
	if hasNN {
		axN, ixN = ax[q0+2*nx:q0+3*nx], ix[k0+ncx:k0+2*ncx]
	}
	xcS, xcN := xc[c0:c0+ncx+1], xc[c0+cst:c0+cst+ncx+1]
	ixS, iyS := ix[k0:k0+ncx], iy[k0:k0+ncx]
	for I := 0; 2*I+1 < nx; I++ {
		i := 2 * I
		v, ve := xcS[I], xcS[I+1]
		us := (axS[i]*v + axS[i+1]*ve) * ixS[I]
		var ue, un float64
		if i+2 < nx {
			ue = (ayS[i+2]*ve + ayC[i+2]*xcN[I+1]) * iyS[I+1]
		}
		if hasNN {
			un = (axN[i]*xcN[I] + axN[i+1]*xcN[I+1]) * ixN[I]
		}
		xC[i+1] += (axC[i]*uw + axC[i+1]*ue + ayS[i+1]*us + ayC[i+1]*un) * invC[i+1]
		uw = ue
	}
}

// addXEdges adds to d, the restricted residuals of coarse row J, what the
// x-edge points of fine row 2J pass on to their two coarse neighbours,
// given the residuals prev and next of the cell centres in the rows below
// and above (entry I for the centre above or below x-edge I).
func (f *fineLevel) addXEdges(J int, prev, next, d []float64) {
	s := f.sys
	nx, ny, ncx := f.nx, f.ny, f.ncx
	ax, ay, inv := s.AX, s.AY, f.k.invDiag
	j := 2 * J
	hasN := j+1 < ny
	q0, k0 := j*nx, ncx*J
	axR, ayR, ixR := ax[q0:q0+nx], ay[q0:q0+nx], f.ix[k0:k0+ncx]
	// nXE is the number of x-edge points on the row; every one but, on
	// an even-width row, the last has an east coarse neighbour.
	nXE := nx / 2
	last := min(nXE, ncx-1)
	if J > 0 && hasN {
		qs := q0 - nx
		ayS, invS, invN := ay[qs:qs+nx], inv[qs:qs+nx], inv[q0+nx:q0+2*nx]
		ayS, invS, invN, axR = ayS[:len(ayR)], invS[:len(ayR)], invN[:len(ayR)], axR[:len(ayR)]
		pv, nv := prev[:nXE], next[:nXE]
		for I := range last {
			i := 2*I + 1
			t := ayS[i]*invS[i]*pv[I] + ayR[i]*invN[i]*nv[I]
			d[I] += axR[i-1] * ixR[I] * t
			d[I+1] += axR[i] * ixR[I] * t
		}
		if last < nXE {
			I := last
			i := 2*I + 1
			t := ayS[i]*invS[i]*pv[I] + ayR[i]*invN[i]*nv[I]
			d[I] += axR[i-1] * ixR[I] * t
		}
		return
	}
	for I := 0; I < nXE; I++ {
		e := q0 + 2*I + 1
		var t float64
		if J > 0 {
			t = ay[e-nx] * inv[e-nx] * prev[I]
		}
		if hasN {
			t += ay[e] * inv[e+nx] * next[I]
		}
		d[I] += ax[e-1] * ixR[I] * t
		if I < last {
			d[I+1] += ax[e] * ixR[I] * t
		}
	}
}
