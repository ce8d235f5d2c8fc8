package solve

// restrictZero is the finest level's relaxation from zero and the
// restriction of the residual it leaves, in one pass over memory, for
// red-black relaxation: the same as smooth(x, b, zero, forward) followed
// by restrictRed, up to round-off.
//
// From zero, red-black relaxation sets the red nodes to D⁻¹b and the black
// ones to D⁻¹(b + couplings·red). The black values matter only through the
// residual at the red nodes that the restriction needs: the backward
// relaxation after the coarse correction overwrites them without reading
// them. So they are computed into row buffers and never stored; the red
// values are stored for the rows of the block's own coarse rows, and
// recomputed from b where a block needs its neighbours' rows.
func (f *fineLevel) restrictZero(dst, x, b []float64) {
	f.cb, f.opX, f.opB = dst, x, b
	f.run(min(64, f.ncy), f.zeroFn)
}

// blackRow writes into out[I] the black value of row j that red-black
// relaxation from zero produces: node (p + 2I, j) with p = (j+1) mod 2.
// Rows outside the grid give zeros.
func (f *fineLevel) blackRow(j int, out []float64) {
	nx, ny := f.nx, f.ny
	if j < 0 || j >= ny {
		clear(out)
		return
	}
	s := f.sys
	b, inv, ax, ay := f.opB, f.k.invDiag, s.AX, s.AY
	o := j * nx
	p := (j + 1) & 1
	if j == 0 || j == ny-1 || nx < 4 {
		I := 0
		for i := p; i < nx; i, I = i+2, I+1 {
			n := o + i
			v := b[n]
			if i > 0 {
				v += ax[n-1] * (b[n-1] * inv[n-1])
			}
			if i+1 < nx {
				v += ax[n] * (b[n+1] * inv[n+1])
			}
			if j > 0 {
				v += ay[n-nx] * (b[n-nx] * inv[n-nx])
			}
			if j+1 < ny {
				v += ay[n] * (b[n+nx] * inv[n+nx])
			}
			out[I] = v * inv[n]
		}
		return
	}
	br, ir, axr := b[o:o+nx], inv[o:o+nx], ax[o:o+nx]
	bs, is, ays := b[o-nx:o], inv[o-nx:o], ay[o-nx:o]
	bn, in, ayr := b[o+nx:o+2*nx], inv[o+nx:o+2*nx], ay[o:o+nx]
	i, I := p, 0
	if i == 0 {
		out[0] = (br[0] + axr[0]*(br[1]*ir[1]) + ays[0]*(bs[0]*is[0]) + ayr[0]*(bn[0]*in[0])) * ir[0]
		i, I = 2, 1
	}
	// One length for every row slice and node i = k+1 reached through
	// unsigned k with k+2 < nx let the compiler drop the bounds checks.
	m := len(br)
	ir, axr, bs, is, ays, bn, in, ayr = ir[:m], axr[:m], bs[:m], is[:m], ays[:m], bn[:m], in[:m], ayr[:m]
	k := uint(i - 1)
	for ; k+2 < uint(m); k, I = k+2, I+1 {
		out[I] = ((br[k+1] + axr[k]*(br[k]*ir[k]) + axr[k+1]*(br[k+2]*ir[k+2])) +
			(ays[k+1]*(bs[k+1]*is[k+1]) + ayr[k+1]*(bn[k+1]*in[k+1]))) * ir[k+1]
	}
	i = int(k) + 1
	if i == nx-1 {
		out[I] = (br[i] + axr[i-1]*(br[i-1]*ir[i-1]) + ays[i]*(bs[i]*is[i]) + ayr[i]*(bn[i]*in[i])) * ir[i]
	}
}

