package solve

// galerkin fills the operator of c with the Galerkin product Pᵀ·A·P of
// the finer level f, P being f's interpolation. It is the reference for
// any level, built from its rows and interpolation weights through the
// mgLevel interface; the fast products galerkinFine and galerkinCoarse are
// tested against it, and it against a dense Pᵀ·A·P.
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
