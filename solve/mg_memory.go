package solve

// EstimateMemory returns the number of bytes a solver of method m
// allocates when it is set up for an nx×ny System (NewSolver), its peak
// during set-up included; solving allocates only a Result. The System
// itself and the caller's right-hand side and solution vectors are not
// included: the System takes about 41 bytes per node plus its
// right-hand-side parts, each vector 8.
//
// The figure is computed from the same sizes the set-up allocates, so it
// can be checked before committing memory to a large grid. Where NewSolver
// works on the box around the free nodes, it allocates the figure for the
// box plus about 41 bytes per box node: at most about the figure for the
// whole grid, as the box then holds at most three quarters of it. For multigrid
// it assumes point relaxation; where the operator is strongly
// anisotropic, line relaxation adds 8 bytes per node of the finest level
// (its residual), 8 more where it relaxes X lines (their pivots), and 8
// per node of each coarser level that relaxes X lines: at most about
// 19 bytes per node of the finest level in all.
func EstimateMemory(nx, ny int, m Method) int64 {
	if nx < 1 || ny < 1 {
		return 0
	}
	n := int64(nx) * int64(ny)
	const f = 8 // bytes per float64
	kern := n*f + 2*int64(min(64, ny))*f + 1024
	switch m {
	case SOR:
		// The solver's kernels and residual, and during set-up the
		// relaxation-factor estimate's own kernels and six vectors.
		return 2*kern + 7*n*f
	case CG:
		return kern + 4*n*f
	}
	return kern + 4*n*f + multigridBytes(nx, ny)
}

// multigridBytes returns what newMultigrid allocates: the finest level's
// edge diagonals and per-block row buffers; per coarse level eight padded
// vectors and the fixed marks; the interpolation weights of every level
// that has a coarser one below it; and the band factor of the coarsest.
func multigridBytes(nx, ny int) int64 {
	const f = 8
	b := int64(4096)
	if min(nx, ny) > 3 {
		ncx, ncy := int64((nx+1)/2), int64((ny+1)/2)
		blocks := int64(min(64, int(ncy)))
		b += 2*ncx*ncy*f + 4*ncx*blocks*f + 9*int64(nx/2+1)*blocks*f
	}
	for min(nx, ny) > 3 {
		ncx, ncy := (nx+1)/2, (ny+1)/2
		padded := int64(ncx+2) * int64(ncy+2)
		b += 8*padded*f + padded + 1024
		if min(ncx, ncy) > 3 {
			b += pLen * int64((ncx+1)/2) * int64((ncy+1)/2) * f
		}
		nx, ny = ncx, ncy
	}
	nl := int64(nx) * int64(ny)
	return b + nl*int64(min(nx, ny)+2)*f + nl*f
}

// prefault writes a zero into every memory page of the vectors, spread
// over the workers. Fresh memory is mapped by the operating system on the
// first write to each page; doing that for the large vectors of a set-up
// in parallel, once, keeps the page faults off the single-threaded paths
// and off the first iterations.
func prefault(run func(n int, fn func(lo, hi int)), vs ...[]float64) {
	const step = 512 // float64 values per 4 KiB page
	for _, v := range vs {
		if len(v) < 4*step {
			continue
		}
		blocks := min(64, len(v)/step)
		run(blocks, func(lo, hi int) {
			for b := lo; b < hi; b++ {
				i0, i1 := b*len(v)/blocks, (b+1)*len(v)/blocks
				for i := i0; i < i1; i += step {
					v[i] = 0
				}
			}
		})
	}
}
