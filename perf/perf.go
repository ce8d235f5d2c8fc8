package perf

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"runtime"
	"sort"
	"strings"
	"text/tabwriter"
	"time"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
	"github.com/phigrid/phigrid/io/model"
	"github.com/phigrid/phigrid/solve"
)

// DefaultSizes are the unit-square sizes (nodes per side) of the ladder.
var DefaultSizes = []int{257, 513, 1025, 2049, 4097}

// DefaultSolvers are the solvers the ladder runs.
var DefaultSolvers = []solve.Method{solve.SOR, solve.CG, solve.MGCG}

// Defaults of Options' zero fields.
const (
	DefaultMaxNodes  = 4097 * 4097
	DefaultTol       = 1e-8
	DefaultSlowNodes = 1025 * 1025
)

// Case is one problem of the ladder: a problem and the grid to solve it
// on.
type Case struct {
	Name    string
	Problem *bc.Problem
	Grid    *grid.Grid
}

// Options selects the ladder. The zero value runs the default ladder.
type Options struct {
	// MaxNodes caps the nodes of every case; larger cases are skipped.
	// Zero means DefaultMaxNodes.
	MaxNodes int
	// Solvers lists the methods to run. Nil means DefaultSolvers.
	Solvers []solve.Method
	// Sizes lists the unit-square sizes in nodes per side, which are also
	// the targets of the refined model grids. Nil means DefaultSizes; an
	// empty non-nil slice runs no unit square.
	Sizes []int
	// Examples lists model files; each runs on its own grid and on grids
	// refined toward Sizes.
	Examples []string
	// Cases are further cases built by the caller.
	Cases []Case
	// Tol is the relative-residual tolerance. Zero means DefaultTol.
	Tol float64
	// Workers caps the goroutines of every solve. Zero means all cores.
	Workers int
	// SlowNodes is the largest case on which SOR and CG run; beyond it
	// they need thousands of iterations. Zero means DefaultSlowNodes; a
	// negative value removes the limit.
	SlowNodes int
	// Repeat runs every set-up and solve this many times and reports the
	// median times, as the peer programs do. Zero means 1. Memory is
	// measured on the first run.
	Repeat int
	// Progress, when not nil, receives one line per finished row.
	Progress io.Writer
}

// Row is the outcome of one solver on one case.
type Row struct {
	Case string `json:"case"`
	// Nodes is the size of the grid, Unknowns the free nodes among them.
	Nodes    int    `json:"nodes"`
	Unknowns int    `json:"unknowns"`
	Solver   string `json:"solver"`
	// AssembleS is the time to rasterise and assemble the case, SetupS
	// the solver set-up, SolveS the iterations, all in seconds.
	AssembleS float64 `json:"assemble_s"`
	SetupS    float64 `json:"setup_s"`
	SolveS    float64 `json:"solve_s"`
	// Iterations and Residual (‖b − Aφ‖/‖b‖ over free nodes) at the end.
	Iterations int     `json:"iterations"`
	Residual   float64 `json:"relative_residual"`
	// PeakBytesPerNode counts the operator the solver reads (diagonal,
	// couplings, fixed marks), the right-hand side and solution, and
	// every byte the set-up and the solve allocate, per node.
	PeakBytesPerNode float64 `json:"peak_bytes_per_node"`
	// ResidualS is the time of one residual evaluation on the case's grid
	// with the same workers; WorkUnits is SolveS over it.
	ResidualS float64 `json:"residual_eval_s"`
	WorkUnits float64 `json:"work_units"`
	// Error is the solver's error, if any (for example the iteration
	// limit); the other figures then describe the best iterate.
	Error string `json:"error,omitempty"`
}

// Report is the result of Run.
type Report struct {
	Tol     float64 `json:"tolerance"`
	Workers int     `json:"workers"`
	CPUs    int     `json:"cpus"`
	Rows    []Row   `json:"rows"`
	// Skipped names the cases left out by MaxNodes or SlowNodes.
	Skipped []string `json:"skipped,omitempty"`
}

// UnitSquare returns the unit-square Poisson case with n × n nodes:
// ρ = ε₀ so that −Δφ = 1, every side at 0 V.
func UnitSquare(n int) (Case, error) {
	p := &bc.Problem{
		Domain:  bc.Rect{X1: 1, Y1: 1},
		Regions: []bc.Region{{Name: "charge", Kind: bc.Charge, Shape: bc.Rect{X1: 1, Y1: 1}, Rho: solve.Eps0}},
	}
	for s := range p.Sides {
		p.Sides[s] = bc.Side{Kind: bc.Fixed}
	}
	x, err := grid.Uniform(0, 1, n)
	if err != nil {
		return Case{}, fmt.Errorf("perf: unit square of %d nodes per side: %w", n, err)
	}
	g, err := grid.New(x, x, grid.Planar)
	if err != nil {
		return Case{}, fmt.Errorf("perf: unit square: %w", err)
	}
	return Case{Name: fmt.Sprintf("unit-square %d²", n), Problem: p, Grid: g}, nil
}

