package solve

// Whole-vector chores of the multigrid cycles, spread over the worker pool
// by row blocks like every other kernel, so that no single goroutine walks
// a fine-grid vector inside a solve.

// clearRows sets x to zero on the level's rows (and halo columns).
func (l *coarseLevel) clearRows(x []float64) {
	l.opX = x
	l.run(l.blocks, l.clearFn)
}

func (l *coarseLevel) clearBlocks(lo, hi int) {
	for blk := lo; blk < hi; blk++ {
		j0, j1 := l.rows(blk)
		clear(l.opX[(j0+1)*l.st : (j1+1)*l.st])
	}
}

// Modes of startFrom.
const (
	startCheck = iota // report whether x is zero on every free node
	startZero         // x = 0
	startFixed        // x = b/D on the fixed nodes, others kept
)

// startFrom prepares or inspects x on the finest level following mode;
// for startCheck it returns whether x is zero on every free node.
func (f *fineLevel) startFrom(x, b []float64, mode int) bool {
	f.opX, f.opB, f.mode = x, b, mode
	f.run(f.k.blocks, f.startFn)
	for _, nz := range f.nonzero[:f.k.blocks] {
		if nz {
			return false
		}
	}
	return true
}

func (f *fineLevel) startBlocks(lo, hi int) {
	s := f.sys
	x, b, nx := f.opX, f.opB, f.nx
	for blk := lo; blk < hi; blk++ {
		j0, j1 := f.k.rows(blk)
		i0, i1 := j0*nx, j1*nx
		fixed, xr := s.Fixed[i0:i1], x[i0:i1]
		f.nonzero[blk] = false
		switch f.mode {
		case startCheck:
			for i, fx := range fixed {
				if !fx && xr[i] != 0 {
					f.nonzero[blk] = true
					break
				}
			}
		case startZero:
			clear(xr)
		case startFixed:
			br, d := b[i0:i1], s.Diag[i0:i1]
			for i, fx := range fixed {
				if fx {
					xr[i] = br[i] / d[i]
				}
			}
		}
	}
}

// forRows calls fn for every row J in [0, n), the rows split into up to 64
// blocks on run. It is for set-up: the closure allocates.
func forRows(run func(n int, fn func(lo, hi int)), n int, fn func(J int)) {
	blocks := min(64, n)
	run(blocks, func(lo, hi int) {
		for b := lo; b < hi; b++ {
			for J := b * n / blocks; J < (b+1)*n/blocks; J++ {
				fn(J)
			}
		}
	})
}

// forRowsByParity calls fn for every coarse row J in [0, n), first the
// even rows, then the odd ones, each parity in row blocks on run. Rows of
// one parity are two fine rows apart, so work that also writes the coarse
// row above its own (as a Galerkin product does) never touches a row that
// another block of the same pass writes.
func forRowsByParity(run func(n int, fn func(lo, hi int)), n int, fn func(J int)) {
	for parity := 0; parity < 2; parity++ {
		rows := (n - parity + 1) / 2
		blocks := min(64, rows)
		if blocks <= 0 {
			continue
		}
		run(blocks, func(lo, hi int) {
			for b := lo; b < hi; b++ {
				for r := b * rows / blocks; r < (b+1)*rows/blocks; r++ {
					fn(2*r + parity)
				}
			}
		})
	}
}
