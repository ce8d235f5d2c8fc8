package solve

import (
	"context"
	"fmt"
	"testing"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
)

// benchSystems caches the unit-square systems of the benchmarks.
var benchSystems = map[int]*System{}

func benchSquare(b *testing.B, n int) *System {
	b.Helper()
	if s, ok := benchSystems[n]; ok {
		return s
	}
	s := mgSquare(b, n)
	benchSystems[n] = s
	return s
}

// benchKernel runs a multigrid kernel of the unit-square hierarchy at
// 513², 1025² and 2049² nodes.
func benchKernel(b *testing.B, op func(m *Multigrid, x, rhs []float64)) {
	for _, n := range []int{513, 1025, 2049} {
		b.Run(fmt.Sprint(n), func(b *testing.B) {
			s := benchSquare(b, n)
			m, err := NewMultigrid(s, nil)
			if err != nil {
				b.Fatal(err)
			}
			defer m.Close()
			rhs := s.RHS(nil, nil, true, true)
			x := make([]float64, s.Len())
			m.Precondition(x, rhs)
			b.SetBytes(int64(s.Len()) * 8)
			b.ReportAllocs()
			b.ResetTimer()
			for i := 0; i < b.N; i++ {
				op(m, x, rhs)
			}
		})
	}
}

// BenchmarkSmoother is one symmetric red-black Gauss–Seidel step (both
// colours) on the finest level.
func BenchmarkSmoother(b *testing.B) {
	benchKernel(b, func(m *Multigrid, x, rhs []float64) { m.fine.smooth(x, rhs, false, false) })
}

// BenchmarkResidual is r = b − A·x on the finest level: the unit of the
// work counts that the bench ladder reports.
func BenchmarkResidual(b *testing.B) {
	benchKernel(b, func(m *Multigrid, x, rhs []float64) { m.fine.residual(m.fine.r, x, rhs) })
}

// BenchmarkRestriction is the finest level's fused residual and
// restriction, as a V-cycle runs it after red-black relaxation.
func BenchmarkRestriction(b *testing.B) {
	benchKernel(b, func(m *Multigrid, x, rhs []float64) { m.fine.restrictRed(m.cs[0].b, x, rhs) })
}

// BenchmarkRestrictionGeneral is the restriction of a stored residual,
// used after line relaxation.
func BenchmarkRestrictionGeneral(b *testing.B) {
	benchKernel(b, func(m *Multigrid, x, rhs []float64) { m.fine.restrict(m.cs[0].b, m.fine.r) })
}

// BenchmarkProlongation adds the interpolated first coarse level's
// correction to the finest level.
func BenchmarkProlongation(b *testing.B) {
	benchKernel(b, func(m *Multigrid, x, rhs []float64) { m.fine.prolong(x, m.cs[0].x) })
}

// BenchmarkVCycle is one V-cycle from zero: the preconditioner step.
func BenchmarkVCycle(b *testing.B) {
	benchKernel(b, func(m *Multigrid, x, rhs []float64) { m.Precondition(x, rhs) })
}

// BenchmarkSetup sets up the default solver (the multigrid hierarchy and
// the Krylov vectors) at 1025² and 2049² nodes and releases it.
func BenchmarkSetup(b *testing.B) {
	for _, n := range []int{1025, 2049} {
		b.Run(fmt.Sprint(n), func(b *testing.B) {
			s := benchSquare(b, n)
			set := &Settings{Method: MGCG, Tol: 1e-8}
			b.ReportAllocs()
			b.ResetTimer()
			for i := 0; i < b.N; i++ {
				solver, err := NewSolver(s, set)
				if err != nil {
					b.Fatal(err)
				}
				solver.Close()
			}
		})
	}
}

// BenchmarkAssemble rasterises and assembles the unit-square problem.
func BenchmarkAssemble(b *testing.B) {
	for _, n := range []int{257, 513, 1025} {
		b.Run(fmt.Sprint(n), func(b *testing.B) {
			p := &bc.Problem{
				Domain:  bc.Rect{X1: 1, Y1: 1},
				Regions: []bc.Region{{Kind: bc.Charge, Shape: bc.Rect{X1: 1, Y1: 1}, Rho: Eps0}},
			}
			allFixed(p)
			x, _ := grid.Uniform(0, 1, n)
			g, err := grid.New(x, x, grid.Planar)
			if err != nil {
				b.Fatal(err)
			}
			b.ReportAllocs()
			b.ResetTimer()
			for i := 0; i < b.N; i++ {
				m, err := bc.Rasterize(p, g, nil)
				if err != nil {
					b.Fatal(err)
				}
				if _, err := Assemble(m); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkSolve solves the unit square to 1e-8 with each method (MG-PCG
// also at 2049²), set-up
// included ("setup+solve") and with the solver set up once outside the
// timer ("solve").
func BenchmarkSolve(b *testing.B) {
	for _, m := range []Method{SOR, CG, MGCG} {
		for _, n := range []int{257, 513, 1025, 2049} {
			if m != MGCG && (n > 1025 || n > 513 && testing.Short()) {
				continue
			}
			s := benchSquare(b, n)
			rhs := s.RHS(nil, nil, true, true)
			set := &Settings{Method: m, Tol: 1e-8}
			b.Run(fmt.Sprintf("%v/%d/setup+solve", m, n), func(b *testing.B) {
				x := make([]float64, s.Len())
				b.ReportAllocs()
				for i := 0; i < b.N; i++ {
					clear(x)
					if _, err := Solve(context.Background(), s, rhs, x, set); err != nil {
						b.Fatal(err)
					}
				}
			})
			b.Run(fmt.Sprintf("%v/%d/solve", m, n), func(b *testing.B) {
				solver, err := NewSolver(s, set)
				if err != nil {
					b.Fatal(err)
				}
				defer solver.Close()
				x := make([]float64, s.Len())
				b.ReportAllocs()
				b.ResetTimer()
				for i := 0; i < b.N; i++ {
					clear(x)
					if _, err := solver.Solve(context.Background(), rhs, x); err != nil {
						b.Fatal(err)
					}
				}
			})
		}
	}
}