// redResidual0 writes into out[I] the residual at the red nodes
// (i0 + 2I, j), i0 = j mod 2, after relaxation from zero; xs, xr and xn
// are the black values of rows j−1, j and j+1 as blackRow leaves them.
func (f *fineLevel) redResidual0(j int, xs, xr, xn, out []float64) {
	s := f.sys
	nx, ny := f.nx, f.ny
	b, inv, d, ax, ay := f.opB, f.k.invDiag, s.Diag, s.AX, s.AY
	o := j * nx
	p := j & 1
	// The black neighbours (i±1, j) are entries (i−1−(1−p))/2 and
	// (i+1−(1−p))/2 of xr; (i, j±1) are entry (i−(1−p'))/2 of their rows,
	// p' = (j±1) mod 2 = 1−p, so entry (i−p)/2.
	if j == 0 || j == ny-1 || nx < 4 {
		I := 0
		for i := p; i < nx; i, I = i+2, I+1 {
			n := o + i
			v := b[n] - d[n]*(b[n]*inv[n])
			if i > 0 {
				v += ax[n-1] * xr[(i-1-(1-p))>>1]
			}
			if i+1 < nx {
				v += ax[n] * xr[(i+1-(1-p))>>1]
			}
			if j > 0 {
				v += ay[n-nx] * xs[(i-p)>>1]
			}
			if j+1 < ny {
				v += ay[n] * xn[(i-p)>>1]
			}
			out[I] = v
		}
		return
	}
	br, ir, dr, axr, ays, ayr := b[o:o+nx], inv[o:o+nx], d[o:o+nx], ax[o:o+nx], ay[o-nx:o], ay[o:o+nx]
	// For red node i = p + 2I: its west black neighbour is entry I−1+p of
	// xr, the east one entry I+p, the south and north ones entry I.
	i, I := p, 0
	if i == 0 {
		out[0] = br[0] - dr[0]*(br[0]*ir[0]) + axr[0]*xr[0] + ays[0]*xs[0] + ayr[0]*xn[0]
		i, I = 2, 1
	}
	m := len(br)
	ir, dr, axr, ays, ayr = ir[:m], dr[:m], axr[:m], ays[:m], ayr[:m]
	k := uint(i - 1)
	for ; k+2 < uint(m); k, I = k+2, I+1 {
		out[I] = (br[k+1] - dr[k+1]*(br[k+1]*ir[k+1]) + axr[k]*xr[I-1+p]) + (axr[k+1]*xr[I+p] + ays[k+1]*xs[I] + ayr[k+1]*xn[I])
	}
	i = int(k) + 1
	if i == nx-1 {
		out[I] = br[i] - dr[i]*(br[i]*ir[i]) + axr[i-1]*xr[I-1+p] + ays[i]*xs[I] + ayr[i]*xn[I]
	}
}

func (f *fineLevel) zeroBlocks(lo, hi int) {
	s := f.sys
	nx, ny := f.nx, f.ny
	inv := f.k.invDiag
	ax, ay, iy := s.AX, s.AY, f.iy
	x, b := f.opX, f.opB
	ncx, cst := f.ncx, f.ncx+2
	blocks := min(64, f.ncy)
	w := nx/2 + 1
	for blk := lo; blk < hi; blk++ {
		buf := f.zeroBuf[blk*9*w : (blk+1)*9*w]
		// Black rows 2J−2 … 2J+2, centre residual rows 2J∓1, the coarse
		// row's residuals and the carried y-edge contributions.
		rows := [5][]float64{buf[:w], buf[w : 2*w], buf[2*w : 3*w], buf[3*w : 4*w], buf[4*w : 5*w]}
		prev, next, rc, carry := buf[5*w:6*w], buf[6*w:7*w], buf[7*w:8*w], buf[8*w:9*w]
		J0, J1 := blk*f.ncy/blocks, (blk+1)*f.ncy/blocks
		for J := J0; J < J1; J++ {
			j := 2 * J
			hasN := j+1 < ny
			if J == J0 {
				for q := range rows {
					f.blackRow(j-2+q, rows[q])
				}
				if J > 0 {
					f.redResidual0(j-1, rows[0], rows[1], rows[2], prev)
				}
			} else {
				rows[0], rows[1], rows[2], rows[3], rows[4] = rows[2], rows[3], rows[4], rows[0], rows[1]
				f.blackRow(j+1, rows[3])
				f.blackRow(j+2, rows[4])
			}
			// The red values of this coarse row's two fine rows.
			for jj := j; jj < min(j+2, ny); jj++ {
				o := jj * nx
				xr, br, ir := x[o:o+nx], b[o:o+nx], inv[o:o+nx]
				br, ir = br[:len(xr)], ir[:len(xr)]
				for i := uint(jj & 1); i < uint(len(xr)); i += 2 {
					xr[i] = br[i] * ir[i]
				}
			}
			if hasN {
				f.redResidual0(j+1, rows[2], rows[3], rows[4], next)
			}
			f.redResidual0(j, rows[1], rows[2], rows[3], rc)
			d := f.cb[(J+1)*cst+1 : (J+1)*cst+1+ncx]
			copy(d, rc[:ncx])
			q0, k0 := j*nx, ncx*J
			ayR, iyR := ay[q0:q0+nx], iy[k0:k0+ncx]
			if J > 0 {
				if J == J0 {
					qs := q0 - nx
					axS, ayS, invS, iyS := ax[qs:qs+nx], ay[qs:qs+nx], inv[qs:qs+nx], iy[k0-ncx:k0]
					for I := range carry[:ncx] {
						carry[I] = ayS[2*I] * iyS[I] * yEdgeT(axS, invS, prev, 2*I, nx, I)
					}
				}
				for I, v := range carry[:ncx] {
					d[I] += v
				}
			}
			// x-edges of this row, to both coarse neighbours.
			f.addXEdges(J, prev, next, d)
			if hasN {
				qn := q0 + nx
				axN, ayN, invN := ax[qn:qn+nx], ay[qn:qn+nx], inv[qn:qn+nx]
				for I := range carry[:ncx] {
					t := yEdgeT(axN, invN, next, 2*I, nx, I)
					d[I] += ayR[2*I] * iyR[I] * t
					carry[I] = ayN[2*I] * iyR[I] * t
				}
			}
			prev, next = next, prev
		}
	}
}
