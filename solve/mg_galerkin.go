package solve

// mgLevel is what the hierarchy needs of a level: its operator row by row
// and the interpolation weights from the next coarser level (for setup),
// and the kernels of a V-cycle.
type mgLevel interface {
	dims() (nx, ny int)
	index(i, j int) int
	isFixed(i, j int) bool
	row(i, j int, a *[9]float64)
	interp(I, J int, w *[pLen]float64)
	smooth(x, b []float64, zero, post bool)
	residual(r, x, b []float64)
	restrict(dst, r []float64)
	prolong(x, xc []float64)
}

func (l *coarseLevel) index(i, j int) int { return l.idx(i, j) }

// galerkin fills the operator of c with the Galerkin product Pᵀ·A·P of
// the finer level f, P being f's interpolation.
//
// The product is assembled from the bilinear form of A written over its
// links, uᵀAv = Σ_links −a_ij (u_i − u_j)(v_i − v_j) + Σ_i s_i u_i v_i with s_i
// the row sums, so that every fine link contributes a small outer product
// to the coarse points whose basis functions it sees: links along coarse
// grid lines to the two end points, links inside a coarse cell to its four
// corners. Coarse rows are written by the cell rows next to them; cell
// rows of one parity never share a coarse row, so each parity runs in
// parallel and every entry is summed in a fixed order.
func galerkin(f mgLevel, c *coarseLevel, run func(n int, fn func(lo, hi int))) {
	nx, ny := f.dims()
	ncx, ncy := c.nx, c.ny
	for parity := 0; parity < 2; parity++ {
		rowsP := (ncy - parity + 1) / 2
		blocks := min(64, rowsP)
		if blocks <= 0 {
			continue
		}
		run(blocks, func(lo, hi int) {
			var wI, wE, wN [pLen]float64
			var a, am, a1, a7 [9]float64
			for blk := lo; blk < hi; blk++ {
				r0, r1 := blk*rowsP/blocks, (blk+1)*rowsP/blocks
				for r := r0; r < r1; r++ {
					J := 2*r + parity
					j := 2 * J
					for I := 0; I < ncx; I++ {
						i := 2 * I
						n := c.idx(I, J)
						f.interp(I, J, &wI)
						hasE, hasN := i+1 < nx, j+1 < ny
						hasCE, hasCN := i+2 < nx, j+2 < ny
						// The coarse point's own row sum.
						f.row(i, j, &a)
						c.c[n] += rowSum(&a)
						// The x-edge to the east coarse point.
						if hasE {
							f.row(i+1, j, &a)
							w0, w1 := wI[pXW], wI[pXE]
							a0, a1e, se := -a[sW], -a[sE], rowSum(&a)
							d0, d1 := 1-w0, -w1 // φ(i) − φ(e)
							e0, e1 := w0, w1-1  // φ(e) − φ(i+2)
							c.c[n] += a0*d0*d0 + a1e*e0*e0 + se*w0*w0
							if hasCE {
								c.c[n+1] += a0*d1*d1 + a1e*e1*e1 + se*w1*w1
								c.w[n+1] += a0*d0*d1 + a1e*e0*e1 + se*w0*w1
							}
						}
						if !hasN {
							continue
						}
						// The y-edge to the north coarse point.
						f.row(i, j+1, &a)
						{
							w0, w1 := wI[pYS], wI[pYN]
							a0, a1n, se := -a[sS], -a[sN], rowSum(&a)
							d0, d1 := 1-w0, -w1
							e0, e1 := w0, w1-1
							c.c[n] += a0*d0*d0 + a1n*e0*e0 + se*w0*w0
							if hasCN {
								st := c.st
								c.c[n+st] += a0*d1*d1 + a1n*e1*e1 + se*w1*w1
								c.s[n+st] += a0*d0*d1 + a1n*e0*e1 + se*w0*w1
							}
						}
						if !hasE {
							continue
						}
						// The cell whose south-west corner is (I, J).
						wE, wN = [pLen]float64{}, [pLen]float64{}
						if hasCE {
							f.interp(I+1, J, &wE)
						}
						if hasCN {
							f.interp(I, J+1, &wN)
						}
						f.row(i+1, j+1, &am)
						f.row(i+1, j, &a1)
						if hasCN {
							f.row(i+1, j+2, &a7)
						} else {
							a7 = [9]float64{}
						}
						// Basis values over the corners SW, SE, NW, NE of the
						// nine cell nodes, numbered di + 3·dj.
						var phi [9][4]float64
						phi[0][0] = 1
						phi[2][1] = 1
						phi[6][2] = 1
						phi[8][3] = 1
						phi[1] = [4]float64{wI[pXW], wI[pXE], 0, 0}
						phi[3] = [4]float64{wI[pYS], 0, wI[pYN], 0}
						phi[5] = [4]float64{0, wE[pYS], 0, wE[pYN]}
						phi[7] = [4]float64{0, 0, wN[pXW], wN[pXE]}
						phi[4] = [4]float64{wI[pSW], wI[pSE], wI[pNW], wI[pNE]}
						var m [4][4]float64
						link := func(p, q int, g float64) {
							if g == 0 {
								return
							}
							var d [4]float64
							for k := range d {
								d[k] = phi[p][k] - phi[q][k]
							}
							for k := 0; k < 4; k++ {
								gk := g * d[k]
								for l := k; l < 4; l++ {
									m[k][l] += gk * d[l]
								}
							}
						}
						link(4, 1, -am[sS])
						link(4, 3, -am[sW])
						link(4, 5, -am[sE])
						link(4, 7, -am[sN])
						link(4, 0, -am[sSW])
						link(4, 2, -am[sSE])
						link(4, 6, -am[sNW])
						link(4, 8, -am[sNE])
						link(1, 3, -a1[sNW])
						link(1, 5, -a1[sNE])
						link(7, 3, -a7[sSW])
						link(7, 5, -a7[sSE])
						if sm := rowSum(&am); sm != 0 {
							p := &phi[4]
							for k := 0; k < 4; k++ {
								for l := k; l < 4; l++ {
									m[k][l] += sm * p[k] * p[l]
								}
							}
						}
						st := c.st
						c.c[n] += m[0][0]
						if hasCE {
							c.c[n+1] += m[1][1]
							c.w[n+1] += m[0][1]
						}
						if hasCN {
							c.c[n+st] += m[2][2]
							c.s[n+st] += m[0][2]
							if hasCE {
								c.c[n+st+1] += m[3][3]
								c.w[n+st+1] += m[2][3]
								c.s[n+st+1] += m[1][3]
								c.sw[n+st+1] += m[0][3]
								c.se[n+st] += m[1][2]
							}
						}
					}
				}
			}
		})
	}
	for J := 0; J < ncy; J++ {
		for I := 0; I < ncx; I++ {
			c.fixed[c.idx(I, J)] = f.isFixed(2*I, 2*J)
		}
	}
	c.pinFixed()
}

