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
		out[I] = br[i] - dr[i]*xr[i] + axr[i-1]*xr[i-1] + axr[i]*xr[i+1] + ays[i]*xs[i] + ayr[i]*xn[i]
	}
	if i == nx-1 {
		out[I] = f.redResidual(i, j)
	}
}

func (f *fineLevel) redBlocks(lo, hi int) {
	s := f.sys
	nx, ny := f.nx, f.ny
	inv := f.k.invDiag
	ax, ay, ix, iy := s.AX, s.AY, f.ix, f.iy
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
			d := dst(f.cb, (J+1)*cst+1, ncx)
			copy(d, rc)
			q0, k0 := j*nx, ncx*J
			// South y-edges: carried from the row below, or computed
			// afresh at the block's first row by the same expression.
			if J > 0 {
				if J == J0 {
					for I := 0; I < ncx; I++ {
						e := q0 + 2*I - nx
						carry[I] = ay[e] * iy[k0+I-ncx] * yEdgeT(ax, inv, prev, e, 2*I, nx, I)
					}
				}
				for I := 0; I < ncx; I++ {
					d[I] += carry[I]
				}
			}
			// x-edges of this row, to both coarse neighbours.
			for I := 0; 2*I+1 < nx; I++ {
				q := q0 + 2*I
				e := q + 1
				var t float64
				if J > 0 {
					t = ay[e-nx] * inv[e-nx] * prev[I]
				}
				if hasN {
					t += ay[e] * inv[e+nx] * next[I]
				}
				d[I] += ax[q] * ix[k0+I] * t
				if I+1 < ncx {
					d[I+1] += ax[e] * ix[k0+I] * t
				}
			}
			// North y-edges, to this row and carried to the next.
			if hasN {
				for I := 0; I < ncx; I++ {
					q := q0 + 2*I
					e := q + nx
					t := yEdgeT(ax, inv, next, e, 2*I, nx, I)
					d[I] += ay[q] * iy[k0+I] * t
					carry[I] = ay[e] * iy[k0+I] * t
				}
			}
			prev, next = next, prev
		}
	}
}

// yEdgeT is what the centre neighbours of y-edge point e = (i, ·) pass on
// to it; cr holds the residuals of the centres of its row.
func yEdgeT(ax, inv, cr []float64, e, i, nx, I int) float64 {
	var t float64
	if i > 0 {
		t = ax[e-1] * inv[e-1] * cr[I-1]
	}
	if i+1 < nx {
		t += ax[e] * inv[e+1] * cr[I]
	}
	return t
}

func dst(v []float64, o, n int) []float64 { return v[o : o+n] }
