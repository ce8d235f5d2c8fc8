package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"math"
	"text/tabwriter"
	"time"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
	"github.com/phigrid/phigrid/solve"
)

func init() {
	register(&command{
		name:    "check",
		args:    "MODEL",
		summary: "validate a model and summarise its grid, conductors, materials and cost",
		help: `check reads the model, builds its grid and rasterises it, exactly as solve
would, and prints a summary: grid size, smallest and largest cells, conductors,
materials, and estimates of the memory and time a solve needs. Nothing is
solved and nothing is written. The exit status is 2 when the model is invalid.`,
		run: runCheck,
	})
}

func runCheck(ctx context.Context, e *env, fs *flag.FlagSet, _ any) error {
	if fs.NArg() != 1 {
		return &usageError{"check needs exactly one model file"}
	}
	p, err := prepare(fs.Arg(0))
	if err != nil {
		return err
	}
	set, err := p.settings("", 0)
	if err != nil {
		return err
	}
	writeSummary(e.stdout, p, set)
	fmt.Fprintln(e.stdout, "model is valid")
	return nil
}

// writeSummary prints what check shows; solve prints it too, before it
// starts.
func writeSummary(w io.Writer, p *prepared, set solve.Settings) {
	m, g := p.model, p.grid
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintf(tw, "model\t%s\n", m.Name)
	if m.Title != "" {
		fmt.Fprintf(tw, "title\t%s\n", m.Title)
	}
	kind := "planar cross-section (charges, energies and capacitances per metre of depth)"
	xn, yn := "x", "y"
	if g.Metric() == grid.Axisymmetric {
		kind = "axisymmetric r–z body of revolution"
		xn, yn = "r", "z"
	}
	fmt.Fprintf(tw, "kind\t%s\n", kind)
	d := m.Problem.Domain
	fmt.Fprintf(tw, "domain\t%s %s … %s, %s %s … %s\n", xn, p.length(d.X0), p.length(d.X1), yn, p.length(d.Y0), p.length(d.Y1))
	lo, hi := g.MinMaxStep()
	free := p.bcmap.FreeNodes()
	fmt.Fprintf(tw, "grid\t%d × %d = %d nodes, %d unknown; cells %s … %s\n", g.Nx(), g.Ny(), g.Len(), free, p.length(lo), p.length(hi))
	if p.bcmap.Snapped > 0 {
		fmt.Fprintf(tw, "\t%s moved onto conductor surfaces they nearly touch\n", plural(p.bcmap.Snapped, "node"))
	}
	for k, c := range m.Problem.Conductors {
		n := len(p.sys.Nodes[k])
		label := "conductor"
		if k > 0 {
			label = ""
		}
		if c.Floating {
			fmt.Fprintf(tw, "%s\t%s: floating, charge %s (%s)\n", label, c.Name, si(c.Charge, chargeUnit(g)), plural(n, "node"))
		} else {
			fmt.Fprintf(tw, "%s\t%s: %s (%s)\n", label, c.Name, si(c.Potential, "V"), plural(n, "node"))
		}
	}
	for i, mat := range m.Materials {
		label := "material"
		if i > 0 {
			label = ""
		}
		fmt.Fprintf(tw, "%s\t%s: εr %g (%s)\n", label, mat.Name, mat.EpsR, mat.Note)
	}
	for s, side := range m.Problem.Sides {
		desc := side.Kind.String()
		if side.Kind == bc.Fixed {
			if side.Conductor != "" {
				desc = "conductor " + side.Conductor
			} else {
				desc = "fixed at " + si(side.Potential, "V")
			}
		}
		label := "boundary"
		if s > 0 {
			label = ""
		}
		fmt.Fprintf(tw, "%s\t%s: %s\n", label, bc.SideNames[s], desc)
	}
	method := set.Method
	if method == solve.Default {
		method = solve.MGCG
	}
	tol := set.Tol
	if tol == 0 {
		tol = solve.DefaultTol
	}
	fmt.Fprintf(tw, "solver\t%v, relative residual %.3g\n", method, tol)
	solves := 1 + len(m.Problem.Conductors)
	mem := estimateMemory(g.Nx(), g.Ny(), method)
	fmt.Fprintf(tw, "memory\tabout %s (estimate)\n", bytesString(float64(mem)))
	per := estimateSolveTime(p.sys, method)
	fmt.Fprintf(tw, "time\tabout %s per solve, %d solves (potential and capacitance matrix); rough estimate from a timed operator evaluation\n", roundDuration(per), solves)
	tw.Flush()
}

func chargeUnit(g *grid.Grid) string {
	if g.Metric() == grid.Axisymmetric {
		return "C"
	}
	return "C/m"
}

// estimateMemory returns the bytes a solve is expected to hold: the map,
// the system, the solution and the solver's workspace.
func estimateMemory(nx, ny int, m solve.Method) int64 {
	return solve.EstimateMemory(nx, ny, m) + int64(nx*ny)*(mapBytesPerNode+systemBytesPerNode)
}

// systemBytesPerNode is the assembled system (about 41 bytes per node)
// and the right-hand side, potential and one field vector.
const systemBytesPerNode = 41 + 3*8

// mapBytesPerNode is the rasterised map's share: kind, conductor index,
// prescribed value, cut fractions and the per-cell materials.
const mapBytesPerNode = 1 + 4 + 8 + 16 + 24

// estimateSolveTime times one operator evaluation on the system and scales
// it by the work a solve of the method typically costs, in operator
// evaluations.
func estimateSolveTime(sys *solve.System, m solve.Method) time.Duration {
	x := make([]float64, sys.Len())
	y := make([]float64, sys.Len())
	for i := range x {
		x[i] = 1
	}
	best := time.Duration(math.MaxInt64)
	for range 3 {
		t0 := time.Now()
		sys.Apply(y, x)
		best = min(best, time.Since(t0))
	}
	n := float64(max(sys.Nx, sys.Ny))
	var units float64
	switch m {
	case solve.SOR:
		units = 8 * n
	case solve.CG:
		units = 6 * n
	default:
		units = 60
	}
	return time.Duration(float64(best) * units)
}

func roundDuration(d time.Duration) string {
	switch {
	case d < time.Millisecond:
		return "1 ms"
	case d < time.Second:
		return d.Round(time.Millisecond).String()
	case d < time.Minute:
		return d.Round(100 * time.Millisecond).String()
	}
	return d.Round(time.Second).String()
}
