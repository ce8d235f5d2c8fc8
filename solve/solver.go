package solve

import (
	"context"
	"errors"
	"fmt"
	"math"
	"time"
)

// Method selects a solver.
type Method int

const (
	// Default selects the project's default solver.
	Default Method = iota
	// SOR is red-black successive over-relaxation with an estimated
	// optimal relaxation factor.
	SOR
	// CG is conjugate gradients with a Jacobi (diagonal) preconditioner.
	CG
	// MGCG is conjugate gradients preconditioned by a multigrid V-cycle.
	MGCG
	// MG is stand-alone multigrid: V-cycles from a full-multigrid start
	// until the tolerance is met.
	MG
)

var methodNames = map[Method]string{Default: "default", SOR: "sor", CG: "cg", MGCG: "mg-pcg", MG: "mg"}

// String returns the method's name as used in model files and reports.
func (m Method) String() string {
	if s, ok := methodNames[m]; ok {
		return s
	}
	return fmt.Sprintf("Method(%d)", int(m))
}

// ParseMethod returns the method named s ("sor", "cg", "mg-pcg" or
// "default").
func ParseMethod(s string) (Method, error) {
	for m, n := range methodNames {
		if n == s {
			return m, nil
		}
	}
	return 0, fmt.Errorf("solve: unknown method %q; use mg-pcg, mg, cg or sor", s)
}

// Progress is what a progress callback sees after an iteration.
type Progress struct {
	Iteration int
	// Residual is the relative residual ‖b − Aφ‖/‖b‖ over free rows.
	Residual float64
	Elapsed  time.Duration
}

// Settings controls a solve. A nil *Settings and zero fields mean the
// documented defaults.
type Settings struct {
	// Method selects the solver. Zero means Default.
	Method Method
	// Tol is the relative-residual tolerance ‖b − Aφ‖₂/‖b‖₂ over free
	// rows. Zero means 1e-10.
	Tol float64
	// MaxIter caps the iterations. Zero means 20 000 for SOR and CG and
	// 500 for multigrid.
	MaxIter int
	// Workers caps the goroutines used. Zero means runtime.GOMAXPROCS(0).
	Workers int
	// Omega is SOR's relaxation factor in (0, 2). Zero means an estimate
	// of the optimum from a short Lanczos run.
	Omega float64
	// Progress, when not nil, is called after every iteration (SOR: every
	// residual check) from the solving goroutine.
	Progress func(Progress)
	// KeepHistory records the residual of every iteration in the result.
	KeepHistory bool
}

// DefaultTol is the relative-residual tolerance used when Settings.Tol is
// zero.
const DefaultTol = 1e-10

func (s *Settings) withDefaults() Settings {
	var o Settings
	if s != nil {
		o = *s
	}
	if o.Tol == 0 {
		o.Tol = DefaultTol
	}
	return o
}

// Status is the outcome of a solve.
type Status int

const (
	// Converged means the tolerance was reached.
	Converged Status = iota
	// IterationLimit means MaxIter iterations ran without reaching the
	// tolerance.
	IterationLimit
	// Canceled means the context was cancelled.
	Canceled
	// Breakdown means the iteration could not continue (a non-finite or
	// non-positive quantity appeared).
	Breakdown
)

var statusInfo = [...]struct {
	name string
	err  error
}{
	Converged:      {"converged", nil},
	IterationLimit: {"iteration limit", ErrNotConverged},
	Canceled:       {"canceled", context.Canceled},
	Breakdown:      {"breakdown", ErrBreakdown},
}

// String returns the status's name.
func (s Status) String() string {
	if int(s) < len(statusInfo) {
		return statusInfo[s].name
	}
	return fmt.Sprintf("Status(%d)", int(s))
}

// Err returns the sentinel error of a status that is not Converged, or nil.
func (s Status) Err() error {
	if int(s) < len(statusInfo) {
		return statusInfo[s].err
	}
	return nil
}

// ErrNotConverged is wrapped by a solve that stopped at its iteration limit
// before reaching the tolerance; the result holds the best iterate.
var ErrNotConverged = errors.New("solve: tolerance not reached")

