package field

import (
	"context"
	"fmt"

	"gonum.org/v1/gonum/mat"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
	"github.com/phigrid/phigrid/solve"
)

// Settings controls Solve. A nil *Settings means the defaults.
type Settings struct {
	// Solver controls the linear solver.
	Solver solve.Settings
	// Raster controls rasterisation.
	Raster bc.Options
}

// Solution is a solved problem: the potential at every node together with
// the system it solves.
type Solution struct {
	Grid *grid.Grid
	Map  *bc.Map
	Sys  *solve.System
	// Phi is the potential of every node in volts, in grid index order.
	Phi []float64
	// V is the potential of every conductor in volts; for floating
	// conductors, the potential that gives them their charge.
	V []float64
	// Results holds the statistics of every linear solve made.
	Results []*solve.Result
	// Capacitance is the capacitance matrix when Solve had to compute it
	// (floating conductors); nil otherwise.
	Capacitance [][]float64

	ex, ey []float64     // cached nodal field for FieldAt
	surf   *surfaceCache // potential corrected near conductors (surface.go)
}

// Solve rasterises p onto g, assembles and solves it. Floating conductors
// are handled through the capacitance matrix: their potentials are those
// that give them their charges.
func Solve(ctx context.Context, p *bc.Problem, g *grid.Grid, set *Settings) (*Solution, error) {
	var o Settings
	if set != nil {
		o = *set
	}
	m, err := bc.Rasterize(p, g, &o.Raster)
	if err != nil {
		return nil, err
	}
	sys, err := solve.Assemble(m)
	if err != nil {
		return nil, err
	}
	s, err := solve.NewSolver(sys, &o.Solver)
	if err != nil {
		return nil, err
	}
	defer s.Close()
	return SolveSystem(ctx, sys, s)
}

// SolveSystem solves an assembled system with a set-up solver, using the
// conductor potentials and charges of its map.
func SolveSystem(ctx context.Context, sys *solve.System, s solve.Solver) (*Solution, error) {
	m := sys.Map
	sol := &Solution{Grid: m.Grid, Map: m, Sys: sys, V: make([]float64, len(m.Conductors))}
	var floating []int
	for k, c := range m.Conductors {
		sol.V[k] = c.Potential
		if c.Floating {
			floating = append(floating, k)
		}
	}
	if len(floating) > 0 {
		if err := sol.floatPotentials(ctx, s, floating); err != nil {
			return sol, err
		}
	}
	b := sys.RHS(nil, sol.V, true, true)
	sol.Phi = make([]float64, sys.Len())
	r, err := s.Solve(ctx, b, sol.Phi)
	if r != nil {
		sol.Results = append(sol.Results, r)
	}
	if err != nil {
		return sol, fmt.Errorf("field: potential: %w", err)
	}
	return sol, nil
}

// floatPotentials sets the potentials of floating conductors from
// Q = C·V + Q₀, where Q₀ is the charge that free charge and prescribed
// boundaries induce with every conductor at 0 V.
func (sol *Solution) floatPotentials(ctx context.Context, s solve.Solver, floating []int) error {
	sys := sol.Sys
	n := len(sol.V)
	c, results, err := capacitance(ctx, sys, s)
	sol.Results = append(sol.Results, results...)
	if err != nil {
		return err
	}
	sol.Capacitance = c
	zero := make([]float64, n)
	b := sys.RHS(nil, zero, true, true)
	phi0 := make([]float64, sys.Len())
	r, err := s.Solve(ctx, b, phi0)
	sol.Results = append(sol.Results, r)
	if err != nil {
		return fmt.Errorf("field: induced charges: %w", err)
	}
	q0 := Charges(sys, phi0, zero)
	isFloat := make([]bool, n)
	for _, k := range floating {
		isFloat[k] = true
	}
	// C_FF·V_F = Q_F − Q₀_F − C_FD·V_D
	nf := len(floating)
	a := mat.NewDense(nf, nf, nil)
	rhs := mat.NewVecDense(nf, nil)
	for i, ki := range floating {
		v := sol.Map.Conductors[ki].Charge - q0[ki]
		for kj := 0; kj < n; kj++ {
			if !isFloat[kj] {
				v -= c[ki][kj] * sol.V[kj]
			}
		}
		rhs.SetVec(i, v)
		for j, kj := range floating {
			a.Set(i, j, c[ki][kj])
		}
	}
	var vf mat.VecDense
	if err := vf.SolveVec(a, rhs); err != nil {
		return fmt.Errorf("field: floating conductors have no definite potential (is each coupled to a fixed potential?): %w", err)
	}
	for i, k := range floating {
		sol.V[k] = vf.AtVec(i)
	}
	return nil
}

// Charges returns the charge on every conductor of sys for the node
// potentials phi and conductor potentials v, by the discrete Gauss law: the
// net flux out of the conductor's nodes through the couplings of the
// operator.
func Charges(sys *solve.System, phi, v []float64) []float64 {
	q := make([]float64, sys.Conductors())
	for k, p := range sys.Parts {
		var s float64
		for i, idx := range p.Index {
			s += p.Value[i] * (v[k] - phi[idx])
		}
		q[k] = s
	}
	cond := sys.Map.Cond
	for _, l := range sys.FixedLinks {
		d := l.G * (phi[l.A] - phi[l.B])
		if ka := cond[l.A]; ka >= 0 {
			q[ka] += d
		}
		if kb := cond[l.B]; kb >= 0 {
			q[kb] -= d
		}
	}
	return q
}

// Charges returns the charge on every conductor.
func (sol *Solution) Charges() []float64 { return Charges(sol.Sys, sol.Phi, sol.V) }

// Energy returns the stored electrostatic energy ½·Σ g·(Δφ)² over every
// link of the operator, plus ½·Σ Far·φ² for the field beyond open sides:
// J/m in a planar problem, J in an axisymmetric one.
func Energy(sys *solve.System, phi []float64) float64 {
	nx, ny := sys.Nx, sys.Ny
	var w float64
	for j := 0; j < ny; j++ {
		for i := 0; i < nx; i++ {
			n := j*nx + i
			if i+1 < nx {
				if g := sys.AX[n]; g != 0 {
					d := phi[n] - phi[n+1]
					w += g * d * d
				}
			}
			if j+1 < ny {
				if g := sys.AY[n]; g != 0 {
					d := phi[n] - phi[n+nx]
					w += g * d * d
				}
			}
		}
	}
	for k, p := range sys.Parts {
		nodes := sys.Nodes[k]
		var vk float64
		if len(nodes) > 0 {
			vk = phi[nodes[0]]
		}
		for i, idx := range p.Index {
			d := phi[idx] - vk
			w += p.Value[i] * d * d
		}
	}
	for _, links := range [][]solve.Link{sys.FixedLinks, sys.PrescribedLinks} {
		for _, l := range links {
			d := phi[l.A] - phi[l.B]
			w += l.G * d * d
		}
	}
	for n, f := range sys.Far {
		w += f * phi[n] * phi[n]
	}
	return 0.5 * w
}

// Energy returns the stored energy of the solution.
func (sol *Solution) Energy() float64 { return Energy(sol.Sys, sol.Phi) }
