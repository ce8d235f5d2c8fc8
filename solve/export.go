package solve

// Free-node export: the part of a System that external solvers need. The
// fixed rows are identity rows that carry the conductor and prescribed
// potentials; the couplings of free nodes to them are already in the
// right-hand side. What remains, the matrix over free nodes with free
// columns only, is symmetric positive definite, and the same system the
// solvers of this package solve.

// FreeIndex returns the compact number of every node among the free
// nodes, in node order (−1 for a fixed node), and the number of free
// nodes.
func (s *System) FreeIndex() (index []int32, n int) {
	index = make([]int32, s.Len())
	for i, f := range s.Fixed {
		if f {
			index[i] = -1
			continue
		}
		index[i] = int32(n)
		n++
	}
	return index, n
}

// FreeNonzeros returns the number of entries Entries emits.
func (s *System) FreeNonzeros() int {
	nz := 0
	for i, f := range s.Fixed {
		if f {
			continue
		}
		nz++
		if s.AX[i] != 0 {
			nz += 2
		}
		if s.AY[i] != 0 {
			nz += 2
		}
	}
	return nz
}

// Entries calls emit(i, j, v) for every nonzero entry A(i, j) = v of the
// free-node system, i and j in the compact numbering of FreeIndex, row by
// row and within a row by increasing column: both triangles and the
// diagonal, FreeNonzeros entries in all. For a symmetric storage format
// keep the entries with j ≤ i.
func (s *System) Entries(emit func(i, j int, v float64)) {
	index, _ := s.FreeIndex()
	nx := s.Nx
	for n, f := range s.Fixed {
		if f {
			continue
		}
		r := int(index[n])
		if n >= nx && s.AY[n-nx] != 0 {
			emit(r, int(index[n-nx]), -s.AY[n-nx])
		}
		if n%nx > 0 && s.AX[n-1] != 0 {
			emit(r, int(index[n-1]), -s.AX[n-1])
		}
		emit(r, r, s.Diag[n])
		if s.AX[n] != 0 {
			emit(r, int(index[n+1]), -s.AX[n])
		}
		if s.AY[n] != 0 {
			emit(r, int(index[n+nx]), -s.AY[n])
		}
	}
}

// FreeVector writes the free rows of the full-length vector v into dst in
// the compact numbering and returns dst (allocated when nil). Applied to a
// right-hand side from RHS it gives the right-hand side of the free-node
// system.
func (s *System) FreeVector(dst, v []float64) []float64 {
	if len(v) != s.Len() {
		panic("solve: FreeVector needs a full-length vector")
	}
	if dst == nil {
		_, n := s.FreeIndex()
		dst = make([]float64, n)
	}
	k := 0
	for i, f := range s.Fixed {
		if !f {
			dst[k] = v[i]
			k++
		}
	}
	if k != len(dst) {
		panic("solve: FreeVector destination has the wrong length")
	}
	return dst
}

// ExpandFree writes a solution of the free-node system (compact numbering)
// into the full-length dst, taking the fixed nodes' potentials from the
// full right-hand side b, and returns dst (allocated when nil). It is the
// inverse of FreeVector for a potential computed outside this package.
func (s *System) ExpandFree(dst, free, b []float64) []float64 {
	if len(b) != s.Len() {
		panic("solve: ExpandFree needs a full-length right-hand side")
	}
	if dst == nil {
		dst = make([]float64, s.Len())
	}
	k := 0
	for i, f := range s.Fixed {
		if f {
			dst[i] = b[i] / s.Diag[i]
			continue
		}
		if k >= len(free) {
			panic("solve: ExpandFree has too few free values")
		}
		dst[i] = free[k]
		k++
	}
	return dst
}