// ErrBreakdown is wrapped by a solve that could not continue because a
// non-finite or non-positive quantity appeared, which points at a bad
// system.
var ErrBreakdown = errors.New("solve: iteration broke down")

// Result reports a solve.
type Result struct {
	Method     Method
	Status     Status
	Iterations int
	// Residual is the final relative residual over free rows.
	Residual float64
	// History holds the relative residual after every iteration when
	// Settings.KeepHistory is set.
	History []float64
	// Setup is the time spent preparing the solver (preconditioner,
	// relaxation estimate); Elapsed the time spent iterating.
	Setup, Elapsed time.Duration
}

// Solver solves a System for any number of right-hand sides. A solver is
// set up once for its system (NewSolver) and then reused; it is not safe
// for concurrent use.
type Solver interface {
	// Solve solves A·x = b, starting from x and overwriting it with the
	// best iterate. The fixed rows of x are set from b. It returns an error
	// wrapping ErrNotConverged, ErrBreakdown or the context's error when
	// the tolerance is not reached.
	Solve(ctx context.Context, b, x []float64) (*Result, error)
	// Close releases the solver's workers.
	Close()
}

// NewSolver sets up a solver for sys following set. When the box around
// the free nodes holds at most three quarters of the grid, it works on it
// only (fixed margins at the domain's edges, such as the outside of a
// shield, then cost nothing); vectors passed to Solve still cover the
// whole grid.
func NewSolver(sys *System, set *Settings) (Solver, error) {
	o := set.withDefaults()
	if !(o.Tol > 0 && o.Tol < 1) {
		return nil, fmt.Errorf("solve: tolerance must lie in (0, 1), got %g", o.Tol)
	}
	if o.MaxIter < 0 {
		return nil, fmt.Errorf("solve: iteration limit must be ≥ 0, got %d", o.MaxIter)
	}
	if o.Omega != 0 && !(o.Omega > 0 && o.Omega < 2) {
		return nil, fmt.Errorf("solve: SOR relaxation factor must lie in (0, 2), got %g", o.Omega)
	}
	switch o.Method {
	case SOR, CG, Default, MGCG, MG:
	default:
		return nil, fmt.Errorf("solve: unknown method %d", int(o.Method))
	}
	if c, err := newCropped(sys, o); c != nil || err != nil {
		return c, err
	}
	return newMethod(sys, o)
}

// newMethod sets up the solver of o.Method for sys.
func newMethod(sys *System, o Settings) (Solver, error) {
	switch o.Method {
	case SOR:
		return newSOR(sys, o), nil
	case CG:
		return newCG(sys, o), nil
	case MG:
		return NewMultigrid(sys, &o)
	}
	return newDefault(sys, o)
}

// Solve is a convenience that sets up a solver, solves once and releases
// it.
func Solve(ctx context.Context, sys *System, b, x []float64, set *Settings) (*Result, error) {
	s, err := NewSolver(sys, set)
	if err != nil {
		return nil, err
	}
	defer s.Close()
	return s.Solve(ctx, b, x)
}

// finish turns a status into the error a Solve returns; ctxErr is the
// context's error for a cancelled solve.
func finish(r *Result, ctxErr error) error {
	switch r.Status {
	case Converged:
		return nil
	case Canceled:
		if ctxErr == nil {
			ctxErr = context.Canceled
		}
		return fmt.Errorf("solve: %v stopped after %d iterations at relative residual %.3g: %w", r.Method, r.Iterations, r.Residual, ctxErr)
	case IterationLimit:
		return fmt.Errorf("%w: %v reached relative residual %.3g after %d iterations; raise the iteration limit or loosen the tolerance", ErrNotConverged, r.Method, r.Residual, r.Iterations)
	default:
		return fmt.Errorf("%w: %v after %d iterations; check the problem for isolated regions without a fixed potential", ErrBreakdown, r.Method, r.Iterations)
	}
}

func badNumber(v float64) bool { return math.IsNaN(v) || math.IsInf(v, 0) }