func rowSum(a *[9]float64) float64 {
	var s float64
	for _, v := range a {
		s += v
	}
	return s
}

// galerkinFine is galerkin for the five-point finest level, reading the
// System's arrays directly: of the cell's links only the four from the
// centre to the edge points exist, and no diagonal ones.
func galerkinFine(f *fineLevel, c *coarseLevel, run func(n int, fn func(lo, hi int))) {
	s := f.sys
	nx, ny := f.nx, f.ny
	ncx, ncy := c.nx, c.ny
	d, ax, ay, ix, iy, inv := s.Diag, s.AX, s.AY, f.ix, f.iy, f.k.invDiag
	st := c.st
	for parity := 0; parity < 2; parity++ {
		rowsP := (ncy - parity + 1) / 2
		blocks := min(64, rowsP)
		if blocks <= 0 {
			continue
		}
		run(blocks, func(lo, hi int) {
			for blk := lo; blk < hi; blk++ {
				r0, r1 := blk*rowsP/blocks, (blk+1)*rowsP/blocks
				for r := r0; r < r1; r++ {
					J := 2*r + parity
					j := 2 * J
					hasN, hasCN := j+1 < ny, j+2 < ny
					for I := 0; I < ncx; I++ {
						i := 2 * I
						q := j*nx + i
						k := I + ncx*J
						n := c.idx(I, J)
						hasE, hasCE := i+1 < nx, i+2 < nx
						// Row sum of the coarse point.
						sq := d[q] - ax[q]
						if i > 0 {
							sq -= ax[q-1]
						}
						if j > 0 {
							sq -= ay[q-nx]
						}
						if hasN {
							sq -= ay[q]
						}
						c.c[n] += sq
						var xw, xe, ys, yn float64
						if hasE {
							e := q + 1
							xw, xe = ax[q]*ix[k], ax[e]*ix[k]
							a0, a1 := ax[q], ax[e]
							se := d[e] - a0 - a1
							if j > 0 {
								se -= ay[e-nx]
							}
							if hasN {
								se -= ay[e]
							}
							d0, d1 := 1-xw, -xe
							e0, e1 := xw, xe-1
							c.c[n] += a0*d0*d0 + a1*e0*e0 + se*xw*xw
							if hasCE {
								c.c[n+1] += a0*d1*d1 + a1*e1*e1 + se*xe*xe
								c.w[n+1] += a0*d0*d1 + a1*e0*e1 + se*xw*xe
							}
						}
						if !hasN {
							continue
						}
						g := q + nx
						ys, yn = ay[q]*iy[k], ay[g]*iy[k]
						{
							a0, a1 := ay[q], ay[g]
							sg := d[g] - a0 - a1 - ax[g]
							if i > 0 {
								sg -= ax[g-1]
							}
							d0, d1 := 1-ys, -yn
							e0, e1 := ys, yn-1
							c.c[n] += a0*d0*d0 + a1*e0*e0 + sg*ys*ys
							if hasCN {
								c.c[n+st] += a0*d1*d1 + a1*e1*e1 + sg*yn*yn
								c.s[n+st] += a0*d0*d1 + a1*e0*e1 + sg*ys*yn
							}
						}
						if !hasE {
							continue
						}
						m := g + 1
						var ysE, ynE, xwN, xeN float64
						if hasCE {
							ysE, ynE = ay[q+2]*iy[k+1], ay[g+2]*iy[k+1]
						}
						if hasCN {
							qn := q + 2*nx
							xwN, xeN = ax[qn]*ix[k+ncx], ax[qn+1]*ix[k+ncx]
						}
						gS, gW, gE, gN := ay[q+1], ax[g], ax[m], ay[m]
						vw, ve, vs, vn := gW*inv[m], gE*inv[m], gS*inv[m], gN*inv[m]
						p := [4]float64{vw*ys + vs*xw, ve*ysE + vs*xe, vw*yn + vn*xwN, ve*ynE + vn*xeN}
						var mm [10]float64
						add := func(g float64, d0, d1, d2, d3 float64) {
							mm[0] += g * d0 * d0
							mm[1] += g * d0 * d1
							mm[2] += g * d0 * d2
							mm[3] += g * d0 * d3
							mm[4] += g * d1 * d1
							mm[5] += g * d1 * d2
							mm[6] += g * d1 * d3
							mm[7] += g * d2 * d2
							mm[8] += g * d2 * d3
							mm[9] += g * d3 * d3
						}
						add(gS, p[0]-xw, p[1]-xe, p[2], p[3])
						add(gW, p[0]-ys, p[1], p[2]-yn, p[3])
						add(gE, p[0], p[1]-ysE, p[2], p[3]-ynE)
						add(gN, p[0], p[1], p[2]-xwN, p[3]-xeN)
						add(d[m]-gS-gW-gE-gN, p[0], p[1], p[2], p[3])
						c.c[n] += mm[0]
						if hasCE {
							c.c[n+1] += mm[4]
							c.w[n+1] += mm[1]
						}
						if hasCN {
							c.c[n+st] += mm[7]
							c.s[n+st] += mm[2]
							if hasCE {
								c.c[n+st+1] += mm[9]
								c.w[n+st+1] += mm[8]
								c.s[n+st+1] += mm[6]
								c.sw[n+st+1] += mm[3]
								c.se[n+st] += mm[5]
							}
						}
					}
				}
			}
		})
	}
	for J := 0; J < ncy; J++ {
		for I := 0; I < ncx; I++ {
			c.fixed[c.idx(I, J)] = f.isFixed(2*I, 2*J)
		}
	}
	c.pinFixed()
}

