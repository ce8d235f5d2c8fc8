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

// galerkinFine fills the operator of c with the Galerkin product Pᵀ·A·P
// of the five-point finest level f, P being f's interpolation.
//
// The product is assembled from the bilinear form of A written over its
// links, uᵀAv = Σ_links −a_ij (u_i − u_j)(v_i − v_j) + Σ_i s_i u_i v_i with s_i
// the row sums, so that every fine link contributes a small outer product
// to the coarse points whose basis functions it sees: links along coarse
// grid lines to the two end points, links inside a coarse cell to its four
// corners. Coarse rows are written by the cell rows next to them; cell
// rows of one parity never share a coarse row, so each parity runs in
// parallel and every entry is summed in a fixed order. On the five-point
// level only the four links from a cell's centre to its edge points lie
// inside the cell.
func galerkinFine(f *fineLevel, c *coarseLevel, run func(n int, fn func(lo, hi int))) {
	s := f.sys
	nx, ny := f.nx, f.ny
	ncx, ncy := c.nx, c.ny
	d, ax, ay, ix, iy, inv := s.Diag, s.AX, s.AY, f.ix, f.iy, f.k.invDiag
	st := c.st
	forRowsByParity(run, ncy, func(J int) {
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
			c.scatter(n, st, hasCE, hasCN, &mm)
		}
	})
	forRows(run, ncy, func(J int) {
		for I := 0; I < ncx; I++ {
			c.fixed[c.idx(I, J)] = f.isFixed(2*I, 2*J)
		}
	})
	c.pinFixed()
}

// galerkinCoarse is galerkinFine for a nine-point level, whose cells also
// hold the four diagonal links from the centre to the corners and the
// four between edge points; it reads the padded arrays directly, the halo
// supplying the zeros beyond the grid.
func galerkinCoarse(f *coarseLevel, c *coarseLevel, run func(n int, fn func(lo, hi int))) {
	nx, ny := f.nx, f.ny
	ncx, ncy := c.nx, c.ny
	fc, fw, fs, fsw, fse, pw := f.c, f.w, f.s, f.sw, f.se, f.p
	fst, st := f.st, c.st
	// full returns the row sum and the diagonal of node n.
	sum := func(n int) float64 {
		return fc[n] + fw[n] + fw[n+1] + fs[n] + fs[n+fst] + fsw[n] + fse[n] + fsw[n+fst+1] + fse[n+fst-1]
	}
	forRowsByParity(run, ncy, func(J int) {
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
			c.scatter(n, st, hasCE, hasCN, &mm)
		}
	})
	forRows(run, ncy, func(J int) {
		for I := 0; I < ncx; I++ {
			c.fixed[c.idx(I, J)] = f.fixed[f.idx(2*I, 2*J)]
		}
	})
	c.pinFixed()
}

// scatter adds the contributions mm of one fine cell to the coarse
// stencils of its corner n (row stride st) and of the corners east and
// north of it that exist (hasCE, hasCN). mm holds, in order, the centre
// of n, the west and south entries of the east and north corners, the
// south-west and south-east diagonals, the south entry of the north-east
// corner, the centres of the east and north corners, the west entry of the
// north-east corner and its centre.
func (c *coarseLevel) scatter(n, st int, hasCE, hasCN bool, mm *[10]float64) {
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