// ModelCases loads a model file and returns it on its own grid and on
// grids refined toward each size² nodes that is larger than its own, every
// grid within maxNodes (zero means DefaultMaxNodes).
func ModelCases(path string, sizes []int, maxNodes int) ([]Case, error) {
	if maxNodes <= 0 {
		maxNodes = DefaultMaxNodes
	}
	m, err := model.Load(path)
	if err != nil {
		return nil, fmt.Errorf("perf: %w", err)
	}
	name := strings.TrimSuffix(filepath.Base(path), filepath.Ext(path))
	var out []Case
	mesh := m.Mesh
	mesh.MaxNodes = maxNodes
	g, err := bc.AutoGrid(m.Problem, mesh)
	switch {
	case err == nil:
		out = append(out, Case{Name: fmt.Sprintf("%s %d×%d", name, g.Nx(), g.Ny()), Problem: m.Problem, Grid: g})
	case errors.Is(err, bc.ErrTooLarge):
	default:
		return nil, fmt.Errorf("perf: %s: %w", path, err)
	}
	own := bc.EstimateNodes(m.Problem, m.Mesh)
	for _, n := range sizes {
		target := float64(n) * float64(n)
		// Only refinements: a coarser grid than the model asks for says
		// nothing a designer would run.
		if target > float64(maxNodes) || target < 1.2*own {
			continue
		}
		ms := scaledMesh(m.Problem, m.Mesh, target)
		ms.MaxNodes = maxNodes
		g, err := bc.AutoGrid(m.Problem, ms)
		if err != nil {
			if errors.Is(err, bc.ErrTooLarge) {
				continue
			}
			return nil, fmt.Errorf("perf: %s at about %d² nodes: %w", path, n, err)
		}
		out = append(out, Case{Name: fmt.Sprintf("%s %d×%d", name, g.Nx(), g.Ny()), Problem: m.Problem, Grid: g})
	}
	return out, nil
}

// scaledMesh returns mesh with its cell size scaled so that the grid has
// about target nodes, by bisection on the logarithm of the cell size.
func scaledMesh(p *bc.Problem, mesh bc.Mesh, target float64) bc.Mesh {
	mesh.MaxNodes = math.MaxInt32
	lo, hi := math.Log(mesh.Cell)-8, math.Log(mesh.Cell)+8
	for it := 0; it < 40; it++ {
		mid := 0.5 * (lo + hi)
		mesh.Cell = math.Exp(mid)
		if bc.EstimateNodes(p, mesh) > target {
			lo = mid
		} else {
			hi = mid
		}
	}
	mesh.Cell = math.Exp(hi)
	return mesh
}

// Run runs the ladder and returns its report. It stops at the first case
// that cannot be built and when ctx is done; a solver that does not reach
// the tolerance is reported in its row, not as an error.
func Run(ctx context.Context, opt Options) (*Report, error) {
	o := opt
	if o.MaxNodes <= 0 {
		o.MaxNodes = DefaultMaxNodes
	}
	if o.Solvers == nil {
		o.Solvers = DefaultSolvers
	}
	if o.Sizes == nil {
		o.Sizes = DefaultSizes
	}
	if o.Tol == 0 {
		o.Tol = DefaultTol
	}
	if !(o.Tol > 0 && o.Tol < 1) {
		return nil, fmt.Errorf("perf: tolerance must lie in (0, 1), got %g", o.Tol)
	}
	if o.SlowNodes == 0 {
		o.SlowNodes = DefaultSlowNodes
	}
	workers := o.Workers
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	rep := &Report{Tol: o.Tol, Workers: workers, CPUs: runtime.NumCPU()}
	// Cases are built one at a time so that only one large grid is in
	// memory.
	var builders []func() ([]Case, error)
	for _, n := range o.Sizes {
		if n*n > o.MaxNodes {
			rep.Skipped = append(rep.Skipped, fmt.Sprintf("unit-square %d² (over %d nodes)", n, o.MaxNodes))
			continue
		}
		builders = append(builders, func() ([]Case, error) {
			c, err := UnitSquare(n)
			return []Case{c}, err
		})
	}
	for _, path := range o.Examples {
		builders = append(builders, func() ([]Case, error) { return ModelCases(path, o.Sizes, o.MaxNodes) })
	}
	for _, c := range o.Cases {
		builders = append(builders, func() ([]Case, error) { return []Case{c}, nil })
	}
	for _, build := range builders {
		cases, err := build()
		if err != nil {
			return rep, err
		}
		for _, c := range cases {
			if err := ctx.Err(); err != nil {
				return rep, fmt.Errorf("perf: %w", err)
			}
			if c.Grid.Len() > o.MaxNodes {
				rep.Skipped = append(rep.Skipped, fmt.Sprintf("%s (over %d nodes)", c.Name, o.MaxNodes))
				continue
			}
			rows, skipped, err := runCase(ctx, c, o, workers)
			rep.Rows = append(rep.Rows, rows...)
			rep.Skipped = append(rep.Skipped, skipped...)
			if err != nil {
				return rep, err
			}
			if o.Progress != nil {
				for _, r := range rows {
					fmt.Fprintf(o.Progress, "%s: %s %.3f s + %.3f s, %d iterations\n", r.Case, r.Solver, r.SetupS, r.SolveS, r.Iterations)
				}
			}
		}
	}
	return rep, nil
}

