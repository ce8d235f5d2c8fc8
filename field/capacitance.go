package field

import (
	"context"
	"fmt"

	"gonum.org/v1/gonum/mat"

	"github.com/phigrid/phigrid/solve"
)

// CapacitanceMatrix returns the Maxwell capacitance matrix of the
// conductors of sys: column k holds the conductor charges when conductor k
// is at 1 V and every other conductor, and every prescribed boundary, is at
// 0 V. It makes one solve per conductor with one solver set-up. Entries are
// F/m in a planar problem and F in an axisymmetric one; the diagonal is
// positive and off-diagonal entries are negative or zero.
func CapacitanceMatrix(ctx context.Context, sys *solve.System, set *solve.Settings) ([][]float64, []*solve.Result, error) {
	s, err := solve.NewSolver(sys, set)
	if err != nil {
		return nil, nil, err
	}
	defer s.Close()
	return capacitance(ctx, sys, s)
}

// CapacitanceMatrixWith is CapacitanceMatrix with a solver already set up
// for sys, so that the potential solve and the matrix share one set-up.
func CapacitanceMatrixWith(ctx context.Context, sys *solve.System, s solve.Solver) ([][]float64, []*solve.Result, error) {
	return capacitance(ctx, sys, s)
}

func capacitance(ctx context.Context, sys *solve.System, s solve.Solver) ([][]float64, []*solve.Result, error) {
	n := sys.Conductors()
	c := make([][]float64, n)
	for i := range c {
		c[i] = make([]float64, n)
	}
	v := make([]float64, n)
	b := make([]float64, sys.Len())
	phi := make([]float64, sys.Len())
	var results []*solve.Result
	for k := 0; k < n; k++ {
		clear(v)
		v[k] = 1
		sys.RHS(b, v, false, false)
		clear(phi)
		r, err := s.Solve(ctx, b, phi)
		results = append(results, r)
		if err != nil {
			return nil, results, fmt.Errorf("field: capacitance column %d: %w", k, err)
		}
		q := Charges(sys, phi, v)
		for j := range q {
			c[j][k] = q[j]
		}
	}
	return c, results, nil
}

// TwoTerminal returns the capacitance between conductors a and b of the
// Maxwell matrix c when every other conductor floats uncharged and any
// prescribed boundary is at b's potential: charge +Q on a and −Q on b give
// a potential difference Q/C.
func TwoTerminal(c [][]float64, a, b int) (float64, error) {
	n := len(c)
	if a < 0 || a >= n || b < 0 || b >= n || a == b {
		return 0, fmt.Errorf("field: two-terminal capacitance needs two different conductors among %d, got %d and %d", n, a, b)
	}
	// Hold b at 0 V and solve the rest for unit charge on a.
	idx := make([]int, 0, n-1)
	for k := 0; k < n; k++ {
		if k != b {
			idx = append(idx, k)
		}
	}
	m := mat.NewDense(n-1, n-1, nil)
	q := mat.NewVecDense(n-1, nil)
	pa := 0
	for i, ki := range idx {
		if ki == a {
			pa = i
			q.SetVec(i, 1)
		}
		for j, kj := range idx {
			m.Set(i, j, c[ki][kj])
		}
	}
	var v mat.VecDense
	if err := v.SolveVec(m, q); err != nil {
		return 0, fmt.Errorf("field: the capacitance matrix is singular: %w", err)
	}
	return 1 / v.AtVec(pa), nil
}