// galerkinCoarse is galerkin for a nine-point level, reading its padded
// arrays directly; the halo supplies the zeros beyond the grid.
func galerkinCoarse(f *coarseLevel, c *coarseLevel, run func(n int, fn func(lo, hi int))) {
	nx, ny := f.nx, f.ny
	ncx, ncy := c.nx, c.ny
	fc, fw, fs, fsw, fse, pw := f.c, f.w, f.s, f.sw, f.se, f.p
	fst, st := f.st, c.st
	// full returns the row sum and the diagonal of node n.
	sum := func(n int) float64 {
		return fc[n] + fw[n] + fw[n+1] + fs[n] + fs[n+fst] + fsw[n] + fse[n] + fsw[n+fst+1] + fse[n+fst-1]
	}
	for parity := 0; parity < 2; parity++ {
		rowsP := (ncy - parity + 1) / 2
		blocks := min(64, rowsP)
		if blocks <= 0 {
			continue
		}
		run(blocks, func(lo, hi int) {
			for blk := lo; blk < hi; blk++ {
				r0, r1 := blk*rowsP/blocks, (blk+1)*rowsP/blocks
				for r := r0; r < r1; r++ {
					J := 2*r + parity
					j := 2 * J
					hasN, hasCN := j+1 < ny, j+2 < ny
					for I := 0; I < ncx; I++ {
						i := 2 * I
						q := f.idx(i, j)
						k := (I + ncx*J) * pLen
						n := c.idx(I, J)
						hasE, hasCE := i+1 < nx, i+2 < nx
						w := pw[k : k+pLen]
						c.c[n] += sum(q)
						if hasE {
							e := q + 1
							xw, xe := w[pXW], w[pXE]
							a0, a1, se := -fw[e], -fw[e+1], sum(e)
							d0, d1 := 1-xw, -xe
							e0, e1 := xw, xe-1
							c.c[n] += a0*d0*d0 + a1*e0*e0 + se*xw*xw
							if hasCE {
								c.c[n+1] += a0*d1*d1 + a1*e1*e1 + se*xe*xe
								c.w[n+1] += a0*d0*d1 + a1*e0*e1 + se*xw*xe
							}
						}
						if !hasN {
							continue
						}
						g := q + fst
						ys, yn := w[pYS], w[pYN]
						{
							a0, a1, sg := -fs[g], -fs[g+fst], sum(g)
							d0, d1 := 1-ys, -yn
							e0, e1 := ys, yn-1
							c.c[n] += a0*d0*d0 + a1*e0*e0 + sg*ys*ys
							if hasCN {
								c.c[n+st] += a0*d1*d1 + a1*e1*e1 + sg*yn*yn
								c.s[n+st] += a0*d0*d1 + a1*e0*e1 + sg*ys*yn
							}
						}
						if !hasE {
							continue
						}
						m := g + 1
						var ysE, ynE, xwN, xeN float64
						if hasCE {
							ysE, ynE = pw[k+pLen+pYS], pw[k+pLen+pYN]
						}
						if hasCN {
							kn := k + ncx*pLen
							xwN, xeN = pw[kn+pXW], pw[kn+pXE]
						}
						xw, xe := w[pXW], w[pXE]
						p := [4]float64{w[pSW], w[pSE], w[pNW], w[pNE]}
						var mm [10]float64
						add := func(g float64, d0, d1, d2, d3 float64) {
							if g == 0 {
								return
							}
							mm[0] += g * d0 * d0
							mm[1] += g * d0 * d1
							mm[2] += g * d0 * d2
							mm[3] += g * d0 * d3
							mm[4] += g * d1 * d1
							mm[5] += g * d1 * d2
							mm[6] += g * d1 * d3
							mm[7] += g * d2 * d2
							mm[8] += g * d2 * d3
							mm[9] += g * d3 * d3
						}
						// Centre to the four edge points and the four corners.
						add(-fs[m], p[0]-xw, p[1]-xe, p[2], p[3])
						add(-fw[m], p[0]-ys, p[1], p[2]-yn, p[3])
						add(-fw[m+1], p[0], p[1]-ysE, p[2], p[3]-ynE)
						add(-fs[m+fst], p[0], p[1], p[2]-xwN, p[3]-xeN)
						add(-fsw[m], p[0]-1, p[1], p[2], p[3])
						add(-fse[m], p[0], p[1]-1, p[2], p[3])
						add(-fse[m+fst-1], p[0], p[1], p[2]-1, p[3])
						add(-fsw[m+fst+1], p[0], p[1], p[2], p[3]-1)
						// Edge to edge: S–W, S–E, N–W, N–E.
						add(-fse[q+fst], xw-ys, xe, -yn, 0)
						add(-fsw[q+fst+2], xw, xe-ysE, 0, -ynE)
						add(-fsw[q+2*fst+1], -ys, 0, xwN-yn, xeN)
						add(-fse[q+2*fst+1], 0, -ysE, xwN, xeN-ynE)
						add(sum(m), p[0], p[1], p[2], p[3])
						c.c[n] += mm[0]
						if hasCE {
							c.c[n+1] += mm[4]
							c.w[n+1] += mm[1]
						}
						if hasCN {
							c.c[n+st] += mm[7]
							c.s[n+st] += mm[2]
							if hasCE {
								c.c[n+st+1] += mm[9]
								c.w[n+st+1] += mm[8]
								c.s[n+st+1] += mm[6]
								c.sw[n+st+1] += mm[3]
								c.se[n+st] += mm[5]
							}
						}
					}
				}
			}
		})
	}
	for J := 0; J < ncy; J++ {
		for I := 0; I < ncx; I++ {
			c.fixed[c.idx(I, J)] = f.fixed[f.idx(2*I, 2*J)]
		}
	}
	c.pinFixed()
}