// runCase assembles one case and runs every solver on it.
func runCase(ctx context.Context, c Case, o Options, workers int) ([]Row, []string, error) {
	t0 := time.Now()
	m, err := bc.Rasterize(c.Problem, c.Grid, nil)
	if err != nil {
		return nil, nil, fmt.Errorf("perf: %s: %w", c.Name, err)
	}
	sys, err := solve.Assemble(m)
	if err != nil {
		return nil, nil, fmt.Errorf("perf: %s: %w", c.Name, err)
	}
	assemble := time.Since(t0).Seconds()
	v := make([]float64, sys.Conductors())
	for k, cd := range c.Problem.Conductors {
		v[k] = cd.Potential
	}
	b := sys.RHS(nil, v, true, true)
	n := sys.Len()
	_, free := sys.FreeIndex()
	unit := solve.TimeResidual(sys, workers, 5).Seconds()
	var rows []Row
	var skipped []string
	for _, meth := range o.Solvers {
		if meth != solve.MGCG && meth != solve.Default && o.SlowNodes > 0 && n > o.SlowNodes {
			skipped = append(skipped, fmt.Sprintf("%s with %v (over %d nodes)", c.Name, meth, o.SlowNodes))
			continue
		}
		row := Row{Case: c.Name, Nodes: n, Unknowns: free, Solver: meth.String(), AssembleS: assemble, ResidualS: unit}
		reps := max(1, o.Repeat)
		setups, solves := make([]float64, 0, reps), make([]float64, 0, reps)
		var before, after runtime.MemStats
		for rep := 0; rep < reps; rep++ {
			x := make([]float64, n)
			runtime.GC()
			if rep == 0 {
				runtime.ReadMemStats(&before)
			}
			ts := time.Now()
			s, err := solve.NewSolver(sys, &solve.Settings{Method: meth, Tol: o.Tol, Workers: workers})
			if err != nil {
				return rows, skipped, fmt.Errorf("perf: %s: %w", c.Name, err)
			}
			setups = append(setups, time.Since(ts).Seconds())
			res, err := s.Solve(ctx, b, x)
			s.Close()
			if rep == 0 {
				runtime.ReadMemStats(&after)
			}
			if res != nil {
				solves = append(solves, res.Elapsed.Seconds())
				row.Iterations = res.Iterations
				row.Residual = res.Residual
			}
			if err != nil {
				if ctx.Err() != nil {
					return rows, skipped, fmt.Errorf("perf: %s: %w", c.Name, err)
				}
				row.Error = err.Error()
				break
			}
		}
		row.SetupS, row.SolveS = median(setups), median(solves)
		// Operator (Diag, AX, AY, Fixed), b and x, and all the solver
		// allocated.
		resident := float64(n)*(3*8+1) + float64(2*n*8)
		row.PeakBytesPerNode = (resident + float64(after.TotalAlloc-before.TotalAlloc)) / float64(n)
		if unit > 0 {
			row.WorkUnits = row.SolveS / unit
		}
		rows = append(rows, row)
	}
	return rows, skipped, nil
}

// WriteText writes the report as an aligned table.
func (r *Report) WriteText(w io.Writer) error {
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintf(tw, "case\tnodes\tsolver\tsetup s\tsolve s\titerations\trel. residual\tbytes/node\twork units\t\n")
	for _, row := range r.Rows {
		fmt.Fprintf(tw, "%s\t%d\t%s\t%.3f\t%.3f\t%d\t%.2e\t%.0f\t%.0f\t", row.Case, row.Nodes, row.Solver, row.SetupS, row.SolveS, row.Iterations, row.Residual, row.PeakBytesPerNode, row.WorkUnits)
		if row.Error != "" {
			fmt.Fprintf(tw, " %s", row.Error)
		}
		fmt.Fprintln(tw)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	_, err := fmt.Fprintf(w, "tolerance %g, %d workers on %d CPUs; work units are solve time over one residual evaluation\n", r.Tol, r.Workers, r.CPUs)
	for _, s := range r.Skipped {
		if err == nil {
			_, err = fmt.Fprintf(w, "skipped: %s\n", s)
		}
	}
	return err
}

// WriteJSON writes the report as indented JSON.
func (r *Report) WriteJSON(w io.Writer) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(r)
}

// median returns the median of v (the mean of the middle two for an even
// count), or 0 for an empty slice. It sorts v.
func median(v []float64) float64 {
	if len(v) == 0 {
		return 0
	}
	sort.Float64s(v)
	m := len(v) / 2
	if len(v)%2 == 1 {
		return v[m]
	}
	return 0.5 * (v[m-1] + v[m])
}
